/**
 * Growing one regression tree of a boosting round on binned features, best split first.
 *
 * The tree fits the round's derivatives g, h of the loss (Friedman 2001, Algorithm 1, step 4,
 * with the second-order split gain of Chen & Guestrin 2016, eq. 7; see histogram.ts). Growth is
 * best first: of the leaves that can still split, the one whose best split gains most is split
 * next (ties: the leaf made first), until the tree has `leaves` leaves or no leaf can split.
 * A leaf can split when its depth is below `depth` and some split leaves at least `leafRows`
 * rows and `leafHessian` of h on each side and gains more than rounding noise.
 *
 * A node's rows are the segment rows[start..end) of one buffer; splitting a node is a stable
 * partition of its segment (rows stay ascending), and the rows' derivatives are gathered into
 * gg, hh and partitioned with them, so histogram passes read memory forwards. Every split
 * builds the smaller child's histogram from its rows and gets the larger one's by subtracting
 * it from the parent's (sibling subtraction), reusing the parent's buffer.
 *
 * Nodes go into a NodeStore in the flat layout of cart/flat-forest.ts (children after their
 * parent, threshold on the raw value: code <= bin exactly when x <= cuts[bin]). Leaves get
 * `width` value slots; the grower leaves them for the caller, which knows the loss.
 */
import type { BinnedMatrix } from '../cart/bins.js';
import type { NodeStore } from '../cart/node-store.js';
import { type BestSplit, type HistogramLayout, type SplitLimits, bestSplit, buildHistogram, layoutOf, subtractHistogram } from './histogram.js';

export interface GrowLimits extends SplitLimits {
  readonly depth: number;
  readonly leaves: number;
}

/** A finished leaf: its node, its rows as a segment of `rows`, and its derivative sums. */
export interface GrownLeaf {
  readonly node: number;
  readonly start: number;
  readonly end: number;
  readonly G: number;
  readonly H: number;
}

interface Open {
  node: number;
  start: number;
  end: number;
  depth: number;
  G: number;
  H: number;
  hist: Float64Array | undefined;
  split: BestSplit;
  /** order of creation, for ties */
  seq: number;
}

export class BoostGrower {
  readonly layout: HistogramLayout;
  /** the rows of the last grown tree, partitioned into its leaves' segments */
  readonly rows: Int32Array;
  private readonly gg: Float64Array;
  private readonly hh: Float64Array;
  private readonly tmpRows: Int32Array;
  private readonly tmpG: Float64Array;
  private readonly tmpH: Float64Array;
  private readonly pool: Float64Array[] = [];
  /** row-major copy of the codes: the code of row i, feature j is at i * p + j */
  private readonly rowCodes: Uint8Array;

  constructor(
    private readonly binned: BinnedMatrix,
    private readonly limits: GrowLimits,
    /** true when every h is 1 (the regression losses): histograms then skip the row counts */
    unitHessian: boolean,
  ) {
    const n = binned.rows;
    this.layout = layoutOf(binned.cuts, unitHessian);
    this.rows = new Int32Array(n);
    this.gg = new Float64Array(n);
    this.hh = new Float64Array(n);
    this.tmpRows = new Int32Array(n);
    this.tmpG = new Float64Array(n);
    this.tmpH = new Float64Array(n);
    const p = binned.cols;
    this.rowCodes = new Uint8Array(n * p);
    for (let j = 0; j < p; j++) {
      const col = j * n;
      for (let i = 0; i < n; i++) this.rowCodes[i * p + j] = binned.codes[col + i];
    }
  }

  private take(): Float64Array {
    return this.pool.pop() ?? new Float64Array(this.layout.stride * this.layout.total);
  }

  private give(h: Float64Array | undefined): void {
    if (h) this.pool.push(h);
  }

  private sums(start: number, end: number): [number, number] {
    let G = 0;
    let H = 0;
    for (let r = start; r < end; r++) {
      G += this.gg[r];
      H += this.hh[r];
    }
    return [G, H];
  }

  /** Finds a node's best split if it may split at all; keeps its histogram only then. */
  private consider(o: Open, features: Int32Array): void {
    const m = o.end - o.start;
    o.split = { feature: -1, bin: -1, gain: 0 };
    if (o.depth >= this.limits.depth || m < 2 * this.limits.leafRows || o.H < 2 * this.limits.leafHessian || !o.hist) {
      this.give(o.hist);
      o.hist = undefined;
      return;
    }
    bestSplit(o.hist, this.layout, features, o.G, o.H, m, this.limits, o.split);
    if (o.split.feature < 0) {
      this.give(o.hist);
      o.hist = undefined;
    }
  }

  /** Stable partition of the segment by code <= bin of feature f; returns the left count. */
  private partition(start: number, end: number, f: number, bin: number): number {
    const { codes, rows: n } = this.binned;
    const col = f * n;
    const { rows, gg, hh, tmpRows, tmpG, tmpH } = this;
    let l = start;
    let r = 0;
    for (let k = start; k < end; k++) {
      const i = rows[k];
      if (codes[col + i] <= bin) {
        rows[l] = i;
        gg[l] = gg[k];
        hh[l] = hh[k];
        l++;
      } else {
        tmpRows[r] = i;
        tmpG[r] = gg[k];
        tmpH[r] = hh[k];
        r++;
      }
    }
    rows.set(tmpRows.subarray(0, r), l);
    gg.set(tmpG.subarray(0, r), l);
    hh.set(tmpH.subarray(0, r), l);
    return l - start;
  }

  /**
   * Grows one tree on `sample` (ascending row indices) over `features` (ascending) from the
   * derivatives g, h (indexed by row), appending its nodes to `store`; `gainOut[j]` gets the
   * gain of every split on feature j added. Returns the leaves, in node order.
   */
  grow(sample: Int32Array, features: Int32Array, g: Float64Array, h: Float64Array, store: NodeStore, width: number, gainOut: Float64Array): GrownLeaf[] {
    const m = sample.length;
    const { cols: p, cuts } = this.binned;
    const codes = this.rowCodes;
    const maxNodes = 2 * this.limits.leaves - 1;
    store.reserve(maxNodes, this.limits.leaves * width);
    store.roots.push(store.count);
    for (let r = 0; r < m; r++) {
      const i = sample[r];
      this.rows[r] = i;
      this.gg[r] = g[i];
      this.hh[r] = h[i];
    }
    const rootHist = this.take();
    buildHistogram(rootHist, this.layout, codes, p, features, this.rows, this.gg, this.hh, 0, m);
    const [G0, H0] = this.sums(0, m);
    let seq = 0;
    const root: Open = { node: store.add(), start: 0, end: m, depth: 0, G: G0, H: H0, hist: rootHist, split: { feature: -1, bin: -1, gain: 0 }, seq: seq++ };
    this.consider(root, features);
    const open: Open[] = [root];
    const done: Open[] = [];
    let leafCount = 1;
    while (leafCount < this.limits.leaves) {
      let pick = -1;
      for (let q = 0; q < open.length; q++) {
        const o = open[q];
        if (o.split.feature < 0) continue;
        if (pick < 0 || o.split.gain > open[pick].split.gain || (o.split.gain === open[pick].split.gain && o.seq < open[pick].seq)) pick = q;
      }
      if (pick < 0) break;
      const o = open[pick];
      open.splice(pick, 1);
      const { feature: f, bin, gain } = o.split;
      const nl = this.partition(o.start, o.end, f, bin);
      const mid = o.start + nl;
      const node = o.node;
      store.feature[node] = f;
      store.threshold[node] = cuts[f][bin];
      const leftNode = store.add();
      const rightNode = store.add();
      store.left[node] = leftNode;
      store.right[node] = rightNode;
      gainOut[f] += gain;
      const [GL, HL] = this.sums(o.start, mid);
      const [GR, HR] = this.sums(mid, o.end);
      const left: Open = { node: leftNode, start: o.start, end: mid, depth: o.depth + 1, G: GL, H: HL, hist: undefined, split: o.split, seq: seq++ };
      const right: Open = { node: rightNode, start: mid, end: o.end, depth: o.depth + 1, G: GR, H: HR, hist: undefined, split: o.split, seq: seq++ };
      const mayGrow = o.depth + 1 < this.limits.depth && leafCount + 1 < this.limits.leaves;
      if (mayGrow) {
        const [small, large] = nl <= o.end - mid ? [left, right] : [right, left];
        const hs = this.take();
        buildHistogram(hs, this.layout, codes, p, features, this.rows, this.gg, this.hh, small.start, small.end);
        subtractHistogram(o.hist!, hs, this.layout, features);
        small.hist = hs;
        large.hist = o.hist;
      } else this.give(o.hist);
      o.hist = undefined;
      this.consider(left, features);
      this.consider(right, features);
      open.push(left, right);
      leafCount++;
    }
    for (const o of open) {
      this.give(o.hist);
      o.hist = undefined;
      done.push(o);
    }
    done.sort((a, b) => a.node - b.node);
    return done.map((o) => {
      store.offset[o.node] = store.addValues(width);
      return { node: o.node, start: o.start, end: o.end, G: o.G, H: o.H };
    });
  }
}
