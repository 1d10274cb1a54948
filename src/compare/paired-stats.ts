/**
 * Paired comparison of two score series on the same folds: this learner against a reference.
 *
 * In words: with paired fold scores x_j (this) and r_j (reference), j = 1..J, the differences
 * d_j = x_j - r_j have mean diff. The corrected resampled t test of Nadeau & Bengio (2003) gives
 * t = diff / sqrt((1/J + testRows/trainRows) s_d^2) with J - 1 degrees of freedom (Bouckaert &
 * Frank 2004 for r repeats of k-fold, J = k r), its two-sided p-value and the 95% interval of
 * diff (src/stats/corrected-t.ts). The Wilcoxon signed-rank test (src/stats/wilcoxon.ts) is run
 * on the same d_j; it treats the folds as independent, which they are not (training sets
 * overlap), so its p-value is too small and is reported as a description, never used to decide.
 * Wins, ties and losses count the folds where this learner is better, equal or worse in the
 * metric's better direction; `direction` is the sign of diff read the same way.
 *
 * Floors, ranges and ties (`rules`, from the metric registry): for a share of test rows (accuracy)
 * the variance of d_j is at least the binomial floor of a paired difference (src/stats/
 * variance-floor.ts), so equal differences on every fold never give an infinite t; for other
 * metrics equal differences give t, p and ci95 = null (no spread seen, none assumed: nothing is
 * claimed). The interval is clipped to the range a difference can take. Two differences within
 * roundingTolerance(testRows, largest |score|) count as equal, in the Wilcoxon ranks and in wins,
 * ties and losses, so that scores equal as fractions are not split by rounding noise.
 *
 * Edge cases: J = 1 gives diff and the Wilcoxon figures but no t, df, p or interval.
 *
 * Sources: C. Nadeau and Y. Bengio, "Inference for the Generalization Error", Machine Learning
 * 52:239-281, 2003; R. R. Bouckaert and E. Frank, PAKDD 2004, LNCS 3056, pp. 3-12; F. Wilcoxon,
 * Biometrics Bulletin 1(6):80-83, 1945 (free links in src/stats/corrected-interval.ts and
 * src/stats/wilcoxon.ts).
 */
import { mean, sampleVariance } from 'simple-statistics';
import { minimalDetectable } from '../stats/power.js';

import { InputError } from '../errors.js';
import {
  binomialVarianceFloor,
  clipInterval,
  correctedT,
  correctedVarianceFactor,
  differenceRange,
  roundingTolerance,
  wilcoxon,
  type ResampleCorrection,
  type SummaryRules,
} from '../stats/index.js';
import type { Direction, PairedStats } from '../model/compare.js';

/** The comparisons' minimal detectable difference: two-sided 0.05 (one-sided 0.025), power 0.8 (common practice). */
const COMPARISON_POWER = { alpha: 0.025, power: 0.8 };

/** Which way `diff` points for a metric: "better", "worse" or "equal". */
export function directionOf(diff: number, higherIsBetter: boolean): Direction {
  if (diff === 0) return 'equal';
  return diff > 0 === higherIsBetter ? 'better' : 'worse';
}

export function pairedStats(
  learner: readonly number[],
  reference: readonly number[],
  correction: ResampleCorrection,
  higherIsBetter: boolean,
  skippedFolds = 0,
  rules: SummaryRules = {},
): PairedStats {
  if (learner.length !== reference.length) {
    throw new InputError(`pairedStats: the series must pair up, got ${learner.length} and ${reference.length} scores`);
  }
  if (learner.length === 0) throw new InputError('pairedStats: need at least 1 paired score, got 0');
  const j = learner.length;
  let scale = 0;
  for (let i = 0; i < j; i++) scale = Math.max(scale, Math.abs(learner[i]), Math.abs(reference[i]));
  const tolerance = roundingTolerance(correction.testRows, scale);
  let wins = 0;
  let ties = 0;
  let losses = 0;
  for (let i = 0; i < j; i++) {
    const d = learner[i] - reference[i];
    if (Math.abs(d) <= tolerance) ties++;
    else if (d > 0 === higherIsBetter) wins++;
    else losses++;
  }
  const w = wilcoxon(learner, reference, { tolerance });
  const base = {
    folds: j,
    skippedFolds,
    testRows: correction.testRows,
    trainRows: correction.trainRows,
    learnerMean: mean([...learner]),
    referenceMean: mean([...reference]),
  };
  const wil = { n: w.n, tPlus: w.tPlus, tMinus: w.tMinus, p: w.p, method: w.method };
  if (j < 2) {
    const diff = learner[0] - reference[0];
    return { ...base, diff, direction: directionOf(diff, higherIsBetter), ci95: null, t: null, df: null, p: null, wilcoxon: wil, mdd: null, wins, ties, losses };
  }
  let sum = 0;
  for (let i = 0; i < j; i++) sum += learner[i] - reference[i];
  const rows = correction.testRows + correction.trainRows;
  const floor = rules.proportion ? binomialVarianceFloor(Math.abs(sum / j), rows) / correctedVarianceFactor(j, correction) : 0;
  const ct = correctedT(learner, reference, correction, 0.95, floor);
  const diffs = learner.map((x, i) => x - reference[i]);
  const s2 = Math.max(sampleVariance(diffs), floor);
  const mdd = s2 > 0 ? minimalDetectable({ folds: j, variance: s2, testRows: correction.testRows, trainRows: correction.trainRows }, COMPARISON_POWER) : null;
  return {
    ...base,
    diff: ct.meanDiff,
    direction: directionOf(ct.meanDiff, higherIsBetter),
    ci95: ct.ci95 && rules.range ? clipInterval(ct.ci95, differenceRange(rules.range)) : ct.ci95,
    t: ct.t,
    df: ct.df,
    p: ct.p,
    wilcoxon: wil,
    mdd,
    wins,
    ties,
    losses,
  };
}
