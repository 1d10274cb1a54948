/**
 * Number and label text of the HTML report: four decimals as in the Markdown report, a sign on
 * differences, p-values floored at 0.0001, and the axis label of a metric with its unit and the
 * better direction ("accuracy (share of rows right, 0 to 1; higher is better)").
 */
import { esc } from './escape.js';

export const DIGITS = 4;

export function num(v: number | null | undefined, digits = DIGITS): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  const t = v.toFixed(digits);
  return /^-0\.?0*$/.test(t) ? t.slice(1) : t.replace('-', '−');
}

export function signed(v: number, digits = DIGITS): string {
  const t = num(v, digits);
  return v > 0 && t !== num(0, digits) ? `+${t}` : t;
}

export function pText(p: number | null): string {
  return p === null ? '–' : p < 0.0001 ? '< 0.0001' : p.toFixed(4);
}

export function intervalText(ci: readonly [number, number] | null | undefined, digits = DIGITS): string {
  return ci ? `${num(ci[0], digits)} to ${num(ci[1], digits)}` : 'no interval';
}

/** The unit of each metric's values; the error metrics of regression are in the target's units. */
function unitOf(metric: string, target: string): string {
  switch (metric) {
    case 'accuracy':
      return 'share of rows right, 0 to 1';
    case 'balanced-accuracy':
      return 'mean recall over classes, 0 to 1';
    case 'macro-precision':
    case 'macro-recall':
    case 'macro-f1':
    case 'roc-auc':
    case 'average-precision':
      return '0 to 1';
    case 'ece':
      return 'probability gap, 0 to 1';
    case 'cost':
      return 'cost per row, from the --costs matrix';
    case 'mcc':
    case 'kappa':
      return '−1 to 1';
    case 'log-loss':
      return 'nats per row';
    case 'brier':
      return 'squared probability error per row, 0 to 2';
    case 'mae':
    case 'rmse':
    case 'medae':
      return `units of ${target}`;
    case 'r2':
      return 'share of variance explained, at most 1';
    default:
      return '';
  }
}

/** Unescaped axis label text of a metric. */
export function metricLabel(metric: string, target: string, higherIsBetter: boolean | undefined): string {
  const parts = [unitOf(metric, target), higherIsBetter === undefined ? '' : `${higherIsBetter ? 'higher' : 'lower'} is better`].filter(Boolean);
  return parts.length ? `${metric} (${parts.join('; ')})` : metric;
}

/** A number for an attribute value: the shortest text that reads back as the same double. */
export function attrNum(v: number): string {
  return Number.isFinite(v) ? String(v) : 'NaN';
}

/** Pixel coordinates with two decimals. */
export const px = (v: number): string => (Math.round(v * 100) / 100).toString();

/** SVG text with the given attributes; `text` is escaped here. */
export function svgText(x: number, y: number, text: string, attrs = ''): string {
  return `<text x="${px(x)}" y="${px(y)}"${attrs ? ` ${attrs}` : ''}>${esc(text)}</text>`;
}
