/**
 * The gate chart: the change of the gated metric (current mean minus previous mean, in the
 * metric's units) as a dot with its corrected 95% interval, a line at zero, and a dashed line
 * at the largest drop the gate allows (--max-drop, on the worse side of zero). The gate fails
 * on a regression when even the optimistic one-sided bound of the drop passes that line.
 * Figures come from the verdict (src/compare/gate.ts); this chart only draws them.
 */
import { xAxis } from './axis.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, intervalText, num, px, signed, svgText } from './format.js';
import { FAIL, INK, MUTED, PASS, BASELINE } from './palette.js';
import { linearScale } from './scale.js';
import type { GateVerdict } from '../../model/compare.js';

const WIDTH = CHART_WIDTH;

export function gateChart(v: GateVerdict): string {
  const left = 150;
  const right = WIDTH - 40;
  const top = 40;
  const cy = top + 34;
  const bottom = top + 70;
  const limit = v.higherIsBetter ? -v.maxDrop : v.maxDrop;
  // no interval when no fold shows any spread: the dot alone
  const ci: readonly [number, number] = v.ci95 ?? [v.change, v.change];
  const values = [0, v.change, ci[0], ci[1], limit].filter(Number.isFinite);
  const x = linearScale(Math.min(...values), Math.max(...values), left, right, 6);
  const colour = v.verdict === 'pass' ? PASS : FAIL;
  const better = v.higherIsBetter ? 'higher' : 'lower';
  const body: string[] = [xAxis(x, top, bottom, `change in ${v.metric}, current minus previous (${better} is better)`)];
  body.push(`<line class="zero" x1="${px(x(0))}" x2="${px(x(0))}" y1="${top}" y2="${bottom}" stroke="${INK}" stroke-width="1.5"/>`);
  // with --max-drop 0 the limit is the zero line itself: one line, one label
  const zeroLabel = limit === 0 ? 'no change (largest allowed drop 0)' : 'no change';
  body.push(svgText(x(0), top - 8, zeroLabel, `text-anchor="middle" font-size="13" fill="${MUTED}"`));
  body.push(`<g class="limit" data-value="${attrNum(limit)}">${limit === 0 ? '' : `<line x1="${px(x(limit))}" x2="${px(x(limit))}" y1="${top}" y2="${bottom}" stroke="${BASELINE}" stroke-width="2" stroke-dasharray="5 3"/>${svgText(x(limit), top - 24, `largest allowed drop ${num(v.maxDrop)}`, `text-anchor="middle" font-size="13" fill="${BASELINE}"`)}`}</g>`);
  body.push(svgText(left - 12, cy + 5, 'change', `text-anchor="end" font-size="14" font-weight="600" fill="${INK}"`));
  body.push(`<g class="change" data-change="${attrNum(v.change)}" data-lo="${attrNum(ci[0])}" data-hi="${attrNum(ci[1])}">`);
  if (v.ci95) body.push(`<line x1="${px(x(ci[0]))}" x2="${px(x(ci[1]))}" y1="${cy}" y2="${cy}" stroke="${colour}" stroke-width="3"/>`);
  for (const b of v.ci95 ?? []) body.push(`<line x1="${px(x(b))}" x2="${px(x(b))}" y1="${cy - 6}" y2="${cy + 6}" stroke="${colour}" stroke-width="2"/>`);
  body.push(`<circle cx="${px(x(v.change))}" cy="${cy}" r="7" fill="${colour}" stroke="#ffffff" stroke-width="1.2"><title>change ${signed(v.change)}, corrected 95% interval ${intervalText(v.ci95)}</title></circle>`);
  body.push('</g>');
  return figure({
    id: 'gate',
    width: WIDTH,
    height: bottom + 56,
    title: `Change in ${v.metric} from the previous run to the current run`,
    desc: `Gate ${v.verdict}. Change ${signed(v.change)} (current ${num(v.current.mean)} minus previous ${num(v.previous.mean)}), corrected 95% interval ${intervalText(v.ci95)}; largest allowed drop ${num(v.maxDrop)}.`,
    caption: `The dot is the change of the mean ${v.metric} (current minus previous), the bar its corrected 95% interval from the ${v.rule} rule; the dashed line marks the largest drop the gate allows.`,
    body: body.join('\n'),
  });
}
