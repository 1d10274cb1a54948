/**
 * Growing one CART tree (Breiman, Friedman, Olshen & Stone 1984, "Classification and Regression
 * Trees") on binned features, as used by both the `tree` and the `forest` learners.
 *
 * A node holds the training rows in rows[start..end), each with a weight (its number of
 * bootstrap draws, or 1). It becomes a leaf when it is pure (one class; or one target value),
 * when its depth has reached the cap, when its weight is below 2 * minLeaf, or when no drawn
 * feature has a valid split. Otherwise the split with the largest impurity decrease is chosen
 * among the features drawn for this node, where a split is valid when both children weigh at
 * least minLeaf. A split that does not lower impurity is still taken (it can open the way to
 * useful splits below, as on an exclusive-or), so with minLeaf = 1 trees grow until pure.
 *
 * Impurity decrease of a split of node t into L and R, in weighted units (W = weights):
 *   gini:     W_t gini(t) - W_L gini(L) - W_R gini(R), gini = 1 - sum_k p_k^2, which equals
 *             sum_k L_k^2 / W_L + sum_k R_k^2 / W_R - sum_k t_k^2 / W_t  (class weights L_k, R_k, t_k)
 *   entropy:  W_t H(t) - W_L H(L) - W_R H(R), H = -sum_k p_k ln p_k (in nats)
 *   variance: SSE(t) - SSE(L) - SSE(R), which equals S_L^2 / W_L + S_R^2 / W_R - S_t^2 / W_t
 *             (S = weighted sum of the targets)
 * Ties keep the first split met: features in the order drawn, thresholds ascending (splits
 * that are equal only up to rounding count as tied at a two-row node).
 *
 * Feature drawing (random forest, Breiman 2001, "Random Forests", Machine Learning 45:5-32,
 * free: https://www.stat.berkeley.edu/~breiman/randomforest2001.pdf): at every node a fresh
 * uniform draw without replacement of `mtry` features. When none of them has a valid split
 * (all constant within the node), more features are drawn one at a time until one has or all
 * have been tried, so a node is never made a leaf only because of an unlucky draw. With
 * mtry = p the features are tried in column order and the generator is not used.
 *
 * Split search per drawn feature: one pass over the node's rows builds a histogram of class
 * weights (or of weights and weighted target sums) per bin code, then the bins are walked in
 * ascending order. A node of fewer than 256 rows marks its occupied bins in a 256-bit mask and
 * walks only those; a node of at most 16 rows sorts its codes instead (insertion sort); a
 * two-row node takes the first drawn feature that tells its rows apart. So a small node costs
 * time in its size, not in the number of bins. A node holding fewer than one in BATCH_SPARSITY
 * of the training rows fills the histograms of all its first `mtry` drawn features in one pass
 * over its rows, reading the row-major copy of the codes: deep in a tree on many rows a node's
 * rows lie far apart, and a column lookup per row and feature would touch one memory line each.
 * The draws, the sums (in row order) and the walk order are those of the one-feature scans, so
 * the trees are identical. (Histogram subtraction between siblings is not used: with a fresh
 * feature draw at every node the parent's histograms are mostly for other features, and
 * building all p of them to subtract would cost p / 2 passes instead of mtry.)
 * Splitting a node is a stable partition of its rows, so rows stay in ascending order and
 * the code lookups walk memory forwards.
 *
 * Why classes and values have a fill, a walk and a partition each (near-copies on purpose):
 * one generic search was tried (2026-12-02), treating a value target as one channel whose
 * histogram holds w * y, so one fill, one walk (sum_k L_k^2 / W_L + sum_k R_k^2 / W_R, which is
 * the variance score when there is one channel) and one partition served both. Measured on
 * 200,000 x 20 random features, 6 bootstrap trees, the same binned matrix and draws, 7
 * alternating runs of each in one process (medians): classes (3, gini) 1,888 ms generic
 * against 1,863 ms here (1.01, within the noise); values 2,668 ms against 2,267 ms (1.18
 * slower: the channel array is moved and read for nothing), and the regression trees changed
 * (381,572 nodes against 381,656), because the running sums of squares round differently from
 * sL * sL, so reports would no longer be byte for byte the same. Kept apart: a change to one
 * side must be made to the other.
 *
 * Mean decrease in impurity (Breiman 2001 sec. 10; Louppe, Wehenkel, Sutera & Geurts 2013,
 * "Understanding variable importances in forests of randomized trees", NIPS, free:
 * https://papers.nips.cc/paper/4928): each split adds its impurity decrease divided by the
 * root's weight to its feature.
 */
import type { Rng } from '../../rng.js';
import type { BinnedMatrix } from './bins.js';
import type { NodeStore } from './node-store.js';

export type Impurity = 'gini' | 'entropy' | 'variance';

/** What a tree is grown to predict: class codes 0..classCount-1, or (centred) values. */
export type GrowTarget =
  | { readonly kind: 'classes'; readonly codes: Int32Array; readonly classCount: number }
  | {
      readonly kind: 'values';
      /** targets centred on their mean, for the split sums */
      readonly values: Float64Array;
      /** the targets as given, for the leaf means */
      readonly raw: Float64Array;
    };

export interface GrowSettings {
  readonly maxDepth: number;
  readonly minLeaf: number;
  /** features drawn per node, 1..p */
  readonly mtry: number;
  readonly impurity: Impurity;
}

function xlogx(x: number): number {
  return x > 0 ? x * Math.log(x) : 0;
}

/** Row-major copy of column-major n x p codes. */
function transpose(codes: Uint8Array, n: number, p: number): Uint8Array {
  const out = new Uint8Array(n * p);
  for (let j = 0; j < p; j++) {
    const base = j * n;
    for (let i = 0; i < n; i++) out[i * p + j] = codes[base + i];
  }
  return out;
}

/** Nodes with at most this many distinct rows are searched by sorting codes, not by histogram. */
const SMALL_NODE = 16;

/** A node whose rows are fewer than one in this many of the training rows is scanned in batch. */
const BATCH_SPARSITY = 8;

/**
 * Grows trees on one binned matrix; scratch buffers are allocated once and reused, so one
 * grower serves all the trees of a forest (one at a time).
 */
export class TreeGrower {
  private readonly codes: Uint8Array;
  private readonly n: number;
  private readonly p: number;
  private readonly cuts: readonly Float64Array[];
  private readonly binCounts: Int32Array;
  private readonly target: GrowTarget;
  private readonly isClasses: boolean;
  private readonly classCount: number;
  private readonly settings: GrowSettings;
  // per position in `rows`: weight and target, moved along with the rows when a node is split
  private readonly posW: Float64Array;
  private readonly posY: Float64Array;
  private readonly posC: Int32Array;
  private readonly tmpRows: Int32Array;
  private readonly tmpW: Float64Array;
  private readonly tmpY: Float64Array;
  private readonly tmpC: Int32Array;
  /** row-major copy of the codes (row r, feature j at r * p + j), for small nodes */
  private readonly rowCodes: Uint8Array;
  // scratch
  private readonly hist: Float64Array;
  private readonly histW: Float64Array;
  /** per histogram slot: a 256-bit mask of the bins to walk */
  private readonly mask: Uint32Array;
  /** the features of a batched scan, slot by slot */
  private readonly batch: Int32Array;
  private readonly tot: Float64Array;
  private readonly leftTot: Float64Array;
  private readonly perm: Int32Array;
  private readonly keys = new Int32Array(SMALL_NODE);
  // the current node and its best split
  private nodeWeight = 0;
  private nodePure = false;
  private bestFeature = -1;
  private bestBin = -1;
  private bestGain = -Infinity;

  constructor(data: BinnedMatrix, target: GrowTarget, settings: GrowSettings) {
    this.codes = data.codes;
    this.n = data.rows;
    this.p = data.cols;
    this.cuts = data.cuts;
    this.binCounts = Int32Array.from(data.cuts, (c) => c.length + 1);
    this.target = target;
    this.isClasses = target.kind === 'classes';
    this.classCount = target.kind === 'classes' ? target.classCount : 1;
    this.settings = settings;
    this.posW = new Float64Array(this.n);
    this.posY = new Float64Array(this.isClasses ? 0 : this.n);
    this.posC = new Int32Array(this.isClasses ? this.n : 0);
    this.tmpRows = new Int32Array(this.n);
    this.tmpW = new Float64Array(this.n);
    this.tmpY = new Float64Array(this.isClasses ? 0 : this.n);
    this.tmpC = new Int32Array(this.isClasses ? this.n : 0);
    this.rowCodes = transpose(this.codes, this.n, this.p);
    const width = this.classCount;
    const slots = Math.max(1, settings.mtry);
    this.hist = new Float64Array(slots * 256 * Math.max(2, width));
    this.histW = new Float64Array(slots * 256);
    this.mask = new Uint32Array(slots * 8);
    this.batch = new Int32Array(slots);
    this.tot = new Float64Array(width);
    this.leftTot = new Float64Array(width);
    this.perm = new Int32Array(this.p);
  }

  /**
   * Grows a tree on the rows listed in `rows` (reordered in place), with weights indexed by row
   * number, and appends it to `store`; every listed row must weigh > 0. `rng` draws the
   * features (unused when mtry = p).
   */
  grow(rows: Int32Array, weights: Float64Array, rng: Rng, store: NodeStore): void {
    const p = this.p;
    const { maxDepth, minLeaf } = this.settings;
    const m = rows.length;
    const posW = this.posW;
    for (let i = 0; i < m; i++) posW[i] = weights[rows[i]];
    if (this.target.kind === 'classes') {
      const y = this.target.codes;
      for (let i = 0; i < m; i++) this.posC[i] = y[rows[i]];
    } else {
      const y = this.target.values;
      for (let i = 0; i < m; i++) this.posY[i] = y[rows[i]];
    }
    for (let j = 0; j < p; j++) this.perm[j] = j;

    // room is made as the tree grows (two nodes per split, one leaf's values per leaf), not for
    // the 2m - 1 nodes a tree on m rows can have: on noisy data with 423,000 distinct rows that
    // bound was 847,000 nodes (27 MB) for trees of about 109,000 nodes
    store.reserve(1, 0);
    store.roots.push(store.count);
    const importance = store.importance;
    const stack: number[] = [0, m, 0, store.add()]; // start, end, depth, node
    let rootWeight = -1;

    while (stack.length > 0) {
      const node = stack.pop() as number;
      const depth = stack.pop() as number;
      const end = stack.pop() as number;
      const start = stack.pop() as number;

      this.totals(rows, start, end);
      const weight = this.nodeWeight;
      if (rootWeight < 0) rootWeight = weight;

      this.bestFeature = -1;
      if (!this.nodePure && depth < maxDepth && weight >= 2 * minLeaf && p > 0 && end - start >= 2) {
        this.search(rows, start, end, rng);
      }
      if (this.bestFeature < 0) {
        this.writeLeaf(store, node, weight, rows, start, end);
        continue;
      }
      const f = this.bestFeature;
      const mid = this.partition(rows, start, end, f, this.bestBin);
      store.reserve(2, 0);
      const l = store.add();
      const r = store.add();
      store.feature[node] = f;
      store.threshold[node] = this.cuts[f][this.bestBin];
      store.left[node] = l;
      store.right[node] = r;
      importance[f] += Math.max(0, this.bestGain) / rootWeight;
      // right pushed first so the left child is grown first
      stack.push(mid, end, depth + 1, r, start, mid, depth + 1, l);
    }
  }

  /**
   * Moves positions with code <= bin to the front of [start, end), keeping the order of each
   * side (rows start ascending, so every node's rows stay ascending and the code lookups of a
   * scan walk memory forwards); returns the boundary.
   *
   * Without a branch: each position is written both to the front (at l) and to the scratch (at
   * r), and the side it belongs to advances by one. A write at l <= i lands on a position
   * already read, and is overwritten by the next left position or the copy back from the
   * scratch. (A branch on the code goes either way about half the time on a good split, and
   * the missed predictions dominated: measured 2026-12-05 on 1,000,000 positions, 7.0 to 7.5 ms
   * a pass against 12.2 to 12.4 ms with the branch, in one process.) right = 1 exactly when
   * bin - code < 0, as both are 0..255.
   */
  private partition(rows: Int32Array, start: number, end: number, f: number, bin: number): number {
    const codes = this.codes;
    const base = f * this.n;
    const posW = this.posW;
    const tmpRows = this.tmpRows;
    const tmpW = this.tmpW;
    let l = start;
    let r = 0;
    if (this.isClasses) {
      const posC = this.posC;
      const tmpC = this.tmpC;
      for (let i = start; i < end; i++) {
        const row = rows[i];
        const w = posW[i];
        const c = posC[i];
        const right = (bin - codes[base + row]) >>> 31;
        rows[l] = row;
        posW[l] = w;
        posC[l] = c;
        tmpRows[r] = row;
        tmpW[r] = w;
        tmpC[r] = c;
        l += 1 - right;
        r += right;
      }
      for (let k = 0; k < r; k++) posC[l + k] = tmpC[k];
    } else {
      const posY = this.posY;
      const tmpY = this.tmpY;
      for (let i = start; i < end; i++) {
        const row = rows[i];
        const w = posW[i];
        const y = posY[i];
        const right = (bin - codes[base + row]) >>> 31;
        rows[l] = row;
        posW[l] = w;
        posY[l] = y;
        tmpRows[r] = row;
        tmpW[r] = w;
        tmpY[r] = y;
        l += 1 - right;
        r += right;
      }
      for (let k = 0; k < r; k++) posY[l + k] = tmpY[k];
    }
    for (let k = 0; k < r; k++) {
      rows[l + k] = tmpRows[k];
      posW[l + k] = tmpW[k];
    }
    return l;
  }

  /** Fills this.tot (class weights, or [sum of w * y]), this.nodeWeight and this.nodePure. */
  private totals(rows: Int32Array, start: number, end: number): void {
    const tot = this.tot;
    const posW = this.posW;
    tot.fill(0);
    let weight = 0;
    let pure = true;
    if (this.isClasses) {
      const posC = this.posC;
      const first = posC[start];
      for (let i = start; i < end; i++) {
        const w = posW[i];
        const c = posC[i];
        tot[c] += w;
        weight += w;
        if (c !== first) pure = false;
      }
    } else {
      const posY = this.posY;
      const raw = this.target.kind === 'values' ? this.target.raw : posY;
      const first = raw[rows[start]];
      let s = 0;
      for (let i = start; i < end; i++) {
        const w = posW[i];
        s += w * posY[i];
        weight += w;
        if (raw[rows[i]] !== first) pure = false;
      }
      tot[0] = s;
    }
    this.nodeWeight = weight;
    this.nodePure = pure;
  }

  /** Class shares, or the weighted mean of the raw targets (exactly the value in a pure leaf). */
  private writeLeaf(store: NodeStore, node: number, weight: number, rows: Int32Array, start: number, end: number): void {
    store.reserve(0, this.classCount);
    const at = store.addValues(this.classCount);
    store.offset[node] = at;
    if (this.target.kind === 'classes') {
      for (let k = 0; k < this.classCount; k++) store.values[at + k] = this.tot[k] / weight;
      return;
    }
    const raw = this.target.raw;
    if (this.nodePure) {
      store.values[at] = raw[rows[start]];
      return;
    }
    let s = 0;
    for (let i = start; i < end; i++) s += this.posW[i] * raw[rows[i]];
    store.values[at] = s / weight;
  }

  /** Sets bestFeature / bestBin / bestGain from the drawn features (bestFeature -1: none valid). */
  private search(rows: Int32Array, start: number, end: number, rng: Rng): void {
    const p = this.p;
    const perm = this.perm;
    const mtry = this.settings.mtry;
    const drawAll = mtry >= p;
    const small = end - start <= SMALL_NODE;
    // two rows: every valid split makes the same two one-row children, so the first drawn
    // feature that tells them apart is the answer (features are still drawn as usual)
    const two = end - start === 2;
    const at0 = rows[start] * p;
    const at1 = two ? rows[start + 1] * p : 0;
    const rowCodes = this.rowCodes;
    this.bestGain = -Infinity;
    const draw = (j: number): number => {
      if (drawAll) return j;
      const k = j + rng.int(p - j);
      const f = perm[k];
      perm[k] = perm[j];
      perm[j] = f;
      return f;
    };
    let j = 0;
    if (!small && this.batchRows(end - start)) {
      // the first mtry draws are made whatever the scans find, so they can be scanned together:
      // one pass over the node's rows fills every drawn feature's histogram from the row-major
      // codes (one memory line per row instead of one per row and feature), then each is walked
      // in draw order, which keeps the tie rule and the generator's sequence unchanged
      const batch = this.batch;
      let k = 0;
      for (; j < p && j < mtry; j++) {
        const f = draw(j);
        if (this.binCounts[f] >= 2) batch[k++] = f;
      }
      if (this.isClasses) this.fillClassesBatch(k, rows, start, end);
      else this.fillValuesBatch(k, rows, start, end);
      for (let a = 0; a < k; a++) {
        if (this.isClasses) this.walkClasses(batch[a], a);
        else this.walkValues(batch[a], a);
      }
    }
    let tried = j;
    for (; j < p && (tried < mtry || this.bestFeature < 0); j++) {
      const f = draw(j);
      tried++;
      if (this.binCounts[f] < 2) continue;
      if (two && (this.bestFeature >= 0 || rowCodes[at0 + f] === rowCodes[at1 + f])) continue;
      if (small) this.scanSmall(f, rows, start, end);
      else if (this.isClasses) {
        this.fillClasses(f, rows, start, end);
        this.walkClasses(f, 0);
      } else {
        this.fillValues(f, rows, start, end);
        this.walkValues(f, 0);
      }
    }
  }

  /**
   * Whether a node of m positions fills its histograms from the row-major codes in one pass:
   * when its rows are sparse in the column-major codes (fewer than one in BATCH_SPARSITY), where
   * each column lookup would touch its own memory line.
   */
  private batchRows(m: number): boolean {
    return this.settings.mtry > 1 && m * BATCH_SPARSITY < this.n;
  }

  private consider(gain: number, f: number, bin: number): void {
    if (gain > this.bestGain) {
      this.bestGain = gain;
      this.bestFeature = f;
      this.bestBin = bin;
    }
  }

  /**
   * Marks the bins to walk in histogram slot `slot`: for a node of fewer than 256 rows, the bins
   * its rows fall in (kept while filling, see the fills); for a larger one, simply all of the
   * feature's bins.
   */
  private markAllBins(f: number, slot: number): void {
    const bins = this.binCounts[f];
    const mask = this.mask;
    const o = slot * 8;
    for (let word = 0; word < 8; word++) {
      const lo = word << 5;
      mask[o + word] = bins >= lo + 32 ? 0xffffffff : bins > lo ? (1 << (bins - lo)) - 1 : 0;
    }
  }

  /** Histogram of class weights per bin of feature f, in slot 0. */
  private fillClasses(f: number, rows: Int32Array, start: number, end: number): void {
    const C = this.classCount;
    const codes = this.codes;
    const base = f * this.n;
    const posW = this.posW;
    const posC = this.posC;
    const hist = this.hist;
    const histW = this.histW;
    const mask = this.mask;
    if (end - start >= 256) {
      for (let i = start; i < end; i++) {
        const b = codes[base + rows[i]];
        const w = posW[i];
        hist[b * C + posC[i]] += w;
        histW[b] += w;
      }
      this.markAllBins(f, 0);
    } else {
      for (let i = start; i < end; i++) {
        const b = codes[base + rows[i]];
        const w = posW[i];
        hist[b * C + posC[i]] += w;
        histW[b] += w;
        mask[b >>> 5] |= 1 << (b & 31);
      }
    }
  }

  /** Histograms of class weights of the features batch[0..k) in slots 0..k-1, in one pass over the rows. */
  private fillClassesBatch(k: number, rows: Int32Array, start: number, end: number): void {
    const C = this.classCount;
    const p = this.p;
    const codes = this.rowCodes;
    const batch = this.batch;
    const posW = this.posW;
    const posC = this.posC;
    const hist = this.hist;
    const histW = this.histW;
    const mask = this.mask;
    const marking = end - start < 256;
    for (let i = start; i < end; i++) {
      const o = rows[i] * p;
      const w = posW[i];
      const c = posC[i];
      for (let a = 0; a < k; a++) {
        const b = codes[o + batch[a]];
        const sb = (a << 8) | b;
        hist[sb * C + c] += w;
        histW[sb] += w;
        if (marking) mask[(a << 3) | (b >>> 5)] |= 1 << (b & 31);
      }
    }
    if (!marking) for (let a = 0; a < k; a++) this.markAllBins(batch[a], a);
  }

  /** Walks the class histogram in slot `slot` (feature f) in ascending bins, clearing it. */
  private walkClasses(f: number, slot: number): void {
    const C = this.classCount;
    const hist = this.hist;
    const histW = this.histW;
    const mask = this.mask;
    const weight = this.nodeWeight;
    const tot = this.tot;
    const L = this.leftTot;
    L.fill(0);
    const minLeaf = this.settings.minLeaf;
    const entropy = this.settings.impurity === 'entropy';
    // gini: maximise sum L_k^2 / W_L + sum R_k^2 / W_R (sums of squares of integer weights are exact)
    let sqL = 0;
    let sqR = 0;
    let parentScore: number;
    if (entropy) parentScore = this.parentEntropy();
    else {
      for (let k = 0; k < C; k++) sqR += tot[k] * tot[k];
      parentScore = sqR / weight;
    }
    let wL = 0;
    const slotBin = slot << 8;
    for (let word = 0; word < 8; word++) {
      let bits = mask[slot * 8 + word];
      if (bits === 0) continue;
      mask[slot * 8 + word] = 0;
      while (bits !== 0) {
        const low = bits & -bits;
        bits ^= low;
        const b = (word << 5) | (31 - Math.clz32(low));
        const sb = slotBin | b;
        const wb = histW[sb];
        if (wb === 0) continue;
        histW[sb] = 0;
        wL += wb;
        const hb = sb * C;
        for (let k = 0; k < C; k++) {
          const c = hist[hb + k];
          if (c !== 0) {
            const lk = L[k];
            sqL += c * (2 * lk + c);
            sqR += c * (c - 2 * (tot[k] - lk));
            L[k] = lk + c;
            hist[hb + k] = 0;
          }
        }
        const wR = weight - wL;
        if (wR <= 0 || wL < minLeaf || wR < minLeaf) continue;
        const gain = entropy ? this.entropyGain(parentScore, wL, wR) : sqL / wL + sqR / wR - parentScore;
        this.consider(gain, f, b);
      }
    }
  }

  /** W ln W - sum_k t_k ln t_k = W * H(t) for the current node. */
  private parentEntropy(): number {
    let s = 0;
    for (let k = 0; k < this.classCount; k++) s += xlogx(this.tot[k]);
    return xlogx(this.nodeWeight) - s;
  }

  /** W_t H(t) - W_L H(L) - W_R H(R), with the left class weights in this.leftTot. */
  private entropyGain(parent: number, wL: number, wR: number): number {
    const L = this.leftTot;
    const tot = this.tot;
    let sl = 0;
    let sr = 0;
    for (let k = 0; k < this.classCount; k++) {
      sl += xlogx(L[k]);
      sr += xlogx(tot[k] - L[k]);
    }
    return parent - (xlogx(wL) - sl) - (xlogx(wR) - sr);
  }

  /** Histogram of weights and weighted target sums per bin of feature f, in slot 0. */
  private fillValues(f: number, rows: Int32Array, start: number, end: number): void {
    const codes = this.codes;
    const base = f * this.n;
    const posW = this.posW;
    const posY = this.posY;
    // hist[2b] = sum of w * y, hist[2b + 1] = sum of w, over the node's rows in bin b
    const hist = this.hist;
    const mask = this.mask;
    if (end - start >= 256) {
      for (let i = start; i < end; i++) {
        const b2 = codes[base + rows[i]] << 1;
        const w = posW[i];
        hist[b2] += w * posY[i];
        hist[b2 + 1] += w;
      }
      this.markAllBins(f, 0);
    } else {
      for (let i = start; i < end; i++) {
        const b = codes[base + rows[i]];
        const w = posW[i];
        hist[b << 1] += w * posY[i];
        hist[(b << 1) + 1] += w;
        mask[b >>> 5] |= 1 << (b & 31);
      }
    }
  }

  /** The value histograms of batch[0..k) in slots 0..k-1, in one pass over the rows (same sums, same order). */
  private fillValuesBatch(k: number, rows: Int32Array, start: number, end: number): void {
    const p = this.p;
    const codes = this.rowCodes;
    const batch = this.batch;
    const posW = this.posW;
    const posY = this.posY;
    const hist = this.hist;
    const mask = this.mask;
    const marking = end - start < 256;
    for (let i = start; i < end; i++) {
      const o = rows[i] * p;
      const w = posW[i];
      const wy = w * posY[i];
      for (let a = 0; a < k; a++) {
        const b = codes[o + batch[a]];
        const sb2 = ((a << 8) | b) << 1;
        hist[sb2] += wy;
        hist[sb2 + 1] += w;
        if (marking) mask[(a << 3) | (b >>> 5)] |= 1 << (b & 31);
      }
    }
    if (!marking) for (let a = 0; a < k; a++) this.markAllBins(batch[a], a);
  }

  /** Walks the value histogram in slot `slot` (feature f) in ascending bins, clearing it. */
  private walkValues(f: number, slot: number): void {
    const hist = this.hist;
    const mask = this.mask;
    const weight = this.nodeWeight;
    const total = this.tot[0];
    const parentScore = (total * total) / weight;
    const minLeaf = this.settings.minLeaf;
    let wL = 0;
    let sL = 0;
    const slotBin = slot << 8;
    for (let word = 0; word < 8; word++) {
      let bits = mask[slot * 8 + word];
      if (bits === 0) continue;
      mask[slot * 8 + word] = 0;
      while (bits !== 0) {
        const low = bits & -bits;
        bits ^= low;
        const b = (word << 5) | (31 - Math.clz32(low));
        const sb2 = (slotBin | b) << 1;
        const wb = hist[sb2 + 1];
        if (wb === 0) continue;
        wL += wb;
        sL += hist[sb2];
        hist[sb2] = 0;
        hist[sb2 + 1] = 0;
        const wR = weight - wL;
        if (wR <= 0 || wL < minLeaf || wR < minLeaf) continue;
        const sR = total - sL;
        this.consider((sL * sL) / wL + (sR * sR) / wR - parentScore, f, b);
      }
    }
  }

  /**
   * Split search for a node of at most SMALL_NODE positions: sort (code, position) keys by
   * insertion and walk them; same splits and tie rule as the histogram scans.
   */
  private scanSmall(f: number, rows: Int32Array, start: number, end: number): void {
    const m = end - start;
    // row-major codes: a small node's rows are read once per drawn feature, from the same lines
    const codes = this.rowCodes;
    const p = this.p;
    const keys = this.keys;
    for (let i = 0; i < m; i++) {
      const key = (codes[rows[start + i] * p + f] << 8) | i;
      let j = i - 1;
      while (j >= 0 && keys[j] > key) {
        keys[j + 1] = keys[j];
        j--;
      }
      keys[j + 1] = key;
    }
    if (keys[0] >>> 8 === keys[m - 1] >>> 8) return; // constant within the node
    const weight = this.nodeWeight;
    const minLeaf = this.settings.minLeaf;
    const posW = this.posW;
    if (this.isClasses) {
      const C = this.classCount;
      const posC = this.posC;
      const tot = this.tot;
      const L = this.leftTot;
      L.fill(0);
      const entropy = this.settings.impurity === 'entropy';
      let sqL = 0;
      let sqR = 0;
      let parentScore: number;
      if (entropy) parentScore = this.parentEntropy();
      else {
        for (let k = 0; k < C; k++) sqR += tot[k] * tot[k];
        parentScore = sqR / weight;
      }
      let wL = 0;
      for (let i = 0; i < m - 1; i++) {
        const pos = start + (keys[i] & 255);
        const c = posW[pos];
        const k = posC[pos];
        const lk = L[k];
        sqL += c * (2 * lk + c);
        sqR += c * (c - 2 * (tot[k] - lk));
        L[k] = lk + c;
        wL += c;
        const b = keys[i] >>> 8;
        if (b === keys[i + 1] >>> 8) continue;
        const wR = weight - wL;
        if (wL < minLeaf || wR < minLeaf) continue;
        const gain = entropy ? this.entropyGain(parentScore, wL, wR) : sqL / wL + sqR / wR - parentScore;
        this.consider(gain, f, b);
      }
    } else {
      const posY = this.posY;
      const total = this.tot[0];
      const parentScore = (total * total) / weight;
      let wL = 0;
      let sL = 0;
      for (let i = 0; i < m - 1; i++) {
        const pos = start + (keys[i] & 255);
        const w = posW[pos];
        wL += w;
        sL += w * posY[pos];
        const b = keys[i] >>> 8;
        if (b === keys[i + 1] >>> 8) continue;
        const wR = weight - wL;
        if (wL < minLeaf || wR < minLeaf) continue;
        const sR = total - sL;
        this.consider((sL * sL) / wL + (sR * sR) / wR - parentScore, f, b);
      }
    }
  }
}
