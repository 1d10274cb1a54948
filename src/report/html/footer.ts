/**
 * The footer block of an eval report: the data fingerprint (path, SHA-256, rows, columns,
 * target, features, dropped columns), the plan (text, folds, repeats, stratification, group and
 * order columns, holdout), seed, imputation, tool and report format versions as a compact
 * definition list, then the quick audit's suspects ("Data audit") and the warnings. Every value
 * is escaped.
 */
import { esc } from './escape.js';
import type { Report, ReportAudit } from '../types.js';

const item = (term: string, value: string): string => `<div><dt>${esc(term)}</dt><dd>${value}</dd></div>`;

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

export function evalFooter(report: Report): string {
  const d = report.data;
  const p = report.plan;
  const task = d.task === 'classification' ? `classification, ${d.classes?.length ?? 0} classes: ${(d.classes ?? []).join(', ')}` : 'regression';
  const plan = [
    `${p.text} (${p.folds} folds${p.repeats > 1 ? ` × ${p.repeats} repeats` : ''})`,
    p.stratified ? 'stratified' : 'not stratified',
    p.group !== undefined ? `grouped by ${p.group}` : '',
    p.order !== undefined ? `ordered by ${p.order}` : '',
    p.holdoutRows !== undefined ? `holdout of ${p.holdoutRows} rows ${p.finalScored ? 'scored (--final)' : 'not scored'}` : '',
  ].filter(Boolean);
  const items = [
    item('data', `<code>${esc(d.path)}</code>`),
    item('SHA-256', `<code class="hash">${esc(d.sha256)}</code>`),
    item('rows', esc(`${d.rowsUsed} used of ${d.rows}${d.excludedRows ? ` (${d.excludedRows} left out for a missing target)` : ''}; ${d.columns} columns`)),
    item('target', esc(`${d.target} (${task})`)),
    item('features', esc(`${d.features.length}: ${d.features.join(', ')}`)),
    ...(d.dropped.length ? [item('dropped', esc(d.dropped.join(', ')))] : []),
    item('plan', esc(plan.join(', '))),
    item('seed', esc(String(p.seed))),
    item('imputation', esc(report.settings.impute)),
    item('metrics', esc(report.metrics.join(', '))),
    item('tool', esc(`${report.tool.name} ${report.tool.version}, report format ${report.schema}`)),
    ...(report.timing ? [item('time', esc(`${(report.timing.totalMs / 1000).toFixed(1)} s in all`))] : []),
  ];
  return ['<footer>', '<h2>Run details</h2>', `<dl class="facts">${items.join('')}</dl>`, auditBlock(report.audit), '<h3>Warnings</h3>', warningsBlock(report.warnings), '</footer>'].filter(Boolean).join('\n');
}
