/**
 * Summary of one numeric column from its sorted present values: min, first quartile, median,
 * mean, third quartile, max and sample standard deviation.
 *
 * In words: quantiles use linear interpolation between order statistics ("type 7" of Hyndman
 * & Fan 1996, the default of R and NumPy): for sorted x_0..x_{n-1} and probability p, take
 * h = (n - 1) p and return x_floor(h) + (h - floor(h)) (x_ceil(h) - x_floor(h)). The mean is a
 * compensated sum (Neumaier's variant of Kahan summation) divided by n; the standard deviation
 * is sqrt(sum (x - mean)^2 / (n - 1)), two passes.
 *
 * Free sources: R. J. Hyndman and Y. Fan, "Sample Quantiles in Statistical Packages", The
 * American Statistician 50(4), 1996 (https://robjhyndman.com/publications/quantiles/);
 * A. Neumaier, "Rundungsfehleranalyse einiger Verfahren zur Summation endlicher Summen",
 * ZAMM 54, 1974 (summarised at https://en.wikipedia.org/wiki/Kahan_summation_algorithm).
 */
import { quantileSorted as ssQuantileSorted } from 'simple-statistics';
import { InputError } from '../errors.js';
import type { NumericProfile } from './types.js';

/**
 * The p-quantile of sorted values by linear interpolation (Hyndman & Fan type 7): simple-statistics'
 * `quantileSorted`, the one src/slices and src/stats use, behind the audit's own input checks and
 * messages (it reads typed arrays by index as it reads arrays).
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  if (sorted.length === 0) throw new InputError('quantileSorted: values is empty; need at least one value');
  if (!(p >= 0 && p <= 1)) throw new InputError(`quantileSorted: p ${p} must be from 0 to 1`);
  return ssQuantileSorted(sorted as number[], p);
}

/** Compensated (Neumaier) sum of the values. */
export function compensatedSum(values: ArrayLike<number>): number {
  let sum = 0;
  let c = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const t = sum + v;
    c += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  return sum + c;
}

/** The summary of sorted present values; throws InputError when there are none. */
export function numericProfile(sorted: Float64Array): NumericProfile {
  const n = sorted.length;
  if (n === 0) throw new InputError('numericProfile: no present values to summarise');
  const mean = compensatedSum(sorted) / n;
  let sd: number | null = null;
  if (n >= 2) {
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (sorted[i] - mean) ** 2;
    sd = Math.sqrt(ss / (n - 1));
  }
  let integer = true;
  for (let i = 0; i < n && integer; i++) integer = Number.isInteger(sorted[i]);
  return {
    min: sorted[0],
    q1: quantileSorted(sorted, 0.25),
    median: quantileSorted(sorted, 0.5),
    mean: sorted[0] === sorted[n - 1] ? sorted[0] : mean,
    q3: quantileSorted(sorted, 0.75),
    max: sorted[n - 1],
    sd: sd === null ? null : sorted[0] === sorted[n - 1] ? 0 : sd,
    integer,
  };
}
