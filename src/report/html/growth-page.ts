/**
 * The HTML page of a growth report: one panel per learner, training rows on a log scale across,
 * the score up; the test curve (mean over folds) with its corrected 95% band and the training
 * curve with its band, so the gap between them is visible at every size.
 */
import { xAxis, yAxis, yAxisWidth } from './axis.js';
import { esc } from './escape.js';
import { costsItem } from './footer.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, num, px, svgText } from './format.js';
import { page } from './page.js';
import { INTERVAL, MUTED, SERIES } from './palette.js';
import { linearScale } from './scale.js';
import type { GrowthLearner, GrowthReport } from '../../growth/growth.js';

const HEIGHT = 300;

function panel(r: GrowthReport, l: GrowthLearner, index: number): string {
  const pts = l.points.filter((p) => p.test || p.train);
  const values: number[] = [];
  for (const p of pts) for (const s of [p.test, p.train]) if (s) values.push(s.mean, ...(s.ci95 ?? []));
  const finite = values.filter(Number.isFinite);
  const y = linearScale(finite.length ? Math.min(...finite) : 0, finite.length ? Math.max(...finite) : 1, HEIGHT - 50, 20, 6);
  const left = yAxisWidth(y) + 10;
  const right = CHART_WIDTH - 150;
  const logs = pts.map((p) => Math.log10(p.rows));
  const x = linearScale(Math.min(...logs), Math.max(...logs), left, right, 6);
  const body: string[] = [yAxis(y, left, right, r.metric), xAxis(x, 20, HEIGHT - 50, 'training rows (log scale)', (t) => String(Math.round(10 ** t)))];
  const series = [
    { key: 'test' as const, colour: SERIES[0], label: 'test (outer folds)' },
    { key: 'train' as const, colour: SERIES[1], label: 'training rows' },
  ];
  series.forEach((s, si) => {
    const with_ = pts.filter((p) => p[s.key]);
    const banded = with_.filter((p) => p[s.key]!.ci95);
    if (banded.length >= 2) {
      const upper = banded.map((p) => `${px(x(Math.log10(p.rows)))} ${px(y(Math.min(y.domain[1], p[s.key]!.ci95![1])))}`);
      const lower = banded.map((p) => `${px(x(Math.log10(p.rows)))} ${px(y(Math.max(y.domain[0], p[s.key]!.ci95![0])))}`).reverse();
      body.push(`<path class="band" d="M${[...upper, ...lower].join(' L')} Z" fill="${s.colour}" fill-opacity="0.18" stroke="none"/>`);
    }
    if (with_.length) body.push(`<path class="curve" data-series="${s.key}" d="M${with_.map((p) => `${px(x(Math.log10(p.rows)))} ${px(y(p[s.key]!.mean))}`).join(' L')}" fill="none" stroke="${s.colour}" stroke-width="2.5"/>`);
    for (const p of with_) {
      body.push(`<circle cx="${px(x(Math.log10(p.rows)))}" cy="${px(y(p[s.key]!.mean))}" r="3.5" fill="${s.colour}" data-rows="${attrNum(p.rows)}" data-mean="${attrNum(p[s.key]!.mean)}"><title>${esc(`${s.label}, ${p.rows.toFixed(0)} rows: ${num(p[s.key]!.mean)}`)}</title></circle>`);
    }
    body.push(`<line x1="${px(right + 16)}" x2="${px(right + 36)}" y1="${30 + si * 22}" y2="${30 + si * 22}" stroke="${s.colour}" stroke-width="2.5"/>`, svgText(right + 42, 34 + si * 22, s.label, `font-size="13" fill="${MUTED}"`));
  });
  const fitText = l.doubling ? `doubling to ${l.doubling.rows.toFixed(0)} rows: ${num(l.doubling.gain)}` : 'no curve fitted';
  body.push(svgText(right + 16, 90, fitText, `font-size="12" fill="${INTERVAL}"`));
  return figure({
    id: `growth-${index + 1}`,
    width: CHART_WIDTH,
    height: HEIGHT,
    title: `Learning curve of ${l.spec}`,
    desc: `${r.metric} of ${l.spec} on the outer test rows and on its own training rows at ${pts.length} training sizes. ${pts.map((p) => `${p.rows.toFixed(0)} rows: test ${num(p.test?.mean)}, training ${num(p.train?.mean)}.`).join(' ')}`,
    caption: `Lines are means over the folds, bands the corrected 95% intervals (clipped to the axis). ${fitText}${l.flatFrom !== null ? `; flat within noise from size ${l.flatFrom}` : ''}.`,
    body: body.join('\n'),
  });
}

export function renderGrowthHtml(r: GrowthReport): string {
  const parts = [`<header><h1>${esc(`Learning curves for ${r.data.target}`)}</h1><p>${esc(`${r.data.path}: ${r.data.rowsUsed} rows; plan ${r.plan.text}, seed ${r.plan.seed}; ${r.metric}, ${r.higherIsBetter ? 'higher' : 'lower'} is better`)}</p></header>`];
  r.learners.forEach((l, i) => parts.push(`<section><h2>${esc(l.spec)}</h2>`, panel(r, l, i), '</section>'));
  if (r.warnings.length) parts.push('<section><h2>Warnings</h2><ul>', ...r.warnings.map((w) => `<li>${esc(w)}</li>`), '</ul></section>');
  // the matrix the metric scored with, in the line eval's and tune's run details give
  if (r.settings?.costs) parts.push('<footer>', '<h2>Run details</h2>', `<dl class="facts">${costsItem(r.settings.costs).join('')}</dl>`, '</footer>');
  return page(`foldwise growth: ${r.data.target} in ${r.data.path}`, parts.join('\n'));
}
