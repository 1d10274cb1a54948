/**
 * A report read back must hold scores its metrics can take: an accuracy of 5 or a log loss of
 * -1 is a hand-edited or corrupted file, and a gate that compared it would pass or fail on
 * numbers no run produced. Every fold, holdout and pooled score of a metric the registry knows
 * is checked against the metric's range (src/metrics/index.ts, ScoreRules.range), with a slack
 * of 1e-9 times the bound's size (at least 1e-9) for the last bit of a mean; a score outside
 * is refused naming the report, the learner, the fold and the value. Metrics the registry does
 * not know are left alone (the schema has checked they are numbers or null).
 */
import { InputError } from '../errors.js';
import { METRICS, type MetricName } from '../metrics/index.js';
import { foldLabel } from '../model/fold-label.js';
import type { Report } from '../model/report.js';

function outside(value: number, [lo, hi]: readonly [number, number]): boolean {
  const slack = (bound: number) => 1e-9 * Math.max(1, Math.abs(bound));
  return (Number.isFinite(lo) && value < lo - slack(lo)) || (Number.isFinite(hi) && value > hi + slack(hi));
}

function checkScores(where: string, what: string, scores: Readonly<Record<string, number | null>>): void {
  for (const [name, value] of Object.entries(scores)) {
    if (value === null) continue;
    const metric = METRICS.get(name as MetricName);
    if (metric === undefined) continue;
    if (outside(value, metric.range)) {
      const [lo, hi] = metric.range;
      throw new InputError(`${where}: ${what} has ${name} = ${value}, outside the range [${lo}, ${hi}] that ${name} can take; the report was edited or damaged, so write it again with foldwise eval`);
    }
  }
}

/** Throws InputError at the first score outside its metric's range. */
export function checkScoreRanges(where: string, report: Report): void {
  for (const learner of report.learners) {
    for (const f of learner.folds) checkScores(where, `${learner.spec} fold ${foldLabel(f)}`, f.scores);
    if (learner.final) checkScores(where, `${learner.spec} holdout`, learner.final.scores);
    checkScores(where, `${learner.spec} pooled`, learner.pooled);
  }
}
