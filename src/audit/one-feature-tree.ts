/**
 * A depth-limited regression or classification tree on one numeric feature, for the
 * single-feature scores of the leakage check. On one feature a tree is a set of cut points
 * cutting the line into intervals, each predicting one value.
 *
 * In words: the training rows arrive sorted by the feature. A node's rows are split at the cut
 * between two consecutive distinct values that most reduces the impurity, provided both sides
 * keep at least `minLeaf` rows; nodes stop at `maxDepth` or when no cut reduces it.
 * Classification uses the Gini impurity with class weights (a row of class k weighs
 * w_k = n / (K n_k), so every class weighs the same in total and the tree aims at balanced
 * accuracy): minimising W_L gini_L + W_R gini_R is maximising sum_k L_k^2 / W_L + sum_k R_k^2 /
 * W_R, with L_k, R_k the weighted class totals on each side. Leaves predict the class of
 * largest weighted total (the lowest code on a tie). Regression minimises the squared error,
 * i.e. maximises S_L^2 / n_L + S_R^2 / n_R with S the sums of the target, and leaves predict
 * the mean. One scan per node with running totals: O(rows x depth) per tree.
 * Rows whose feature is missing are predicted by `missingPrediction`, chosen by the caller.
 *
 * Free source: L. Breiman, J. Friedman, R. Olshen and C. Stone, Classification and Regression
 * Trees (1984), chapters 2-4 and 8 (CART: Gini splitting and least-squares regression trees);
 * summarised at https://en.wikipedia.org/wiki/Decision_tree_learning.
 */
import { InputError } from '../errors.js';

export interface OneFeatureTree {
  /** cut points, ascending: a value x goes to the first interval j with x <= cuts[j] */
  readonly cuts: Float64Array;
  /** prediction per interval (cuts.length + 1 of them): class code or mean */
  readonly leaves: Float64Array;
  /** prediction for a missing value */
  readonly missingPrediction: number;
}

export interface TreeLimits {
  readonly maxDepth: number;
  readonly minLeaf: number;
}

/** Target of the training rows in sorted order: class codes with class weights, or values. */
export type SortedTarget =
  | { readonly task: 'classification'; readonly codes: Int32Array; readonly weights: Float64Array }
  | { readonly task: 'regression'; readonly values: Float64Array };

function checkLimits(limits: TreeLimits): void {
  if (!Number.isInteger(limits.maxDepth) || limits.maxDepth < 0) throw new InputError(`one-feature tree: maxDepth ${limits.maxDepth} must be a whole number >= 0`);
  if (!Number.isInteger(limits.minLeaf) || limits.minLeaf < 1) throw new InputError(`one-feature tree: minLeaf ${limits.minLeaf} must be a whole number >= 1`);
}

/** A cut between a and b (a < b) that sends a left and b right. */
function cutBetween(a: number, b: number): number {
  const mid = a + (b - a) / 2;
  return mid < b && Number.isFinite(mid) ? mid : a;
}

/**
 * Fits the tree. `xs` are the training values sorted ascending (no NaN), `y` the target in
 * the same order.
 */
export function fitOneFeatureTree(xs: Float64Array, y: SortedTarget, limits: TreeLimits, missingPrediction: number): OneFeatureTree {
  checkLimits(limits);
  const n = xs.length;
  const cuts: number[] = [];
  const leaves: number[] = [];
  if (n === 0) return { cuts: new Float64Array(0), leaves: Float64Array.of(missingPrediction), missingPrediction };

  const classes = y.task === 'classification' ? y.weights.length : 0;
  // plain locals for the hot loops (no property reads through the union type)
  const codes = y.task === 'classification' ? y.codes : new Int32Array(0);
  const weights = y.task === 'classification' ? y.weights : new Float64Array(0);
  const values = y.task === 'regression' ? y.values : new Float64Array(0);
  const regression = y.task === 'regression';
  const minLeaf = limits.minLeaf;
  const total = new Float64Array(classes);
  const left = new Float64Array(classes);

  const leafValue = (lo: number, hi: number): number => {
    if (regression) {
      let s = 0;
      for (let i = lo; i < hi; i++) s += values[i];
      return s / (hi - lo);
    }
    total.fill(0);
    for (let i = lo; i < hi; i++) total[codes[i]] += weights[codes[i]];
    let best = 0;
    for (let k = 1; k < classes; k++) if (total[k] > total[best]) best = k;
    return best;
  };

  /** Best cut position i (left = lo..i) or -1. */
  const bestCut = (lo: number, hi: number): number => {
    const m = hi - lo;
    if (m < 2 * minLeaf) return -1;
    let best = -1;
    if (regression) {
      let s = 0;
      for (let i = lo; i < hi; i++) s += values[i];
      let topGain = (s * s) / m;
      const tol = 1e-12 * Math.max(1, Math.abs(topGain));
      let sl = 0;
      const first = lo + minLeaf - 1;
      const last = hi - minLeaf - 1;
      for (let i = lo; i < first; i++) sl += values[i];
      for (let i = first; i <= last; i++) {
        sl += values[i];
        if (xs[i] === xs[i + 1]) continue;
        const nl = i - lo + 1;
        const sr = s - sl;
        const score = (sl * sl) / nl + (sr * sr) / (m - nl);
        if (score > topGain + tol) {
          topGain = score;
          best = i;
        }
      }
      return best;
    }
    total.fill(0);
    left.fill(0);
    let w = 0;
    for (let i = lo; i < hi; i++) {
      const k = codes[i];
      total[k] += weights[k];
      w += weights[k];
    }
    let sq = 0;
    for (let k = 0; k < classes; k++) sq += total[k] * total[k];
    let topGain = sq / w;
    const tol = 1e-12 * Math.max(1, topGain);
    // right holds total - left; adding weight v of class k to the left changes the sums of
    // squares by v (2 L_k + v) on the left and v (v - 2 R_k) on the right
    const right = total;
    let sl2 = 0;
    let sr2 = sq;
    let wl = 0;
    const first = lo + minLeaf - 1; // the first cut keeps minLeaf rows on the left
    const last = hi - minLeaf - 1; // the last keeps minLeaf rows on the right
    for (let i = lo; i < first; i++) {
      const k = codes[i];
      const v = weights[k];
      sl2 += v * (2 * left[k] + v);
      sr2 += v * (v - 2 * right[k]);
      left[k] += v;
      right[k] -= v;
      wl += v;
    }
    for (let i = first; i <= last; i++) {
      const k = codes[i];
      const v = weights[k];
      sl2 += v * (2 * left[k] + v);
      sr2 += v * (v - 2 * right[k]);
      left[k] += v;
      right[k] -= v;
      wl += v;
      if (xs[i] === xs[i + 1]) continue;
      const wr = w - wl;
      if (wl <= 0 || wr <= 0) continue;
      const score = sl2 / wl + sr2 / wr;
      if (score > topGain + tol) {
        topGain = score;
        best = i;
      }
    }
    return best;
  };

  const grow = (lo: number, hi: number, depth: number): void => {
    const cut = depth < limits.maxDepth ? bestCut(lo, hi) : -1;
    if (cut < 0) {
      leaves.push(leafValue(lo, hi));
      return;
    }
    grow(lo, cut + 1, depth + 1);
    cuts.push(cutBetween(xs[cut], xs[cut + 1]));
    grow(cut + 1, hi, depth + 1);
  };
  grow(0, n, 0);
  return { cuts: Float64Array.from(cuts), leaves: Float64Array.from(leaves), missingPrediction };
}

/** The tree's prediction for one value (NaN = missing). */
export function predictOneFeatureTree(tree: OneFeatureTree, x: number): number {
  if (Number.isNaN(x)) return tree.missingPrediction;
  const cuts = tree.cuts;
  let lo = 0;
  let hi = cuts.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (x <= cuts[mid]) hi = mid;
    else lo = mid + 1;
  }
  return tree.leaves[lo];
}
