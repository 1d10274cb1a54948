/**
 * The paired comparison chart: for each pair of the report's comparisons (each learner against
 * the best learner and against the baseline, on the headline metric), the mean of the paired
 * fold differences (this learner minus the reference, in the metric's units) as a dot with its
 * corrected 95% interval, and a line at zero. A pair whose interval lies wholly on the better
 * side of zero is drawn in blue, wholly on the worse side in orange, otherwise in grey; the
 * figures are also written at the right of each row, so colour is never the only cue.
 *
 * The figures come from src/compare/within-report.ts (corrected resampled t of Nadeau & Bengio
 * 2003); this chart only draws them.
 */
import { textWidth, xAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, intervalText, num, pText, px, signed, svgText } from './format.js';
import { BETTER, INK, MUTED, UNCLEAR, WORSE } from './palette.js';
import { linearScale } from './scale.js';
import type { ChartContext } from './context.js';

const WIDTH = CHART_WIDTH;
const ROW = 50;
const TOP = 24;
const LABEL_CHARS = 34;
const RIGHT_TEXT = 310;

export function comparisonChart(ctx: ChartContext): string | undefined {
  const cmp = ctx.report.comparisons;
  if (!cmp || cmp.pairs.length === 0) return undefined;
  const pairs = cmp.pairs;
  const labels = pairs.map((p) => `${p.learner} vs ${p.reference}`);
  const labelChars = Math.min(LABEL_CHARS, Math.max(12, ...labels.map((t) => Array.from(t).length)));
  const left = textWidth(labelChars, 14) + 20;
  const right = WIDTH - RIGHT_TEXT;
  const bottom = TOP + pairs.length * ROW;
  const values = [0];
  for (const p of pairs) values.push(p.diff, ...(p.ci95 ?? []));
  const finite = values.filter(Number.isFinite);
  const x = linearScale(Math.min(...finite), Math.max(...finite), left, right, 6);
  const better = cmp.higherIsBetter ? 'higher' : 'lower';
  const axisLabel = `difference in ${cmp.metric}, this learner minus the reference (${better} is better)`;
  const body: string[] = [xAxis(x, TOP - 8, bottom, axisLabel)];
  body.push(`<line class="zero" x1="${px(x(0))}" x2="${px(x(0))}" y1="${TOP - 8}" y2="${bottom}" stroke="${INK}" stroke-width="1.5"/>`);
  body.push(svgText(x(0), TOP - 12, 'no difference', `text-anchor="middle" font-size="13" fill="${MUTED}"`));
  const words: string[] = [];
  pairs.forEach((p, i) => {
    const cy = TOP + i * ROW + 20;
    const clear = p.ci95 !== null && (p.ci95[0] > 0 || p.ci95[1] < 0);
    const colour = !clear ? UNCLEAR : p.direction === 'better' ? BETTER : p.direction === 'worse' ? WORSE : UNCLEAR;
    const against = p.against.map((a) => (a === 'best' ? 'the best' : 'the baseline')).join(' and ');
    const verdict = !clear ? 'within fold noise' : p.direction === 'better' ? 'better beyond noise' : 'worse beyond noise';
    const g: string[] = [`<g class="pair" data-learner="${esc(p.learner)}" data-reference="${esc(p.reference)}" data-diff="${attrNum(p.diff)}"${p.ci95 ? ` data-lo="${attrNum(p.ci95[0])}" data-hi="${attrNum(p.ci95[1])}"` : ''}>`];
    g.push(`<text x="${px(left - 12)}" y="${px(cy + 1)}" text-anchor="end" font-size="14" font-weight="600" fill="${INK}">${esc(clip(labels[i], LABEL_CHARS))}<title>${esc(labels[i])}</title></text>`);
    g.push(svgText(left - 12, cy + 17, `against ${against}`, `text-anchor="end" font-size="13" fill="${MUTED}"`));
    if (p.ci95) {
      const [a, b] = p.ci95;
      g.push(`<line x1="${px(x(a))}" x2="${px(x(b))}" y1="${cy}" y2="${cy}" stroke="${colour}" stroke-width="3"/>`);
      for (const v of [a, b]) g.push(`<line x1="${px(x(v))}" x2="${px(x(v))}" y1="${cy - 6}" y2="${cy + 6}" stroke="${colour}" stroke-width="2"/>`);
    }
    g.push(`<circle cx="${px(x(p.diff))}" cy="${cy}" r="6" fill="${colour}" stroke="#ffffff" stroke-width="1.2"><title>${esc(`${labels[i]}: ${signed(p.diff)}, corrected 95% interval ${intervalText(p.ci95)}, p ${pText(p.p)}`)}</title></circle>`);
    g.push(svgText(right + 12, cy + 1, `${signed(p.diff)}  (${intervalText(p.ci95)})`, `font-size="13" fill="${INK}"`));
    g.push(svgText(right + 12, cy + 17, `${verdict}; won ${p.wins} of ${p.folds} fold${p.folds === 1 ? "" : "s"}`, `font-size="13" fill="${MUTED}"`));
    g.push('</g>');
    body.push(g.join('\n'));
    words.push(`${labels[i]} (against ${against}): difference ${signed(p.diff)}, corrected 95% interval ${intervalText(p.ci95)}, ${verdict}; better on ${p.wins}, equal on ${p.ties}, worse on ${p.losses} of ${p.folds} paired folds.`);
  });
  return figure({
    id: 'comparisons',
    width: WIDTH,
    height: bottom + 56,
    title: `Paired differences in ${cmp.metric} against the best learner and the baseline`,
    desc: `Mean paired fold difference in ${cmp.metric} with its corrected ${Math.round(cmp.level * 100)}% interval, zero marked. ${words.join(' ')}`,
    caption: `Each learner against the best learner and against the baseline, paired fold by fold: the dot is the mean difference (this learner minus the reference, in ${cmp.metric} units), the bar its corrected ${Math.round(cmp.level * 100)}% interval. Blue: better beyond fold noise; orange: worse beyond fold noise; grey: the interval reaches across zero.`,
    body: body.join('\n'),
  });
}
