/**
 * When a named column is not in the header, the header may have been split with the wrong
 * delimiter: a semicolon- or tab-separated file read with the default comma has one column
 * named "a;b;label". This says which delimiter the header looks like it holds.
 */
import { quoted } from './quote.js';

const CANDIDATES = [';', '\t', '|', ','] as const;

function shown(d: string): string {
  return d === '\t' ? '"\\t" (tab)' : quoted(d);
}

/** A hint naming --delimiter, or undefined when the header does not look split wrongly. */
export function delimiterHint(header: readonly string[], wanted: string, current: string): string | undefined {
  for (const d of CANDIDATES) {
    if (d === current) continue;
    const parts = header.flatMap((h) => h.split(d).map((p) => p.trim()));
    const holds = header.some((h) => h.includes(d));
    if (holds && parts.length > header.length && (parts.includes(wanted) || header.length === 1)) {
      const example = header.find((h) => h.includes(d))!;
      return `the header looks separated by ${shown(d)} (${quoted(example)}); set --delimiter ${d === '\t' ? 'tab' : quoted(d)}`;
    }
  }
  return undefined;
}
