/**
 * The slice chart, one per --slice column: a row per slice level, and in it each learner's mean
 * of the headline metric over the folds scored in the slice (a dot, in the learner's colour)
 * with its corrected 95% interval (a line; src/slices/slice-report.ts says which sizes the
 * correction uses). A level with no scored fold says so in words instead of a mark. The
 * learners' colours follow the series palette, in report order, with a legend above.
 */
import { textWidth, xAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, intervalText, metricLabel, num, px, svgText } from './format.js';
import { INK, MUTED, SERIES } from './palette.js';
import { linearScale } from './scale.js';
import type { Report, SliceReport } from '../../model/report.js';

const ROW_GAP = 10;
const LANE = 12;
const LABEL_CHARS = 30;

function oneChart(report: Report, s: SliceReport, index: number, higherIsBetter: boolean | undefined): string {
  const metric = report.metrics[0];
  const learners = report.learners.map((l) => l.spec);
  const left = Math.max(120, textWidth(Math.min(LABEL_CHARS, Math.max(8, ...s.levels.map((l) => Array.from(l.level).length))), 14) + 20);
  const right = CHART_WIDTH - 28;
  const legendRows = Math.ceil(learners.length / 4);
  const top = 20 + legendRows * 22 + 20;
  const rowH = learners.length * LANE + ROW_GAP;
  const bottom = top + s.levels.length * rowH;
  const values: number[] = [];
  for (const lv of s.levels) for (const l of lv.learners) {
    const sm = l.summary[metric];
    if (sm) values.push(sm.mean, ...(sm.ci95 ?? []));
  }
  const finite = values.filter(Number.isFinite);
  const x = linearScale(finite.length ? Math.min(...finite) : 0, finite.length ? Math.max(...finite) : 1, left, right, 8);
  const body: string[] = [];
  learners.forEach((spec, i) => {
    const lx = (i % 4) * (CHART_WIDTH / 4);
    const ly = 20 + Math.floor(i / 4) * 22;
    body.push(`<g class="legend"><circle cx="${px(lx + 8)}" cy="${px(ly)}" r="5" fill="${SERIES[i % SERIES.length]}"/>${svgText(lx + 20, ly + 5, clip(spec, 28), `font-size="13" fill="${INK}"`)}</g>`);
  });
  body.push(xAxis(x, top - 6, bottom, metricLabel(metric, report.data.target, higherIsBetter)));
  const words: string[] = [];
  s.levels.forEach((lv, r) => {
    const y0 = top + r * rowH;
    body.push(`<text x="${px(left - 12)}" y="${px(y0 + rowH / 2)}" text-anchor="end" font-size="14" fill="${INK}">${esc(clip(lv.level, LABEL_CHARS))}<title>${esc(`${lv.level}: ${lv.rows} rows, ${lv.scoredFolds} folds scored`)}</title></text>`);
    if (lv.scoredFolds === 0) {
      body.push(svgText(left + 8, y0 + rowH / 2, `too few rows (fewer than ${s.minRows} test rows in every fold)`, `font-size="13" fill="${MUTED}"`));
      words.push(`${lv.level}: not scored, too few rows.`);
      return;
    }
    lv.learners.forEach((l, i) => {
      const sm = l.summary[metric];
      if (!sm) return;
      const cy = y0 + i * LANE + LANE / 2;
      const colour = SERIES[i % SERIES.length];
      const g = [`<g class="slice-mark" data-level="${esc(lv.level)}" data-learner="${esc(l.spec)}" data-mean="${attrNum(sm.mean)}">`];
      if (sm.ci95) g.push(`<line x1="${px(x(sm.ci95[0]))}" x2="${px(x(sm.ci95[1]))}" y1="${px(cy)}" y2="${px(cy)}" stroke="${colour}" stroke-width="2"/>`);
      g.push(`<circle cx="${px(x(sm.mean))}" cy="${px(cy)}" r="4" fill="${colour}"><title>${esc(`${l.spec} on ${lv.level}: mean ${num(sm.mean)}, interval ${intervalText(sm.ci95)}`)}</title></circle>`, '</g>');
      body.push(g.join(''));
      words.push(`${lv.level}, ${l.spec}: ${num(sm.mean)} (${intervalText(sm.ci95)}).`);
    });
  });
  return figure({
    id: `slice-chart-${index + 1}`,
    width: CHART_WIDTH,
    height: bottom + 52,
    title: `${metric} by ${s.column}`,
    desc: `Mean ${metric} per level of ${s.column}, per learner, with corrected 95% intervals. ${words.join(' ')}`,
    caption: `${metric} by ${s.column}${s.kind === 'bins' ? ' (quantile bins fixed on all rows)' : ''}: mean over the folds with at least ${s.minRows} test rows in the slice, line = corrected 95% interval (whole-fold sizes, conservative).`,
    body: body.join('\n'),
  });
}

/** The slice charts of a report, or "" without slices. */
export function sliceCharts(report: Report, higherIsBetter: boolean | undefined): string {
  if (!report.slices?.length) return '';
  return report.slices.map((s, i) => oneChart(report, s, i, higherIsBetter)).join('\n');
}
