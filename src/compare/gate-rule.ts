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
 *
 * Floors (variance-floor.ts in src/stats): for a share of test rows (accuracy; `proportion`)
 * the variance of each mean is at least the binomial floor over the rows of a split
 * (testRows + trainRows = N): for the paired rule that of a difference, q~ (1 - q~) / N with
 * q~ the add-two estimate of |mean drop|; for the unpaired rule each run's own p~ (1 - p~) / N. So equal fold scores never give an infinite t: a 2-fold report
 * with one error more in each fold is not a regression "with 95% confidence".
 * Zero spread (SE = 0, possible only without a floor): nothing can be claimed beyond what the
 * scores show. A mean drop <= maxDrop passes (t = null, p = 1, no interval): the runs agree
 * within the allowance on every fold. A mean drop > maxDrop is refused with an InputError
 * (exit 2): fold noise cannot be told from a drop, and passing it silently would hide it.
 * The reported interval of change = current - baseline is the two-sided corrected 95% interval,
 * clipped to the range a difference of the metric can take.
 *
 * Sources: Nadeau & Bengio (2003) and Bouckaert & Frank (2004), see
 * src/stats/corrected-interval.ts; B. L. Welch, "The generalization of 'Student's' problem when
 * several different population variances are involved", Biometrika 34:28-35, 1947 (free
 * summary: NIST/SEMATECH e-Handbook sec. 1.3.5.3, https://www.itl.nist.gov/div898/handbook/
 * eda/section3/eda353.htm).
 */
import { mean, sampleVariance } from 'simple-statistics';
import { InputError, UsageError } from '../errors.js';
import {
  binomialVarianceFloor,
  clipInterval,
  correctedVarianceFactor,
  differenceRange,
  tCdf,
  tQuantile,
  type ResampleCorrection,
} from '../stats/index.js';

export interface GateRuleOptions {
  readonly higherIsBetter: boolean;
  /** allowed drop, in the metric's units, >= 0 */
  readonly maxDrop: number;
  /** one-sided level, 0 < alpha < 0.5 */
  readonly alpha: number;
  /** the metric is a share of test rows: floor the variances by the binomial (default false) */
  readonly proportion?: boolean;
  /** the values the metric takes; the interval of change is clipped to their differences */
  readonly range?: readonly [number, number];
}

export interface GateTest {
  readonly rule: 'paired' | 'unpaired';
  readonly baselineMean: number;
  readonly currentMean: number;
  readonly baselineFolds: number;
  readonly currentFolds: number;
  /** current mean - baseline mean, metric units */
  readonly change: number;
  /** two-sided corrected 95% interval of change; null when the spread is zero */
  readonly ci95: [number, number] | null;
  /** change in the worse direction: positive = current worse */
  readonly drop: number;
  /** one-sided (1 - alpha) lower confidence bound of the drop (the drop itself without spread) */
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

/** Sample variance, exactly 0 for equal scores (no rounding residue of the mean). */
function spread(xs: readonly number[]): number {
  return xs.every((x) => x === xs[0]) ? 0 : sampleVariance([...xs]);
}

type Base = Pick<GateTest, 'rule' | 'baselineMean' | 'currentMean' | 'baselineFolds' | 'currentFolds' | 'change' | 'drop' | 'df'>;

/** The one-sided decisions and the interval from the drop's standard error (see the module text). */
function decide(base: Base, se: number, o: GateRuleOptions): GateTest {
  if (se === 0) {
    if (base.drop > o.maxDrop) {
      throw new InputError(
        `gate: every fold shows the same scores (no spread), and the mean drop ${base.drop} exceeds --max-drop ${o.maxDrop}; with no spread the gate cannot tell a drop from fold noise, so it gives no verdict: gate on a share of rows such as accuracy, or use more folds or repeats`,
      );
    }
    return { ...base, ci95: null, dropBound: base.drop, t: null, p: 1, regression: false, improvement: false };
  }
  const q = tQuantile(1 - o.alpha, base.df);
  const half95 = tQuantile(0.975, base.df) * se;
  const t = (base.drop - o.maxDrop) / se;
  const ci: [number, number] = [base.change - half95, base.change + half95];
  return {
    ...base,
    ci95: o.range ? clipInterval(ci, differenceRange(o.range)) : ci,
    dropBound: base.drop - q * se,
    t,
    p: tCdf(-t, base.df),
    regression: base.drop - q * se > o.maxDrop,
    improvement: -base.drop - q * se > 0,
  };
}

/** The paired rule on scores of the same folds, in the same order. */
export function pairedGateTest(baseline: readonly number[], current: readonly number[], correction: ResampleCorrection, o: GateRuleOptions): GateTest {
  checkGateRuleOptions(o);
  checkSeries('baseline', baseline);
  checkSeries('current', current);
  if (baseline.length !== current.length) throw new InputError(`gate: paired scores must pair up, got ${baseline.length} and ${current.length}`);
  const s = o.higherIsBetter ? 1 : -1;
  const j = baseline.length;
  const drops = baseline.map((b, i) => s * (b - current[i]));
  const flat = drops.every((x) => x === drops[0]);
  const drop = flat ? drops[0] : mean(drops);
  const factor = correctedVarianceFactor(j, correction);
  const floor = o.proportion ? binomialVarianceFloor(Math.abs(drop), correction.testRows + correction.trainRows) : 0;
  const v = Math.max(factor * (flat ? 0 : sampleVariance(drops)), floor);
  const base: Base = {
    rule: 'paired',
    baselineMean: mean([...baseline]),
    currentMean: mean([...current]),
    baselineFolds: j,
    currentFolds: j,
    change: 0 - s * drop, // 0 - x: never -0
    drop,
    df: j - 1,
  };
  return decide(base, Math.sqrt(v), o);
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
  const floorB = o.proportion ? binomialVarianceFloor(mb, baselineCorrection.testRows + baselineCorrection.trainRows) : 0;
  const floorC = o.proportion ? binomialVarianceFloor(mc, currentCorrection.testRows + currentCorrection.trainRows) : 0;
  const vb = Math.max(correctedVarianceFactor(jb, baselineCorrection) * spread(baseline), floorB);
  const vc = Math.max(correctedVarianceFactor(jc, currentCorrection) * spread(current), floorC);
  const se = Math.sqrt(vb + vc);
  const df = se > 0 ? (vb + vc) ** 2 / (vb ** 2 / (jb - 1) + vc ** 2 / (jc - 1)) : jb + jc - 2;
  return decide({ rule: 'unpaired', baselineMean: mb, currentMean: mc, baselineFolds: jb, currentFolds: jc, change: mc - mb, drop: s * (mb - mc), df }, se, o);
}
