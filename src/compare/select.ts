/**
 * Picking learners out of a report: the baseline, the best on a metric, or one named by spec.
 *
 * The best learner has the best mean of the metric's fold scores (the report's summary), in the
 * metric's better direction; the first one wins a tie; learners with no score are never best.
 * A learner is named by its canonical spec as the report prints it ("knn:k=7"); other spellings
 * of the same options ("knn:k=7,vote=equal" with a default) are canonicalised through the
 * learner registry before matching.
 */
import { closeNames, UsageError } from '../errors.js';
import { formatSpec, getLearner, parseLearnerSpec, resolveParams } from '../learners/index.js';
import type { LearnerReport, Report } from '../model/report.js';

/** The summary mean of a metric, or undefined when the learner has none. */
export function summaryMean(learner: LearnerReport, metric: string): number | undefined {
  if (!Object.hasOwn(learner.summary, metric)) return undefined;
  const s = learner.summary[metric];
  return s && Number.isFinite(s.mean) ? s.mean : undefined;
}

/** The learner with the best mean score among those `keep` accepts, or undefined. */
export function bestBy(
  report: Report,
  metric: string,
  higherIsBetter: boolean,
  keep: (l: LearnerReport) => boolean = () => true,
): LearnerReport | undefined {
  let best: LearnerReport | undefined;
  let bestMean = NaN;
  for (const l of report.learners) {
    const m = summaryMean(l, metric);
    if (m === undefined || !keep(l)) continue;
    if (!best || (higherIsBetter ? m > bestMean : m < bestMean)) {
      best = l;
      bestMean = m;
    }
  }
  return best;
}

/** The report's baseline learner (the first learner named "baseline"), or undefined. */
export function baselineOf(report: Report): LearnerReport | undefined {
  return report.learners.find((l) => l.name === 'baseline');
}

/** The learner of `report` whose spec is `spec`; throws a UsageError naming `where` otherwise. */
export function findLearner(report: Report, spec: string, option: string, where: string): LearnerReport {
  const text = spec.trim();
  const exact = report.learners.find((l) => l.spec === text);
  if (exact) return exact;
  let canonical: string | undefined;
  try {
    const parsed = parseLearnerSpec(text);
    canonical = formatSpec(getLearner(parsed.name), resolveParams(getLearner(parsed.name), parsed, report.data.task));
  } catch {
    canonical = undefined;
  }
  const hit = canonical === undefined ? undefined : report.learners.find((l) => l.spec === canonical);
  if (hit) return hit;
  const specs = report.learners.map((l) => l.spec);
  const sameName = specs.filter((s) => s.split(':')[0] === text.split(':')[0]);
  const hint = closeNames(text, specs) || (sameName.length ? `did you mean ${sameName.slice(0, 3).map((s) => JSON.stringify(s)).join(', ')}?` : '');
  throw new UsageError(
    `${option} ${text}: ${where} has no such learner${hint ? `; ${hint}` : ''} (it has ${specs.map((s) => JSON.stringify(s)).join(', ')})`,
  );
}
