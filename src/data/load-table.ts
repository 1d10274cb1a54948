/**
 * The one entry point of every data command: a CSV (streamed, `load-csv.ts`), a Parquet file
 * (`load-parquet.ts`) or an Arrow IPC file or stream (`load-arrow.ts`), told apart by their
 * magic bytes: "PAR1" at both ends of a Parquet file, "ARROW1" at the start of an Arrow file,
 * 0xFFFFFFFF (a continuation marker) at the start of an Arrow stream. A name ending in
 * .parquet, .arrow, .feather, .arrows or .ipc promises that format, and a file whose bytes do
 * not match it is refused rather than read as text. Standard input is read as CSV.
 */
import { createHash } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { InputError } from '../errors.js';
import { DEFAULT_MISSING, loadCsv, type CsvSource, type LoadOptions } from './load-csv.js';
import { typedTable } from './typed-columns.js';
import type { Table } from './types.js';
import { allocFor } from './alloc.js';

export type DataFormat = 'csv' | 'parquet' | 'arrow';
export const DATA_FORMATS: readonly DataFormat[] = ['csv', 'parquet', 'arrow'];

/** The format a file name promises, if any. */
export function formatOfName(path: string): DataFormat | undefined {
  const lower = path.toLowerCase();
  if (lower.endsWith('.parquet') || lower.endsWith('.pq')) return 'parquet';
  if (lower.endsWith('.arrow') || lower.endsWith('.feather') || lower.endsWith('.arrows') || lower.endsWith('.ipc')) return 'arrow';
  if (lower.endsWith('.csv') || lower.endsWith('.tsv') || lower.endsWith('.txt')) return 'csv';
  return undefined;
}

/** The format the first bytes of a file show, if they show one. */
export function formatOfBytes(head: Uint8Array): DataFormat | undefined {
  if (head.length >= 4 && head[0] === 0x50 && head[1] === 0x41 && head[2] === 0x52 && head[3] === 0x31) return 'parquet';
  if (head.length >= 6 && Buffer.from(head.subarray(0, 6)).toString('latin1') === 'ARROW1') return 'arrow';
  if (head.length >= 8 && head[0] === 0xff && head[1] === 0xff && head[2] === 0xff && head[3] === 0xff) return 'arrow';
  return undefined;
}

const LABEL: Record<DataFormat, string> = { csv: 'CSV', parquet: 'Parquet', arrow: 'Arrow IPC' };

async function head(path: string): Promise<Uint8Array> {
  const { open } = await import('node:fs/promises');
  const h = await open(path, 'r');
  try {
    const b = Buffer.alloc(8);
    const { bytesRead } = await h.read(b, 0, 8, 0);
    return b.subarray(0, bytesRead);
  } finally {
    await h.close();
  }
}

/** Which format a path holds: by its bytes, checked against what its name promises. */
export async function sniffFormat(path: string): Promise<DataFormat> {
  let bytes: Uint8Array;
  try {
    const info = await stat(path);
    if (info.isDirectory()) return 'csv'; // the CSV loader gives the message
    bytes = await head(path);
  } catch {
    return 'csv'; // the CSV loader names the problem (no such file, permission)
  }
  const byBytes = formatOfBytes(bytes);
  const byName = formatOfName(path);
  if (byName && byName !== 'csv' && byBytes !== byName) {
    throw new InputError(
      `${path}: the name says ${LABEL[byName]} but the file does not start with the ${LABEL[byName]} magic bytes (${byName === 'parquet' ? '"PAR1"' : '"ARROW1" or a stream marker'}); the file is damaged or not ${LABEL[byName]}`,
    );
  }
  return byBytes ?? 'csv';
}

/** Loads a table from a CSV, Parquet or Arrow source (see the file comment). */
export async function loadTable(source: CsvSource, options: LoadOptions = {}): Promise<Table> {
  if (!('path' in source)) return loadCsv(source, options);
  const format = await sniffFormat(source.path);
  if (format === 'csv') return loadCsv(source, options);
  return loadTyped(source.path, format, options);
}

async function loadTyped(path: string, format: 'parquet' | 'arrow', options: LoadOptions): Promise<Table> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch (e) {
    throw new InputError(`${path}: cannot be read (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
  options.onProgress?.(bytes.length, bytes.length);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const missing = new Set((options.missing ?? DEFAULT_MISSING).map((t) => t.trim()));
  const alloc = allocFor(options.shared);
  // the readers (hyparquet, apache-arrow) load only when such a file is read: a CSV run never holds them
  const read =
    format === 'parquet'
      ? await (await import('./load-parquet.js')).readParquet(bytes, path, missing, alloc)
      : (await import('./load-arrow.js')).readArrow(bytes, path, missing, alloc);
  return typedTable(path, sha256, read.rows, read.columns, { categorical: options.categorical, missing, alloc });
}
