/**
 * The comparisons an eval report carries: on the headline metric, every learner that is not
 * the baseline against the baseline, and every learner that is not the best against the best
 * (best = best mean, in the metric's better direction; see select.ts). When one reference is
 * both (the baseline is the best), the pair appears once with against = ["baseline", "best"].
 * The baseline is never compared against the best: that is the best-vs-baseline pair mirrored.
 *
 * Folds pair by (repeat, fold) within the report; a fold where either score is null is left out
 * of that pair and counted in skippedFolds; a pair with no fold in common is left out. The
 * statistics are those of paired-stats.ts: diff = learner minus reference in the metric's units.
 * A report with one learner, or with no pair left, has no comparisons field.
 */
import { getMetric } from '../metrics/index.js';
import type { LearnerReport, Report } from '../model/report.js';
import { pairFolds } from './pair-folds.js';
import { pairedStats } from './paired-stats.js';
import { baselineOf, bestBy } from './select.js';
import type { Against, ComparisonEntry, ReportComparisons } from '../model/compare.js';

export const COMPARISON_LEVEL = 0.95;

function entry(learner: LearnerReport, reference: LearnerReport, against: Against[], metric: string, higherIsBetter: boolean): ComparisonEntry | undefined {
  const paired = pairFolds(learner, reference, metric);
  if (!paired.correction) return undefined;
  const stats = pairedStats(paired.a, paired.b, paired.correction, higherIsBetter, paired.skipped, getMetric(metric));
  return { learner: learner.spec, reference: reference.spec, against, ...stats };
}

/** The comparisons of a report on its headline metric, or undefined when there are none. */
export function reportComparisons(report: Report): ReportComparisons | undefined {
  if (report.learners.length < 2) return undefined;
  const metric = report.metrics[0];
  const higherIsBetter = getMetric(metric).higherIsBetter;
  const baseline = baselineOf(report);
  const best = bestBy(report, metric, higherIsBetter);
  const pairs: ComparisonEntry[] = [];
  for (const l of report.learners) {
    if (l === baseline) continue;
    const refs: [LearnerReport, Against[]][] = [];
    if (baseline) refs.push([baseline, baseline === best ? ['baseline', 'best'] : ['baseline']]);
    if (best && best !== l && best !== baseline) refs.push([best, ['best']]);
    for (const [ref, against] of refs) {
      const e = entry(l, ref, against, metric, higherIsBetter);
      if (e) pairs.push(e);
    }
  }
  if (pairs.length === 0) return undefined;
  return { metric, higherIsBetter, level: COMPARISON_LEVEL, pairs };
}

/** The report with its comparisons attached (placed before the timings), or unchanged. */
export function withComparisons(report: Report): Report {
  const comparisons = reportComparisons(report);
  if (!comparisons) return report;
  const { timing, ...rest } = report;
  return { ...rest, comparisons, ...(timing ? { timing } : {}) };
}
