/**
 * An independent implementation of the intervals foldwise reports, written out from the
 * published formulas, for tests that recompute a report's figures from its own fold scores and
 * sizes. Nothing here imports src/stats: the t quantile is jstat's, the mean and variance are
 * simple-statistics', and the formulas are typed in again.
 *
 * - Nadeau & Bengio (2003): mean +/- t_{J-1, 0.975} sqrt((1/J + n_test/n_train) s^2);
 * - the binomial floor for a share of test rows (accuracy), with the add-two estimate of
 *   Agresti & Coull (1998): p~ = (p J n_test + 2) / (J n_test + 4), floor = p~ (1 - p~) / n_test;
 *   for a paired difference the same with p = |mean d| (README, "The report");
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

export function agrestiFloor(share: number, testRows: number, j: number): number {
  const rows = j * testRows;
  const p = (share * rows + 2) / (rows + 4);
  return (p * (1 - p)) / testRows;
}

function spread(xs: readonly number[]): number {
  return xs.every((x) => x === xs[0]) ? 0 : sampleVariance([...xs]);
}

/** The expected ci95 of a metric's fold scores, or null when foldwise must refuse one. */
export function expectedInterval(scores: readonly number[], sizes: Sized, proportion: boolean, range: readonly [number, number]): [number, number] | null {
  const j = scores.length;
  if (j < 2) return null;
  const m = mean([...scores]);
  const v = proportion ? Math.max(spread(scores), agrestiFloor(m, sizes.testRows, j)) : spread(scores);
  if (v === 0) return null;
  const half = jStat.studentt.inv(0.975, j - 1) * Math.sqrt((1 / j + sizes.testRows / sizes.trainRows) * v);
  return [Math.max(range[0], m - half), Math.min(range[1], m + half)];
}

/** The expected ci95 of paired differences d_j, or null when foldwise must refuse one. */
export function expectedPairedInterval(d: readonly number[], sizes: Sized, proportion: boolean, range: readonly [number, number]): [number, number] | null {
  const j = d.length;
  const m = mean([...d]);
  const v = proportion ? Math.max(spread(d), agrestiFloor(Math.abs(m), sizes.testRows, j)) : spread(d);
  if (v === 0) return null;
  const half = jStat.studentt.inv(0.975, j - 1) * Math.sqrt((1 / j + sizes.testRows / sizes.trainRows) * v);
  const width = range[1] - range[0];
  return [Math.max(-width, m - half), Math.min(width, m + half)];
}

/** The corrected t of paired differences with the same floor, or null. */
export function expectedPairedT(d: readonly number[], sizes: Sized, proportion: boolean): number | null {
  const j = d.length;
  const m = mean([...d]);
  const v = proportion ? Math.max(spread(d), agrestiFloor(Math.abs(m), sizes.testRows, j)) : spread(d);
  if (v === 0) return null;
  return m / Math.sqrt((1 / j + sizes.testRows / sizes.trainRows) * v);
}
