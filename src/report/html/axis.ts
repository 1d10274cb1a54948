/**
 * A horizontal value axis: vertical grid lines at the ticks across the plot area, tick labels
 * below it, and the axis label (metric, unit, better direction) centred under the labels; and a
 * vertical value axis: horizontal grid lines at the ticks, tick labels at the left.
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

/** A vertical value axis for `y` (pixels from bottom to top): grid lines from `left` to `right`, labels left of `left`. */
export function yAxis(y: Scale, left: number, right: number): string {
  const out: string[] = [`<g class="axis" font-size="13" fill="${MUTED}">`];
  for (const t of y.ticks) {
    const yp = y(t);
    out.push(`<line x1="${px(left)}" x2="${px(right)}" y1="${px(yp)}" y2="${px(yp)}" stroke="${GRID}" stroke-width="1"/>`);
    out.push(svgText(left - 8, yp + 4, t.toFixed(y.decimals).replace('-', '−'), 'text-anchor="end"'));
  }
  const [b, t] = [y(y.domain[0]), y(y.domain[1])];
  out.push(`<line x1="${px(left)}" x2="${px(left)}" y1="${px(b)}" y2="${px(t)}" stroke="${AXIS}" stroke-width="1"/>`);
  out.push('</g>');
  return out.join('\n');
}

/** Width in pixels that a label of `chars` characters takes at `size` px (a rough average). */
export const textWidth = (chars: number, size = 14): number => chars * size * 0.6;
