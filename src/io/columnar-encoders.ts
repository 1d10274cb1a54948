/**
 * The encoders behind write-columnar.ts: columns as Parquet bytes (hyparquet-writer, snappy pages)
 * and Arrow IPC file bytes (apache-arrow), whole or batch by batch. Loaded on demand
 * (write-columnar.ts, loadColumnarWriters), so that a run which writes no such file does not
 * load the two libraries into every thread. Call through write-columnar.ts, not directly.
 */
import * as A from 'apache-arrow';
import { ByteWriter, ParquetWriter, parquetWriteBuffer } from 'hyparquet-writer';
import type { ColumnBatch, OutColumn } from './columnar-types.js';

const DAY_MS = 86_400_000;

function validity(length: number, isNull: (i: number) => boolean): { bitmap: Uint8Array; nulls: number } {
  const bitmap = new Uint8Array(Math.ceil(length / 8));
  let nulls = 0;
  for (let i = 0; i < length; i++) {
    if (isNull(i)) nulls++;
    else bitmap[i >> 3] |= 1 << (i & 7);
  }
  return { bitmap, nulls };
}

function wholeDays(v: Float64Array, length: number): boolean {
  for (let i = 0; i < length; i++) if (v[i] === v[i] && !Number.isInteger(v[i])) return false;
  return true;
}

/** The Arrow type of a column: dictionary-coded strings (with the id given, else the library's next), int32, date (whole days) or millisecond timestamp, float64. */
function arrowType(c: OutColumn, length: number, dictionaryId?: number): A.DataType {
  if (c.kind === 'text') return new A.Dictionary(new A.Utf8(), new A.Int32(), dictionaryId);
  if (c.kind === 'int') return new A.Int32();
  if (c.kind === 'days') return (c.times ?? !wholeDays(c.values, length)) ? new A.TimestampMillisecond() : new A.DateDay();
  return new A.Float64();
}

/** A column's Arrow data of the type `arrowType` gave (a text column with its dictionary vector). */
function arrowData(c: OutColumn, length: number, type: A.DataType, dictionary?: A.Vector): A.Data {
  if (c.kind === 'text') {
    const { bitmap, nulls } = validity(length, (i) => c.codes[i] < 0);
    const indices = nulls ? Int32Array.from(c.codes, (k) => (k < 0 ? 0 : k)) : c.codes;
    return A.makeData({ type: type as A.Dictionary<A.Utf8, A.Int32>, length, nullCount: nulls, nullBitmap: nulls ? bitmap : undefined, data: indices, dictionary: dictionary ?? A.vectorFromArray([...c.levels], new A.Utf8()) });
  }
  if (c.kind === 'int') {
    const { bitmap, nulls } = validity(length, (i) => c.nulls?.[i] === 1);
    return A.makeData({ type: new A.Int32(), length, nullCount: nulls, nullBitmap: nulls ? bitmap : undefined, data: c.values });
  }
  const v = c.values;
  const { bitmap, nulls } = validity(length, (i) => v[i] !== v[i]);
  const nullBitmap = nulls ? bitmap : undefined;
  if (c.kind === 'days') {
    if (type instanceof A.DateDay) {
      if (!wholeDays(v, length)) throw new Error(`arrowData: column ${c.name} holds times of day in a date column (decide its type over all rows first: OutColumn times)`);
      return A.makeData({ type, length, nullCount: nulls, nullBitmap, data: Int32Array.from(v, (d) => (d === d ? d : 0)) });
    }
    const ms = BigInt64Array.from(v, (d) => (d === d ? BigInt(Math.round(d * DAY_MS)) : 0n));
    return A.makeData({ type: new A.TimestampMillisecond(), length, nullCount: nulls, nullBitmap, data: ms });
  }
  return A.makeData({ type: new A.Float64(), length, nullCount: nulls, nullBitmap, data: v });
}

function arrowVector(c: OutColumn, length: number): A.Vector {
  return A.makeVector(arrowData(c, length, arrowType(c, length)));
}

/** The columns as an Arrow IPC file (Feather version 2). */
export function arrowBytes(columns: readonly OutColumn[], length: number): Uint8Array {
  const vectors: Record<string, A.Vector> = {};
  // Arrow tables are keyed by name; foldwise names are unique within a file
  for (const c of columns) vectors[c.name] = arrowVector(c, length);
  const table = columns.length ? new A.Table(vectors) : new A.Table();
  return A.tableToIPC(table, 'file');
}

type ParquetSchema = { name: string; type?: string; converted_type?: string; repetition_type?: string; num_children?: number }[];

/** The Parquet schema of the columns and their data as hyparquet-writer takes them. */
function parquetParts(columns: readonly OutColumn[], length: number): { schema: ParquetSchema; columnData: { name: string; data: ArrayLike<unknown> }[] } {
  const schema: ParquetSchema = [{ name: 'root', num_children: columns.length }];
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
    if (c.kind === 'days' && (c.times === undefined ? whole : !c.times)) {
      if (!whole) throw new Error(`parquetParts: column ${c.name} holds times of day in a date column (times: false)`);
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
  return { schema, columnData };
}

/** The columns as a Parquet file. */
export function parquetBytes(columns: readonly OutColumn[], length: number): Uint8Array {
  const { schema, columnData } = parquetParts(columns, length);
  return new Uint8Array(parquetWriteBuffer({ columnData: columnData as never, schema: schema as never, rowGroupSize: 1 << 20 }));
}

const sameShape = (a: readonly OutColumn[], b: readonly OutColumn[]): boolean =>
  a.length === b.length && a.every((c, j) => c.name === b[j].name && c.kind === b[j].kind && (c.kind !== 'text' || c.levels === (b[j] as typeof c).levels));

/** hyparquet-writer's byte writer handing each row group's bytes out when the row group is done, instead of growing a buffer for the whole file. */
class HandOutWriter extends ByteWriter {
  readonly done: Uint8Array[] = [];
  flush(): void {
    if (this.index === 0) return;
    this.done.push(this.getBytes().slice());
    this.index = 0;
  }
  override finish(): void {
    this.flush();
  }
}

/**
 * A Parquet file written batch by batch (one row group a batch, through hyparquet-writer's
 * ParquetWriter): each batch's bytes are yielded before the next batch is asked for, so no more
 * than one batch is held. A single batch of up to 2^20 rows gives `parquetBytes`'s bytes.
 */
export function* parquetChunks(batches: Iterable<ColumnBatch>): Generator<Uint8Array> {
  const out = new HandOutWriter();
  let writer: ParquetWriter | undefined;
  let first: { columns: readonly OutColumn[]; schema: string } | undefined;
  for (const b of batches) {
    const { schema, columnData } = parquetParts(b.columns, b.length);
    if (!first) {
      first = { columns: b.columns, schema: JSON.stringify(schema) };
      writer = new ParquetWriter({ writer: out, schema: schema as never });
    } else if (!sameShape(first.columns, b.columns) || JSON.stringify(schema) !== first.schema) throw new Error('parquetChunks: a batch with other columns than the first');
    void writer!.write({ columnData: columnData as never, rowGroupSize: Math.max(1, b.length) });
    yield* out.done.splice(0);
  }
  if (!writer) throw new Error('parquetChunks: no batch (give one batch of no rows for an empty file)');
  void writer.finish();
  yield* out.done.splice(0);
}

/** apache-arrow's byte queue keeping what the IPC writer wrote until it is taken. */
class TakenQueue extends A.AsyncByteQueue {
  readonly done: Uint8Array[] = [];
  override write(value: Uint8Array): void {
    if (value.byteLength > 0) this.done.push(value);
  }
}

/**
 * An Arrow IPC file written batch by batch (one record batch a batch, through apache-arrow's
 * RecordBatchFileWriter): each batch's bytes are yielded before the next batch is asked for.
 * The schema is the first batch's, every field nullable as in `arrowBytes` (where apache-arrow
 * calls a column of no nulls nullable too); each text column's dictionary (its `levels`) is
 * written once, with the first batch; dictionary ids are the text columns' order, 0, 1, ...
 */
export function* arrowChunks(batches: Iterable<ColumnBatch>): Generator<Uint8Array> {
  const sink = new TakenQueue();
  const writer = new A.RecordBatchFileWriter();
  writer.reset(sink);
  let first: readonly OutColumn[] | undefined;
  let schema: A.Schema | undefined;
  let types: A.DataType[] = [];
  let dictionaries: (A.Vector | undefined)[] = [];
  for (const b of batches) {
    if (!first) {
      first = b.columns;
      let id = 0;
      types = first.map((c) => arrowType(c, b.length, c.kind === 'text' ? id++ : undefined));
      dictionaries = first.map((c) => (c.kind === 'text' ? A.vectorFromArray([...c.levels], new A.Utf8()) : undefined));
      schema = new A.Schema(first.map((c, j) => new A.Field(c.name, types[j], true)));
    } else if (!sameShape(first, b.columns)) throw new Error('arrowChunks: a batch with other columns than the first');
    const children = b.columns.map((c, j) => arrowData(c, b.length, types[j], dictionaries[j]));
    const data = A.makeData({ type: new A.Struct(schema!.fields), length: b.length, nullCount: 0, children });
    writer.write(new A.RecordBatch(schema!, data));
    yield* sink.done.splice(0);
  }
  if (!first) throw new Error('arrowChunks: no batch (give one batch of no rows for an empty file)');
  writer.finish();
  yield* sink.done.splice(0);
}
