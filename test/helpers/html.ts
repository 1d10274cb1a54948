/** Reading our own generated HTML in structural tests. */
import { expect } from 'vitest';

/** The attributes of every start tag named `tag` (the page escapes all data, so a raw "<" always opens a tag). */
export function tags(html: string, tag: string): Map<string, string>[] {
  const out: Map<string, string>[] = [];
  for (const m of html.matchAll(new RegExp(`<${tag}\\b([^>]*)>`, 'g'))) {
    const attrs = new Map<string, string>();
    for (const a of m[1].matchAll(/([a-zA-Z_:][-a-zA-Z0-9_:.]*)="([^"]*)"/g)) attrs.set(a[1], a[2]);
    out.push(attrs);
  }
  return out;
}

/** The markup of the figure with this id. */
export function figureOf(html: string, id: string): string {
  const start = html.indexOf(`<figure class="chart" id="${id}">`);
  expect(start).toBeGreaterThanOrEqual(0);
  return html.slice(start, html.indexOf('</figure>', start) + '</figure>'.length);
}
