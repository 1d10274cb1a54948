/**
 * An independent implementation of the intervals foldwise reports, written out from the
 * published formulas, for tests that recompute a report's figures from its own fold scores and
 * sizes. Nothing here imports src/stats: the t quantile is jstat's, the mean and variance are
 * simple-statistics', and the formulas are typed in again.
 *
 * - Nadeau & Bengio (2003): mean +/- t_{J-1, 0.975} sqrt(V), V = (1/J + n_test/n_train) s^2;
 * - the binomial floor for a share of test rows (accuracy): V >= p~ (1 - p~) / N over the
 *   N = n_test + n_train rows of a split, with the add-two estimate of Agresti & Coull (1998),
 *   p~ = (p N + 2) / (N + 4); for a paired difference the same with p = |mean d| (README,
 *   "The report");
 * - clipped to the metric's range, [lo, hi] for a score and [lo - hi, hi - lo] for a difference.
 */
import jStat from 'jstat';
import { mean, sampleVariance } from 'simple-statistics';

export interface Sized {
  readonly testRows: number;
  readonly trainRows: number;
}

export function meanSizes(folds: readonly Sized[]): Sized {
  return { testRows: mean(folds.map((f) => f.testRows)), trainRows: mean(folds.map((f) => f.trainRows)) };
}

export function agrestiFloor(share: number, rows: number): number {
  const p = (share * rows + 2) / (rows + 4);
  return (p * (1 - p)) / rows;
}

function spread(xs: readonly number[]): number {
  return xs.every((x) => x === xs[0]) ? 0 : sampleVariance([...xs]);
}

/** Variance of the mean: corrected s^2, floored for shares; 0 when foldwise must refuse. */
function meanVariance(xs: readonly number[], share: number, sizes: Sized, proportion: boolean): number {
  const j = xs.length;
  const v = (1 / j + sizes.testRows / sizes.trainRows) * spread(xs);
  return proportion ? Math.max(v, agrestiFloor(share, sizes.testRows + sizes.trainRows)) : v;
}

/** The expected ci95 of a metric's fold scores, or null when foldwise must refuse one. */
export function expectedInterval(scores: readonly number[], sizes: Sized, proportion: boolean, range: readonly [number, number]): [number, number] | null {
  const j = scores.length;
  if (j < 2) return null;
  const m = mean([...scores]);
  const v = meanVariance(scores, m, sizes, proportion);
  if (v === 0) return null;
  const half = jStat.studentt.inv(0.975, j - 1) * Math.sqrt(v);
  return [Math.max(range[0], m - half), Math.min(range[1], m + half)];
}

/** The expected ci95 of paired differences d_j, or null when foldwise must refuse one. */
export function expectedPairedInterval(d: readonly number[], sizes: Sized, proportion: boolean, range: readonly [number, number]): [number, number] | null {
  const j = d.length;
  const m = mean([...d]);
  const v = meanVariance(d, Math.abs(m), sizes, proportion);
  if (v === 0) return null;
  const half = jStat.studentt.inv(0.975, j - 1) * Math.sqrt(v);
  const width = range[1] - range[0];
  return [Math.max(-width, m - half), Math.min(width, m + half)];
}

/** The corrected t of paired differences with the same floor, or null. */
export function expectedPairedT(d: readonly number[], sizes: Sized, proportion: boolean): number | null {
  const m = mean([...d]);
  const v = meanVariance(d, Math.abs(m), sizes, proportion);
  if (v === 0) return null;
  return m / Math.sqrt(v);
}
