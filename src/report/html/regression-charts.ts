/**
 * The two charts of a regression learner, drawn from the sample of its pooled out-of-fold
 * predictions that the report carries (`pooledSample`, src/run/pooled-sample.ts: at most 1,000
 * pairs at evenly spaced positions in fold order):
 *
 * - predicted against actual: one dot per pair, predicted value up, actual value across, both
 *   axes on the same scale and the same number of pixels, so the identity line (predicted =
 *   actual) runs corner to corner at 45 degrees; dots above it were over-predicted;
 * - residuals against predicted: residual = actual - predicted up, predicted value across, with
 *   a line at zero; a funnel or a bend shows errors that depend on the prediction.
 *
 * Both axes are labelled with the target's name. Each dot carries its values in its tooltip (six
 * significant digits, `value`); the text alternative gives the ranges and counts in words.
 */
import { textWidth, xAxis, yAxis, yAxisWidth } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, num, px, svgText } from './format.js';
import { INK, INTERVAL, MUTED, POINT } from './palette.js';
import { linearScale } from './scale.js';
import { own } from './context.js';
import type { LearnerReport, PooledSample } from '../../model/report.js';

const WIDTH = CHART_WIDTH;
/** side of the square plot area of the scatter */
const SQUARE = 520;
const RESIDUAL_HEIGHT = 300;
const TOP = 24;
const TARGET_CHARS = 48;
const R = 3;

/** A value in a tooltip or sentence: six significant digits, a true minus sign. */
export function value(v: number): string {
  if (!Number.isFinite(v)) return '–';
  return String(Number(v.toPrecision(6))).replace('-', '−');
}

/** 1234567 -> "1,234,567". */
export const count = (n: number): string => String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ',');

interface Pair {
  readonly actual: number;
  readonly predicted: number;
}

function pairsOf(s: PooledSample): Pair[] {
  const out: Pair[] = [];
  const n = Math.min(s.actual.length, s.predicted.length);
  for (let i = 0; i < n; i++) {
    const a = s.actual[i];
    const p = s.predicted[i];
    if (Number.isFinite(a) && Number.isFinite(p)) out.push({ actual: a, predicted: p });
  }
  return out;
}

/** "A sample of 1,000 of 3,420" or "All 342": the sample's size against the pooled total. */
export function sampleText(s: PooledSample, drawn: number): string {
  return drawn >= s.total ? `All ${count(s.total)}` : `A sample of ${count(drawn)} of ${count(s.total)}`;
}

function legendItem(x: number, y: number, mark: string, text: string): string {
  return `<g transform="translate(${px(x)},${px(y)})">${mark}${svgText(24, 5, text, `font-size="13" fill="${INK}"`)}</g>`;
}

const minMax = (values: readonly number[]): [number, number] => {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
};

/** The pooled score of `metric` as "metric 0.1234", or '' when the report has none. */
function pooledText(l: LearnerReport, metric: string): string {
  const v = own(l.pooled, metric);
  return typeof v === 'number' && Number.isFinite(v) ? `${metric} ${num(v)}` : '';
}

/** `suffix` makes the figure ids unique when several learners are drawn ('' for the first). */
export function scatterChart(l: LearnerReport, target: string, suffix = ''): string | undefined {
  const s = l.pooledSample;
  if (!s) return undefined;
  const pairs = pairsOf(s);
  if (pairs.length === 0) return undefined;
  const [lo, hi] = minMax(pairs.flatMap((p) => [p.actual, p.predicted]));
  const bottom = TOP + SQUARE;
  const y = linearScale(lo, hi, bottom, TOP, 6);
  const left = Math.max(90, yAxisWidth(y) + 10);
  const right = left + SQUARE;
  const x = linearScale(lo, hi, left, right, 6);
  const name = clip(target, TARGET_CHARS);
  const body: string[] = [xAxis(x, TOP, bottom, `actual ${name}`), yAxis(y, left, right, `predicted ${name}`)];
  const [d0, d1] = x.domain;
  body.push(`<line class="identity" x1="${px(x(d0))}" y1="${px(y(d0))}" x2="${px(x(d1))}" y2="${px(y(d1))}" data-from="${attrNum(d0)}" data-to="${attrNum(d1)}" stroke="${INTERVAL}" stroke-width="2"><title>predicted = actual</title></line>`);
  const dots: string[] = [];
  let above = 0;
  let below = 0;
  for (const p of pairs) {
    if (p.predicted > p.actual) above++;
    else if (p.predicted < p.actual) below++;
    dots.push(`<circle cx="${px(x(p.actual))}" cy="${px(y(p.predicted))}" r="${R}"><title>${esc(`actual ${value(p.actual)}, predicted ${value(p.predicted)}`)}</title></circle>`);
  }
  body.push(`<g class="predictions" fill="${POINT}" fill-opacity="0.5" data-learner="${esc(l.spec)}" data-total="${s.total}">`, ...dots, '</g>');
  // legend and figures to the right of the square
  const lx = right + 30;
  const side: string[] = [
    legendItem(lx, TOP + 8, `<circle cx="9" cy="0" r="4" fill="${POINT}" fill-opacity="0.6"/>`, 'one out-of-fold prediction'),
    legendItem(lx, TOP + 32, `<line x1="0" x2="18" y1="0" y2="0" stroke="${INTERVAL}" stroke-width="2"/>`, 'predicted = actual'),
  ];
  const facts = [`${count(pairs.length)} of ${count(s.total)} shown`, `${count(above)} above the line`, `${count(below)} below it`, pooledText(l, 'rmse'), pooledText(l, 'r2')].filter(Boolean);
  facts.forEach((t, i) => side.push(svgText(lx, TOP + 68 + i * 20, clip(t, Math.floor((WIDTH - lx) / textWidth(1, 13))), `font-size="13" fill="${MUTED}"`)));
  body.push(`<g class="legend">${side.join('')}</g>`);
  const [a0, a1] = minMax(pairs.map((p) => p.actual));
  const [p0, p1] = minMax(pairs.map((p) => p.predicted));
  const scores = [pooledText(l, 'rmse'), pooledText(l, 'r2')].filter(Boolean).join(', ');
  return figure({
    id: `scatter${suffix}`,
    width: WIDTH,
    height: bottom + 56,
    title: `Predicted against actual ${target}, ${l.spec}`,
    desc:
      `Scatter plot of ${count(pairs.length)} of ${count(s.total)} pooled out-of-fold predictions of ${l.spec}: predicted ${target} up, actual ${target} across, on the same scale, ` +
      `with the identity line where predicted equals actual. Actual values run from ${value(a0)} to ${value(a1)}, predictions from ${value(p0)} to ${value(p1)}; ` +
      `${count(above)} points lie above the line (predicted too high), ${count(below)} below it.${scores ? ` Pooled scores on all predictions: ${scores}.` : ''}`,
    caption: `${sampleText(s, pairs.length)} pooled out-of-fold predictions of ${l.spec}${pairs.length < s.total ? ' (taken at evenly spaced positions in fold order)' : ''}, one dot each; on the orange line the prediction equals the actual value, and dots above it were predicted too high.`,
    body: body.join('\n'),
  });
}

export function residualChart(l: LearnerReport, target: string, suffix = ''): string | undefined {
  const s = l.pooledSample;
  if (!s) return undefined;
  const pairs = pairsOf(s);
  if (pairs.length === 0) return undefined;
  const residuals = pairs.map((p) => p.actual - p.predicted);
  const [r0, r1] = minMax([0, ...residuals]);
  const [p0, p1] = minMax(pairs.map((p) => p.predicted));
  const bottom = TOP + RESIDUAL_HEIGHT;
  const y = linearScale(r0, r1, bottom, TOP, 6);
  const left = Math.max(90, yAxisWidth(y) + 10);
  const right = WIDTH - 28;
  const x = linearScale(p0, p1, left, right, 8);
  const name = clip(target, TARGET_CHARS);
  const body: string[] = [xAxis(x, TOP, bottom, `predicted ${name}`), yAxis(y, left, right, `residual (actual − predicted)`)];
  body.push(`<line class="zero" x1="${px(left)}" x2="${px(right)}" y1="${px(y(0))}" y2="${px(y(0))}" stroke="${INTERVAL}" stroke-width="2"><title>residual 0: predicted = actual</title></line>`);
  const dots = pairs.map((p, i) => {
    const r = residuals[i];
    return `<circle cx="${px(x(p.predicted))}" cy="${px(y(r))}" r="${R}"><title>${esc(`predicted ${value(p.predicted)}, residual ${value(r)}`)}</title></circle>`;
  });
  body.push(`<g class="residuals" fill="${POINT}" fill-opacity="0.5" data-learner="${esc(l.spec)}" data-total="${s.total}">`, ...dots, '</g>');
  const positive = residuals.filter((r) => r > 0).length;
  const negative = residuals.filter((r) => r < 0).length;
  const mean = residuals.reduce((a, b) => a + b, 0) / residuals.length;
  const [rl, rh] = minMax(residuals);
  return figure({
    id: `residuals${suffix}`,
    width: WIDTH,
    height: bottom + 56,
    title: `Residuals against predicted ${target}, ${l.spec}`,
    desc:
      `Scatter plot of the residuals (actual minus predicted ${target}) of ${count(pairs.length)} of ${count(s.total)} pooled out-of-fold predictions of ${l.spec}, against the predicted value, with a line at zero. ` +
      `Predictions run from ${value(p0)} to ${value(p1)}; residuals from ${value(rl)} to ${value(rh)}, mean ${value(mean)}; ${count(positive)} are above zero (predicted too low), ${count(negative)} below.`,
    caption: `${sampleText(s, pairs.length)} pooled out-of-fold predictions of ${l.spec}: residual = actual − predicted ${target}, in the target's units, against the prediction. Dots scattered evenly about the orange zero line, with no funnel or bend, mean errors that do not depend on the prediction.`,
    body: body.join('\n'),
  });
}
