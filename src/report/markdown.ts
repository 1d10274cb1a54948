/**
 * The Markdown report, for people: what was run, one summary table of the headline metric,
 * a table of every metric, the per-fold scores of the headline metric, the pooled confusion
 * matrix of the best learner, the quick audit's suspects, and the warnings. Numbers are
 * right-aligned with four decimals.
 */
import { curvesSection } from '../curves/markdown.js';
import { thresholdSection } from './threshold-markdown.js';
import { costsSection } from './costs-markdown.js';
import { confusionView, foldedNote } from './confusion-view.js';
import { foldCount, foldLabel } from '../model/fold-label.js';
import type { LearnerReport, Report, ReportAudit, ScoreSummary } from '../model/report.js';

import { cell, code, inline, num } from '../markdown-text.js';

export { cell, code, inline, num };

function interval(s: ScoreSummary | null): string {
  return s?.ci95 ? `${num(s.ci95[0])} to ${num(s.ci95[1])}` : '–';
}

function table(header: readonly string[], align: readonly ('l' | 'r')[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]): string => `| ${cells.join(' | ')} |`;
  return [line(header), line(align.map((a) => (a === 'l' ? ':--' : '--:'))), ...rows.map(line)].join('\n');
}

/**
 * --importance: one table per learner (the baseline ignores its inputs and is left out), inputs by
 * mean drop, largest first; forest and boost also show their own importance per feature.
 */
function importanceSection(report: Report): string[] {
  const imp = report.importance;
  if (!imp) return [];
  const out: string[] = [
    `## Permutation importance: drop of ${cell(imp.metric)} when an input is shuffled`,
    '',
    `Each fold's drop is the mean over ${imp.repeats} shuffle${imp.repeats === 1 ? '' : 's'} of that input among the fold's test rows; the model is not refitted. An interval that covers 0 means the data do not show that the model uses the input.${imp.clusters ? ' A cluster is shuffled as one input: copies of one signal hide each other when shuffled alone.' : ''}`,
    '',
  ];
  for (const l of report.learners) {
    if (!l.importance || l.name === 'baseline') continue;
    const own = l.importance.own;
    const ownOf = new Map(own?.features.map((f) => [f.name, f.mean]) ?? []);
    const rows = l.importance.inputs
      .map((x, k) => ({ x, k, kind: imp.inputs[k]?.kind ?? 'feature' }))
      .sort((a, b) => (b.x.summary?.mean ?? -Infinity) - (a.x.summary?.mean ?? -Infinity) || a.k - b.k);
    out.push(`### ${cell(l.spec)}`, '');
    out.push(
      table(
        ['input', 'mean drop', 'sd', '95% interval (corrected)', ...(own ? [`own (${own.kind}, share)`] : [])],
        ['l', 'r', 'r', 'r', ...(own ? ['r' as const] : [])],
        rows.map(({ x, kind }) => [
          cell(x.name),
          num(x.summary?.mean),
          num(x.summary?.sd),
          interval(x.summary),
          ...(own ? [kind === 'feature' ? num(ownOf.get(x.name)) : '–'] : []),
        ]),
      ),
      '',
    );
  }
  return out;
}

/** The learner with the best mean headline score (the first on a tie), or undefined. */
export function bestLearner(report: Report, higherIsBetter: boolean): LearnerReport | undefined {
  const m = report.metrics[0];
  let best: LearnerReport | undefined;
  for (const l of report.learners) {
    const s = l.summary[m];
    if (!s) continue;
    const b = best?.summary[m];
    if (!b || (higherIsBetter ? s.mean > b.mean : s.mean < b.mean)) best = l;
  }
  return best;
}

function describe(report: Report): string[] {
  const d = report.data;
  const p = report.plan;
  const excluded = d.excludedRows ? `, ${d.excludedRows} left out for a missing target` : '';
  const task = d.task === 'classification' ? `classification into ${d.classes?.length ?? 0} classes` : 'regression';
  const extras = [p.stratified ? 'stratified' : 'not stratified', p.group ? `grouped by ${cell(p.group)}` : '', p.order ? `ordered by ${cell(p.order)}` : '']
    .filter(Boolean)
    .join(', ');
  return [
    `- Data: ${cell(d.path)}, ${d.rowsUsed} of ${d.rows} rows used${excluded}; ${d.features.length} features; target ${cell(d.target)} (${task}); SHA-256 ${d.sha256.slice(0, 12)}`,
    `- Plan: ${p.text} (${foldCount(p)}${p.repeats > 1 ? ` x ${p.repeats} repeats` : ''}), ${extras}; seed ${p.seed}`,
    ...(d.dates?.length ? [`- Dates: ${d.dates.map((x) => `${cell(x.column)} read as ${x.read}`).join('; ')}`] : []),
    ...(p.holdoutRows !== undefined ? [`- Holdout: ${p.holdoutRows} rows, ${p.finalScored ? 'scored (--final)' : 'not scored (use --final to score it once)'}`] : []),
  ];
}

/** The quick audit's suspects (eval and tune) as a short section; empty when it found none. */
export function auditSection(audit: ReportAudit | undefined): string[] {
  if (!audit?.suspects.length) return [];
  const note = "_The quick audit's high and warn findings; `foldwise audit` gives the full report, notes included._";
  return ['## Data audit', '', ...audit.suspects.map((s) => `- ${cell(s)}`), '', note, ''];
}

const signedNum = (v: number): string => (v > 0 ? `+${num(v)}` : num(v) === '-0.0000' ? num(0) : num(v));
const pText = (p: number | null): string => (p === null ? '–' : p < 0.0001 ? '< 0.0001' : p.toFixed(4));

/**
 * The paired comparisons (src/compare/within-report.ts) as one compact table: difference =
 * learner minus reference on the same folds, its corrected interval, corrected t with its
 * two-sided p, the Wilcoxon p and the learner's wins/ties/losses over folds. Empty without them.
 */
function comparisonSection(report: Report): string[] {
  const c = report.comparisons;
  if (!c?.pairs.length) return [];
  const rows = c.pairs.map((e) => [
    cell(e.learner),
    `${cell(e.reference)}${e.against.includes('best') ? ' (best)' : ''}`,
    signedNum(e.diff),
    e.ci95 ? `${signedNum(e.ci95[0])} to ${signedNum(e.ci95[1])}` : '–',
    e.t === null ? (e.p === 0 ? (e.diff > 0 ? '∞' : '-∞') : '–') : e.t.toFixed(2),
    pText(e.p),
    pText(e.wilcoxon.p),
    e.mdd === null || e.mdd === undefined ? '–' : num(e.mdd),
    `${e.wins}/${e.ties}/${e.losses}`,
  ]);
  const counts = c.pairs.map((e) => e.folds);
  const lo = Math.min(...counts);
  const hi = Math.max(...counts);
  const folds = lo === hi ? `${hi} paired fold${hi === 1 ? "" : "s"}` : `${lo} to ${hi} paired folds (a fold with an undefined score is left out)`;
  return [
    `## ${cell(c.metric)}: paired comparisons on the same folds`,
    '',
    table(
      ['learner', 'vs', 'difference', '95% interval (corrected)', 't', 'p', 'Wilcoxon p', 'detectable', 'wins/ties/losses'],
      ['l', 'l', 'r', 'r', 'r', 'r', 'r', 'r', 'r'],
      rows,
    ),
    '',
    `_difference = learner minus reference over ${folds} (${cell(c.metric)}: ${c.higherIsBetter ? 'higher' : 'lower'} is better); interval, t and p use the Nadeau-Bengio correction; the Wilcoxon test treats folds as independent, so its p is too small and only describes; detectable = the smallest true difference the corrected test (two-sided 0.05) finds with power 0.8: a smaller one can go unseen._`,
    '',
  ];
}

/** One summary line per learner with failed folds (command: learners under --on-fold-error skip). */
function failedLines(report: Report): string[] {
  return report.learners.flatMap((l) => {
    const failed = l.folds.filter((f) => f.failed !== undefined);
    if (!failed.length) return [];
    const where = failed.map(foldLabel).join(', ');
    return [`- **Failed folds: ${cell(l.spec)} failed in ${failed.length} of ${l.folds.length} folds (${where})**; its scores use the other folds, and \`foldwise gate\` does not compare this report (the reasons are under Warnings)`];
  });
}

/** One line per learner and note (Model.notes, such as boost's stopped-at) with its value in every fold. */
function notesLines(report: Report): string[] {
  return report.learners.flatMap((l) => {
    const keys = [...new Set(l.folds.flatMap((f) => Object.keys(f.notes ?? {})))];
    return keys.map((k) => {
      const values = l.folds.map((f) => (f.notes && typeof f.notes[k] === 'number' ? String(f.notes[k]) : '-'));
      const shown = values.length > 30 ? [...values.slice(0, 30), '…'] : values;
      const final = l.final?.notes?.[k];
      return `- ${cell(l.spec)}: ${cell(k)} per fold (in fold order): ${shown.join(', ')}${typeof final === 'number' ? `; final: ${final}` : ''}`;
    });
  });
}

/**
 * One table per --slice column on the headline metric: each level's rows, the folds scored in
 * it, and each learner's mean with its corrected interval; a level whose folds all have fewer
 * than minRows test rows in it says so instead of a score.
 */
function sliceSection(report: Report): string[] {
  if (!report.slices?.length) return [];
  const head = report.metrics[0];
  const out: string[] = [];
  for (const s of report.slices) {
    const folds = report.learners[0]?.folds.length ?? 0;
    out.push(`## ${cell(head)} by ${cell(s.column)}${s.kind === 'bins' ? ' (quantile bins fixed on all rows)' : ''}`, '');
    out.push(
      table(
        ['slice', 'rows', 'folds scored', ...report.learners.map((l) => cell(l.spec))],
        ['l', 'r', 'r', ...report.learners.map(() => 'r' as const)],
        s.levels.map((lv) => [
          cell(lv.level),
          String(lv.rows),
          `${lv.scoredFolds} of ${folds}`,
          ...lv.learners.map((l) => {
            const sm = l.summary[head];
            if (!sm) return lv.scoredFolds === 0 ? `too few rows (< ${s.minRows} per fold)` : '–';
            return sm.ci95 ? `${num(sm.mean)} (${num(sm.ci95[0])} to ${num(sm.ci95[1])})` : `${num(sm.mean)} (one fold)`;
          }),
        ]),
      ),
      '',
      `_mean over the folds with at least ${s.minRows} test rows in the slice, corrected 95% interval in brackets (whole-fold sizes: conservative); the JSON report has every metric, fold by fold, and the paired comparisons per slice._`,
      '',
    );
  }
  return out;
}

/** Renders the report as Markdown. `higherIsBetter` tells the headline metric's direction. */
export function renderMarkdown(report: Report, higherIsBetter: (metric: string) => boolean): string {
  const head = report.metrics[0];
  const out: string[] = [`# foldwise eval: ${cell(report.data.target)}`, '', ...describe(report), ...failedLines(report), ...notesLines(report), '', ...costsSection(report.settings.costs)];

  out.push(`## ${head} (headline)`, '');
  out.push(
    table(
      ['learner', 'mean', 'sd', 'median', 'min', 'max', '95% interval (corrected)'],
      ['l', 'r', 'r', 'r', 'r', 'r', 'r'],
      report.learners.map((l) => {
        const s = l.summary[head];
        return [cell(l.spec), num(s?.mean), num(s?.sd), num(s?.median), num(s?.min), num(s?.max), interval(s)];
      }),
    ),
    '',
  );
  out.push(...comparisonSection(report));

  if (report.metrics.length > 1) {
    out.push('## All metrics: mean over folds (pooled out-of-fold in brackets)', '');
    out.push(
      table(
        ['learner', ...report.metrics],
        ['l', ...report.metrics.map(() => 'r' as const)],
        report.learners.map((l) => [cell(l.spec), ...report.metrics.map((m) => `${num(l.summary[m]?.mean)} (${num(l.pooled[m])})`)]),
      ),
      '',
    );
  }

  out.push(...sliceSection(report));

  if (report.learners.some((l) => l.final)) {
    out.push('## Holdout (scored once)', '');
    out.push(
      table(
        ['learner', ...report.metrics],
        ['l', ...report.metrics.map(() => 'r' as const)],
        report.learners.map((l) => [cell(l.spec), ...report.metrics.map((m) => num(l.final?.scores[m]))]),
      ),
      '',
    );
  }

  const folds = report.learners[0]?.folds ?? [];
  out.push(`## ${head} per fold`, '');
  out.push(
    table(
      ['repeat', 'fold', 'train', 'test', ...report.learners.map((l) => cell(l.spec))],
      ['r', 'r', 'r', 'r', ...report.learners.map(() => 'r' as const)],
      folds.map((f, i) => [
        String(f.repeat + 1),
        String(f.fold + 1),
        String(f.trainRows),
        String(f.testRows),
        ...report.learners.map((l) => (l.folds[i]?.failed ? 'failed' : num(l.folds[i]?.scores[head]))),
      ]),
    ),
    '',
  );

  out.push(...importanceSection(report));

  const best = bestLearner(report, higherIsBetter(head));
  const view = best && report.data.classes ? confusionView(best, report.data.classes) : undefined;
  if (best && view) {
    out.push(`## Confusion matrix of ${cell(best.spec)} (pooled over folds; rows actual, columns predicted)`, '');
    if (view.folded) out.push(foldedNote(view), '');
    out.push(
      table(
        ['actual \\ predicted', ...view.labels.map(cell)],
        ['l', ...view.labels.map(() => 'r' as const)],
        view.matrix.map((row, i) => [cell(view.labels[i]), ...row.map(String)]),
      ),
      '',
    );
  }

  out.push(...curvesSection(report, cell, num, table));
  out.push(...thresholdSection(report.threshold, report.learners, table));
  out.push(...auditSection(report.audit));
  if (report.warnings.length) {
    out.push('## Warnings', '', ...report.warnings.map((w) => `- ${cell(w)}`), '');
  }
  out.push(
    '_A cross-validated score estimates performance on data drawn like this data; it is not a guarantee. High-stakes uses need domain validation._',
    '',
  );
  return out.join('\n');
}
