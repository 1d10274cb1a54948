/**
 * Parquet input through `hyparquet` (a dependency-free reader of the whole format) with the
 * codecs of `hyparquet-compressors` (gzip, brotli, zstd, lz4 next to its own snappy). Only
 * top-level columns of plain types are read; each is typed from the file's schema
 * (`typed-columns.ts`), never from text.
 */
import { parquetMetadata, parquetRead, type FileMetaData, type SchemaElement } from 'hyparquet';
import { compressors } from 'hyparquet-compressors';
import { InputError } from '../errors.js';
import { quoted } from './quote.js';
import { TextCoder, type ColumnIn } from './typed-columns.js';
import { type Alloc, PLAIN } from './alloc.js';

const DAY_MS = 86_400_000;

type Kind = 'number' | 'date' | 'timestamp' | 'text' | 'boolean';

function kindOf(name: string, e: SchemaElement): Kind {
  const c = e.converted_type;
  const l = e.logical_type?.type;
  if (e.num_children) throw new InputError(`${name}: column ${quoted(e.name)} is nested (a group of ${e.num_children} fields); flatten it to plain columns before reading`);
  if (e.repetition_type === 'REPEATED') throw new InputError(`${name}: column ${quoted(e.name)} holds lists; flatten it to plain columns before reading`);
  if (c === 'DATE' || l === 'DATE') return 'date';
  if (c === 'TIMESTAMP_MILLIS' || c === 'TIMESTAMP_MICROS' || l === 'TIMESTAMP' || (!c && e.type === 'INT96')) return 'timestamp';
  if (e.type === 'BOOLEAN') return 'boolean';
  if (c === 'DECIMAL' || l === 'DECIMAL' || l === 'FLOAT16') return 'number';
  if (e.type === 'INT32' || e.type === 'INT64' || e.type === 'FLOAT' || e.type === 'DOUBLE') return 'number';
  if (e.type === 'BYTE_ARRAY' && c !== 'JSON' && c !== 'BSON' && l !== 'JSON' && l !== 'BSON' && l !== 'GEOMETRY' && l !== 'GEOGRAPHY') return 'text';
  if (l === 'UUID') return 'text';
  const what = c ?? l ?? e.type ?? 'unknown';
  throw new InputError(`${name}: column ${quoted(e.name)} has Parquet type ${what}, which foldwise does not read; store numbers, strings, booleans, dates or timestamps`);
}

const READING: Partial<Record<Kind, string>> = {
  date: 'Parquet DATE (days since 1970-01-01)',
  timestamp: 'Parquet TIMESTAMP (days since 1970-01-01 UTC, the time as a fraction of a day)',
};

/** Parses a whole Parquet file held in memory. */
export async function readParquet(bytes: Uint8Array, name: string, missing: ReadonlySet<string>, alloc: Alloc = PLAIN): Promise<{ rows: number; columns: ColumnIn[] }> {
  const buffer = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? (bytes.buffer as ArrayBuffer) : (bytes.slice().buffer as ArrayBuffer);
  let metadata: FileMetaData;
  try {
    metadata = parquetMetadata(buffer);
  } catch (e) {
    throw corrupt(name, e);
  }
  const rows = Number(metadata.num_rows);
  // the root element, then its children in order; nested groups are refused in kindOf
  const top: SchemaElement[] = [];
  const schema = metadata.schema;
  for (let i = 1; i < schema.length; i++) {
    const e = schema[i];
    top.push(e);
    if (e.num_children) break;
  }
  if (top.length !== (schema[0].num_children ?? 0) && !top.some((e) => e.num_children)) throw new InputError(`${name}: the Parquet schema is damaged (it lists more columns than it holds)`);
  const kinds = top.map((e) => kindOf(name, e));
  const numbers = kinds.map((k) => (k === 'text' || k === 'boolean' ? undefined : alloc.f64(rows).fill(NaN)));
  const texts = kinds.map((k) => (k === 'text' || k === 'boolean' ? new TextCoder(rows, missing) : undefined));
  const big = kinds.map(() => false);
  const index = new Map(top.map((e, j) => [e.name, j]));
  const filled = new Float64Array(top.length);
  try {
    await parquetRead({
      file: buffer,
      metadata,
      compressors,
      parsers: {
        dateFromDays: (d: number) => d,
        timestampFromMilliseconds: (t: bigint) => Number(t) / DAY_MS,
        timestampFromMicroseconds: (t: bigint) => Number(t) / (DAY_MS * 1e3),
        timestampFromNanoseconds: (t: bigint) => Number(t) / (DAY_MS * 1e6),
      },
      onChunk: (chunk) => {
        const j = index.get(chunk.columnName);
        if (j === undefined) return;
        const data = chunk.columnData as ArrayLike<unknown>;
        const n = Math.min(chunk.rowEnd, rows) - chunk.rowStart;
        filled[j] += n;
        const out = numbers[j];
        if (out) {
          if (data instanceof Float64Array || data instanceof Float32Array || data instanceof Int32Array) {
            out.set(data.subarray(0, n), chunk.rowStart);
            return;
          }
          for (let i = 0; i < n; i++) {
            const v = data[i];
            if (typeof v === 'number') out[chunk.rowStart + i] = v;
            else if (typeof v === 'bigint') {
              const x = Number(v);
              if (x > Number.MAX_SAFE_INTEGER || x < -Number.MAX_SAFE_INTEGER) big[j] = true;
              out[chunk.rowStart + i] = x;
            }
          }
          return;
        }
        const coder = texts[j]!;
        for (let i = 0; i < n; i++) {
          const v = data[i];
          coder.set(chunk.rowStart + i, v === null || v === undefined ? null : String(v));
        }
      },
    });
  } catch (e) {
    throw corrupt(name, e);
  }
  for (let j = 0; j < top.length; j++) {
    if (filled[j] !== rows) throw new InputError(`${name}: column ${quoted(top[j].name)} holds ${filled[j]} values for ${rows} rows; the Parquet file is damaged`);
  }
  const columns = top.map((e, j): ColumnIn => {
    const out = numbers[j];
    if (out) return { kind: 'numeric', name: e.name, values: out, ...(READING[kinds[j]] ? { dateReading: READING[kinds[j]] } : {}), ...(big[j] ? { bigIntegers: true } : {}) };
    return texts[j]!.column(e.name);
  });
  return { rows, columns };
}

function corrupt(name: string, e: unknown): InputError {
  if (e instanceof InputError) return e;
  const why = e instanceof Error ? e.message : String(e);
  return new InputError(`${name}: is not a readable Parquet file (${why.split('\n')[0]}); the file may be truncated or damaged: write it again`);
}
