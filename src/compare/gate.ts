/**
 * The gate on two eval reports: the previous one (committed) and the current run.
 *
 * Steps, each refusing with exit code 2 (InputError / UsageError) when it cannot go on:
 * 1. The reports must measure the same thing (match-reports.ts): same data.sha256, rowsUsed,
 *    target, task, metric set, group and order. A difference in plan.text, plan.seed or
 *    plan.stratified only means other folds: the unpaired rule is used, and labelled.
 * 2. The metric (--metric, default the previous report's headline) and the learner: --learner SPEC in
 *    both reports, or by default the previous report's best learner on that metric, leaving out
 *    the baseline learner unless it is the only one; --current-learner SPEC names a different
 *    learner in the current report (e.g. after an option change).
 * 3. Every fold of both learners must have a score of the metric: a report with a failed fold
 *    (a command: learner under --on-fold-error skip) or a metric undefined on a fold is not
 *    comparable, since dropping folds on one side would bias the comparison.
 * 4. Same folds (every (repeat, fold) on both sides with equal sizes): the paired rule;
 *    otherwise the unpaired rule (gate-rule.ts). At least 2 folds per run.
 * 5. --worst-allowed X: also fail when the current mean is worse than X in the metric's better
 *    direction (below X when higher is better, above X when lower is better): the worst score
 *    allowed, whichever way the metric points (it was called --absolute-min, a name that read as
 *    a floor for rmse too).
 * The verdict is "fail" when the rule finds a regression or the current mean is worse than X.
 */
import { UsageError, InputError } from '../errors.js';
import { getMetric } from '../metrics/index.js';
import type { LearnerReport } from '../model/report.js';
import { foldScore, pairFolds } from './pair-folds.js';
import { describeDifferences, NotComparableError, reportDifferences, versionWarning } from './match-reports.js';
import type { LoadedReport } from './read-report.js';
import { baselineOf, bestBy, findLearner } from './select.js';
import { pairedGateTest, unpairedGateTest, checkGateRuleOptions, type GateTest } from './gate-rule.js';
import type { GateVerdict } from '../model/compare.js';
import { checkPowerSetting, DEFAULT_POWER, mddInSe } from '../stats/power.js';
import { tQuantile } from '../stats/index.js';
import { gateFamily } from './gate-family.js';

export const GATE_SCHEMA = 'foldwise-gate/2';
export const DEFAULT_MAX_DROP = 0;
export const DEFAULT_ALPHA = 0.05;

export interface GateOptions {
  readonly metric?: string;
  /** several metrics at once (the first is the verdict's headline); overrides `metric` */
  readonly metrics?: readonly string[];
  /** also gate every slice level both reports carry (gate-family.ts) */
  readonly slices?: boolean;
  readonly learner?: string;
  readonly currentLearner?: string;
  readonly maxDrop?: number;
  readonly alpha?: number;
  readonly worstAllowed?: number;
  /** the power at which the verdict states the drop it could detect (default 0.8) */
  readonly power?: number;
}

/** Every fold score of the metric, or an InputError naming the file and the folds without one. */
function allScores(side: LoadedReport, learner: LearnerReport, metric: string): number[] {
  const failed = learner.folds.filter((f) => f.failed !== undefined);
  if (failed.length) {
    const list = failed.slice(0, 3).map((f) => `repeat ${f.repeat + 1} fold ${f.fold + 1}`).join(', ');
    throw new NotComparableError(
      'gate',
      [],
      `${side.path}: ${learner.spec} failed in ${failed.length} of ${learner.folds.length} folds (${list}${failed.length > 3 ? ', …' : ''}); fix the learner and rerun before gating`,
    );
  }
  const missing = learner.folds.filter((f) => foldScore(f, metric) === null);
  if (missing.length) {
    const list = missing.slice(0, 3).map((f) => `repeat ${f.repeat + 1} fold ${f.fold + 1}`).join(', ');
    throw new InputError(
      `gate: ${side.path}: ${learner.spec} has no ${metric} score in ${missing.length} of ${learner.folds.length} folds (${list}${missing.length > 3 ? ', …' : ''}); a report with failed or undefined folds is not comparable`,
    );
  }
  return learner.folds.map((f) => foldScore(f, metric) as number);
}

function meanRows(l: LearnerReport): { testRows: number; trainRows: number } {
  const n = l.folds.length;
  return { testRows: l.folds.reduce((s, f) => s + f.testRows, 0) / n, trainRows: l.folds.reduce((s, f) => s + f.trainRows, 0) / n };
}

export function gateReports(base: LoadedReport, cur: LoadedReport, options: GateOptions = {}): GateVerdict {
  const maxDrop = options.maxDrop ?? DEFAULT_MAX_DROP;
  const alpha = options.alpha ?? DEFAULT_ALPHA;
  checkGateRuleOptions({ higherIsBetter: true, maxDrop, alpha });
  if (options.worstAllowed !== undefined && !Number.isFinite(options.worstAllowed)) {
    throw new UsageError(`--worst-allowed ${options.worstAllowed}: expected a finite number, in the metric's units`);
  }
  const b = base.report;
  const c = cur.report;
  const differences = reportDifferences(b, c);
  if (differences.some((d) => d.kind === 'data')) throw new NotComparableError('gate', differences);

  const metrics = options.metrics?.length ? [...new Set(options.metrics)] : [options.metric ?? b.metrics[0]];
  for (const m of metrics) {
    if (!b.metrics.includes(m)) throw new UsageError(`--metric ${m}: the reports do not score it (they score ${b.metrics.join(', ')})`);
  }
  const metric = metrics[0];
  const scoreRules = getMetric(metric);
  const higherIsBetter = scoreRules.higherIsBetter;

  let bl: LearnerReport;
  if (options.learner !== undefined) bl = findLearner(b, options.learner, '--learner', `the previous report ${base.path}`);
  else {
    const baseLearner = baselineOf(b);
    const pick = bestBy(b, metric, higherIsBetter, (l) => l !== baseLearner) ?? bestBy(b, metric, higherIsBetter);
    if (!pick) throw new InputError(`gate: ${base.path}: no learner has a ${metric} score`);
    bl = pick;
  }
  const cl = findLearner(c, options.currentLearner ?? bl.spec, options.currentLearner !== undefined ? '--current-learner' : '--learner', `the current report ${cur.path}`);

  const warnings: string[] = [];
  const vw = versionWarning(b, c);
  if (vw) warnings.push(vw);

  let unpairedBecause: string[] = differences.map((d) => describeDifferences([d]));
  const testFor = (m: string): GateTest => {
    const bs = allScores(base, bl, m);
    const cs = allScores(cur, cl, m);
    const rules = getMetric(m);
    const ruleOptions = { higherIsBetter: rules.higherIsBetter, maxDrop, alpha, proportion: rules.proportion, range: rules.range };
    if (differences.length === 0) {
      const paired = pairFolds(bl, cl, m);
      if (paired.unmatched === 0 && !paired.sizeMismatch && paired.correction) return pairedGateTest(paired.a, paired.b, paired.correction, ruleOptions);
      const why = paired.sizeMismatch
        ? `fold sizes (repeat ${paired.sizeMismatch.key.repeat + 1} fold ${paired.sizeMismatch.key.fold + 1}: train/test ${paired.sizeMismatch.a} vs ${paired.sizeMismatch.b})`
        : `fold lists (${paired.unmatched} folds on one side only)`;
      unpairedBecause = [`${why}, although the plans match`];
    }
    return unpairedGateTest(bs, meanRows(bl), cs, meanRows(cl), ruleOptions);
  };
  const overall = metrics.map(testFor);
  const test = overall[0];
  const family =
    metrics.length > 1 || options.slices
      ? gateFamily({
          previous: b,
          current: c,
          previousLearner: bl.spec,
          currentLearner: cl.spec,
          metrics,
          overall,
          slices: Boolean(options.slices),
          paired: test.rule === 'paired',
          maxDrop,
          alpha,
        })
      : undefined;

  const worse =
    options.worstAllowed !== undefined && (higherIsBetter ? test.currentMean < options.worstAllowed : test.currentMean > options.worstAllowed);
  const reasons: ('regression' | 'worst-allowed')[] = [];
  if (family ? family.failing.length > 0 : test.regression) reasons.push('regression');
  if (worse) reasons.push('worst-allowed');
  // what this gate could see: the standard error behind its bound, and the drop it catches with the asked power
  const power = options.power ?? DEFAULT_POWER;
  checkPowerSetting({ alpha, power });
  const se = test.df > 0 ? (test.drop - test.dropBound) / tQuantile(1 - alpha, test.df) : 0;
  const mdd = se > 0 && Number.isFinite(se) ? mddInSe(test.df, { alpha, power }) * se : null;
  if (mdd !== null && maxDrop > 0 && mdd > maxDrop) {
    warnings.push(
      `this gate cannot see a drop of the size it guards: with this plan's fold noise a drop is caught with power ${power} only from ${num(maxDrop + mdd)} on (--max-drop ${maxDrop} plus ${num(mdd)}); more repeats help (foldwise power ${base.path} --drop ${maxDrop})`,
    );
  }
  return {
    schema: GATE_SCHEMA,
    verdict: reasons.length ? 'fail' : 'pass',
    reasons,
    improvement: test.improvement,
    metric,
    higherIsBetter,
    previous: { path: base.path, learner: bl.spec, folds: test.baselineFolds, mean: test.baselineMean },
    current: { path: cur.path, learner: cl.spec, folds: test.currentFolds, mean: test.currentMean },
    rule: test.rule,
    unpairedBecause: test.rule === 'paired' ? [] : unpairedBecause,
    change: test.change,
    ci95: test.ci95,
    drop: test.drop,
    dropBound: test.dropBound,
    maxDrop,
    alpha,
    t: test.t,
    df: test.df,
    p: test.p,
    worstAllowed: options.worstAllowed ?? null,
    detectable: mdd === null ? null : { power, mdd, drop: maxDrop + mdd },
    ...(family ? { family } : {}),
    warnings,
  };
}

const num = (v: number): string => (Math.abs(v) >= 1 ? v.toFixed(3) : v.toPrecision(3));
