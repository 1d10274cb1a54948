/**
 * Power of the corrected one-sided paired t test, and the minimal detectable difference.
 *
 * In words: a paired comparison on J folds has the corrected standard error
 * SE = sqrt((1/J + testRows/trainRows) s_d^2) (Nadeau & Bengio 2003), s_d^2 the sample variance
 * of the fold differences. The one-sided test at level alpha rejects when mean / SE exceeds
 * t_{J-1, 1-alpha}. When the true mean difference is delta, mean / SE follows the noncentral t
 * distribution with J - 1 degrees of freedom and noncentrality delta / SE, so the power is
 *
 *   power(delta) = 1 - F_{nct}(t_{J-1, 1-alpha}; J - 1, delta / SE),
 *
 * and the minimal detectable difference (MDD) at power P is the delta with power(delta) = P,
 * found here by bisection on the noncentral t CDF (jstat). It is close to the usual
 * approximation (t_{J-1, 1-alpha} + t_{J-1, P}) SE (2.697 against 2.716 standard errors at ten
 * folds, alpha 0.05, power 0.8) and meets (z_{1-alpha} + z_P) SE for many folds. The variance s_d^2 is the observed one: the MDD is an
 * estimate, as uncertain as that variance.
 *
 * More repeats shrink only the 1/J part of the corrected variance: as J grows the MDD falls
 * towards (z_{1-alpha} + z_P) sqrt(testRows/trainRows) s_d and no further, because the folds of
 * one data set share their rows (`mddLimit`). A drop below that limit needs more data, not more
 * repeats.
 *
 * Sources: C. Nadeau and Y. Bengio, Machine Learning 52:239-281, 2003 (the corrected variance);
 * the noncentral t power of the one-sample t test, e.g. NIST/SEMATECH e-Handbook sec. 7.2.2.2
 * "Sample sizes required" (https://www.itl.nist.gov/div898/handbook/prc/section2/prc222.htm).
 */
import jStat from 'jstat';
import { UsageError } from '../errors.js';
import { tQuantile } from './t-quantile.js';

export interface PowerSetting {
  /** one-sided level, 0 < alpha < 0.5 */
  readonly alpha: number;
  /** the power asked for, alpha < power < 1 (0.8 by common practice) */
  readonly power: number;
}

export const DEFAULT_POWER = 0.8;

export function checkPowerSetting(s: PowerSetting): void {
  if (!(s.alpha > 0 && s.alpha < 0.5)) throw new UsageError(`--alpha ${s.alpha}: expected a number above 0 and below 0.5 (such as 0.05)`);
  if (!(s.power > s.alpha && s.power < 1)) throw new UsageError(`--power ${s.power}: expected a number above alpha and below 1 (such as 0.8)`);
}

/** The power of the one-sided corrected test with `df` degrees of freedom against a true difference of `delta / se` standard errors. */
export function powerAt(deltaOverSe: number, df: number, alpha: number): number {
  if (!(df > 0)) throw new UsageError(`powerAt: df must be > 0, got ${df}`);
  const crit = tQuantile(1 - alpha, df);
  return 1 - jStat.noncentralt.cdf(crit, df, deltaOverSe);
}

/**
 * The minimal detectable difference in standard errors: the noncentrality at which the
 * one-sided test reaches `power`. Multiply by the standard error for metric units.
 */
export function mddInSe(df: number, s: PowerSetting): number {
  checkPowerSetting(s);
  // a pure function of three numbers, asked for again and again by repeatsFor and the simulations
  const key = `${df} ${s.alpha} ${s.power}`;
  const known = mddCache.get(key);
  if (known !== undefined) return known;
  const value = mddBisect(df, s);
  if (mddCache.size > 10_000) mddCache.clear();
  mddCache.set(key, value);
  return value;
}

const mddCache = new Map<string, number>();

function mddBisect(df: number, s: PowerSetting): number {
  // the approximation brackets the answer from below; power grows with the noncentrality
  let lo = 0;
  let hi = tQuantile(1 - s.alpha, df) + tQuantile(s.power, df) + 1;
  while (powerAt(hi, df, s.alpha) < s.power) hi *= 2;
  for (let i = 0; i < 80 && hi - lo > 1e-10 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (powerAt(mid, df, s.alpha) < s.power) lo = mid;
    else hi = mid;
  }
  return hi;
}

export interface DetectableInput {
  /** paired folds J >= 2 */
  readonly folds: number;
  /** sample variance of the fold differences */
  readonly variance: number;
  /** mean test and training rows of the folds (the Nadeau-Bengio correction) */
  readonly testRows: number;
  readonly trainRows: number;
}

/** The corrected standard error of a mean of fold differences. */
export function correctedSe(x: DetectableInput): number {
  if (!Number.isInteger(x.folds) || x.folds < 2) throw new UsageError(`power: need at least 2 paired folds, got ${x.folds}`);
  if (!(x.variance >= 0) || !(x.testRows > 0) || !(x.trainRows > 0)) throw new UsageError('power: the variance must be >= 0 and the fold sizes > 0');
  return Math.sqrt((1 / x.folds + x.testRows / x.trainRows) * x.variance);
}

/** The minimal detectable difference in the metric's units (0 when the differences have no spread). */
export function minimalDetectable(x: DetectableInput, s: PowerSetting): number {
  return mddInSe(x.folds - 1, s) * correctedSe(x);
}

/** What no number of repeats gets below: the MDD as J grows without bound. */
export function mddLimit(x: Omit<DetectableInput, 'folds'>, s: PowerSetting): number {
  checkPowerSetting(s);
  const z = (p: number): number => jStat.normal.inv(p, 0, 1);
  return (z(1 - s.alpha) + z(s.power)) * Math.sqrt((x.testRows / x.trainRows) * x.variance);
}

export interface RepeatsAdvice {
  /** the fewest repeats whose MDD is at most the target, or null when none is (target below the limit) */
  readonly repeats: number | null;
  /** the MDD with that many repeats (or with `maxRepeats` when none reaches the target) */
  readonly mdd: number;
  /** the MDD no number of repeats gets below */
  readonly limit: number;
}

/**
 * The fewest repeats R (of a k-fold plan with `foldsPerRepeat` folds, J = kR) whose minimal
 * detectable difference is at most `target`, searching up to `maxRepeats`.
 */
export function repeatsFor(
  target: number,
  x: Omit<DetectableInput, 'folds'> & { readonly foldsPerRepeat: number },
  s: PowerSetting,
  maxRepeats = 1000,
): RepeatsAdvice {
  if (!(target > 0)) throw new UsageError(`the drop to detect must be > 0, got ${target}`);
  const limit = mddLimit(x, s);
  const at = (r: number): number => minimalDetectable({ ...x, folds: Math.max(2, x.foldsPerRepeat * r) }, s);
  if (at(maxRepeats) > target) return { repeats: null, mdd: at(maxRepeats), limit };
  // the MDD falls as R grows: bisect on R
  let lo = 0;
  let hi = maxRepeats;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (at(mid || 1) <= target) hi = mid;
    else lo = mid;
  }
  const r = Math.max(1, hi);
  return { repeats: r, mdd: at(r), limit };
}
