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
 * When every difference is the same (s_d = 0): if that difference is 0, t = 0 and p = 1 (no
 * evidence of any difference; 0/0 is reported as 0, not NaN, so that it survives JSON); if it is
 * not 0, t = +Infinity or -Infinity with the sign of dbar and p = 0. In both cases
 * ci95 = [dbar, dbar].
 *
 * Inputs: two arrays of equal length J >= 2, every value finite (NaN is refused with an
 * InputError; the caller filters missing folds from both arrays together).
 *
 * Sources: Nadeau & Bengio (2003) and Bouckaert & Frank (2004), see corrected-interval.ts.
 */
import { mean as ssMean, sampleVariance } from 'simple-statistics';
import { InputError } from '../errors.js';
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
  /** corrected interval of the mean difference at `level` (0.95 by default) */
  readonly ci95: [number, number];
  readonly t: number;
  readonly df: number;
  /** two-sided p-value */
  readonly p: number;
}

export function correctedT(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  correction: ResampleCorrection,
  level = 0.95,
): CorrectedTResult {
  const xs = finiteValues('correctedT', 'a', a);
  const ys = finiteValues('correctedT', 'b', b);
  if (xs.length !== ys.length) {
    throw new InputError(`correctedT: a and b must pair up, got ${xs.length} and ${ys.length} scores`);
  }
  if (xs.length < 2) throw new InputError(`correctedT: need at least 2 paired scores, got ${xs.length}`);
  checkCorrection('correctedT', correction);
  checkLevel('correctedT', level);

  const j = xs.length;
  const df = j - 1;
  const d = xs.map((x, i) => x - ys[i]);
  if (d.every((v) => v === d[0])) {
    const m = d[0];
    return { meanDiff: m, ci95: [m, m], t: m === 0 ? 0 : m > 0 ? Infinity : -Infinity, df, p: m === 0 ? 1 : 0 };
  }
  const m = ssMean(d);
  const s2 = sampleVariance(d);
  const t = m / Math.sqrt(correctedVarianceFactor(j, correction) * s2);
  const p = Math.min(1, 2 * tCdf(-Math.abs(t), df));
  return { meanDiff: m, ci95: correctedInterval(m, s2, j, correction, level), t, df, p };
}
