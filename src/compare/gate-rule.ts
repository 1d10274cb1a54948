/**
 * The gate's decision rule on fold scores: has the current run dropped by more than the allowed
 * amount, beyond fold noise?
 *
 * Let s = +1 when higher is better and -1 otherwise, and call drop = s (baseline - current) the
 * change in the worse direction (positive = the current run is worse). The gate tests
 *
 *   H0: true drop <= maxDrop   against   H1: true drop > maxDrop
 *
 * with a one-sided corrected t test at level alpha, and fails only when H0 is rejected. In words:
 * it fails when the whole one-sided (1 - alpha) confidence bound of the drop lies above maxDrop,
 * i.e. dropBound = meanDrop - t_{df,1-alpha} SE > maxDrop. This implies meanDrop > maxDrop, so
 * "the drop exceeds --max-drop AND the test says it is beyond fold noise" both hold. Testing
 * H0: drop <= 0 and then asking meanDrop > maxDrop would fail about half the runs whose true
 * drop sits exactly at the allowance; this rule fails at most alpha of them.
 *
 * Paired rule (same folds): d_j = s (b_j - c_j), SE^2 = (1/J + testRows/trainRows) s_d^2,
 * df = J - 1 (Nadeau & Bengio 2003; Bouckaert & Frank 2004), computed with correctedT on
 * d_j - maxDrop against 0 at level 1 - 2 alpha, whose lower end is the one-sided bound.
 *
 * Unpaired rule (different folds of the same data, e.g. another seed or plan): each run's mean
 * gets its own corrected variance V = (1/J + testRows/trainRows) s^2, SE^2 = V_b + V_c and the
 * Welch-Satterthwaite df = (V_b + V_c)^2 / (V_b^2/(J_b - 1) + V_c^2/(J_c - 1)) (Welch 1947).
 * It treats the two runs as independent; on shared data they are positively correlated, so the
 * rule is conservative (fewer false alarms, less power than pairing).
 *
 * Improvement: the same one-sided test of H0: gain <= 0 (gain = -drop) rejected at alpha.
 * Zero spread (SE = 0): the drop is known exactly; fail when it exceeds maxDrop (t = null,
 * p = 0 when it does and 1 when it does not).
 * The reported interval of change = current - baseline is the two-sided corrected 95% interval.
 *
 * Sources: Nadeau & Bengio (2003) and Bouckaert & Frank (2004), see
 * src/stats/corrected-interval.ts; B. L. Welch, "The generalization of 'Student's' problem when
 * several different population variances are involved", Biometrika 34:28-35, 1947 (free
 * summary: NIST/SEMATECH e-Handbook sec. 1.3.5.3, https://www.itl.nist.gov/div898/handbook/
 * eda/section3/eda353.htm).
 */
import { mean, sampleVariance } from 'simple-statistics';
import { InputError, UsageError } from '../errors.js';
import { correctedT, correctedVarianceFactor, tCdf, tQuantile, type ResampleCorrection } from '../stats/index.js';

export interface GateRuleOptions {
  readonly higherIsBetter: boolean;
  /** allowed drop, in the metric's units, >= 0 */
  readonly maxDrop: number;
  /** one-sided level, 0 < alpha < 0.5 */
  readonly alpha: number;
}

export interface GateTest {
  readonly rule: 'paired' | 'unpaired';
  readonly baselineMean: number;
  readonly currentMean: number;
  readonly baselineFolds: number;
  readonly currentFolds: number;
  /** current mean - baseline mean, metric units */
  readonly change: number;
  /** two-sided corrected 95% interval of change */
  readonly ci95: [number, number];
  /** change in the worse direction: positive = current worse */
  readonly drop: number;
  /** one-sided (1 - alpha) lower confidence bound of the drop */
  readonly dropBound: number;
  /** t of (drop - maxDrop); null when the spread is zero */
  readonly t: number | null;
  readonly df: number;
  /** one-sided p-value of H0: drop <= maxDrop */
  readonly p: number;
  /** H0 rejected: the drop exceeds maxDrop beyond fold noise */
  readonly regression: boolean;
  /** H0: gain <= 0 rejected at alpha */
  readonly improvement: boolean;
}

export function checkGateRuleOptions(o: GateRuleOptions): void {
  if (typeof o.maxDrop !== 'number' || !Number.isFinite(o.maxDrop) || o.maxDrop < 0) {
    throw new UsageError(`--max-drop ${o.maxDrop}: expected a number >= 0, in the metric's units`);
  }
  if (typeof o.alpha !== 'number' || !(o.alpha > 0 && o.alpha < 0.5)) {
    throw new UsageError(`--alpha ${o.alpha}: expected a number above 0 and below 0.5 (such as 0.05)`);
  }
}

function checkSeries(name: string, xs: readonly number[]): void {
  if (xs.length < 2) throw new InputError(`gate: the ${name} run has ${xs.length} fold score${xs.length === 1 ? '' : 's'}; the gate needs at least 2 folds per run`);
  if (!xs.every(Number.isFinite)) throw new InputError(`gate: the ${name} run has a score that is not a finite number`);
}

/** One-sided p of P(T >= t) from a two-sided corrected-t result. */
function upperP(t: number, twoSided: number): number {
  if (t === 0) return 0.5;
  return t > 0 ? twoSided / 2 : 1 - twoSided / 2;
}

/** The paired rule on scores of the same folds, in the same order. */
export function pairedGateTest(baseline: readonly number[], current: readonly number[], correction: ResampleCorrection, o: GateRuleOptions): GateTest {
  checkGateRuleOptions(o);
  checkSeries('baseline', baseline);
  checkSeries('current', current);
  if (baseline.length !== current.length) throw new InputError(`gate: paired scores must pair up, got ${baseline.length} and ${current.length}`);
  const s = o.higherIsBetter ? 1 : -1;
  const zeros = baseline.map(() => 0);
  const drops = baseline.map((b, i) => s * (b - current[i]));
  const change = correctedT(current, baseline, correction, 0.95);
  const level = 1 - 2 * o.alpha;
  const shifted = correctedT(drops.map((d) => d - o.maxDrop), zeros, correction, level);
  const gain = correctedT(drops.map((d) => -d), zeros, correction, level);
  const drop = mean(drops);
  // zero spread: the drop is known exactly; correctedT gives t = 0 (no difference) or +-Infinity
  const flat = drops.every((x) => x === drops[0]);
  return {
    rule: 'paired',
    baselineMean: mean([...baseline]),
    currentMean: mean([...current]),
    baselineFolds: baseline.length,
    currentFolds: current.length,
    change: change.meanDiff,
    ci95: change.ci95,
    drop,
    dropBound: shifted.ci95[0] + o.maxDrop,
    t: flat ? null : shifted.t,
    df: shifted.df,
    p: flat ? (shifted.meanDiff > 0 ? 0 : 1) : upperP(shifted.t, shifted.p),
    regression: shifted.ci95[0] > 0,
    improvement: gain.ci95[0] > 0,
  };
}

/** The unpaired (Welch, corrected variances) rule on two runs with different folds. */
export function unpairedGateTest(
  baseline: readonly number[],
  baselineCorrection: ResampleCorrection,
  current: readonly number[],
  currentCorrection: ResampleCorrection,
  o: GateRuleOptions,
): GateTest {
  checkGateRuleOptions(o);
  checkSeries('baseline', baseline);
  checkSeries('current', current);
  const s = o.higherIsBetter ? 1 : -1;
  const jb = baseline.length;
  const jc = current.length;
  const mb = mean([...baseline]);
  const mc = mean([...current]);
  const vb = correctedVarianceFactor(jb, baselineCorrection) * sampleVariance([...baseline]);
  const vc = correctedVarianceFactor(jc, currentCorrection) * sampleVariance([...current]);
  const se = Math.sqrt(vb + vc);
  const df = vb + vc > 0 ? (vb + vc) ** 2 / (vb ** 2 / (jb - 1) + vc ** 2 / (jc - 1)) : jb + jc - 2;
  const change = mc - mb;
  const drop = s * (mb - mc);
  const base = { rule: 'unpaired' as const, baselineMean: mb, currentMean: mc, baselineFolds: jb, currentFolds: jc, change, drop, df };
  if (se === 0) {
    const excess = drop - o.maxDrop;
    return { ...base, ci95: [change, change], dropBound: drop, t: null, p: excess > 0 ? 0 : 1, regression: excess > 0, improvement: drop < 0 };
  }
  const q = tQuantile(1 - o.alpha, df);
  const half95 = tQuantile(0.975, df) * se;
  const t = (drop - o.maxDrop) / se;
  return {
    ...base,
    ci95: [change - half95, change + half95],
    dropBound: drop - q * se,
    t,
    p: tCdf(-t, df),
    regression: drop - q * se > o.maxDrop,
    improvement: -drop - q * se > 0,
  };
}
