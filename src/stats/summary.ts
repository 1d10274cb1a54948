/**
 * Summary statistics of one metric's fold scores, with the Nadeau-Bengio corrected interval.
 *
 * In words: n is the number of scores; mean their arithmetic mean; median, q1 and q3 the 0.5,
 * 0.25 and 0.75 sample quantiles; sd the sample standard deviation sqrt(sum (x - mean)^2 / (n-1));
 * min and max the extremes; ci95 the corrected resampled t interval
 *
 *   mean +/- t_{J-1, (1+level)/2} * sqrt((1/J + testRows/trainRows) * sd^2),   J = n
 *
 * (see corrected-interval.ts; for r repeats of k-fold pass all k*r scores, J = k*r, df = J-1).
 * The field is called ci95 whatever `level` is; level defaults to 0.95.
 *
 * Quantiles follow simple-statistics' `quantile`, which is the linear interpolation rule
 * "type 7" of Hyndman & Fan (1996), the default of R and NumPy: for sorted x_0..x_{n-1}, take
 * h = (n-1) p and return x_floor(h) + (h - floor(h)) (x_ceil(h) - x_floor(h)). Mean and standard
 * deviation are simple-statistics' `mean` (Kahan-Babuska compensated sum divided by n) and
 * `sampleStandardDeviation` (two passes: the mean first, then the squared deviations from it),
 * which reproduce the NIST StRD univariate certified values (see test/stats/summary.test.ts).
 *
 * Edge cases: n = 1 gives sd = null and ci95 = null (no spread can be estimated). When all
 * values are equal, sd = 0, mean is that value exactly and ci95 = [mean, mean]. NaN or infinite
 * values are refused with an InputError: the caller filters missing scores first, so that a
 * summary never silently covers fewer folds than it claims. An empty input is refused too.
 *
 * Free sources: simple-statistics documentation (https://simple-statistics.github.io/docs/);
 * R. J. Hyndman and Y. Fan, "Sample Quantiles in Statistical Packages", The American
 * Statistician 50(4):361-365, 1996 (definition 7; author's page
 * https://robjhyndman.com/publications/quantiles/); Nadeau & Bengio (2003), see
 * corrected-interval.ts.
 */
import { mean as ssMean, quantile as ssQuantile, sampleStandardDeviation } from 'simple-statistics';
import { InputError } from '../errors.js';
import { checkCorrection, checkLevel, correctedInterval, type ResampleCorrection } from './corrected-interval.js';
import { finiteValues } from './finite-values.js';

export interface Summary {
  readonly n: number;
  readonly mean: number;
  readonly median: number;
  /** sample standard deviation (denominator n-1); null when n < 2 */
  readonly sd: number | null;
  readonly min: number;
  readonly max: number;
  /** 0.25 quantile, linear interpolation (Hyndman & Fan type 7) */
  readonly q1: number;
  /** 0.75 quantile, linear interpolation (Hyndman & Fan type 7) */
  readonly q3: number;
  /** corrected resampled t interval at `level` (0.95 by default); null when n < 2 */
  readonly ci95: [number, number] | null;
}

export function summarize(values: ArrayLike<number>, correction: ResampleCorrection, level = 0.95): Summary {
  const xs = finiteValues('summarize', 'values', values);
  if (xs.length === 0) throw new InputError('summarize: values is empty; need at least one score');
  checkCorrection('summarize', correction);
  checkLevel('summarize', level);

  const n = xs.length;
  let lo = xs[0];
  let hi = xs[0];
  for (let i = 1; i < n; i++) {
    if (xs[i] < lo) lo = xs[i];
    if (xs[i] > hi) hi = xs[i];
  }
  if (lo === hi) {
    // All equal: report the value itself, not a rounded recomputation of it.
    return { n, mean: lo, median: lo, sd: n < 2 ? null : 0, min: lo, max: hi, q1: lo, q3: lo, ci95: n < 2 ? null : [lo, lo] };
  }
  const m = ssMean(xs);
  const [q1, median, q3] = ssQuantile(xs, [0.25, 0.5, 0.75]);
  const sd = sampleStandardDeviation(xs);
  return { n, mean: m, median, sd, min: lo, max: hi, q1, q3, ci95: correctedInterval(m, sd * sd, n, correction, level) };
}
