/**
 * `foldwise compare A B`: the same learners across two eval reports made on the same data, plan
 * and seed, fold by fold.
 *
 * Any difference that match-reports.ts finds (data, rows used, target, task, metric set, plan
 * text, seed, stratification, group, order) makes the runs not comparable: a NotComparableError
 * naming every differing field. The learners are those named (--learner SPEC, each present in
 * both reports), or by default every spec present in both, in the first report's order. Folds
 * pair by (repeat, fold); folds whose sizes differ, or that exist on one side only, make the runs
 * not comparable too (only a change in the plan code between versions could cause it). A fold
 * with a null score on either side is left out of that learner's pair and counted.
 *
 * Statistics per learner: paired-stats.ts with this = the SECOND report and reference = the
 * FIRST, so diff = second minus first in the metric's units.
 */
import { UsageError } from '../errors.js';
import { getMetric } from '../metrics/index.js';
import type { LearnerReport } from '../model/report.js';
import { NotComparableError, reportDifferences, versionWarning } from './match-reports.js';
import { pairFolds } from './pair-folds.js';
import { pairedStats } from './paired-stats.js';
import type { LoadedReport } from './read-report.js';
import { findLearner } from './select.js';
import type { CrossComparison, CrossRow } from '../model/compare.js';

export interface CompareOptions {
  readonly metric?: string;
  readonly learners?: readonly string[];
}

export function compareReports(first: LoadedReport, second: LoadedReport, options: CompareOptions = {}): CrossComparison {
  const a = first.report;
  const b = second.report;
  const differences = reportDifferences(a, b);
  if (differences.length) throw new NotComparableError('compare', differences);
  const metric = options.metric ?? a.metrics[0];
  if (!a.metrics.includes(metric)) throw new UsageError(`--metric ${metric}: the reports do not score it (they score ${a.metrics.join(', ')})`);
  const higherIsBetter = getMetric(metric).higherIsBetter;

  let pairs: [LearnerReport, LearnerReport][];
  if (options.learners?.length) {
    pairs = options.learners.map((spec) => [
      findLearner(a, spec, '--learner', `the first report ${first.path}`),
      findLearner(b, spec, '--learner', `the second report ${second.path}`),
    ]);
  } else {
    pairs = [];
    for (const la of a.learners) {
      const lb = b.learners.find((l) => l.spec === la.spec);
      if (lb) pairs.push([la, lb]);
    }
    if (!pairs.length) {
      throw new UsageError(
        `compare: the reports have no learner in common (first: ${a.learners.map((l) => l.spec).join(', ')}; second: ${b.learners.map((l) => l.spec).join(', ')}); name one with --learner`,
      );
    }
  }

  const rows: CrossRow[] = pairs.map(([la, lb]) => {
    const paired = pairFolds(lb, la, metric);
    if (paired.unmatched > 0 || paired.sizeMismatch) {
      const why = paired.sizeMismatch
        ? `the folds differ in size (repeat ${paired.sizeMismatch.key.repeat + 1} fold ${paired.sizeMismatch.key.fold + 1}: train/test ${paired.sizeMismatch.b} vs ${paired.sizeMismatch.a}) although the plans match`
        : `the fold lists differ (${paired.unmatched} folds on one side only) although the plans match`;
      throw new NotComparableError('compare', [], why);
    }
    return {
      first: la.spec,
      second: lb.spec,
      stats: paired.correction ? pairedStats(paired.a, paired.b, paired.correction, higherIsBetter, paired.skipped, getMetric(metric)) : null,
    };
  });
  const warnings: string[] = [];
  const vw = versionWarning(a, b);
  if (vw) warnings.push(vw);
  for (const r of rows) {
    if (!r.stats) warnings.push(`${r.second}: no fold has a ${metric} score in both reports`);
    else if (r.stats.skippedFolds === 1) warnings.push(`${r.second}: 1 fold has no ${metric} score on one side; it is left out`);
    else if (r.stats.skippedFolds > 1) warnings.push(`${r.second}: ${r.stats.skippedFolds} folds have no ${metric} score on one side; they are left out`);
  }
  return { metric, higherIsBetter, firstPath: first.path, secondPath: second.path, sha256: a.data.sha256, plan: a.plan.text, seed: a.plan.seed, rows, warnings };
}
