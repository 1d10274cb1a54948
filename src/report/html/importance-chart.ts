/**
 * The permutation-importance chart of one learner (eval --importance): one row per input, the
 * largest mean drop first; each fold's drop as a dot, the mean as a diamond with its corrected
 * 95% interval (Nadeau-Bengio, as in the report), and a solid line at zero drop, so an input
 * whose interval crosses the line is one the data do not show the model using. For forest and
 * boost a bar at the right gives the model's own importance share of each feature (impurity
 * decrease or split gain), beside the permutation drop it is often mistaken for.
 */
import { textWidth, xAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, intervalText, num, px, svgText } from './format.js';
import { BOX_FILL, BOX_STROKE, INK, INTERVAL, MUTED, POINT } from './palette.js';
import { linearScale } from './scale.js';
import { spread } from './summary-chart.js';
import type { LearnerReport, ReportImportance } from '../../model/report.js';

const ROW = 30;
const LABEL_CHARS = 32;
const OWN_WIDTH = 150;

export function importanceChart(imp: ReportImportance, l: LearnerReport, index: number): string | undefined {
  const li = l.importance;
  if (!li || li.inputs.length === 0) return undefined;
  const own = li.own;
  const ownOf = new Map(own?.features.map((f) => [f.name, f.mean]) ?? []);
  const rows = li.inputs
    .map((x, k) => ({ x, k, kind: imp.inputs[k]?.kind ?? 'feature' }))
    .sort((a, b) => (b.x.summary?.mean ?? -Infinity) - (a.x.summary?.mean ?? -Infinity) || a.k - b.k);
  const labelChars = Math.min(LABEL_CHARS, Math.max(6, ...rows.map((r) => Array.from(r.x.name).length)));
  const left = textWidth(labelChars, 13) + 16;
  const right = CHART_WIDTH - (own ? OWN_WIDTH + 30 : 24);
  const TOP = 30;
  const bottom = TOP + rows.length * ROW;
  const values: number[] = [0];
  for (const { x } of rows) {
    for (const v of x.folds) if (v !== null && Number.isFinite(v)) values.push(v);
    if (x.summary?.ci95) values.push(...x.summary.ci95);
  }
  const x = linearScale(Math.min(...values), Math.max(...values), left, right, 6);
  const body: string[] = [xAxis(x, TOP - 8, bottom, `drop of ${imp.metric} when shuffled (larger: used more)`)];
  body.push(`<line class="zero" x1="${px(x(0))}" x2="${px(x(0))}" y1="${TOP - 8}" y2="${bottom}" stroke="${INK}" stroke-width="1.5"/>`);
  const words: string[] = [];
  const ownMax = own ? Math.max(1e-12, ...own.features.map((f) => f.mean)) : 1;
  if (own) body.push(svgText(right + 30, TOP - 12, `own ${own.kind} share`, `font-size="13" fill="${MUTED}"`));
  rows.forEach(({ x: input, kind }, i) => {
    const cy = TOP + i * ROW + ROW / 2;
    const s = input.summary;
    const g: string[] = [`<g class="input" data-input="${esc(input.name)}"${s ? ` data-mean="${attrNum(s.mean)}"` : ''}>`];
    g.push(`<text x="${px(left - 10)}" y="${px(cy + 4)}" text-anchor="end" font-size="13" fill="${INK}"${kind === 'cluster' ? ' font-style="italic"' : ''}>${esc(clip(input.name, LABEL_CHARS))}<title>${esc(input.name)}</title></text>`);
    input.folds.forEach((v, k) => {
      if (v === null || !Number.isFinite(v)) return;
      g.push(`<circle class="fold" cx="${px(x(v))}" cy="${px(cy + spread(k) * 6)}" r="3" fill="${POINT}" fill-opacity="0.5" data-drop="${attrNum(v)}"/>`);
    });
    if (s?.ci95) {
      const [a, b] = s.ci95;
      g.push(`<line class="interval" x1="${px(x(a))}" x2="${px(x(b))}" y1="${cy}" y2="${cy}" stroke="${INTERVAL}" stroke-width="3" data-lo="${attrNum(a)}" data-hi="${attrNum(b)}"><title>${esc(`${input.name}: mean drop ${num(s.mean)}, corrected 95% interval ${intervalText(s.ci95)}`)}</title></line>`);
    }
    if (s) {
      const mx = x(s.mean);
      g.push(`<path d="M${px(mx)} ${cy - 6} L${px(mx + 6)} ${cy} L${px(mx)} ${cy + 6} L${px(mx - 6)} ${cy} Z" fill="${INTERVAL}" stroke="#ffffff" stroke-width="1"/>`);
    }
    words.push(`${input.name}: ${s ? `mean drop ${num(s.mean)}${s.ci95 ? `, interval ${intervalText(s.ci95)}` : ''}` : 'no defined drop'}${own && kind === 'feature' ? `, own share ${num(ownOf.get(input.name))}` : ''}.`);
    const share = ownOf.get(input.name);
    if (own && kind === 'feature' && share !== undefined) {
      const w = (share / ownMax) * (OWN_WIDTH - 50);
      g.push(`<rect class="own" x="${px(right + 30)}" y="${cy - 7}" width="${px(Math.max(0.5, w))}" height="14" fill="${BOX_FILL}" stroke="${BOX_STROKE}" data-share="${attrNum(share)}"/>`);
      g.push(svgText(right + 34 + w, cy + 4, num(share, 3), `font-size="12" fill="${MUTED}"`));
    }
    g.push('</g>');
    body.push(g.join('\n'));
  });
  return figure({
    id: `importance-${index + 1}`,
    width: CHART_WIDTH,
    height: bottom + 56,
    title: `Permutation importance for ${l.spec}`,
    desc: `Drop of ${imp.metric} on each fold's test rows when an input is shuffled, ${rows.length} inputs, largest first. ${words.join(' ')}`,
    caption: `Each dot is one fold's drop (mean over ${imp.repeats} shuffles), the diamond the mean with its corrected 95% interval; the model is not refitted. An interval crossing the zero line does not show use of the input.${own ? ` The bars are the model's own ${own.kind} shares, which favour features with many split points and split a shared signal between copies (Strobl et al. 2007); read them beside the drops, not instead.` : ''}`,
    body: body.join('\n'),
  });
}
