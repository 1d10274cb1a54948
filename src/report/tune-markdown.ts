/**
 * The Markdown report of `foldwise tune`, for people. Order: what was run; the outer (nested)
 * estimate's summary first, since that is the number to quote; the recommendation to deploy,
 * with how stable the picks were; the holdout if scored; the pick of every outer fold; then the
 * grid as one compact table sorted by inner mean on all search rows (best first), with the
 * recommended candidate marked; the quick audit's suspects and the warnings last. Numbers have
 * four decimals.
 */
import { deployThresholdText, thresholdSection } from './threshold-markdown.js';
import { auditSection, cell, code, inline, num } from './markdown.js';
import { costsSection } from './costs-markdown.js';
import type { TuneCandidate, TuneReport } from '../model/tune.js';

/** What the --threshold section adds in tune (the rule is eval's, applied to each outer fold's pick). */
export const TUNE_THRESHOLD_NOTE = ' In tune the threshold is that of the candidate each outer fold picked, refitted on the inner training parts after the pick; the figures are those of the tuned procedure on the outer test rows.';

function table(header: readonly string[], align: readonly ('l' | 'r')[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]): string => `| ${cells.join(' | ')} |`;
  return [line(header), line(align.map((a) => (a === 'l' ? ':--' : '--:'))), ...rows.map(line)].join('\n');
}

function plural(n: number, noun: string): string {
  return `${n} ${noun}${n === 1 ? '' : 's'}`;
}

/** Candidates by inner mean on all search rows, best first; undefined means last; ties by id. */
export function sortedCandidates(report: TuneReport): TuneCandidate[] {
  const sign = report.selection.higherIsBetter ? -1 : 1;
  return [...report.candidates].sort((a, b) => {
    if (a.all.mean === null || b.all.mean === null) return a.all.mean === null ? (b.all.mean === null ? a.id - b.id : 1) : -1;
    return sign * (a.all.mean - b.all.mean) || a.id - b.id;
  });
}

function describe(r: TuneReport): string[] {
  const d = r.data;
  const p = r.plan;
  const s = r.search;
  const task = d.task === 'classification' ? `classification into ${d.classes?.length ?? 0} classes` : 'regression';
  const excluded = d.excludedRows ? `, ${d.excludedRows} left out for a missing target` : '';
  const size = s.sampled
    ? `${s.tried} sampled at random from ${s.gridSize === null ? 'an unbounded space' : `a grid of ${s.gridSize}`}`
    : `the whole grid of ${s.tried}`;
  const plan = (x: TuneReport['plan']['outer']): string => `${x.text} (${x.stratified ? 'stratified' : 'not stratified'})`;
  const extras = [p.group ? `grouped by ${inline(p.group)}` : '', p.order ? `ordered by ${inline(p.order)}` : ''].filter(Boolean).join(', ');
  return [
    `- Data: ${inline(d.path)}, ${d.rowsUsed} of ${d.rows} rows used${excluded}; ${d.features.length} features; target ${inline(d.target)} (${task}); SHA-256 ${d.sha256.slice(0, 12)}`,
    `- Search: ${size} candidates from ${s.specs.map(code).join(', ')}; pick rule ${r.selection.rule} on ${r.selection.metric} (${r.selection.higherIsBetter ? 'higher' : 'lower'} is better)`,
    `- Plans: outer ${plan(p.outer)}, inner ${plan(p.inner)} on each outer fold's training rows${extras ? `; ${extras}` : ''}; seed ${p.seed}`,
    ...(p.holdout
      ? [`- Holdout: ${p.holdout.rows} rows set aside before any selection (${p.holdout.from === 'option' ? `--holdout ${p.holdout.fraction}` : 'the holdout part of the plan'}), scored once below`]
      : []),
    `- Work: ${plural(s.fits, 'fit')} and neighbour searches, where a plain loop over candidates would run ${s.plainLoopFits}`,
  ];
}

function interval(ci: readonly [number, number] | null | undefined): string {
  return ci ? `${num(ci[0])} to ${num(ci[1])}` : '–';
}

export function renderTuneMarkdown(r: TuneReport): string {
  const head = r.selection.metric;
  const out: string[] = [`# foldwise tune: ${inline(r.data.target)}`, '', ...describe(r), '', ...costsSection(r.settings.costs)];

  out.push('## Outer estimate (nested: quote this)', '');
  out.push(
    table(
      ['metric', 'mean', 'sd', 'median', 'min', 'q1', 'q3', 'max', '95% interval (corrected)', 'pooled'],
      ['l', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r'],
      r.metrics.map((m) => {
        const s = r.outer.summary[m];
        return [m === head ? `${m} (headline)` : m, num(s?.mean), num(s?.sd), num(s?.median), num(s?.min), num(s?.q1), num(s?.q3), num(s?.max), interval(s?.ci95), num(r.outer.pooled[m])];
      }),
    ),
    '',
  );

  const cmp = r.comparisons?.pairs[0];
  if (cmp) {
    const ci = cmp.ci95 ? `${num(cmp.ci95[0])} to ${num(cmp.ci95[1])}` : '–';
    out.push(
      `Tuned against the baseline on the same outer folds (${head}, tuned minus baseline, paired): ${num(cmp.diff)} (95% corrected interval ${ci}), corrected t ${cmp.t === null ? '–' : cmp.t.toFixed(2)}, p ${num(cmp.p)}; won ${cmp.wins}, tied ${cmp.ties}, lost ${cmp.losses} of ${cmp.folds} folds.`,
      '',
    );
  }

  const rec = r.recommendation;
  const top = r.stability.winners[0];
  const folds = r.outer.folds.length;
  out.push('## Recommendation (deploy this)', '');
  out.push(`- **${inline(rec.spec)}**, picked by the inner plan on all ${r.plan.searchRows} search rows: inner ${head} ${num(rec.innerMean)} (sd ${num(rec.innerSd)}). This inner figure is optimistic (it is the winner of the search); quote the outer estimate above.`);
  if (r.threshold && rec.threshold) out.push(`- ${deployThresholdText(r.threshold, rec.threshold, inline)}`);
  if (rec.best !== rec.id) out.push(`- Best inner mean: ${inline(rec.bestSpec)} at ${num(rec.bestInnerMean)}; the one-standard-error rule took the simpler candidate above.`);
  out.push(
    `- Stability: the outer folds made ${plural(r.stability.distinct, 'distinct pick')}; the most frequent, ${inline(top.spec)}, won ${top.folds} of ${folds} (${(100 * r.stability.topShare).toFixed(0)}%)${rec.id === top.id ? ', and it is the recommendation' : ', which is not the recommendation'}.`,
    '',
  );

  if (r.holdout) {
    out.push(`## Holdout (scored once, ${inline(r.holdout.spec)} fitted on ${r.holdout.trainRows} rows, ${r.holdout.testRows} held out)`, '');
    out.push(table(r.metrics.map((m) => m), r.metrics.map(() => 'r' as const), [r.metrics.map((m) => num(r.holdout!.scores[m]))]), '');
  }

  const repeated = r.plan.outer.repeats > 1;
  out.push('## Picks per outer fold', '');
  out.push(
    table(
      ['outer fold', 'train', 'test', 'pick', `inner ${head}`, 'inner sd', `outer ${head}`],
      ['r', 'r', 'r', 'l', 'r', 'r', 'r'],
      r.outer.folds.map((f) => [
        repeated ? `${f.repeat + 1}.${f.fold + 1}` : String(f.fold + 1),
        String(f.trainRows),
        String(f.testRows),
        cell(f.pickSpec) + (f.best !== f.pick ? ' (one-se)' : ''),
        num(f.innerMean),
        num(f.innerSd),
        num(f.scores[head]),
      ]),
    ),
    '',
  );

  out.push(...thresholdSection(r.threshold, r.outer.threshold ? [{ spec: 'tuned', threshold: r.outer.threshold }] : [], table, TUNE_THRESHOLD_NOTE));

  out.push(`## Grid: inner ${head} on all search rows, best first (→ recommended${rec.best !== rec.id ? ', ● best mean' : ''})`, '');
  out.push(
    table(
      ['', 'candidate', 'inner mean', 'inner sd', 'outer wins'],
      ['l', 'l', 'r', 'r', 'r'],
      sortedCandidates(r).map((c) => [
        c.id === rec.id ? '→' : c.id === rec.best ? '●' : '',
        c.id === rec.id ? `**${cell(c.spec)}**` : cell(c.spec),
        num(c.all.mean),
        num(c.all.sd),
        String(c.wins),
      ]),
    ),
    '',
  );

  out.push(...auditSection(r.audit));
  if (r.warnings.length) {
    out.push('## Warnings', '', ...r.warnings.map((w) => `- ${inline(w)}`), '');
  }
  return `${out.join('\n')}`;
}
