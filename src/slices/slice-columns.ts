/**
 * The slice columns of a run: for each `--slice COL`, the level of every data row, known before
 * any fit (they travel in the ReportFrame, so shards, merge and `score` slice the same way).
 *
 * A categorical column gives one slice per level (in the column's level order); a missing cell
 * is the level "(missing)". A numeric column (dates too, as days) is cut into `--slice-bins N`
 * quantile bins whose edges are fixed once on all rows of the file that have a value (not per
 * fold, and not on the rows a plan uses): the edges are the k/N sample quantiles, k = 1..N-1
 * (linear interpolation, Hyndman & Fan 1996 type 7, as in src/stats/summary.ts); equal edges
 * (many tied values) merge, so a column may give fewer than N bins. Bin i holds the values in
 * [edge_i, edge_{i+1}), the last one closed on the right: "[lo, hi)" ... "[lo, hi]".
 */
import { quantileSorted } from 'simple-statistics';
import { InputError, UsageError, closeNames } from '../errors.js';
import type { Table } from '../data/types.js';

export const DEFAULT_SLICE_BINS = 4;
export const MAX_SLICE_BINS = 20;
/** more levels than this is an id or a free-text column, not a slice */
export const MAX_SLICE_LEVELS = 100;
export const MISSING_LEVEL = '(missing)';

export interface SliceColumn {
  readonly column: string;
  readonly kind: 'levels' | 'bins';
  /** the bin edges of a numeric column (lowest value, inner edges, highest value) */
  readonly edges?: readonly number[];
  readonly levels: readonly string[];
  /** level index of each data row (the index a TaskRecord's `rows` holds) */
  readonly codes: readonly number[];
}

export function checkSliceBins(n: number): number {
  if (!Number.isInteger(n) || n < 2 || n > MAX_SLICE_BINS) throw new UsageError(`--slice-bins ${n}: expected a whole number from 2 to ${MAX_SLICE_BINS}`);
  return n;
}

export function parseSliceBins(text: string | undefined): number {
  if (text === undefined) return DEFAULT_SLICE_BINS;
  if (!/^\d+$/.test(text)) throw new UsageError(`--slice-bins ${text}: expected a whole number from 2 to ${MAX_SLICE_BINS}`);
  return checkSliceBins(Number(text));
}

const edgeText = (v: number): string => String(Number(v.toPrecision(6)));

/** Quantile bins of numeric values (NaN = missing), edges fixed on all the values given. */
export function binnedSlice(column: string, values: ArrayLike<number>, bins: number): SliceColumn {
  checkSliceBins(bins);
  const present: number[] = [];
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) present.push(values[i]);
  if (present.length === 0) throw new InputError(`--slice ${column}: the column has no values to cut into bins`);
  present.sort((a, b) => a - b);
  const lo = present[0];
  const hi = present[present.length - 1];
  // distinct inner edges strictly between the lowest and highest values (ties merge bins)
  const inner: number[] = [];
  for (let k = 1; k < bins; k++) {
    const e = quantileSorted(present, k / bins);
    if (e > lo && e < hi && (inner.length === 0 || e > inner[inner.length - 1])) inner.push(e);
  }
  const edges = lo === hi ? [lo, hi] : [lo, ...inner, hi];
  const nb = Math.max(1, edges.length - 1);
  const levels: string[] = [];
  for (let b = 0; b < nb; b++) levels.push(`[${edgeText(edges[b])}, ${edgeText(edges[b + 1])}${b === nb - 1 ? ']' : ')'}`);
  let missing = false;
  const codes = new Array<number>(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isNaN(v)) {
      missing = true;
      codes[i] = nb;
      continue;
    }
    let b = 0;
    while (b < nb - 1 && v >= edges[b + 1]) b++;
    codes[i] = b;
  }
  if (missing) levels.push(MISSING_LEVEL);
  return { column, kind: 'bins', edges, levels, codes };
}

/** One slice per distinct text (in `order`), "" and the missing texts as "(missing)". */
export function levelSlice(column: string, levelNames: readonly string[], codes: ArrayLike<number>): SliceColumn {
  if (levelNames.length > MAX_SLICE_LEVELS) {
    throw new UsageError(`--slice ${column}: ${levelNames.length} levels, at most ${MAX_SLICE_LEVELS}; slice by a coarser column (an id or free text is not a slice)`);
  }
  const levels = [...levelNames];
  let missingAt = -1;
  const out = new Array<number>(codes.length);
  for (let i = 0; i < codes.length; i++) {
    const c = codes[i];
    if (c < 0) {
      if (missingAt < 0) (missingAt = levels.length), levels.push(MISSING_LEVEL);
      out[i] = missingAt;
    } else out[i] = c;
  }
  return { column, kind: 'levels', levels, codes: out };
}

/** Checks the --slice names against a table: each a column, not the target, given once. */
export function checkSliceNames(table: Table, names: readonly string[], target: string): void {
  const seen = new Set<string>();
  for (const name of names) {
    if (!table.byName.has(name)) {
      const hint = closeNames(name, table.columns.map((c) => c.name));
      throw new UsageError(`--slice ${name}: no such column in ${table.source}${hint ? `; ${hint}` : ''}`);
    }
    if (name === target) throw new UsageError(`--slice ${name}: is the target; slice by another column (a slice of the target is one class or one range of values)`);
    if (seen.has(name)) throw new UsageError(`--slice ${name}: given twice`);
    seen.add(name);
  }
}

/** The slice columns of a table, for the data rows of the table. */
export function sliceColumnsOf(table: Table, names: readonly string[], bins: number): SliceColumn[] {
  return names.map((name) => {
    const c = table.byName.get(name)!;
    return c.kind === 'numeric' ? binnedSlice(name, c.values, bins) : levelSlice(name, c.levels, c.codes);
  });
}
