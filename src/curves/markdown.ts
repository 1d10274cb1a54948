/**
 * The Markdown section of the curves: per learner, the exact pooled areas under the ROC and
 * precision-recall curves with the per-fold mean and its corrected interval, and the
 * calibration figures (ECE, MCE over equal-count bins, Murphy's Brier partition when it is
 * kept). More than two classes: the macro and prevalence-weighted mean one-vs-rest areas.
 */
import type { LearnerReport, Report, ScoreSummary } from '../model/report.js';

type Cell = (text: string) => string;
type Num = (v: number | null | undefined) => string;
type Table = (header: readonly string[], align: readonly ('l' | 'r')[], rows: readonly (readonly string[])[]) => string;

export function curvesSection(report: Report, cell: Cell, num: Num, table: Table): string[] {
  const learners = report.learners.filter((l): l is LearnerReport & { curves: NonNullable<LearnerReport['curves']> } => l.curves !== undefined);
  if (!learners.length) return [];
  const interval = (s: ScoreSummary | null): string => (s?.ci95 ? `${num(s.ci95[0])} to ${num(s.ci95[1])}` : '–');
  const many = (report.data.classes?.length ?? 0) > 2;
  const out: string[] = [];
  if (!many) {
    const positive = learners[0].curves.classes[0]?.class ?? '';
    out.push(`## Curves (pooled out-of-fold; ${cell(positive)} positive)`, '');
    out.push(
      table(
        ['learner', 'ROC area', 'per fold: mean, 95% interval', 'PR area (step-wise)', 'per fold: mean, 95% interval'],
        ['l', 'r', 'r', 'r', 'r'],
        learners.map((l) => {
          const c = l.curves.classes[0];
          return [cell(l.spec), num(c?.roc.area), `${num(c?.roc.foldAreas?.mean)}, ${interval(c?.roc.foldAreas ?? null)}`, num(c?.pr.area), `${num(c?.pr.foldAreas?.mean)}, ${interval(c?.pr.foldAreas ?? null)}`];
        }),
      ),
      '',
    );
  } else {
    out.push('## Curves (pooled out-of-fold, one-vs-rest per class)', '');
    out.push(
      table(
        ['learner', 'ROC area, macro', 'ROC area, weighted', 'PR area, macro', 'PR area, weighted'],
        ['l', 'r', 'r', 'r', 'r'],
        learners.map((l) => {
          const a = l.curves.average;
          return [cell(l.spec), num(a?.macro.roc), num(a?.weighted.roc), num(a?.macro.pr), num(a?.weighted.pr)];
        }),
      ),
      '',
    );
  }
  out.push('## Calibration (pooled out-of-fold, equal-count bins)', '');
  out.push(
    table(
      ['learner', 'bins', 'ECE', 'MCE', 'Brier', 'reliability', 'resolution', 'uncertainty'],
      ['l', 'r', 'r', 'r', 'r', 'r', 'r', 'r'],
      learners.map((l) => {
        const k = l.curves.calibration;
        const p = k.brierParts;
        return [cell(l.spec), String(k.bins.length), num(k.ece), num(k.mce), num(p?.brier), num(p?.reliability), num(p?.resolution), num(p?.uncertainty)];
      }),
    ),
    '',
    `${many ? 'Top-label form: the largest probability against "the predicted class is right". ' : ''}The Brier partition (Murphy 1973) is shown when the forecasts take at most 100 distinct values; a dash means they take more. Each bin's observed share has a Wilson interval in the JSON report; on few rows per bin an ECE well above 0 is expected even for a well-calibrated model.`,
    '',
  );
  return out;
}
