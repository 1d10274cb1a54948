/**
 * Floors and ranges for the fold statistics: a fold score is measured on a finite test fold, so
 * the scores' spread cannot be smaller than the test rows allow, and an interval cannot claim
 * values the metric never takes.
 *
 * Binomial floor. A score that is a share of test rows (accuracy: correct rows / test rows)
 * estimates a proportion from the N rows the plan tests on (N = training + test rows of a
 * split: every row of the data for k-fold). Whatever the J fold scores happen to show, the
 * variance of their mean cannot be below the binomial variance of a share over N rows: J equal
 * scores (zero sample variance) are luck, not certainty. The share is estimated with two
 * successes and two failures added (the "add two" estimate of Agresti & Coull 1998), so that a
 * share of 0 or 1 still gives a floor above 0:
 *
 *   p~ = (p N + 2) / (N + 4),   floor of Var(mean) = p~ (1 - p~) / N,
 *
 * and the interval uses max((1/J + n_test/n_train) s^2, floor) as the variance of the mean.
 * For a paired difference of two such shares on the same rows, d = (rows only this model gets
 * right - rows only the other gets right) / n, the variance over rows is (q - d^2) / n with q the
 * share of rows the two models disagree on; q >= |d|, so it is at least |d| (1 - |d|) / n: the
 * same floor with p = |mean d|.
 *
 * Sources: A. Agresti and B. A. Coull, "Approximate is better than 'exact' for interval
 * estimation of binomial proportions", The American Statistician 52(2):119-126, 1998 (the
 * add-two estimate); the variance of a paired difference of proportions: NIST/SEMATECH
 * e-Handbook of Statistical Methods sec. 7.3.3 and any text on McNemar's test (discordant
 * pairs), from memory.
 */

/** The binomial floor p~ (1 - p~) / rows of the variance of a mean share over `rows` rows (see the module text). */
export function binomialVarianceFloor(share: number, rows: number): number {
  const p = (Math.min(1, Math.max(0, share)) * rows + 2) / (rows + 4);
  return (p * (1 - p)) / rows;
}

/** [lo, hi] clipped to [min, max]. */
export function clipInterval(interval: readonly [number, number], range: readonly [number, number]): [number, number] {
  return [Math.min(range[1], Math.max(range[0], interval[0])), Math.max(range[0], Math.min(range[1], interval[1]))];
}

/** The range of a difference of two values in `range`: [min - max, max - min]. */
export function differenceRange(range: readonly [number, number]): [number, number] {
  return [range[0] - range[1], range[1] - range[0]];
}
