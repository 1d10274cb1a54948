/**
 * Columns out as Parquet (through `hyparquet-writer`, snappy pages) or Arrow IPC file format
 * (through `apache-arrow`), for `split --format`, `command:` learners' `format=` and
 * `--predictions FILE.parquet|FILE.arrow`. The shapes mirror the loader's: numbers as doubles
 * (NaN as null), whole numbers as int32, texts as dictionary-coded strings, dates as a date
 * (whole days) or a millisecond timestamp (a time of day), so reading a written file back gives
 * the same columns. `parquetBytes` and `arrowBytes` make a whole file in memory (split parts,
 * `command:` files); `parquetChunks` and `arrowChunks` write a file batch by batch, yielding
 * each batch's bytes before the next batch is asked for (predictions).
 */
import type { Matrix, Target } from '../learning.js';
import type { Problem } from '../data/problem.js';
import type { Column } from '../data/types.js';
import type { ColumnBatch, OutColumn } from './columnar-types.js';

type Encoders = typeof import('./columnar-encoders.js');
let encoders: Encoders | undefined;

/**
 * Loads the Parquet and Arrow encoders (apache-arrow and hyparquet-writer; apache-arrow alone
 * took about 16 MB of a bare process's memory and 7 MB of a bare worker thread's when imported).
 * Every path that may write such a file awaits it first: the CLI before `split --format` and
 * `--predictions`, and loadExternalLearners for a `command:` learner (its `format=`).
 */
export async function loadColumnarWriters(): Promise<void> {
  encoders ??= await import('./columnar-encoders.js');
}

function loaded(): Encoders {
  if (!encoders) throw new Error('internal: the Parquet and Arrow writers are not loaded (await loadColumnarWriters() first)');
  return encoders;
}

export type { ColumnBatch, OutColumn } from './columnar-types.js';

/** A table column (all rows or the listed rows) as an output column. */
export function outColumn(c: Column, rows?: ArrayLike<number>): OutColumn {
  const pick = <T extends Float64Array | Int32Array>(a: T): T => {
    if (!rows) return a;
    const out = new (a.constructor as new (n: number) => T)(rows.length);
    for (let i = 0; i < rows.length; i++) out[i] = a[rows[i]];
    return out;
  };
  if (c.kind === 'categorical') return { kind: 'text', name: c.name, codes: pick(c.codes), levels: c.levels };
  return { kind: c.dates ? 'days' : 'float', name: c.name, values: pick(c.values) };
}

/** Whether any of the date values (days since 1970, a time of day as the fraction) has a time of day: the first pass that decides a 'days' column's `times` over all its rows. */
export function hasTimeOfDay(values: ArrayLike<number>): boolean {
  for (let i = 0; i < values.length; i++) if (values[i] === values[i] && !Number.isInteger(values[i])) return true;
  return false;
}


/** The columns as an Arrow IPC file (Feather version 2). */
export function arrowBytes(columns: readonly OutColumn[], length: number): Uint8Array {
  return loaded().arrowBytes(columns, length);
}

/** The columns as a Parquet file. */
export function parquetBytes(columns: readonly OutColumn[], length: number): Uint8Array {
  return loaded().parquetBytes(columns, length);
}

/** A Parquet file batch by batch (one row group per batch), each batch's bytes yielded before the next batch is read. */
export function parquetChunks(batches: Iterable<ColumnBatch>): Generator<Uint8Array> {
  return loaded().parquetChunks(batches);
}

/** An Arrow IPC file batch by batch (one record batch per batch). */
export function arrowChunks(batches: Iterable<ColumnBatch>): Generator<Uint8Array> {
  return loaded().arrowChunks(batches);
}

/** The target entries `idx` (positions among the used rows) as an output column. */
export function targetColumn(name: string, y: Target, idx?: ArrayLike<number>): OutColumn {
  const n = idx ? idx.length : y.task === 'classification' ? y.codes.length : y.values.length;
  const at = (i: number): number => (idx ? idx[i] : i);
  if (y.task === 'classification') return { kind: 'text', name, codes: Int32Array.from({ length: n }, (_, i) => y.codes[at(i)]), levels: y.classes };
  return { kind: 'float', name, values: Float64Array.from({ length: n }, (_, i) => y.values[at(i)]) };
}

/** A matrix's columns (row-major data) as output columns. */
export function matrixColumns(X: Matrix, names: readonly string[]): OutColumn[] {
  return names.map((name, j) => {
    const values = new Float64Array(X.rows);
    for (let i = 0; i < X.rows; i++) values[i] = X.data[i * X.cols + j];
    return { kind: 'float', name, values };
  });
}

/** The used rows `idx` of a problem as read (features, and the target last when `withTarget`). */
export function problemColumns(problem: Problem, idx: Int32Array, withTarget: boolean): OutColumn[] {
  const rows = Int32Array.from(idx, (i) => problem.rows[i]);
  const out = problem.features.map((f) => outColumn(f, rows));
  if (withTarget) out.push(targetColumn(problem.targetName, problem.target, idx));
  return out;
}

/** Columns in a format's bytes. */
export function formatBytes(format: 'parquet' | 'arrow', columns: readonly OutColumn[], length: number): Uint8Array {
  return format === 'parquet' ? parquetBytes(columns, length) : arrowBytes(columns, length);
}
