/**
 * A horizontal value axis: vertical grid lines at the ticks across the plot area, tick labels
 * below it, and the axis label (metric, unit, better direction) centred under the labels; and
 * its vertical counterpart `yAxis` (horizontal grid lines at the ticks, tick labels at the left,
 * an optional turned label) for the scatter plots and the tune charts.
 */
import { esc } from './escape.js';
import { px, svgText } from './format.js';
import { AXIS, GRID, MUTED } from './palette.js';
import type { Scale } from './scale.js';

/** `tickText` writes a tick's label; by default the tick with the scale's decimals. */
export function xAxis(x: Scale, top: number, bottom: number, label: string, tickText?: (t: number) => string): string {
  const out: string[] = [`<g class="axis" font-size="13" fill="${MUTED}">`];
  for (const t of x.ticks) {
    const xp = x(t);
    out.push(`<line x1="${px(xp)}" x2="${px(xp)}" y1="${px(top)}" y2="${px(bottom)}" stroke="${GRID}" stroke-width="1"/>`);
    out.push(svgText(xp, bottom + 18, tickText ? tickText(t) : t.toFixed(x.decimals).replace('-', '−'), 'text-anchor="middle"'));
  }
  const [r0, r1] = [x(x.domain[0]), x(x.domain[1])];
  out.push(`<line x1="${px(r0)}" x2="${px(r1)}" y1="${px(bottom)}" y2="${px(bottom)}" stroke="${AXIS}" stroke-width="1"/>`);
  out.push(`<text x="${px((r0 + r1) / 2)}" y="${px(bottom + 40)}" text-anchor="middle" font-size="14" fill="${MUTED}">${esc(label)}</text>`);
  out.push('</g>');
  return out.join('\n');
}

/** Width in pixels that a label of `chars` characters takes at `size` px (a rough average). */
export const textWidth = (chars: number, size = 14): number => chars * size * 0.6;

/** A tick value as the axes write it: the scale's decimals, a true minus sign. */
const tickText = (y: Scale, t: number): string => t.toFixed(y.decimals).replace('-', '−');

/** Pixels a vertical axis takes left of the plot area: tick labels, a gap, the turned label. */
export function yAxisWidth(y: Scale): number {
  return 8 + textWidth(Math.max(1, ...y.ticks.map((t) => tickText(y, t).length)), 13) + 12 + 18;
}

/**
 * A vertical value axis: horizontal grid lines at the ticks across the plot area (`left` to
 * `right`), tick labels left of it, and the axis label turned a quarter, centred along the left
 * edge `yAxisWidth(y)` pixels out (no label when `label` is undefined). The scale maps values to
 * y pixels (larger values higher up).
 */
export function yAxis(y: Scale, left: number, right: number, label?: string): string {
  const out: string[] = [`<g class="axis" font-size="13" fill="${MUTED}">`];
  for (const t of y.ticks) {
    const yp = y(t);
    out.push(`<line x1="${px(left)}" x2="${px(right)}" y1="${px(yp)}" y2="${px(yp)}" stroke="${GRID}" stroke-width="1"/>`);
    out.push(svgText(left - 8, yp + 4, tickText(y, t), 'text-anchor="end"'));
  }
  const [r0, r1] = [y(y.domain[0]), y(y.domain[1])];
  out.push(`<line x1="${px(left)}" x2="${px(left)}" y1="${px(r0)}" y2="${px(r1)}" stroke="${AXIS}" stroke-width="1"/>`);
  const lx = left - yAxisWidth(y) + 14;
  const ly = (r0 + r1) / 2;
  if (label !== undefined) out.push(`<text x="${px(lx)}" y="${px(ly)}" transform="rotate(-90 ${px(lx)} ${px(ly)})" text-anchor="middle" font-size="14" fill="${MUTED}">${esc(label)}</text>`);
  out.push('</g>');
  return out.join('\n');
}
