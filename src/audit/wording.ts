/** Shared wording of the audit's evidence texts: quoted names, counts, shares, figures. */

/** A column or level name in double quotes, with JSON escapes for odd characters. */
export function q(name: string): string {
  return JSON.stringify(name);
}

/** Quoted names joined with commas, at most `max` of them, then "and N more". */
export function names(list: readonly string[], max = 6): string {
  const shown = list.slice(0, max).map(q).join(', ');
  return list.length > max ? `${shown} and ${list.length - max} more` : shown;
}

/** "1 row", "12 rows". */
export function count(n: number, noun: string, plural = `${noun}s`): string {
  return `${n} ${n === 1 ? noun : plural}`;
}

/** A share as a percentage with one decimal: "12.5%". */
export function pct(share: number): string {
  return `${(100 * share).toFixed(1)}%`;
}

/** A figure with three decimals, or "undefined" for null. */
export function fig(v: number | null | undefined, digits = 3): string {
  return v === null || v === undefined || !Number.isFinite(v) ? 'undefined' : v.toFixed(digits);
}

/**
 * A p-value: "< 1e-15" below what an upper tail computed as 1 - F can resolve (the
 * cumulative probability is a double near 1), two significant digits otherwise.
 */
export function pValue(p: number): string {
  if (p < 1e-15) return '< 1e-15';
  return p < 0.001 ? p.toExponential(1) : p.toFixed(3);
}

/** The command-line options leaving columns out: --drop "a" --drop "b". */
export function dropOptions(columns: readonly string[]): string {
  return columns.map((c) => `--drop ${q(c)}`).join(' ');
}

/** ISO date (YYYY-MM-DD) of a count of days since 1970-01-01 UTC. */
export function isoDate(days: number): string {
  return new Date(Math.round(days * 86_400_000)).toISOString().slice(0, 10);
}

/** Lower-case word tokens of a column name: split at non-letters/digits and camelCase humps. */
export function nameTokens(name: string): string[] {
  return name
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .split(/[^A-Za-z0-9]+/)
    .filter(Boolean)
    .map((t) => t.toLowerCase());
}
