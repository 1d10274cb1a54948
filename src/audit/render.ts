/**
 * The audit report as JSON (two-space indent, final newline) and as Markdown for people: what
 * was audited, the suspects with evidence and action, the recommendations, the target, one
 * compact table of every column, the single-feature scores, the clusters, and the warnings.
 */
import { cell } from '../markdown-text.js';
import type { AuditReport, ColumnProfile } from './types.js';
import { isoDate } from './wording.js';

export function renderAuditJson(report: AuditReport): string {
  return `${JSON.stringify(report, null, 2)}\n`;
}

function table(header: readonly string[], align: readonly ('l' | 'r')[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]): string => `| ${cells.join(' | ')} |`;
  return [line(header), line(align.map((a) => (a === 'l' ? ':--' : '--:'))), ...rows.map(line)].join('\n');
}

/** A number in at most 4 significant decimals, without trailing zeros; "–" when absent. */
function num(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  if (Number.isInteger(v)) return String(v);
  const a = Math.abs(v);
  const digits = a >= 1000 ? 1 : a >= 1 ? 3 : 4;
  return String(Number(v.toFixed(digits)));
}

function profileRow(c: ColumnProfile): string[] {
  const n = c.numeric;
  const show = (v: number | undefined): string => (v === undefined ? '–' : c.type === 'date' ? isoDate(v) : num(v));
  const top = c.levels
    ? c.levels.top.map((t) => `${cell(t.level)} (${t.count})`).join(', ') + (c.levels.otherRows > 0 ? `, other (${c.levels.otherRows})` : '')
    : '';
  return [
    cell(c.name),
    c.role,
    c.type,
    `${c.missing} (${(100 * c.missingShare).toFixed(1)}%)`,
    String(c.distinct),
    show(n?.min),
    show(n?.q1),
    show(n?.median),
    show(n?.mean),
    show(n?.q3),
    show(n?.max),
    c.type === 'date' ? (n?.sd == null ? '–' : `${num(n.sd)} d`) : num(n?.sd),
    top,
  ];
}

export function renderAuditMarkdown(report: AuditReport): string {
  const d = report.data;
  const p = report.plan;
  const out: string[] = [`# foldwise audit: ${cell(d.target)}`, ''];
  const task = d.task === 'classification' ? `classification into ${d.classes?.length ?? 0} classes` : 'regression';
  const extras = [p.stratified ? 'stratified' : 'not stratified', p.group ? `grouped by ${cell(p.group)}` : '', p.order ? `ordered by ${cell(p.order)}` : '']
    .filter(Boolean)
    .join(', ');
  out.push(
    `- Data: ${cell(d.path)}, ${d.rowsUsed} of ${d.rows} rows used${d.excludedRows ? `, ${d.excludedRows} left out for a missing target` : ''}; ${d.features.length} features; target ${cell(d.target)} (${task}); SHA-256 ${d.sha256.slice(0, 12)}`,
    `- Plan: ${p.text} (${p.folds} folds${p.repeats > 1 ? ` x ${p.repeats} repeats` : ''}), ${extras}; seed ${p.seed}`,
    '',
  );

  const counts = ['high', 'warn', 'note'].map((s) => `${report.suspects.filter((x) => x.severity === s).length} ${s}`).join(', ');
  out.push(`## Suspects (${report.suspects.length}: ${counts})`, '');
  if (report.suspects.length === 0) out.push('None found.', '');
  else {
    out.push(
      table(
        ['severity', 'kind', 'evidence', 'what to do'],
        ['l', 'l', 'l', 'l'],
        report.suspects.map((s) => [s.severity, s.kind, cell(s.evidence), cell(s.action)]),
      ),
      '',
    );
  }

  if (report.recommendations.length) {
    out.push('## Recommendations', '');
    for (const r of report.recommendations) out.push(`- ${cell(r.text)}`);
    out.push('');
  }

  out.push('## Target', '');
  const t = report.target;
  if (t.task === 'classification') {
    out.push(table(['class', 'rows', 'share'], ['l', 'r', 'r'], t.classes.map((c) => [cell(c.name), String(c.count), `${(100 * c.share).toFixed(1)}%`])), '');
    out.push(
      `Largest over smallest class: ${num(t.imbalanceRatio)}; the smallest, ${cell(t.smallest.name)}, has ${num(t.smallestPerTestFold)} rows per test fold on average over ${t.foldsPerRepeat} folds.`,
      '',
    );
  } else {
    const s = t.summary;
    out.push(
      table(['min', 'q1', 'median', 'mean', 'q3', 'max', 'sd', 'skewness'], ['r', 'r', 'r', 'r', 'r', 'r', 'r', 'r'], [
        [num(s.min), num(s.q1), num(s.median), num(s.mean), num(s.q3), num(s.max), num(s.sd), num(t.skewness)],
      ]),
      '',
    );
  }

  out.push('## Columns', '');
  out.push(
    table(
      ['column', 'role', 'type', 'missing', 'distinct', 'min', 'q1', 'median', 'mean', 'q3', 'max', 'sd', 'most frequent levels'],
      ['l', 'l', 'l', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'l'],
      report.columns.map(profileRow),
    ),
    '',
  );

  const sf = report.singleFeature;
  out.push(`## Single-feature scores (out of fold, ${sf.plan}, ${sf.metric})`, '');
  const ranked = [...sf.scores].sort((a, b) => (b.skill ?? -Infinity) - (a.skill ?? -Infinity));
  out.push(table(['feature', 'model', sf.metric, 'skill'], ['l', 'l', 'r', 'r'], ranked.map((s) => [cell(s.feature), s.model, num(s.score), num(s.skill)])), '');

  if (report.clusters.length) {
    out.push(`## Correlated clusters (threshold ${report.settings.clusterThreshold})`, '');
    out.push(
      table(
        ['kind', 'members', 'representative', 'linked pairs', 'association'],
        ['l', 'l', 'l', 'r', 'r'],
        report.clusters.map((c) => [c.kind, cell(c.members.join(', ')), cell(c.representative), String(c.links), `${num(c.minLink)} to ${num(c.maxLink)}`]),
      ),
      '',
    );
  }

  const dup = report.duplicates;
  out.push(
    '## Duplicates',
    '',
    `- Exact (features and target): ${dup.exactRows} rows in ${dup.exactSets} sets, ${dup.exactStraddling} tested while a copy trains.`,
    `- Conflicting (same features, other target): ${dup.conflictingRows} rows in ${dup.conflictingSets} sets, ${dup.conflictingStraddling} tested while a conflicting copy trains.`,
    '',
  );

  if (report.warnings.length) {
    out.push('## Warnings', '');
    for (const w of report.warnings) out.push(`- ${cell(w)}`);
    out.push('');
  }
  return out.join('\n');
}
