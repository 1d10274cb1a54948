/**
 * Columns out as Parquet (through `hyparquet-writer`, snappy pages) or Arrow IPC file format
 * (through `apache-arrow`), for `split --format`, `command:` learners' `format=` and
 * `--predictions FILE.parquet|FILE.arrow`. The shapes mirror the loader's: numbers as doubles
 * (NaN as null), whole numbers as int32, texts as dictionary-coded strings, dates as a date
 * (whole days) or a millisecond timestamp (a time of day), so reading a written file back gives
 * the same columns.
 */
import * as A from 'apache-arrow';
import { parquetWriteBuffer } from 'hyparquet-writer';
import type { Matrix, Target } from '../learning.js';
import type { Problem } from '../data/problem.js';
import type { Column } from '../data/types.js';

const DAY_MS = 86_400_000;

export type OutColumn =
  | { readonly kind: 'float'; readonly name: string; readonly values: Float64Array }
  | { readonly kind: 'int'; readonly name: string; readonly values: Int32Array; readonly nulls?: Uint8Array }
  | { readonly kind: 'text'; readonly name: string; readonly codes: Int32Array; readonly levels: readonly string[] }
  | { readonly kind: 'days'; readonly name: string; readonly values: Float64Array };

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

function validity(length: number, isNull: (i: number) => boolean): { bitmap: Uint8Array; nulls: number } {
  const bitmap = new Uint8Array(Math.ceil(length / 8));
  let nulls = 0;
  for (let i = 0; i < length; i++) {
    if (isNull(i)) nulls++;
    else bitmap[i >> 3] |= 1 << (i & 7);
  }
  return { bitmap, nulls };
}

function arrowVector(c: OutColumn, length: number): A.Vector {
  if (c.kind === 'text') {
    const { bitmap, nulls } = validity(length, (i) => c.codes[i] < 0);
    const dictionary = A.vectorFromArray([...c.levels], new A.Utf8());
    const type = new A.Dictionary(new A.Utf8(), new A.Int32());
    const indices = nulls ? Int32Array.from(c.codes, (k) => (k < 0 ? 0 : k)) : c.codes;
    return A.makeVector(A.makeData({ type, length, nullCount: nulls, nullBitmap: nulls ? bitmap : undefined, data: indices, dictionary }));
  }
  if (c.kind === 'int') {
    const { bitmap, nulls } = validity(length, (i) => c.nulls?.[i] === 1);
    return A.makeVector(A.makeData({ type: new A.Int32(), length, nullCount: nulls, nullBitmap: nulls ? bitmap : undefined, data: c.values }));
  }
  const v = c.values;
  const { bitmap, nulls } = validity(length, (i) => v[i] !== v[i]);
  const nullBitmap = nulls ? bitmap : undefined;
  if (c.kind === 'days') {
    let whole = true;
    for (let i = 0; i < length && whole; i++) if (v[i] === v[i] && !Number.isInteger(v[i])) whole = false;
    if (whole) return A.makeVector(A.makeData({ type: new A.DateDay(), length, nullCount: nulls, nullBitmap, data: Int32Array.from(v, (d) => (d === d ? d : 0)) }));
    const ms = BigInt64Array.from(v, (d) => (d === d ? BigInt(Math.round(d * DAY_MS)) : 0n));
    return A.makeVector(A.makeData({ type: new A.TimestampMillisecond(), length, nullCount: nulls, nullBitmap, data: ms }));
  }
  return A.makeVector(A.makeData({ type: new A.Float64(), length, nullCount: nulls, nullBitmap, data: v }));
}

/** The columns as an Arrow IPC file (Feather version 2). */
export function arrowBytes(columns: readonly OutColumn[], length: number): Uint8Array {
  const vectors: Record<string, A.Vector> = {};
  // Arrow tables are keyed by name; foldwise names are unique within a file
  for (const c of columns) vectors[c.name] = arrowVector(c, length);
  const table = columns.length ? new A.Table(vectors) : new A.Table();
  return A.tableToIPC(table, 'file');
}

/** The columns as a Parquet file. */
export function parquetBytes(columns: readonly OutColumn[], length: number): Uint8Array {
  const schema: { name: string; type?: string; converted_type?: string; repetition_type?: string; num_children?: number }[] = [{ name: 'root', num_children: columns.length }];
  const columnData = columns.map((c) => {
    if (c.kind === 'text') {
      schema.push({ name: c.name, type: 'BYTE_ARRAY', converted_type: 'UTF8', repetition_type: 'OPTIONAL' });
      return { name: c.name, data: Array.from(c.codes, (k) => (k < 0 ? null : c.levels[k])) };
    }
    if (c.kind === 'int') {
      schema.push({ name: c.name, type: 'INT32', repetition_type: 'OPTIONAL' });
      return { name: c.name, data: c.nulls ? Array.from(c.values, (x, i) => (c.nulls![i] ? null : x)) : c.values };
    }
    const v = c.values;
    let nulls = false;
    let whole = true;
    for (let i = 0; i < length; i++) {
      if (v[i] !== v[i]) nulls = true;
      else if (!Number.isInteger(v[i])) whole = false;
    }
    if (c.kind === 'days' && whole) {
      schema.push({ name: c.name, type: 'INT32', converted_type: 'DATE', repetition_type: 'OPTIONAL' });
      return { name: c.name, data: Array.from(v, (d) => (d === d ? d : null)) };
    }
    if (c.kind === 'days') {
      schema.push({ name: c.name, type: 'INT64', converted_type: 'TIMESTAMP_MILLIS', repetition_type: 'OPTIONAL' });
      return { name: c.name, data: Array.from(v, (d) => (d === d ? BigInt(Math.round(d * DAY_MS)) : null)) };
    }
    schema.push({ name: c.name, type: 'DOUBLE', repetition_type: 'OPTIONAL' });
    return { name: c.name, data: nulls ? Array.from(v, (d) => (d === d ? d : null)) : v };
  });
  return new Uint8Array(parquetWriteBuffer({ columnData, schema: schema as never, rowGroupSize: 1 << 20 }));
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
