/**
 * Floors and ranges for the fold statistics: a fold score is measured on a finite test fold, so
 * the scores' spread cannot be smaller than the test rows allow, and an interval cannot claim
 * values the metric never takes.
 *
 * Binomial floor. A fold score that is a share of the fold's test rows (accuracy: correct rows /
 * test rows) has, for a fixed model, the binomial variance p (1 - p) / n_test from the test rows
 * alone; the spread across folds adds the training variation on top. So the variance of one fold
 * score is at least p (1 - p) / n_test, whatever the J scores happen to show: J equal scores
 * (zero sample variance) are luck, not certainty. The share is estimated from all J n_test test
 * rows with two successes and two failures added (the "add two" estimate of Agresti & Coull
 * 1998), so that p = 0 or 1 still gives a floor above 0:
 *
 *   p~ = (p J n_test + 2) / (J n_test + 4),   floor = p~ (1 - p~) / n_test.
 *
 * For a paired difference of two such shares on the same rows, d = (rows only this model gets
 * right - rows only the other gets right) / n_test, the variance over test rows is
 * (q - d^2) / n_test with q the share of rows the two models disagree on; q >= |d|, so the
 * variance is at least |d| (1 - |d|) / n_test: the same floor with p = |mean d|.
 *
 * Sources: A. Agresti and B. A. Coull, "Approximate is better than 'exact' for interval
 * estimation of binomial proportions", The American Statistician 52(2):119-126, 1998 (the
 * add-two estimate); the variance of a paired difference of proportions: NIST/SEMATECH
 * e-Handbook of Statistical Methods sec. 7.3.3 and any text on McNemar's test (discordant
 * pairs), from memory.
 */

/** The binomial floor p~ (1 - p~) / testRows of one fold score's variance (see the module text). */
export function binomialVarianceFloor(share: number, testRows: number, folds: number): number {
  const rows = folds * testRows;
  const p = (Math.min(1, Math.max(0, share)) * rows + 2) / (rows + 4);
  return (p * (1 - p)) / testRows;
}

/** [lo, hi] clipped to [min, max]. */
export function clipInterval(interval: readonly [number, number], range: readonly [number, number]): [number, number] {
  return [Math.min(range[1], Math.max(range[0], interval[0])), Math.max(range[0], Math.min(range[1], interval[1]))];
}

/** The range of a difference of two values in `range`: [min - max, max - min]. */
export function differenceRange(range: readonly [number, number]): [number, number] {
  return [range[0] - range[1], range[1] - range[0]];
}
