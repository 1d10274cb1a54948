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
 * Edge cases: J = 1 gives diff and the Wilcoxon figures but no t, df, p or interval. When every
 * d_j is the same non-zero value the t statistic is infinite: t = null, p = 0, ci95 = [diff, diff].
 *
 * Sources: C. Nadeau and Y. Bengio, "Inference for the Generalization Error", Machine Learning
 * 52:239-281, 2003; R. R. Bouckaert and E. Frank, PAKDD 2004, LNCS 3056, pp. 3-12; F. Wilcoxon,
 * Biometrics Bulletin 1(6):80-83, 1945 (free links in src/stats/corrected-interval.ts and
 * src/stats/wilcoxon.ts).
 */
import { mean } from 'simple-statistics';
import { InputError } from '../errors.js';
import { correctedT, wilcoxon, type ResampleCorrection } from '../stats/index.js';
import type { Direction, PairedStats } from './types.js';

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
): PairedStats {
  if (learner.length !== reference.length) {
    throw new InputError(`pairedStats: the series must pair up, got ${learner.length} and ${reference.length} scores`);
  }
  if (learner.length === 0) throw new InputError('pairedStats: need at least 1 paired score, got 0');
  const j = learner.length;
  let wins = 0;
  let ties = 0;
  let losses = 0;
  for (let i = 0; i < j; i++) {
    const d = learner[i] - reference[i];
    if (d === 0) ties++;
    else if (d > 0 === higherIsBetter) wins++;
    else losses++;
  }
  const w = wilcoxon(learner, reference);
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
    return { ...base, diff, direction: directionOf(diff, higherIsBetter), ci95: null, t: null, df: null, p: null, wilcoxon: wil, wins, ties, losses };
  }
  const ct = correctedT(learner, reference, correction);
  return {
    ...base,
    diff: ct.meanDiff,
    direction: directionOf(ct.meanDiff, higherIsBetter),
    ci95: ct.ci95,
    t: Number.isFinite(ct.t) ? ct.t : null,
    df: ct.df,
    p: ct.p,
    wilcoxon: wil,
    wins,
    ties,
    losses,
  };
}
