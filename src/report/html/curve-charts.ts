/**
 * The curve charts of one classifier (`learners[].curves`, src/curves/): ROC and
 * precision-recall, and the reliability diagram.
 *
 * - ROC / PR, two classes: the pooled curve as a line and the pointwise quartile band of the
 *   per-fold curves (q1 to q3, shaded) with its median dashed; ROC adds the chance diagonal, PR
 *   a line at the prevalence (what a score unrelated to the class reaches). The PR curve is
 *   drawn as steps (precision held until the next point), never as straight joins.
 * - More classes: one pooled one-vs-rest line per drawn class, in the series colours, named in
 *   a legend; no bands (they would hide each other).
 * - Reliability: one dot per equal-count bin at (mean probability, observed share) with its
 *   Wilson 95% interval as a vertical whisker, and the diagonal of perfect calibration.
 *
 * Every text that comes from the data (class names, the learner spec) goes through `esc`.
 */
import { xAxis, yAxis, yAxisWidth } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { num, px, svgText } from './format.js';
import { AXIS, BOX_FILL, INK, INTERVAL, MUTED, POINT, SERIES } from './palette.js';
import { linearScale } from './scale.js';
import type { ClassCurves, Curve } from '../../model/curves.js';
import type { LearnerReport } from '../../model/report.js';

const SIDE = 360;
const TOP = 40;

function frame(xLabel: string, yLabel: string): { x: (v: number) => number; y: (v: number) => number; axes: string; left: number } {
  const yScale = linearScale(0, 1, TOP + SIDE, TOP, 5);
  const left = Math.max(80, yAxisWidth(yScale) + 10);
  const xScale = linearScale(0, 1, left, left + SIDE, 5);
  return { x: xScale, y: yScale, axes: `${xAxis(xScale, TOP, TOP + SIDE, xLabel)}\n${yAxis(yScale, left, left + SIDE, yLabel)}`, left };
}

function line(x: (v: number) => number, y: (v: number) => number, xs: readonly number[], ys: readonly number[], steps: boolean): string {
  const pts: string[] = [];
  for (let i = 0; i < xs.length; i++) {
    if (steps && i > 0) pts.push(`${px(x(xs[i]))},${px(y(ys[i - 1]))}`);
    pts.push(`${px(x(xs[i]))},${px(y(ys[i]))}`);
  }
  return pts.join(' ');
}

function bandMarks(c: Curve, x: (v: number) => number, y: (v: number) => number): string {
  const b = c.band;
  if (!b) return '';
  const upper = b.grid.map((g, i) => `${px(x(g))},${px(y(b.q3[i]))}`);
  const lower = b.grid.map((g, i) => `${px(x(g))},${px(y(b.q1[i]))}`).reverse();
  return [
    `<polygon class="band" points="${upper.concat(lower).join(' ')}" fill="${BOX_FILL}" fill-opacity="0.8" stroke="none"/>`,
    `<polyline class="band-median" points="${line(x, y, b.grid, b.median, false)}" fill="none" stroke="${MUTED}" stroke-width="1.5" stroke-dasharray="5 4"/>`,
  ].join('\n');
}

function curveChart(l: LearnerReport, kind: 'roc' | 'pr', id: string): string | undefined {
  const curves = l.curves;
  if (!curves) return undefined;
  const drawn = curves.classes.filter((k) => k[kind].x && k[kind].y);
  if (!drawn.length) return undefined;
  const roc = kind === 'roc';
  const f = frame(roc ? 'false-positive rate (share of negatives called positive)' : 'recall (share of positives found)', roc ? 'true-positive rate' : 'precision');
  const body: string[] = [f.axes];
  const words: string[] = [];
  const two = curves.classes.length === 1;
  if (roc) body.push(`<line x1="${px(f.x(0))}" y1="${px(f.y(0))}" x2="${px(f.x(1))}" y2="${px(f.y(1))}" stroke="${AXIS}" stroke-dasharray="3 3"/>`);
  drawn.forEach((k: ClassCurves, i) => {
    const c = k[kind];
    const colour = two ? POINT : SERIES[i % SERIES.length];
    if (two) {
      body.push(bandMarks(c, f.x, f.y));
      if (!roc) body.push(`<line class="prevalence" x1="${px(f.x(0))}" y1="${px(f.y(k.prevalence))}" x2="${px(f.x(1))}" y2="${px(f.y(k.prevalence))}" stroke="${AXIS}" stroke-dasharray="3 3"/>`);
    }
    body.push(
      `<polyline class="curve" points="${line(f.x, f.y, c.x!, c.y!, !roc)}" fill="none" stroke="${colour}" stroke-width="2"><title>${esc(`${l.spec}, ${k.class} positive: area ${num(c.area)}`)}</title></polyline>`,
    );
    if (!two) {
      const ly = TOP + 14 + i * 18;
      body.push(`<rect x="${px(f.left + SIDE + 24)}" y="${px(ly - 8)}" width="14" height="4" fill="${colour}"/>`, svgText(f.left + SIDE + 44, ly, `${clip(k.class, 36)}: ${num(c.area)}`, `font-size="13" fill="${INK}"`));
    }
    words.push(`${k.class} positive: area ${num(c.area)}${c.band ? `, band over ${c.band.folds} folds` : ''}`);
  });
  const name = roc ? 'ROC curve' : 'Precision-recall curve';
  return figure({
    id,
    width: CHART_WIDTH,
    height: TOP + SIDE + 60,
    title: `${name} of ${l.spec}`,
    desc: `${name} of the pooled out-of-fold predictions of ${l.spec}. ${words.join('; ')}.`,
    caption: two
      ? `${name} of the pooled out-of-fold predictions (line); shaded: the middle half of the per-fold curves (first to third quartile), dashed: their median. ${roc ? 'The diagonal is chance.' : 'The dotted line is the prevalence, what a score unrelated to the class reaches; the curve is drawn as steps.'}`
      : `${name}s, one class against the rest, on the pooled out-of-fold predictions; the legend gives each area.`,
    body: body.filter(Boolean).join('\n'),
  });
}

export function rocChart(l: LearnerReport, suffix = ''): string | undefined {
  return curveChart(l, 'roc', `roc${suffix}`);
}

export function prChart(l: LearnerReport, suffix = ''): string | undefined {
  return curveChart(l, 'pr', `pr${suffix}`);
}

export function reliabilityChart(l: LearnerReport, suffix = ''): string | undefined {
  const k = l.curves?.calibration;
  if (!k || !k.bins.length) return undefined;
  const top = k.form === 'top-label';
  const f = frame(top ? 'mean largest probability in the bin' : 'mean predicted probability in the bin', top ? 'share predicted right' : 'observed share of the positive class');
  const body: string[] = [f.axes, `<line x1="${px(f.x(0))}" y1="${px(f.y(0))}" x2="${px(f.x(1))}" y2="${px(f.y(1))}" stroke="${AXIS}" stroke-dasharray="3 3"/>`];
  const words: string[] = [];
  for (const b of k.bins) {
    const cx = f.x(b.meanScore);
    body.push(
      `<line class="interval" x1="${px(cx)}" x2="${px(cx)}" y1="${px(f.y(b.interval[0]))}" y2="${px(f.y(b.interval[1]))}" stroke="${INTERVAL}" stroke-width="2"/>`,
      `<circle class="bin" cx="${px(cx)}" cy="${px(f.y(b.observed))}" r="4" fill="${POINT}"><title>${esc(`${b.count} rows, mean probability ${num(b.meanScore)}, observed ${num(b.observed)} (95% interval ${num(b.interval[0])} to ${num(b.interval[1])})`)}</title></circle>`,
    );
    words.push(`${num(b.meanScore, 2)} predicted, ${num(b.observed, 2)} observed`);
  }
  body.push(svgText(f.left + SIDE + 24, TOP + 14, `ECE ${num(k.ece)}`, `font-size="13" fill="${INK}"`), svgText(f.left + SIDE + 24, TOP + 32, `MCE ${num(k.mce)}`, `font-size="13" fill="${INK}"`));
  return figure({
    id: `reliability${suffix}`,
    width: CHART_WIDTH,
    height: TOP + SIDE + 60,
    title: `Reliability of ${l.spec}`,
    desc: `Reliability diagram of ${l.spec}, ${k.bins.length} equal-count bins: ${words.join('; ')}. Expected calibration error ${num(k.ece)}, maximum ${num(k.mce)}.`,
    caption: `One dot per equal-count bin of the pooled out-of-fold rows: mean probability across, observed share up, with its Wilson 95% interval. Dots on the diagonal are well calibrated; a whisker that crosses it is no evidence of miscalibration.`,
    body: body.join('\n'),
  });
}
