/**
 * The footer blocks of the HTML pages, as compact definition lists with every value escaped:
 * - eval: the data fingerprint (path, SHA-256, rows, columns, target, features, dropped
 *   columns), the plan (text, folds, repeats, stratification, group and order columns,
 *   holdout), seed, imputation, tool and report format versions;
 * - tune: the same data fingerprint, the outer and inner plans, seed, the search (specs,
 *   candidates, pick rule), imputation, metrics, tool and format versions;
 * then, for both, the quick audit's suspects ("Data audit") and the warnings.
 */
import { esc } from './escape.js';
import { foldCount } from '../../model/fold-label.js';
import type { DataSection, Report, ReportAudit, ReportCosts } from '../../model/report.js';
import type { TunePlanInfo, TuneReport } from '../../model/tune.js';

export const item = (term: string, value: string): string => `<div><dt>${esc(term)}</dt><dd>${value}</dd></div>`;

export function warningsBlock(warnings: readonly string[]): string {
  if (warnings.length === 0) return '<p class="no-warnings">No warnings.</p>';
  return `<ul class="warnings">${warnings.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>`;
}

/** The "Data audit" block: the quick audit's suspects, or that it found none or did not run; '' for a report without the field. */
export function auditBlock(audit: ReportAudit | undefined): string {
  if (!audit) return '';
  let body: string;
  if (!audit.ran) body = '<p class="no-audit">The quick audit did not run (--no-audit).</p>';
  else if (audit.suspects.length === 0) body = '<p class="no-suspects">The quick audit found no suspect of severity high or warn.</p>';
  else {
    const items = audit.suspects.map((s) => `<li>${esc(s)}</li>`).join('');
    const note = '<p class="note">High and warn findings of the quick audit run before the fits; <code>foldwise audit</code> gives the full report with its evidence and notes.</p>';
    body = `<ul class="warnings suspects">${items}</ul>${note}`;
  }
  return `<h3>Data audit</h3>\n${body}`;
}

/** The data fingerprint: path, SHA-256, rows and columns, target and task, features, dropped columns. */
export function dataItems(d: DataSection): string[] {
  const task = d.task === 'classification' ? `classification, ${d.classes?.length ?? 0} classes: ${(d.classes ?? []).join(', ')}` : 'regression';
  return [
    item('data', `<code>${esc(d.path)}</code>`),
    item('SHA-256', `<code class="hash">${esc(d.sha256)}</code>`),
    item('rows', esc(`${d.rowsUsed} used of ${d.rows}${d.excludedRows ? ` (${d.excludedRows} left out for a missing target)` : ''}; ${d.columns} columns`)),
    item('target', esc(`${d.target} (${task})`)),
    item('features', esc(`${d.features.length}: ${d.features.join(', ')}`)),
    ...(d.dropped.length ? [item('dropped', esc(d.dropped.join(', ')))] : []),
    ...(d.dates?.length ? [item('dates', esc(d.dates.map((x) => `${x.column} read as ${x.read}`).join('; ')))] : []),
  ];
}

const timeItem = (timing: { readonly totalMs: number } | undefined): string[] => (timing ? [item('time', esc(`${(timing.totalMs / 1000).toFixed(1)} s in all`))] : []);

/** The --costs matrix in one line: "actual by predicted (A, B): A 0, 1; B 5, 0; file SHA-256 ..." (eval, tune and growth pages). */
export function costsItem(costs: ReportCosts | undefined): string[] {
  if (!costs) return [];
  const rows = costs.matrix.map((row, a) => `${costs.classes[a]} ${row.join(', ')}`).join('; ');
  return [item('cost matrix', esc(`actual by predicted (${costs.classes.join(', ')}): ${rows}; file SHA-256 ${costs.sha256.slice(0, 12)}`))];
}

function footer(items: readonly string[], audit: ReportAudit | undefined, warnings: readonly string[]): string {
  return ['<footer>', '<h2>Run details</h2>', `<dl class="facts">${items.join('')}</dl>`, auditBlock(audit), '<h3>Warnings</h3>', warningsBlock(warnings), '</footer>']
    .filter(Boolean)
    .join('\n');
}

export function evalFooter(report: Report): string {
  const p = report.plan;
  const plan = [
    `${p.text} (${foldCount(p)}${p.repeats > 1 ? ` × ${p.repeats} repeats` : ''})`,
    p.stratified ? 'stratified' : 'not stratified',
    p.group !== undefined ? `grouped by ${p.group}` : '',
    p.order !== undefined ? `ordered by ${p.order}` : '',
    p.holdoutRows !== undefined ? `holdout of ${p.holdoutRows} rows ${p.finalScored ? 'scored (--final)' : 'not scored'}` : '',
  ].filter(Boolean);
  const items = [
    ...dataItems(report.data),
    item('plan', esc(plan.join(', '))),
    item('seed', esc(String(p.seed))),
    item('imputation', esc(report.settings.impute)),
    ...costsItem(report.settings.costs),
    item('metrics', esc(report.metrics.join(', '))),
    item('tool', esc(`${report.tool.name} ${report.tool.version}, report format ${report.schema}`)),
    ...timeItem(report.timing),
  ];
  return footer(items, report.audit, report.warnings);
}

const planText = (p: TunePlanInfo): string => `${p.text} (${p.folds} folds${p.repeats > 1 ? ` × ${p.repeats} repeats` : ''}, ${p.stratified ? 'stratified' : 'not stratified'})`;

export function tuneFooter(report: TuneReport): string {
  const p = report.plan;
  const s = report.search;
  const extras = [p.group !== undefined ? `grouped by ${p.group}` : '', p.order !== undefined ? `ordered by ${p.order}` : ''].filter(Boolean);
  const holdout = p.holdout
    ? `${p.holdout.rows} rows set aside before any selection (${p.holdout.from === 'option' ? `--holdout ${p.holdout.fraction ?? ''}` : 'the holdout part of the outer plan'})`
    : '';
  const tried = s.sampled ? `${s.tried} sampled from ${s.gridSize === null ? 'an unbounded space' : `a grid of ${s.gridSize}`}` : `the whole grid of ${s.tried}`;
  const items = [
    ...dataItems(report.data),
    item('outer plan', esc([planText(p.outer), ...extras].join(', '))),
    item('inner plan', esc(`${planText(p.inner)}, on each outer fold's training rows`)),
    item('search rows', esc(`${p.searchRows}${holdout ? `; ${holdout}` : ''}`)),
    item('seed', esc(String(p.seed))),
    item('search', esc(`${tried} candidates from ${s.specs.join('  ')}; ${s.fits} fits (a plain loop would run ${s.plainLoopFits})`)),
    item('pick rule', esc(`${report.selection.rule} on ${report.selection.metric} (${report.selection.higherIsBetter ? 'higher' : 'lower'} is better)`)),
    item('imputation', esc(report.settings.impute)),
    ...costsItem(report.settings.costs),
    item('metrics', esc(report.metrics.join(', '))),
    item('tool', esc(`${report.tool.name} ${report.tool.version}, report format ${report.schema}`)),
    ...timeItem(report.timing),
  ];
  return footer(items, report.audit, report.warnings);
}
