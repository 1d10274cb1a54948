/**
 * The frame of one chart: an inline SVG element with role="img", an aria-label, and <title>
 * and <desc> children that name the chart and describe what it shows in words (the text
 * alternative screen readers and text browsers use), inside a <figure> with a visible caption.
 * The SVG scales to the page width through its viewBox; its fonts are the page's.
 */
import { esc } from './escape.js';

/** The width of every chart's coordinate system: narrow enough that 13-unit text stays about 8 pt on an A4 or letter page. */
export const CHART_WIDTH = 880;

export interface FigureSpec {
  /** unique within the page; letters, digits and dashes */
  readonly id: string;
  readonly width: number;
  readonly height: number;
  /** short name, also the aria-label (unescaped) */
  readonly title: string;
  /** text alternative in words (unescaped) */
  readonly desc: string;
  /** visible caption below the chart (unescaped) */
  readonly caption: string;
  /** SVG markup of the marks, already escaped */
  readonly body: string;
}

export function figure(spec: FigureSpec): string {
  if (!/^[a-z][a-z0-9-]*$/.test(spec.id)) throw new RangeError(`figure: id must be lower-case letters, digits and dashes, got ${JSON.stringify(spec.id)}`);
  const { id, width, height } = spec;
  return [
    `<figure class="chart" id="${id}">`,
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img" aria-label="${esc(spec.title)}" aria-describedby="${id}-desc">`,
    `<title id="${id}-title">${esc(spec.title)}</title>`,
    `<desc id="${id}-desc">${esc(spec.desc)}</desc>`,
    spec.body,
    '</svg>',
    `<figcaption>${esc(spec.caption)}</figcaption>`,
    '</figure>',
  ].join('\n');
}
