/**
 * Columns of a typed columnar file (Parquet, Arrow IPC) into the loader's Table. The file's own
 * types decide each column (no guessing from text): numbers and integers are numeric, dates and
 * timestamps are numeric days since 1970-01-01 UTC (a time as the fraction of a day), strings,
 * dictionaries and booleans are categorical with levels in order of first appearance, exactly
 * as the CSV loader orders them. Nulls are missing; so are NaN numbers and strings equal to a
 * missing token (after trimming), as in a CSV. `--categorical` turns a numeric column into
 * levels from each value's text.
 */
import { InputError } from '../errors.js';
import { trimmed } from './column-build.js';
import { quoted } from './quote.js';
import type { CategoricalColumn, Column, NumericColumn, Table } from './types.js';
import { type Alloc, PLAIN } from './alloc.js';

/** A numeric column as read: values with NaN for missing. */
export interface NumericIn {
  readonly kind: 'numeric';
  readonly name: string;
  readonly values: Float64Array;
  /** how a date or timestamp column was read, e.g. "Parquet DATE (days)" */
  readonly dateReading?: string;
  /** integers beyond 2^53 were met (read as the nearest double) */
  readonly bigIntegers?: boolean;
}

/** A categorical column as read: codes into levels by first appearance. */
export interface CategoricalIn {
  readonly kind: 'categorical';
  readonly name: string;
  readonly codes: Int32Array;
  readonly levels: readonly string[];
}

export type ColumnIn = NumericIn | CategoricalIn;

/** Codes texts by first appearance; null and missing tokens are -1. */
export class TextCoder {
  readonly codes: Int32Array;
  readonly levels: string[] = [];
  private readonly dict = new Map<string, number>();
  /** per distinct text: its code, or -1 for a missing token (so each text is checked once) */
  constructor(
    rows: number,
    private readonly missing: ReadonlySet<string>,
  ) {
    this.codes = new Int32Array(rows);
  }
  /** The code of a text (adding it when new), -1 for null or a missing token. */
  codeOf(text: string | null | undefined): number {
    if (text === null || text === undefined) return -1;
    let code = this.dict.get(text);
    if (code === undefined) {
      code = this.missing.has(trimmed(text)) ? -1 : this.levels.push(text) - 1;
      this.dict.set(text, code);
    }
    return code;
  }
  set(row: number, text: string | null | undefined): void {
    this.codes[row] = this.codeOf(text);
  }
  column(name: string): CategoricalIn {
    return { kind: 'categorical', name, codes: this.codes, levels: this.levels };
  }
}

const DAY_MS = 86_400_000;

/** ISO text of a day count (for a date column listed with --categorical). */
function dayText(days: number): string {
  const iso = new Date(days * DAY_MS).toISOString();
  return Number.isInteger(days) ? iso.slice(0, 10) : iso;
}

/** Builds the Table: checks names, applies --categorical, counts missing values. */
export function typedTable(
  name: string,
  sha256: string,
  rows: number,
  read: readonly ColumnIn[],
  options: { readonly categorical?: readonly string[]; readonly missing: ReadonlySet<string>; readonly alloc?: Alloc },
): Table {
  if (read.length === 0) throw new InputError(`${name}: has no columns`);
  if (rows === 0) throw new InputError(`${name}: has columns but no data rows`);
  const seen = new Map<string, number>();
  read.forEach((c, i) => {
    if (c.name.trim() === '') throw new InputError(`${name}: column ${i + 1} has no name; give every column a name`);
    const before = seen.get(c.name);
    if (before !== undefined) throw new InputError(`${name}: column name ${quoted(c.name)} appears twice (columns ${before + 1} and ${i + 1}); rename one`);
    seen.set(c.name, i);
  });
  const forced = new Set(options.categorical ?? []);
  for (const f of forced) if (!seen.has(f)) throw new InputError(`--categorical ${quoted(f)}: no such column in ${name}`);
  const warnings: string[] = [];
  const columns: Column[] = read.map((c, position) => {
    if (c.kind === 'numeric' && forced.has(c.name)) {
      const coder = new TextCoder(rows, options.missing);
      for (let r = 0; r < rows; r++) {
        const v = c.values[r];
        coder.set(r, v !== v ? null : c.dateReading ? dayText(v) : String(v));
      }
      return categorical(coder.column(c.name), position);
    }
    if (c.kind === 'numeric') {
      if (c.bigIntegers) warnings.push(`column ${quoted(c.name)} has integers beyond 2^53; they are read as the nearest double`);
      let missing = 0;
      for (let r = 0; r < rows; r++) if (c.values[r] !== c.values[r]) missing++;
      const col: NumericColumn = {
        kind: 'numeric',
        name: c.name,
        position,
        values: c.values,
        missing,
        ...(c.dateReading ? { dates: true, dateReading: c.dateReading } : {}),
      };
      return col;
    }
    return categorical(c, position);
  });
  const byName = new Map<string, Column>();
  for (const c of columns) byName.set(c.name, c);
  // a row's "line" is its 1-based row number: messages say "line N" for row N of the file
  const lines = (options.alloc ?? PLAIN).i32(rows);
  for (let r = 0; r < rows; r++) lines[r] = r + 1;
  return {
    source: name,
    rows,
    columns,
    byName,
    lines,
    warnings,
    fingerprint: { sha256, rows, columns: columns.length, schema: columns.map((c) => [c.name, c.kind] as const) },
  };
}

function categorical(c: CategoricalIn, position: number): CategoricalColumn {
  let missing = 0;
  for (let r = 0; r < c.codes.length; r++) if (c.codes[r] < 0) missing++;
  return { kind: 'categorical', name: c.name, position, codes: c.codes, levels: c.levels, missing };
}
