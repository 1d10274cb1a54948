/**
 * Arrow IPC input (the file format, also called Feather version 2, and the stream format)
 * through `apache-arrow`, the Arrow project's own JavaScript library. Column chunks are read
 * from their buffers: numbers straight from the typed arrays with the validity bitmap,
 * dictionary-encoded strings through their dictionary (levels still in order of first
 * appearance), dates and timestamps as days since 1970-01-01 UTC.
 */
import { makeVector, tableFromIPC, Type, type Data, type DataType, type Table as ArrowTable } from 'apache-arrow';
import { InputError } from '../errors.js';
import { quoted } from './quote.js';
import { TextCoder, type ColumnIn } from './typed-columns.js';
import { type Alloc, PLAIN } from './alloc.js';

const DAY_MS = 86_400_000;

function valid(d: Data, i: number): boolean {
  if (d.nullCount === 0 || !d.nullBitmap || d.nullBitmap.length === 0) return true;
  const k = d.offset + i;
  return (d.nullBitmap[k >> 3] & (1 << (k & 7))) !== 0;
}

type Kind = 'number' | 'date' | 'timestamp' | 'text';

function kindOf(name: string, column: string, t: DataType): Kind {
  switch (t.typeId) {
    case Type.Int:
    case Type.Float:
    case Type.Decimal:
      return 'number';
    case Type.Date:
      return 'date';
    case Type.Timestamp:
      return 'timestamp';
    case Type.Utf8:
    case Type.LargeUtf8:
    case Type.Bool:
    case Type.Dictionary:
    case Type.Null:
      return 'text';
    default:
      throw new InputError(`${name}: column ${quoted(column)} has Arrow type ${String(t)}, which foldwise does not read; store numbers, strings, booleans, dates or timestamps`);
  }
}

const READING: Partial<Record<Kind, string>> = {
  date: 'Arrow date (days since 1970-01-01)',
  timestamp: 'Arrow timestamp (days since 1970-01-01 UTC, the time as a fraction of a day)',
};

function numbersOf(name: string, column: string, chunks: readonly Data[], rows: number, kind: Kind, alloc: Alloc): { values: Float64Array; big: boolean } {
  const out = alloc.f64(rows).fill(NaN);
  let big = false;
  let at = 0;
  for (const d of chunks) {
    const n = d.length;
    const v = d.values as ArrayLike<number | bigint> | undefined;
    const plain = kind === 'number' && (d.type.typeId === Type.Int || d.type.typeId === Type.Float) && v && !(v instanceof Uint16Array && d.type.typeId === Type.Float) && (d.type as { bitWidth?: number }).bitWidth !== 64;
    if (plain && typeof v[0] !== 'bigint') {
      // Int8..Int32, Uint8..Uint32, Float32, Float64: a typed array at d.offset
      const arr = v as unknown as Float64Array;
      if (d.nullCount === 0) out.set(arr.subarray(d.offset, d.offset + n), at);
      else for (let i = 0; i < n; i++) if (valid(d, i)) out[at + i] = arr[d.offset + i];
    } else if (v instanceof BigInt64Array || v instanceof BigUint64Array) {
      const arr = v as BigInt64Array;
      for (let i = 0; i < n; i++) {
        if (!valid(d, i)) continue;
        const x = Number(arr[d.offset + i]);
        if (kind === 'number' && (x > Number.MAX_SAFE_INTEGER || x < -Number.MAX_SAFE_INTEGER)) big = true;
        out[at + i] = x;
      }
      if (kind !== 'number') for (let i = 0; i < n; i++) out[at + i] = scaleTime(d, out[at + i]);
    } else {
      // decimals, half floats, dates: the library's own reading (dates and timestamps in ms)
      const vec = makeVector(d);
      for (let i = 0; i < n; i++) {
        const x = vec.get(i) as number | bigint | null | { valueOf(): number };
        if (x === null || x === undefined) continue;
        const num = Number(x);
        out[at + i] = kind === 'number' ? num : num / DAY_MS;
      }
    }
    at += n;
  }
  if (at !== rows) throw new InputError(`${name}: column ${quoted(column)} holds ${at} values for ${rows} rows; the Arrow file is damaged`);
  return { values: out, big };
}

/** A date64 or timestamp integer in its unit, as days. */
function scaleTime(d: Data, x: number): number {
  if (x !== x) return x;
  if (d.type.typeId === Type.Date) return x / DAY_MS; // date64: milliseconds
  const unit = (d.type as { unit?: number }).unit ?? 1;
  // TimeUnit: 0 s, 1 ms, 2 us, 3 ns
  return x / (DAY_MS * [1e-3, 1, 1e3, 1e6][unit]);
}

function textsOf(name: string, column: string, chunks: readonly Data[], rows: number, missing: ReadonlySet<string>): TextCoder {
  const coder = new TextCoder(rows, missing);
  let at = 0;
  for (const d of chunks) {
    const n = d.length;
    if (d.type.typeId === Type.Dictionary && d.dictionary) {
      // the dictionary's texts coded once, then each row by its index
      const dict = d.dictionary;
      const local = new Int32Array(dict.length).fill(-2);
      const idx = d.values as ArrayLike<number | bigint>;
      for (let i = 0; i < n; i++) {
        if (!valid(d, i)) {
          coder.codes[at + i] = -1;
          continue;
        }
        const k = Number(idx[d.offset + i]);
        if (local[k] === -2) {
          const t = dict.get(k) as unknown;
          local[k] = coder.codeOf(t === null || t === undefined ? null : String(t));
        }
        coder.codes[at + i] = local[k];
      }
    } else {
      const vec = makeVector(d);
      for (let i = 0; i < n; i++) {
        const t = vec.get(i) as unknown;
        coder.set(at + i, t === null || t === undefined ? null : String(t));
      }
    }
    at += n;
  }
  if (at !== rows) throw new InputError(`${name}: column ${quoted(column)} holds ${at} values for ${rows} rows; the Arrow file is damaged`);
  return coder;
}

/** Parses a whole Arrow IPC file or stream held in memory. */
export function readArrow(bytes: Uint8Array, name: string, missing: ReadonlySet<string>, alloc: Alloc = PLAIN): { rows: number; columns: ColumnIn[] } {
  let table: ArrowTable;
  try {
    table = tableFromIPC(bytes);
  } catch (e) {
    throw corrupt(name, e);
  }
  const rows = table.numRows;
  try {
    const columns = table.schema.fields.map((f, j): ColumnIn => {
      const chunks = table.getChildAt(j)?.data ?? [];
      const kind = kindOf(name, f.name, f.type);
      if (kind === 'text') return textsOf(name, f.name, chunks, rows, missing).column(f.name);
      const { values, big } = numbersOf(name, f.name, chunks, rows, kind, alloc);
      return { kind: 'numeric', name: f.name, values, ...(READING[kind] ? { dateReading: READING[kind] } : {}), ...(big ? { bigIntegers: true } : {}) };
    });
    return { rows, columns };
  } catch (e) {
    throw corrupt(name, e);
  }
}

function corrupt(name: string, e: unknown): InputError {
  if (e instanceof InputError) return e;
  const why = e instanceof Error ? e.message : String(e);
  return new InputError(`${name}: is not a readable Arrow IPC file (${why.split('\n')[0]}); the file may be truncated or damaged: write it again`);
}
