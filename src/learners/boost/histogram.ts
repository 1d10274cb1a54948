/**
 * Gradient/hessian histograms of one tree node, and the best split they give.
 *
 * A histogram holds, for every bin of every feature, sums over the node's rows whose code is
 * that bin: of the first derivatives g, of the second derivatives h, and of rows. With S the
 * stride (3, or 2 when every h is 1, as for the regression losses: then the h sum is the row
 * count, exactly, since sums of ones are exact in doubles), bin b of feature j is at
 * S * (offset[j] + b) (g), +1 (h), and +2 (rows, stride 3 only).
 * Sibling subtraction: a parent's histogram minus its smaller child's is its larger child's,
 * so each split builds one histogram from rows (the smaller child) and gets the other for the
 * price of one pass over the bins (Ke et al. 2017, "LightGBM", NIPS, sec. 2,
 * free: https://papers.nips.cc/paper/6907).
 *
 * Split gain and leaf value are those of Chen & Guestrin (2016), "XGBoost: a scalable tree
 * boosting system", KDD (free: https://arxiv.org/abs/1603.02754), eq. (5) and (7) with
 * gamma = 0: leaf value w* = -G / (H + lambda) and
 *   gain = 1/2 [ G_L^2 / (H_L + lambda) + G_R^2 / (H_R + lambda) - G^2 / (H + lambda) ].
 * A split is valid when both sides have at least leafRows rows and at least leafHessian of h.
 * Ties keep the first split met: features in ascending order, bins ascending.
 */

export interface HistogramLayout {
  /** first bin of each feature (in bins, not entries) */
  readonly offset: Int32Array;
  /** bins of each feature (cuts + 1) */
  readonly bins: Int32Array;
  /** total bins over all features */
  readonly total: number;
  /** entries per bin: 3 (g, h, rows), or 2 (g, h) when every h is 1 */
  readonly stride: 2 | 3;
  /** per-feature work space of buildHistogram */
  readonly scratch: Int32Array;
}

export function layoutOf(cuts: readonly Float64Array[], unitHessian: boolean): HistogramLayout {
  const p = cuts.length;
  const offset = new Int32Array(p);
  const bins = new Int32Array(p);
  let total = 0;
  for (let j = 0; j < p; j++) {
    offset[j] = total;
    bins[j] = cuts[j].length + 1;
    total += bins[j];
  }
  return { offset, bins, total, stride: unitHessian ? 2 : 3, scratch: new Int32Array(p) };
}

/**
 * Fills `hist` (zeroed here) from rows[start..end) of row-major `codes` (p per row), with the
 * rows' derivatives already gathered in gg[start..end), hh[start..end). Row by row: each row's
 * g and h are read once for all its features.
 */
export function buildHistogram(
  hist: Float64Array,
  layout: HistogramLayout,
  codes: Uint8Array,
  p: number,
  features: Int32Array,
  rows: Int32Array,
  gg: Float64Array,
  hh: Float64Array,
  start: number,
  end: number,
): void {
  const nf = features.length;
  const bases = layout.scratch;
  const S = layout.stride;
  for (let f = 0; f < nf; f++) {
    const j = features[f];
    bases[f] = S * layout.offset[j];
    hist.fill(0, bases[f], bases[f] + S * layout.bins[j]);
  }
  if (S === 2) {
    for (let r = start; r < end; r++) {
      const row = rows[r] * p;
      const gr = gg[r];
      for (let f = 0; f < nf; f++) {
        const at = bases[f] + 2 * codes[row + (nf === p ? f : features[f])];
        hist[at] += gr;
        hist[at + 1] += 1;
      }
    }
    return;
  }
  for (let r = start; r < end; r++) {
    const row = rows[r] * p;
    const gr = gg[r];
    const hr = hh[r];
    for (let f = 0; f < nf; f++) {
      const at = bases[f] + 3 * codes[row + (nf === p ? f : features[f])];
      hist[at] += gr;
      hist[at + 1] += hr;
      hist[at + 2] += 1;
    }
  }
}

/** parent -= child over the given features: parent becomes the child's sibling. */
export function subtractHistogram(parent: Float64Array, child: Float64Array, layout: HistogramLayout, features: Int32Array): void {
  for (let f = 0; f < features.length; f++) {
    const j = features[f];
    const lo = layout.stride * layout.offset[j];
    const hi = lo + layout.stride * layout.bins[j];
    for (let e = lo; e < hi; e++) parent[e] -= child[e];
  }
}

export interface SplitLimits {
  readonly leafRows: number;
  readonly leafHessian: number;
  readonly ridge: number;
}

export interface BestSplit {
  /** -1 when no valid split gains anything */
  feature: number;
  /** rows with code <= bin go left */
  bin: number;
  gain: number;
}

/** 1/2 [G_L^2/(H_L+l) + G_R^2/(H_R+l) - G^2/(H+l)] (Chen & Guestrin 2016, eq. 7, gamma = 0). */
export function splitGain(GL: number, HL: number, GR: number, HR: number, ridge: number): number {
  const G = GL + GR;
  const H = HL + HR;
  return 0.5 * ((GL * GL) / (HL + ridge) + (GR * GR) / (HR + ridge) - (G * G) / (H + ridge));
}

/** -G / (H + lambda) (Chen & Guestrin 2016, eq. 5); 0 when H + lambda is 0. */
export function leafValue(G: number, H: number, ridge: number): number {
  const d = H + ridge;
  return d > 0 ? -G / d : 0;
}

/** The best valid split of a node with totals G, H and `rows` rows, into `out`. */
export function bestSplit(
  hist: Float64Array,
  layout: HistogramLayout,
  features: Int32Array,
  G: number,
  H: number,
  rows: number,
  limits: SplitLimits,
  out: BestSplit,
): void {
  const { leafRows, leafHessian, ridge } = limits;
  const parentScore = (G * G) / (H + ridge);
  // gains within rounding of zero are not splits (they would only fit noise in the sums)
  let best = 1e-12 * (1 + Math.abs(parentScore));
  out.feature = -1;
  out.bin = -1;
  out.gain = 0;
  for (let f = 0; f < features.length; f++) {
    const j = features[f];
    const S = layout.stride;
    const base = S * layout.offset[j];
    const last = layout.bins[j] - 1;
    let GL = 0;
    let HL = 0;
    let CL = 0;
    for (let b = 0; b < last; b++) {
      const at = base + S * b;
      GL += hist[at];
      HL += hist[at + 1];
      CL += S === 3 ? hist[at + 2] : hist[at + 1];
      if (CL < leafRows) continue;
      const CR = rows - CL;
      if (CR < leafRows) break;
      const HR = H - HL;
      if (HL < leafHessian || HR < leafHessian) continue;
      const GR = G - GL;
      const gain = 0.5 * ((GL * GL) / (HL + ridge) + (GR * GR) / (HR + ridge) - parentScore);
      if (gain > best) {
        best = gain;
        out.feature = j;
        out.bin = b;
        out.gain = gain;
      }
    }
  }
}
