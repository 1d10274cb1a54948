/**
 * The HTML page of an audit report (format foldwise-audit/2, `foldwise audit --json`, through
 * `foldwise render`): the suspects with their evidence and what to do, the recommendations,
 * the single-feature skill chart (each feature alone, out of fold: a feature near 1 predicts the
 * target by itself), the target, every column's profile, the correlated clusters and the
 * duplicates, and the data fingerprint, plan and warnings in the footer. The same content as the
 * Markdown audit (src/audit/render.ts); every value from the data is escaped (escape.ts).
 */
import { textWidth, xAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { dataItems, item, warningsBlock } from './footer.js';
import { attrNum, num, px, svgText } from './format.js';
import { page } from './page.js';
import { BOX_FILL, BOX_STROKE, FAIL, INK, MUTED } from './palette.js';
import { linearScale } from './scale.js';
import { AUDIT_LIMITS, type AuditReport, type ColumnProfile, type FeatureScore } from '../../audit/types.js';
import { isoDate } from '../../audit/wording.js';

const ROW = 24;
const LABEL_CHARS = 32;

const th = (cells: readonly string[]): string => `<thead><tr>${cells.map((c) => `<th scope="col">${esc(c)}</th>`).join('')}</tr></thead>`;
/** A table row: the first cell is a row header; cells are escaped markup already. */
const tr = (cells: readonly string[]): string => `<tr><th scope="row">${cells[0]}</th>${cells.slice(1).map((c) => `<td>${c}</td>`).join('')}</tr>`;

/** A number in at most 4 significant decimals, as in the Markdown audit; "–" when absent. */
function short(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  if (Number.isInteger(v)) return String(v);
  const a = Math.abs(v);
  return String(Number(v.toFixed(a >= 1000 ? 1 : a >= 1 ? 3 : 4))).replace('-', '−');
}

/** The single-feature skill of every scored feature, best first: a bar from 0, the value as text. */
function skillChart(report: AuditReport): string | undefined {
  const sf = report.singleFeature;
  const rows = sf.scores
    .map((s, k) => ({ s, k }))
    .sort((a, b) => (b.s.skill ?? -Infinity) - (a.s.skill ?? -Infinity) || a.k - b.k)
    .map((r) => r.s);
  if (rows.length === 0) return undefined;
  const skills = rows.map((s) => s.skill).filter((v): v is number => v !== null && Number.isFinite(v));
  const labelChars = Math.min(LABEL_CHARS, Math.max(6, ...rows.map((r) => Array.from(r.feature).length)));
  const left = textWidth(labelChars, 13) + 16;
  const right = CHART_WIDTH - 70;
  const TOP = 14;
  const bottom = TOP + rows.length * ROW;
  const x = linearScale(Math.min(0, ...skills), Math.max(1, ...skills), left, right, 5);
  const body: string[] = [xAxis(x, TOP - 6, bottom, 'skill alone (0 = chance, 1 = perfect)')];
  body.push(`<line class="zero" x1="${px(x(0))}" x2="${px(x(0))}" y1="${TOP - 6}" y2="${bottom}" stroke="${INK}" stroke-width="1.5"/>`);
  const words: string[] = [];
  rows.forEach((s: FeatureScore, i) => {
    const cy = TOP + i * ROW + ROW / 2;
    const g: string[] = [`<g class="feature" data-feature="${esc(s.feature)}"${s.skill !== null ? ` data-skill="${attrNum(s.skill)}"` : ''}>`];
    g.push(`<text x="${px(left - 10)}" y="${px(cy + 4)}" text-anchor="end" font-size="13" fill="${INK}">${esc(clip(s.feature, LABEL_CHARS))}<title>${esc(s.feature)}</title></text>`);
    if (s.skill !== null && Number.isFinite(s.skill)) {
      const a = x(Math.min(0, s.skill));
      const b = x(Math.max(0, s.skill));
      const near = s.skill >= AUDIT_LIMITS.nearPerfectSkill;
      g.push(`<rect x="${px(a)}" y="${px(cy - 7)}" width="${px(Math.max(0.5, b - a))}" height="14" fill="${near ? FAIL : BOX_FILL}" stroke="${near ? FAIL : BOX_STROKE}"/>`);
      g.push(svgText(b + 6, cy + 4, short(s.skill), `font-size="12" fill="${MUTED}"`));
    } else g.push(svgText(x(0) + 6, cy + 4, 'no score', `font-size="12" fill="${MUTED}"`));
    g.push('</g>');
    body.push(g.join('\n'));
    words.push(`${s.feature}: skill ${short(s.skill)} (${s.model}, ${sf.metric} ${short(s.score)}).`);
  });
  return figure({
    id: 'single-feature',
    width: CHART_WIDTH,
    height: bottom + 56,
    title: 'Each feature alone, out of fold',
    desc: `Skill of a model that sees one feature only, cross-validated with ${sf.plan} on ${sf.metric}, ${rows.length} features, best first. ${words.join(' ')}`,
    caption: `A one-feature model per feature (a small tree for numbers, a level table for categories), scored out of fold with ${sf.plan}; skill rescales ${sf.metric} so that 0 is chance and 1 perfect. Bars at or above ${AUDIT_LIMITS.nearPerfectSkill} are drawn dark: a feature that alone predicts the target that well is often a copy of it.`,
    body: body.join('\n'),
  });
}

function columnCells(c: ColumnProfile): string[] {
  const n = c.numeric;
  const show = (v: number | undefined): string => (v === undefined ? '–' : c.type === 'date' ? isoDate(v) : short(v));
  const top = c.levels ? c.levels.top.map((t) => `${t.level} (${t.count})`).join(', ') + (c.levels.otherRows > 0 ? `, other (${c.levels.otherRows})` : '') : '';
  return [
    c.name,
    c.role,
    c.type,
    `${c.missing} (${(100 * c.missingShare).toFixed(1)}%)`,
    String(c.distinct),
    show(n?.min),
    show(n?.median),
    show(n?.mean),
    show(n?.max),
    c.type === 'date' ? (n?.sd == null ? '–' : `${short(n.sd)} d`) : short(n?.sd),
    top,
  ].map(esc);
}

function targetSection(report: AuditReport): string[] {
  const t = report.target;
  const out = ['<section><h2>Target</h2>'];
  if (t.task === 'classification') {
    out.push(
      '<table class="classes">',
      th(['class', 'rows', 'share']),
      '<tbody>',
      ...t.classes.map((c) => tr([esc(c.name), String(c.count), `${(100 * c.share).toFixed(1)}%`])),
      '</tbody></table>',
      `<p>${esc(`Largest over smallest class: ${short(t.imbalanceRatio)}; the smallest, ${t.smallest.name}, has ${short(t.smallestPerTestFold)} rows per test fold on average over ${t.foldsPerRepeat} folds.`)}</p>`,
    );
  } else {
    const s = t.summary;
    out.push(
      '<table class="target-summary">',
      th(['min', 'q1', 'median', 'mean', 'q3', 'max', 'sd', 'skewness']),
      `<tbody><tr>${[s.min, s.q1, s.median, s.mean, s.q3, s.max, s.sd, t.skewness].map((v) => `<td>${esc(short(v))}</td>`).join('')}</tr></tbody></table>`,
    );
  }
  out.push('</section>');
  return out;
}

export function renderAuditHtml(report: AuditReport): string {
  const d = report.data;
  const p = report.plan;
  const counts = (['high', 'warn', 'note'] as const).map((s) => `${report.suspects.filter((x) => x.severity === s).length} ${s}`).join(', ');
  const task = d.task === 'classification' ? `classification into ${d.classes?.length ?? 0} classes` : 'regression';
  const plan = [
    `${p.text} (${p.folds} folds${p.repeats > 1 ? ` × ${p.repeats} repeats` : ''})`,
    p.stratified ? 'stratified' : 'not stratified',
    p.group !== undefined ? `grouped by ${p.group}` : '',
    p.order !== undefined ? `ordered by ${p.order}` : '',
  ].filter(Boolean);
  const high = report.suspects.some((s) => s.severity === 'high');
  const parts: string[] = [
    '<header>',
    `<h1>${esc(`Audit of ${d.target}`)}</h1>`,
    `<p>${esc(`${d.path}: ${d.rowsUsed} of ${d.rows} rows used, ${d.features.length} features, ${task}; plan ${p.text}`)}</p>`,
    `<p class="lead${high ? ' failed' : ''}">${esc(report.suspects.length === 0 ? 'No suspects found.' : `${report.suspects.length} suspects: ${counts}.`)}</p>`,
    '</header>',
    '<section><h2>Suspects</h2>',
  ];
  if (report.suspects.length === 0) parts.push('<p class="no-suspects">None found.</p>');
  else {
    parts.push(
      '<table class="suspects">',
      th(['severity', 'kind', 'evidence', 'what to do']),
      '<tbody>',
      ...report.suspects.map(
        (s) => `<tr class="${s.severity}"><th scope="row">${esc(s.severity)}</th><td class="text">${esc(s.kind)}</td><td class="text">${esc(s.evidence)}</td><td class="text">${esc(s.action)}</td></tr>`,
      ),
      '</tbody></table>',
    );
  }
  parts.push('</section>');
  if (report.recommendations.length) {
    parts.push('<section><h2>Recommendations</h2>', `<ol class="recommendations">${report.recommendations.map((r) => `<li>${esc(r.text)}</li>`).join('')}</ol>`, '</section>');
  }
  const chart = skillChart(report);
  parts.push('<section><h2>Each feature alone</h2>', chart ?? '<p class="note">No feature was scored.</p>', '</section>');
  parts.push(...targetSection(report));
  parts.push(
    '<section><h2>Columns</h2>',
    '<table class="columns">',
    th(['column', 'role', 'type', 'missing', 'distinct', 'min', 'median', 'mean', 'max', 'sd', 'most frequent levels']),
    '<tbody>',
    ...report.columns.map((c) => tr(columnCells(c))),
    '</tbody></table>',
    '</section>',
  );
  if (report.clusters.length) {
    parts.push(
      `<section><h2>${esc(`Correlated clusters (threshold ${report.settings.clusterThreshold})`)}</h2>`,
      '<table class="clusters">',
      th(['kind', 'members', 'representative', 'linked pairs', 'association']),
      '<tbody>',
      ...report.clusters.map((c) => tr([esc(c.kind), esc(c.members.join(', ')), esc(c.representative), String(c.links), esc(`${short(c.minLink)} to ${short(c.maxLink)}`)])),
      '</tbody></table>',
      '</section>',
    );
  }
  const dup = report.duplicates;
  parts.push(
    '<section><h2>Duplicates</h2><ul class="duplicates">',
    `<li>${esc(`Exact (features and target): ${dup.exactRows} rows in ${dup.exactSets} sets, ${dup.exactStraddling} tested while a copy trains.`)}</li>`,
    `<li>${esc(`Conflicting (same features, other target): ${dup.conflictingRows} rows in ${dup.conflictingSets} sets, ${dup.conflictingStraddling} tested while a conflicting copy trains.`)}</li>`,
    '</ul></section>',
  );
  const items = [
    ...dataItems(d),
    item('plan', esc(plan.join(', '))),
    item('seed', esc(String(p.seed))),
    item('clusters', esc(`|r| or Cramer's V at or above ${report.settings.clusterThreshold}`)),
    ...(report.sample ? [item('sample', esc(`scored checks on ${report.sample.rows} of ${report.sample.of} rows (${report.sample.how}, seed ${report.sample.seed})`))] : []),
    item('tool', esc(`${report.tool.name} ${report.tool.version}, report format ${report.schema}`)),
  ];
  parts.push('<footer>', '<h2>Run details</h2>', `<dl class="facts">${items.join('')}</dl>`, '<h3>Warnings</h3>', warningsBlock(report.warnings), '</footer>');
  return page(`foldwise audit: ${d.target}`, parts.join('\n'), AUDIT_STYLE);
}

/** Text cells read left-aligned; a high finding's row is marked at its left edge. */
const AUDIT_STYLE = `
table.suspects td.text,table.columns td:last-child,table.clusters td{text-align:left}
table.suspects tr.high th{border-left:4px solid ${FAIL}}
ol.recommendations li{margin:2px 0}
`;
