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
 * Floor and range (`rules`, from the metric registry). For a score that is a share of the test
 * rows (accuracy) the variance of the mean in the interval is at least the binomial floor over
 * the testRows + trainRows rows of a split (variance-floor.ts): equal fold scores are luck, not
 * certainty. For any other metric, equal fold scores (sd = 0)
 * give ci95 = null: no spread was seen and none can be assumed, so no interval is claimed.
 * The interval is clipped to the metric's range (an AUC interval never goes past 1).
 *
 * Edge cases: n = 1 gives sd = null and ci95 = null (no spread can be estimated). When all
 * values are equal, sd = 0 and mean is that value exactly. NaN or infinite
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
import { checkCorrection, checkLevel, correctedInterval, correctedVarianceFactor, type ResampleCorrection } from './corrected-interval.js';
import { finiteValues } from './finite-values.js';
import { binomialVarianceFloor, clipInterval } from './variance-floor.js';

/** What the interval may assume about a metric's scores (see the module text). */
export interface SummaryRules {
  /** the values a score can take; the interval is clipped to it (default: unbounded) */
  readonly range?: readonly [number, number];
  /** the score is a share of the test rows: floor its variance by the binomial (default false) */
  readonly proportion?: boolean;
}

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

export function summarize(values: ArrayLike<number>, correction: ResampleCorrection, level = 0.95, rules: SummaryRules = {}): Summary {
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
    return { n, mean: lo, median: lo, sd: n < 2 ? null : 0, min: lo, max: hi, q1: lo, q3: lo, ci95: n < 2 ? null : interval(lo, 0, n, correction, level, rules) };
  }
  const m = ssMean(xs);
  const [q1, median, q3] = ssQuantile(xs, [0.25, 0.5, 0.75]);
  const sd = sampleStandardDeviation(xs);
  return { n, mean: m, median, sd, min: lo, max: hi, q1, q3, ci95: interval(m, sd * sd, n, correction, level, rules) };
}

/** The floored, clipped corrected interval, or null when no spread is seen and none is floored. */
function interval(m: number, s2: number, n: number, correction: ResampleCorrection, level: number, rules: SummaryRules): [number, number] | null {
  const rows = correction.testRows + correction.trainRows;
  const v = rules.proportion ? Math.max(s2, binomialVarianceFloor(m, rows) / correctedVarianceFactor(n, correction)) : s2;
  if (!(v > 0)) return null;
  const ci = correctedInterval(m, v, n, correction, level);
  return rules.range ? clipInterval(ci, rules.range) : ci;
}
