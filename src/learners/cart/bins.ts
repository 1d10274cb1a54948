/**
 * Quantile binning of the training features, so that split search runs on small integer codes.
 *
 * For each feature the sorted training values are cut into at most `maxBins` bins holding about
 * equal numbers of rows: cut k (k = 1..maxBins-1) is placed after the smallest distinct value v
 * whose cumulative count reaches k * n / maxBins, halfway between v and the next distinct value.
 * A feature with at most `maxBins` distinct values gets a cut between every pair of neighbouring
 * values, so its candidate splits are exactly those of exhaustive CART (Breiman, Friedman, Olshen
 * & Stone 1984, ch. 2: thresholds halfway between consecutive observed values). Ties never
 * straddle a cut. The code of x is the number of cuts below x, so
 *   code(x) <= k  exactly when  x <= cuts[k],
 * which lets a split found on codes be stored as a plain threshold on the raw value.
 * Binning on histograms is the approach of e.g. Ke et al. (2017), "LightGBM", NIPS
 * (free: https://papers.nips.cc/paper/6907). Only the rows passed in (the training fold) are seen.
 */
import { InputError } from '../../errors.js';
import { type Matrix, matrixColumn } from '../../learning.js';
import { sortFinite } from './radix-sort.js';

export const MAX_BINS = 255;

export interface BinnedMatrix {
  readonly rows: number;
  readonly cols: number;
  /** column-major codes: the code of row i, feature j is codes[j * rows + i] */
  readonly codes: Uint8Array;
  /** per feature, strictly ascending cut points (bins = cuts.length + 1) */
  readonly cuts: readonly Float64Array[];
}

/** A threshold strictly between a < b that sends a left and b right under `x <= t`. */
export function midpoint(a: number, b: number): number {
  const m = a + (b - a) / 2;
  return m < b && Number.isFinite(m) ? m : a;
}

/**
 * Cut points for one feature's values (which must be finite); `sorted` is overwritten (sorted in
 * place, as Float64Array.prototype.sort would, by radix-sort.ts; `scratch` as sortFinite takes it).
 */
export function quantileCuts(sorted: Float64Array, maxBins: number, scratch?: Uint32Array): Float64Array {
  sortFinite(sorted, scratch);
  const n = sorted.length;
  // distinct values and, for each, the count of values <= it
  const distinct: number[] = [];
  const cum: number[] = [];
  for (let i = 0; i < n; i++) {
    if (i === 0 || sorted[i] !== sorted[i - 1]) {
      distinct.push(sorted[i]);
      cum.push(i + 1);
    } else {
      cum[cum.length - 1] = i + 1;
    }
  }
  const d = distinct.length;
  const cuts: number[] = [];
  if (d <= maxBins) {
    for (let i = 0; i + 1 < d; i++) cuts.push(midpoint(distinct[i], distinct[i + 1]));
  } else {
    let i = 0;
    let last = -1;
    for (let k = 1; k < maxBins; k++) {
      const target = (k * n) / maxBins;
      while (i < d - 1 && cum[i] < target) i++;
      if (i >= d - 1) break;
      if (i !== last) {
        cuts.push(midpoint(distinct[i], distinct[i + 1]));
        last = i;
      }
    }
  }
  return Float64Array.from(cuts);
}

/**
 * The cuts in a 256-slot array, the slots past the last cut holding +Infinity, for codeOfPadded.
 * Only for cuts of at most MAX_BINS - 1 = 254 points.
 */
export function paddedCuts(cuts: Float64Array): Float64Array {
  if (cuts.length > MAX_BINS - 1) throw new RangeError(`${cuts.length} cut points; at most ${MAX_BINS - 1} can be padded`);
  const out = new Float64Array(256).fill(Infinity);
  out.set(cuts);
  return out;
}

/**
 * Number of cuts strictly below x, on cuts padded by paddedCuts: the same as codeOf on the cuts
 * themselves (a padded +Infinity is never below x; NaN is below nothing, so it gets 0). Eight
 * fixed halving steps, each adding its step when the slot before it is below x; the step is
 * masked by the comparison, not chosen by a branch. A binary search's branch goes either way
 * half the time on the values of a column, and at 20 million values the missed predictions
 * cost more than the comparisons (measured 2026-12-05: 1,000,000 codes in 13 to 20 ms here
 * against 66 to 81 ms for codeOf's loop, in one process).
 */
export function codeOfPadded(padded: Float64Array, x: number): number {
  let i = 0;
  i += 128 & -(padded[i + 127] < x);
  i += 64 & -(padded[i + 63] < x);
  i += 32 & -(padded[i + 31] < x);
  i += 16 & -(padded[i + 15] < x);
  i += 8 & -(padded[i + 7] < x);
  i += 4 & -(padded[i + 3] < x);
  i += 2 & -(padded[i + 1] < x);
  i += 1 & -(padded[i] < x);
  return i;
}

/** Number of cuts strictly below x (binary search). */
export function codeOf(cuts: Float64Array, x: number): number {
  let lo = 0;
  let hi = cuts.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (cuts[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Bins every column of X. Throws InputError when a value is NaN or infinite: features must be
 * imputed before a tree is grown (prediction, by contrast, sends NaN to the left child).
 */
export function binMatrix(X: Matrix, maxBins: number, learner: string): BinnedMatrix {
  if (!Number.isInteger(maxBins) || maxBins < 2 || maxBins > MAX_BINS) {
    throw new RangeError(`maxBins must be an integer between 2 and ${MAX_BINS}`);
  }
  const { rows: n, cols: p } = X;
  const codes = new Uint8Array(n * p);
  const cuts: Float64Array[] = [];
  const sorted = new Float64Array(n);
  // one column at a time, into one buffer (a matrix made on demand never builds its row-major
  // copy, and 20 columns of 667,000 rows are not 107 MB left to the garbage collector)
  const buffer = new Float64Array(n);
  const scratch = new Uint32Array(2 * n);
  for (let j = 0; j < p; j++) {
    const column = matrixColumn(X, j, buffer);
    for (let i = 0; i < n; i++) {
      const v = column[i];
      if (!Number.isFinite(v)) {
        throw new InputError(
          `${learner}: feature column ${j + 1} of row ${i + 1} is ${v}; features must be finite (impute missing values first)`,
        );
      }
    }
    sorted.set(column);
    const c = quantileCuts(sorted, maxBins, scratch);
    cuts.push(c);
    const base = j * n;
    const padded = paddedCuts(c);
    for (let i = 0; i < n; i++) codes[base + i] = codeOfPadded(padded, column[i]);
  }
  return { rows: n, cols: p, codes, cuts };
}

/**
 * Row-major codes of every row of X under cuts found on other rows (a fold's test rows under
 * its training cuts): the code of row i, feature j is at i * cols + j. A tree's split
 * `x > cuts[j][k]` is then `code > k` exactly, because the cuts ascend strictly (code(x) > k
 * means at least k + 1 cuts lie below x, that is cuts[k] < x). NaN gets code 0, so it goes to the
 * left child as it does against the raw threshold (NaN > t is false); +Infinity gets the top code.
 */
export function codeRows(X: Matrix, cuts: readonly Float64Array[]): Uint8Array {
  const { rows: n, cols: p } = X;
  if (cuts.length !== p) throw new RangeError(`${cuts.length} features of cut points for a matrix of ${p} columns`);
  const out = new Uint8Array(n * p);
  const buffer = new Float64Array(n);
  for (let j = 0; j < p; j++) {
    const column = matrixColumn(X, j, buffer);
    const padded = paddedCuts(cuts[j]);
    for (let i = 0; i < n; i++) out[i * p + j] = codeOfPadded(padded, column[i]);
  }
  return out;
}
