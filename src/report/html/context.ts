/**
 * What every chart of an eval report needs to know: the headline metric (the report's first),
 * which direction is better, the baseline learner (named "baseline", if it was run), the best
 * learner by mean headline score, and the scores read through `own` so that a metric name in a
 * report can never reach an inherited property of a plain object.
 */
import { METRICS, type MetricName } from '../../metrics/index.js';
import { bestLearner } from '../markdown.js';
import type { LearnerReport, Report, ScoreSummary } from '../../model/report.js';

export function own<T>(record: Readonly<Record<string, T>>, key: string): T | undefined {
  return Object.prototype.hasOwnProperty.call(record, key) ? record[key] : undefined;
}

export interface ChartContext {
  readonly report: Report;
  readonly metric: string;
  /** undefined for a metric this version does not know */
  readonly higherIsBetter: boolean | undefined;
  readonly baseline: LearnerReport | undefined;
  readonly best: LearnerReport | undefined;
}

export function chartContext(report: Report): ChartContext {
  if (!report.metrics.length) throw new RangeError('chartContext: the report names no metric');
  const metric = report.metrics[0];
  const known = METRICS.get(metric as MetricName);
  const higherIsBetter = report.comparisons?.metric === metric ? report.comparisons.higherIsBetter : known?.higherIsBetter;
  const baseline = report.learners.find((l) => l.name === 'baseline');
  return { report, metric, higherIsBetter, baseline, best: bestLearner(report, higherIsBetter ?? true) };
}

export function summaryOf(l: LearnerReport, metric: string): ScoreSummary | null {
  return own(l.summary, metric) ?? null;
}

/** The learner's fold scores of `metric` in fold order, null where undefined. */
export function foldScores(l: LearnerReport, metric: string): (number | null)[] {
  return l.folds.map((f) => own(f.scores, metric) ?? null);
}
