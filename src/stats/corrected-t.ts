/**
 * Paired corrected resampled t test of Nadeau & Bengio (2003) for two models scored on the
 * same folds.
 *
 * In words: with paired fold scores a_j and b_j (j = 1..J, same train/test split for both), take
 * the differences d_j = a_j - b_j, their mean dbar and sample variance s_d^2 (denominator J-1).
 * The corrected variance of dbar is (1/J + testRows/trainRows) s_d^2; the statistic is
 *
 *   t = dbar / sqrt((1/J + testRows/trainRows) s_d^2),   df = J - 1,
 *
 * and the two-sided p-value is 2 P(T_df <= -|t|). The interval of the mean difference is
 * dbar +/- t_{J-1,(1+level)/2} sqrt((1/J + testRows/trainRows) s_d^2); the field is called ci95
 * whatever `level` is (0.95 by default). For r repeats of k-fold pass all J = k*r pairs, in the
 * same order for a and b; df = J - 1 (Bouckaert & Frank 2004).
 *
 * Variance floor: `varianceFloor` (default 0) is a lower bound of the variance of one
 * difference, s_d^2, known from outside the scores (for shares of test rows, the binomial floor
 * of variance-floor.ts divided by the correction factor); the test uses max(s_d^2, varianceFloor). When that is still 0 (every
 * difference the same, and no floor), the scores show no spread and none can be assumed: the
 * result refuses to claim anything, with t = null, p = null and ci95 = null. Zero spread is not
 * certainty: an infinite t or a zero-width interval would claim more than J scores hold.
 *
 * Inputs: two arrays of equal length J >= 2, every value finite (NaN is refused with an
 * InputError; the caller filters missing folds from both arrays together).
 *
 * Sources: Nadeau & Bengio (2003) and Bouckaert & Frank (2004), see corrected-interval.ts.
 */
import { mean as ssMean, sampleVariance } from 'simple-statistics';
import { InputError, UsageError } from '../errors.js';
import {
  checkCorrection,
  checkLevel,
  correctedInterval,
  correctedVarianceFactor,
  type ResampleCorrection,
} from './corrected-interval.js';
import { finiteValues } from './finite-values.js';
import { tCdf } from './t-quantile.js';

export interface CorrectedTResult {
  /** mean of a_j - b_j */
  readonly meanDiff: number;
  /** corrected interval of the mean difference at `level` (0.95 by default); null without spread */
  readonly ci95: [number, number] | null;
  /** null without spread (see the module text) */
  readonly t: number | null;
  readonly df: number;
  /** two-sided p-value; null without spread */
  readonly p: number | null;
}

export function correctedT(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  correction: ResampleCorrection,
  level = 0.95,
  varianceFloor = 0,
): CorrectedTResult {
  const xs = finiteValues('correctedT', 'a', a);
  const ys = finiteValues('correctedT', 'b', b);
  if (xs.length !== ys.length) {
    throw new InputError(`correctedT: a and b must pair up, got ${xs.length} and ${ys.length} scores`);
  }
  if (xs.length < 2) throw new InputError(`correctedT: need at least 2 paired scores, got ${xs.length}`);
  checkCorrection('correctedT', correction);
  checkLevel('correctedT', level);
  if (typeof varianceFloor !== 'number' || !(varianceFloor >= 0) || !Number.isFinite(varianceFloor)) {
    throw new UsageError(`correctedT: varianceFloor must be a finite number >= 0, got ${varianceFloor}`);
  }

  const j = xs.length;
  const df = j - 1;
  const d = xs.map((x, i) => x - ys[i]);
  const flat = d.every((v) => v === d[0]);
  // equal differences: the mean is that value exactly, the sample variance exactly 0
  const m = flat ? d[0] : ssMean(d);
  const s2 = Math.max(flat ? 0 : sampleVariance(d), varianceFloor);
  if (s2 === 0) return { meanDiff: m, ci95: null, t: null, df, p: null };
  const t = m / Math.sqrt(correctedVarianceFactor(j, correction) * s2);
  const p = Math.min(1, 2 * tCdf(-Math.abs(t), df));
  return { meanDiff: m, ci95: correctedInterval(m, s2, j, correction, level), t, df, p };
}
