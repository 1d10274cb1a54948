/**
 * The summary chart: for each learner, the headline metric over its folds as a box-and-whisker
 * plot (box from the first to the third quartile, a line at the median, whiskers from the
 * lowest to the highest fold), every fold drawn as a dot, and below it the mean as a diamond
 * with its 95% interval (Student t with the Nadeau-Bengio correction, as in the report). The
 * baseline learner's mean is a dashed reference line across all rows.
 *
 * Dots are spread vertically by the fractional parts of i x 0.618... (the golden-ratio
 * sequence), so the layout is the same on every run; no randomness is involved.
 * Sources: box plots after J. W. Tukey, "Exploratory Data Analysis" (1977) with whiskers to the
 * extremes; the interval is the one in src/stats/summary.ts (Nadeau & Bengio 2003, free from
 * the Machine Learning journal / NeurIPS 1999 proceedings).
 */
import { textWidth, xAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, intervalText, metricLabel, num, px, svgText } from './format.js';
import { BASELINE, BOX_FILL, BOX_STROKE, INK, INTERVAL, MUTED, POINT } from './palette.js';
import { linearScale } from './scale.js';
import { foldScores, summaryOf, type ChartContext } from './context.js';

const WIDTH = CHART_WIDTH;
const ROW = 62;
const LABEL_CHARS = 34;

const GOLDEN = (Math.sqrt(5) - 1) / 2;
/** Vertical offset in -1..1 of the i-th dot. */
export const spread = (i: number): number => (((i * GOLDEN) % 1) - 0.5) * 2;

/** The legend from y = 16 down, wrapped to the chart width; returns its markup and its bottom. */
function legend(): { markup: string; bottom: number } {
  const items: string[] = [];
  let x = 0;
  let row = 0;
  const add = (mark: string, text: string): void => {
    const w = 24 + textWidth(text.length, 13) + 18;
    if (x > 0 && x + w > WIDTH) {
      x = 0;
      row++;
    }
    items.push(`<g transform="translate(${px(x)},${row * 22})">${mark}${svgText(24, y + 4, text, `fill="${INK}"`)}</g>`);
    x += w;
  };
  const y = 16;
  add(`<rect x="0" y="${y - 7}" width="18" height="14" fill="${BOX_FILL}" stroke="${BOX_STROKE}"/><line x1="9" x2="9" y1="${y - 7}" y2="${y + 7}" stroke="${BOX_STROKE}" stroke-width="2"/>`, 'quartiles, line at median');
  add(`<line x1="0" x2="18" y1="${y}" y2="${y}" stroke="${BOX_STROKE}"/><line x1="0" x2="0" y1="${y - 5}" y2="${y + 5}" stroke="${BOX_STROKE}"/><line x1="18" x2="18" y1="${y - 5}" y2="${y + 5}" stroke="${BOX_STROKE}"/>`, 'lowest to highest fold');
  add(`<circle cx="9" cy="${y}" r="4" fill="${POINT}" fill-opacity="0.75"/>`, 'one fold');
  add(`<line x1="0" x2="18" y1="${y}" y2="${y}" stroke="${INTERVAL}" stroke-width="3"/><path d="M9 ${y - 6} L15 ${y} L9 ${y + 6} L3 ${y} Z" fill="${INTERVAL}" stroke="#fff"/>`, 'mean with corrected 95% interval');
  add(`<line x1="0" x2="18" y1="${y}" y2="${y}" stroke="${BASELINE}" stroke-width="2" stroke-dasharray="5 3"/>`, 'baseline mean');
  return { markup: `<g class="legend" font-size="13">${items.join('')}</g>`, bottom: y + row * 22 + 10 };
}

export function summaryChart(ctx: ChartContext): string {
  const { report, metric, higherIsBetter, baseline } = ctx;
  const learners = report.learners;
  const labelChars = Math.min(LABEL_CHARS, Math.max(8, ...learners.map((l) => Array.from(l.spec).length)));
  // room for the longest learner label (14 px, bold) and the longest "mean X" line (13 px) under it
  const meanChars = Math.max(0, ...learners.map((l) => `mean ${num(summaryOf(l, metric)?.mean)}`.length));
  const left = Math.max(110, textWidth(labelChars, 14) + 20, textWidth(meanChars, 13) + 20);
  const right = WIDTH - 28;
  const key = legend();
  const TOP = key.bottom + 38;
  const bottom = TOP + learners.length * ROW;
  const values: number[] = [];
  for (const l of learners) {
    const s = summaryOf(l, metric);
    for (const v of foldScores(l, metric)) if (v !== null && Number.isFinite(v)) values.push(v);
    if (s) values.push(s.min, s.max, ...(s.ci95 ?? []));
  }
  const baseMean = baseline ? summaryOf(baseline, metric)?.mean : undefined;
  if (baseMean !== undefined && Number.isFinite(baseMean)) values.push(baseMean);
  const finite = values.filter(Number.isFinite);
  const x = linearScale(finite.length ? Math.min(...finite) : 0, finite.length ? Math.max(...finite) : 1, left, right, 8);

  const body: string[] = [key.markup, xAxis(x, TOP - 10, bottom, metricLabel(metric, report.data.target, higherIsBetter))];
  const words: string[] = [];
  learners.forEach((l, i) => {
    const cy = TOP + i * ROW + 22;
    const s = summaryOf(l, metric);
    const scores = foldScores(l, metric);
    const defined = scores.filter((v): v is number => v !== null && Number.isFinite(v));
    const g: string[] = [];
    g.push(`<g class="learner" data-learner="${esc(l.spec)}" data-index="${i}"${s ? ` data-mean="${attrNum(s.mean)}" data-median="${attrNum(s.median)}" data-q1="${attrNum(s.q1)}" data-q3="${attrNum(s.q3)}" data-min="${attrNum(s.min)}" data-max="${attrNum(s.max)}"` : ''}>`);
    g.push(`<text x="${px(left - 12)}" y="${px(cy + 5)}" text-anchor="end" font-size="14" font-weight="600" fill="${INK}">${esc(clip(l.spec, LABEL_CHARS))}<title>${esc(l.spec)}</title></text>`);
    if (!s) {
      g.push(svgText(left + 8, cy + 5, `no defined ${metric} score on any fold`, `font-size="13" fill="${MUTED}"`));
      words.push(`${l.spec}: no defined score.`);
      g.push('</g>');
      body.push(g.join('\n'));
      return;
    }
    g.push(svgText(left - 12, cy + 23, `mean ${num(s.mean)}`, `text-anchor="end" font-size="13" fill="${MUTED}"`));
    const boxColour = l === baseline ? BASELINE : BOX_STROKE;
    const fill = l === baseline ? '#e9e9e9' : BOX_FILL;
    g.push(`<line class="whisker" x1="${px(x(s.min))}" x2="${px(x(s.max))}" y1="${cy}" y2="${cy}" stroke="${boxColour}" stroke-width="1.5"/>`);
    for (const v of [s.min, s.max]) g.push(`<line x1="${px(x(v))}" x2="${px(x(v))}" y1="${cy - 7}" y2="${cy + 7}" stroke="${boxColour}" stroke-width="1.5"/>`);
    g.push(`<rect class="box" x="${px(x(s.q1))}" y="${cy - 12}" width="${px(Math.max(1, x(s.q3) - x(s.q1)))}" height="24" fill="${fill}" stroke="${boxColour}" stroke-width="1.5"><title>${esc(`${l.spec}: quartiles ${num(s.q1)} to ${num(s.q3)}, median ${num(s.median)}`)}</title></rect>`);
    g.push(`<line class="median" x1="${px(x(s.median))}" x2="${px(x(s.median))}" y1="${cy - 12}" y2="${cy + 12}" stroke="${boxColour}" stroke-width="3"/>`);
    scores.forEach((v, k) => {
      if (v === null || !Number.isFinite(v)) return;
      const f = l.folds[k];
      const fold = report.plan.repeats > 1 ? `repeat ${f.repeat + 1}, fold ${f.fold + 1}` : `fold ${f.fold + 1}`;
      g.push(`<circle class="fold" cx="${px(x(v))}" cy="${px(cy + spread(k) * 9)}" r="4" fill="${POINT}" fill-opacity="0.7" stroke="#ffffff" stroke-width="0.8" data-score="${attrNum(v)}"><title>${esc(`${l.spec}, ${fold}: ${num(v)}`)}</title></circle>`);
    });
    if (s.ci95) {
      const [a, b] = s.ci95;
      const iy = cy + 24;
      g.push(`<g class="interval" data-lo="${attrNum(a)}" data-hi="${attrNum(b)}"><title>${esc(`${l.spec}: mean ${num(s.mean)}, corrected 95% interval ${intervalText(s.ci95)}`)}</title>`);
      g.push(`<line x1="${px(x(a))}" x2="${px(x(b))}" y1="${iy}" y2="${iy}" stroke="${INTERVAL}" stroke-width="3"/>`);
      for (const v of [a, b]) g.push(`<line x1="${px(x(v))}" x2="${px(x(v))}" y1="${iy - 5}" y2="${iy + 5}" stroke="${INTERVAL}" stroke-width="2"/>`);
      const mx = x(s.mean);
      g.push(`<path d="M${px(mx)} ${iy - 6} L${px(mx + 6)} ${iy} L${px(mx)} ${iy + 6} L${px(mx - 6)} ${iy} Z" fill="${INTERVAL}" stroke="#ffffff" stroke-width="1"/>`);
      g.push('</g>');
    }
    const skipped = scores.length - defined.length;
    words.push(
      `${l.spec}: mean ${num(s.mean)}, ${s.ci95 ? `corrected 95% interval ${intervalText(s.ci95)}, ` : ''}median ${num(s.median)}, quartiles ${num(s.q1)} to ${num(s.q3)}, folds from ${num(s.min)} to ${num(s.max)}${skipped ? ` (${skipped} folds without a score)` : ''}.`,
    );
    g.push('</g>');
    body.push(g.join('\n'));
  });
  if (baseMean !== undefined && Number.isFinite(baseMean)) {
    const bx = x(baseMean);
    const label = `baseline mean ${num(baseMean)}`;
    const anchor = bx > right - textWidth(label.length, 12) / 2 ? 'end' : bx < left + textWidth(label.length, 12) / 2 ? 'start' : 'middle';
    body.push(`<g class="baseline-line" data-value="${attrNum(baseMean)}"><line x1="${px(bx)}" x2="${px(bx)}" y1="${TOP - 10}" y2="${bottom}" stroke="${BASELINE}" stroke-width="2" stroke-dasharray="5 3"/>${svgText(bx, TOP - 16, label, `text-anchor="${anchor}" font-size="13" fill="${BASELINE}"`)}</g>`);
    words.push(`Dashed line: baseline mean ${num(baseMean)}.`);
  }
  const folds = report.plan.folds * report.plan.repeats;
  const title = `${metric} of each learner over ${report.plan.kind === "holdout" ? "the validation split" : `the ${folds} folds`}`;
  return figure({
    id: 'summary',
    width: WIDTH,
    height: bottom + 56,
    title,
    desc: `Box plot of ${metric} for ${learners.length} learners, one dot per fold. ${words.join(' ')}`,
    caption: `Scores on each test fold of plan ${report.plan.text}. The box holds the middle half of the folds, the whiskers reach the lowest and highest fold, each dot is one fold; the orange diamond is the mean with its corrected 95% interval (Nadeau-Bengio), which allows for the overlap of training sets between folds.`,
    body: body.join('\n'),
  });
}
