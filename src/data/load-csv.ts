/**
 * Streams a CSV into typed columns.
 *
 * Bytes flow once: each chunk updates the SHA-256 fingerprint, is decoded as strict UTF-8 and
 * handed to papaparse, whose `step` callback sees one row at a time as an array of strings.
 * Every column is dictionary-encoded while streaming (a Map from cell text to a code, plus an
 * Int32Array of codes); at the end each column's distinct texts are parsed once to decide
 * whether it is numeric (every non-missing text is a decimal number, or every one an ISO date,
 * read as days since 1970-01-01 UTC) or categorical. No array of row objects is ever made.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { Readable, Transform, type TransformCallback } from 'node:stream';
import Papa from 'papaparse';
import { InputError } from '../errors.js';
import type { CategoricalColumn, Column, NumericColumn, Table } from './types.js';

export const DEFAULT_MISSING = ['', 'NA', 'NaN', '?', 'null'] as const;

export interface LoadOptions {
  /** field separator, one character (default ","); never guessed */
  readonly delimiter?: string;
  /** cell texts that mean "missing" (compared after trimming spaces) */
  readonly missing?: readonly string[];
  /** columns read as categorical even when every value is a number */
  readonly categorical?: readonly string[];
  /** called as bytes are read: bytes so far and the total (undefined when unknown, as for stdin) */
  readonly onProgress?: (bytes: number, total: number | undefined) => void;
}

/** Where the CSV comes from: a file path, an already open byte stream (stdin), or text. */
export type CsvSource =
  | { readonly path: string }
  | { readonly stream: Readable; readonly name: string }
  | { readonly text: string; readonly name: string };

/** A decimal number as text: optional sign, digits with an optional point, optional exponent. */
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const INFINITE_WORD = /^[+-]?(?:inf|infinity)$/i;
/** An ISO 8601 calendar date, optionally with a time: read as days since 1970-01-01 (UTC). */
const ISO_DATE = /^\d{4}-\d{2}-\d{2}(?:[T ]\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/;
const DAY_MS = 86_400_000;

/** Days since 1970-01-01 of an ISO date text, or NaN when it is not a valid date. */
export function isoDays(text: string): number {
  if (!ISO_DATE.test(text)) return NaN;
  const withZone = text.length === 10 ? `${text}T00:00:00Z` : /Z|[+-]\d{2}:?\d{2}$/.test(text) ? text.replace(' ', 'T') : `${text.replace(' ', 'T')}Z`;
  const ms = Date.parse(withZone);
  if (Number.isNaN(ms)) return NaN;
  // Date.parse rolls 2023-02-30 over to March; refuse dates that do not exist
  if (new Date(ms).toISOString().slice(0, 10) !== text.slice(0, 10) && text.length === 10) return NaN;
  return ms / DAY_MS;
}
/** Longest user text quoted whole in a message; longer texts are cut with "...". */
const QUOTE_MAX = 80;

/**
 * User text (a cell, a column name, an option value) quoted for a one-line message: JSON string
 * syntax, so line breaks and control characters are escaped and the message stays one line, and
 * cut to QUOTE_MAX characters so a 5 MB cell does not make a 5 MB message.
 */
export function quoted(text: string): string {
  return JSON.stringify(text.length > QUOTE_MAX ? `${text.slice(0, QUOTE_MAX - 3)}...` : text);
}
const INITIAL_CAPACITY = 1024;

class GrowableCodes {
  data = new Int32Array(INITIAL_CAPACITY);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Int32Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  view(): Int32Array {
    return this.data.slice(0, this.length);
  }
}

interface RawColumn {
  readonly name: string;
  readonly dict: Map<string, number>;
  readonly levels: string[];
  readonly codes: GrowableCodes;
  missing: number;
}

/** Count of "\n" bytes in `chunk[from, to)`. */
function newlinesIn(chunk: Buffer, from: number, to: number): number {
  let count = 0;
  for (let i = chunk.indexOf(10, from); i >= 0 && i < to; i = chunk.indexOf(10, i + 1)) count++;
  return count;
}

/** Length of the UTF-8 sequence a lead byte starts (Unicode 15, table 3-7), 0 if it starts none. */
function sequenceLength(b: number): number {
  return b < 0x80 ? 1 : b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
}

/**
 * Offset of the first byte of `bytes` that cannot be part of well-formed UTF-8 (Unicode 15,
 * table 3-7: no overlong forms, surrogates or values beyond U+10FFFF), or -1 when every
 * sequence is well formed (the last one may be cut short by the end of `bytes`).
 */
export function firstBadUtf8(bytes: Uint8Array): number {
  for (let i = 0; i < bytes.length; ) {
    const b = bytes[i];
    const len = sequenceLength(b);
    if (len === 0) return i;
    for (let j = 1; j < len; j++) {
      if (i + j >= bytes.length) return -1;
      const c = bytes[i + j];
      const lo = j === 1 && b === 0xe0 ? 0xa0 : j === 1 && b === 0xf0 ? 0x90 : 0x80;
      const hi = j === 1 && b === 0xed ? 0x9f : j === 1 && b === 0xf4 ? 0x8f : 0xbf;
      if (c < lo || c > hi) return i;
    }
    i += len;
  }
  return -1;
}

/** The bytes at the end of `chunk` that begin a character the chunk does not finish. */
function unfinishedTail(chunk: Buffer): Buffer {
  for (let back = 1; back <= Math.min(3, chunk.length); back++) {
    const b = chunk[chunk.length - back];
    if ((b & 0xc0) === 0x80) continue;
    return sequenceLength(b) > back ? chunk.subarray(chunk.length - back) : chunk.subarray(chunk.length);
  }
  return chunk.subarray(chunk.length);
}

/**
 * Hashes bytes as they pass and decodes them as strict UTF-8; fails on the first NUL byte or
 * bad byte, naming its byte offset and line.
 */
class HashingDecoder extends Transform {
  readonly hash = createHash('sha256');
  private readonly decoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false });
  bytes = 0;
  /** "\n" bytes in the chunks passed so far */
  private newlines = 0;
  /** the start of a character left unfinished by the previous chunk */
  private carry: Buffer = Buffer.alloc(0);
  constructor(private readonly sourceName: string) {
    super({ readableObjectMode: true });
  }
  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    this.hash.update(chunk);
    const nul = chunk.indexOf(0);
    if (nul >= 0) {
      const line = this.newlines + newlinesIn(chunk, 0, nul) + 1;
      done(
        new InputError(
          `${this.sourceName}: byte ${this.bytes + nul} is a NUL byte (line ${line}); this looks like a binary file, not a CSV text file; give a CSV saved as UTF-8 text`,
        ),
      );
      return;
    }
    let text: string;
    try {
      text = this.decoder.decode(chunk, { stream: true });
    } catch {
      // the carry bytes (no line breaks among them) come right before the chunk
      const found = firstBadUtf8(Buffer.concat([this.carry, chunk]));
      const at = found < 0 ? this.carry.length + chunk.length - 1 : found;
      const line = this.newlines + newlinesIn(chunk, 0, Math.max(0, at - this.carry.length)) + 1;
      done(new InputError(`${this.sourceName}: is not valid UTF-8 (line ${line}, byte ${this.bytes - this.carry.length + at}); save the file as UTF-8`));
      return;
    }
    this.bytes += chunk.length;
    this.newlines += newlinesIn(chunk, 0, chunk.length);
    this.carry = Buffer.from(unfinishedTail(chunk.length >= 4 ? chunk : Buffer.concat([this.carry, chunk])));
    if (text.length) this.push(text);
    done();
  }
  override _flush(done: TransformCallback): void {
    try {
      const tail = this.decoder.decode();
      if (tail.length) this.push(tail);
      done();
    } catch {
      done(new InputError(`${this.sourceName}: is not valid UTF-8 (line ${this.newlines + 1}: the file ends inside a character); save the file as UTF-8`));
    }
  }
}

async function openSource(source: CsvSource): Promise<{ stream: Readable; name: string; size?: number }> {
  if ('text' in source) {
    const bytes = Buffer.from(source.text, 'utf8');
    return { stream: Readable.from([bytes]), name: source.name, size: bytes.length };
  }
  if ('stream' in source) return { stream: source.stream, name: source.name };
  const name = source.path;
  let info;
  try {
    info = await stat(name);
  } catch (e) {
    throw fileError(name, e);
  }
  if (info.isDirectory()) throw new InputError(`${name}: is a directory, not a CSV file; give the path of a file`);
  return { stream: createReadStream(name), name, size: info.size };
}

function fileError(name: string, e: unknown): InputError {
  const code = (e as NodeJS.ErrnoException)?.code;
  if (code === 'ENOENT') return new InputError(`${name}: no such file; check the path`);
  if (code === 'EACCES' || code === 'EPERM') return new InputError(`${name}: permission denied; check that the file is readable`);
  if (code === 'EISDIR') return new InputError(`${name}: is a directory, not a CSV file; give the path of a file`);
  return new InputError(`${name}: cannot be read (${code ?? String(e)})`);
}

function checkOptions(options: LoadOptions): { delimiter: string; missing: Set<string> } {
  const delimiter = options.delimiter ?? ',';
  if ([...delimiter].length !== 1 || delimiter === '"' || delimiter === '\n' || delimiter === '\r') {
    throw new InputError(`--delimiter ${quoted(delimiter)}: expected one character other than a quote or a line break (use "\\t" for tab)`);
  }
  return { delimiter, missing: new Set((options.missing ?? DEFAULT_MISSING).map((t) => t.trim())) };
}

/** Loads a CSV into a Table. Throws InputError naming the file, line or column on bad input. */
export async function loadCsv(source: CsvSource, options: LoadOptions = {}): Promise<Table> {
  const { delimiter, missing } = checkOptions(options);
  const { stream, name, size } = await openSource(source);
  const decoder = new HashingDecoder(name);
  if (options.onProgress) {
    const report = options.onProgress;
    let read = 0;
    stream.on('data', (chunk: Buffer | string) => report((read += chunk.length), size));
  }
  const raw: RawColumn[] = [];
  const lines = new GrowableCodes();
  let header: string[] | null = null;
  let line = 1; // line number of the row papaparse hands us next
  let rows = 0;
  let failure = null as Error | null;

  const onRow = (fields: string[], parser: Papa.Parser): void => {
    const rowLine = line;
    for (const f of fields) for (let i = f.indexOf('\n'); i >= 0; i = f.indexOf('\n', i + 1)) line++;
    line++;
    if (header === null) {
      if (fields.length === 1 && fields[0] === '') return; // blank lines before the header
      if (fields.length) fields[0] = fields[0].replace(/^\uFEFF/, '');
      header = fields;
      checkHeader(name, header);
      for (const col of header) raw.push({ name: col, dict: new Map(), levels: [], codes: new GrowableCodes(), missing: 0 });
      return;
    }
    if (fields.length === 1 && fields[0] === '' && header.length > 1) return; // a blank line
    if (fields.length !== header.length) {
      failure = new InputError(
        `${name}: line ${rowLine} has ${fields.length} field${fields.length === 1 ? '' : 's'}, the header has ${header.length}; fix the row or check --delimiter`,
      );
      parser.abort();
      return;
    }
    for (let j = 0; j < fields.length; j++) {
      const col = raw[j];
      const text = fields[j];
      const edge = text.length > 0 && (text.charCodeAt(0) <= 32 || text.charCodeAt(text.length - 1) <= 32);
      if (missing.has(edge ? text.trim() : text)) {
        col.codes.push(-1);
        col.missing++;
        continue;
      }
      let code = col.dict.get(text);
      if (code === undefined) {
        code = col.levels.length;
        col.dict.set(text, code);
        col.levels.push(text);
      }
      col.codes.push(code);
    }
    lines.push(rowLine);
    rows++;
  };

  await new Promise<void>((resolve, reject) => {
    const fail = (e: unknown): void => {
      failure ??= e instanceof InputError ? e : fileError(name, e);
      resolve();
    };
    stream.on('error', fail);
    decoder.on('error', fail);
    stream.pipe(decoder);
    Papa.parse<string[]>(decoder as unknown as NodeJS.ReadableStream as never, {
      delimiter,
      header: false,
      dynamicTyping: false,
      skipEmptyLines: false,
      step: (results, parser) => {
        if (failure) return;
        const quoteError = results.errors.find((e) => e.type === 'Quotes');
        if (quoteError) {
          failure = new InputError(`${name}: line ${line}: ${quoteError.message.toLowerCase()}; check the quoting of that row`);
          parser.abort();
          return;
        }
        try {
          onRow(results.data, parser);
        } catch (e) {
          failure = e as Error;
          parser.abort();
        }
      },
      complete: () => resolve(),
      error: (e: Error) => reject(e),
    });
  });
  if (failure) throw failure;
  if (decoder.bytes === 0) throw new InputError(`${name}: the file is empty; expected a header row and data rows`);
  if (header === null) throw new InputError(`${name}: has no header row; expected a header row and data rows`);
  if (rows === 0) throw new InputError(`${name}: has a header but no data rows`);

  const forced = new Set(options.categorical ?? []);
  for (const f of forced) {
    if (!raw.some((c) => c.name === f)) throw new InputError(`--categorical ${quoted(f)}: no such column in ${name}`);
  }
  const warnings: string[] = [];
  const lineOf = lines.view();
  const columns: Column[] = raw.map((c, position) => finishColumn(name, c, position, forced.has(c.name), lineOf, warnings));
  const byName = new Map<string, Column>();
  for (const c of columns) byName.set(c.name, c);
  return {
    source: name,
    rows,
    columns,
    byName,
    lines: lineOf,
    warnings,
    fingerprint: {
      sha256: decoder.hash.digest('hex'),
      rows,
      columns: columns.length,
      schema: columns.map((c) => [c.name, c.kind] as const),
    },
  };
}

function checkHeader(name: string, header: readonly string[]): void {
  const seen = new Map<string, number>();
  header.forEach((col, i) => {
    if (col.trim() === '') throw new InputError(`${name}: column ${i + 1} of the header has no name; give every column a name`);
    const before = seen.get(col);
    if (before !== undefined) {
      throw new InputError(`${name}: column name ${quoted(col)} appears twice in the header (columns ${before + 1} and ${i + 1}); rename one`);
    }
    seen.set(col, i);
  });
}

function firstLineWith(codes: Int32Array, code: number, lineOf: Int32Array): number {
  for (let i = 0; i < codes.length; i++) if (codes[i] === code) return lineOf[i];
  return -1;
}

function finishColumn(
  name: string,
  c: RawColumn,
  position: number,
  forceCategorical: boolean,
  lineOf: Int32Array,
  warnings: string[],
): Column {
  const codes = c.codes.view();
  if (!forceCategorical) {
    const values = new Float64Array(c.levels.length);
    const textual: number[] = [];
    let bigIntegers = false;
    for (let k = 0; k < c.levels.length; k++) {
      const t = c.levels[k].trim();
      if (DECIMAL.test(t)) {
        const v = Number(t);
        if (!Number.isFinite(v)) {
          throw new InputError(
            `${name}: line ${firstLineWith(codes, k, lineOf)}, column ${quoted(c.name)}: ${quoted(t)} is too large for a double; fix the value or list it with --missing`,
          );
        }
        if (Number.isInteger(v) && Math.abs(v) > Number.MAX_SAFE_INTEGER) bigIntegers = true;
        values[k] = v;
      } else {
        textual.push(k);
      }
    }
    const nonMissing = codes.length - c.missing;
    if (textual.length === 0 && nonMissing > 0) {
      if (bigIntegers) warnings.push(`column ${quoted(c.name)} has integers beyond 2^53; they are read as the nearest double`);
      const out = new Float64Array(codes.length);
      for (let i = 0; i < codes.length; i++) out[i] = codes[i] < 0 ? NaN : values[codes[i]];
      return { kind: 'numeric', name: c.name, position, values: out, missing: c.missing } satisfies NumericColumn;
    }
    if (textual.length > 0 && textual.length < c.levels.length) {
      const inf = textual.find((k) => INFINITE_WORD.test(c.levels[k].trim()));
      if (inf !== undefined && textual.every((k) => INFINITE_WORD.test(c.levels[k].trim()))) {
        throw new InputError(
          `${name}: line ${firstLineWith(codes, inf, lineOf)}, column ${quoted(c.name)}: ${quoted(c.levels[inf])} is not a finite number; fix it or list it with --missing`,
        );
      }
      let textRows = 0;
      const isText = new Uint8Array(c.levels.length);
      for (const k of textual) isText[k] = 1;
      for (let i = 0; i < codes.length; i++) if (codes[i] >= 0 && isText[codes[i]]) textRows++;
      if (textual.length <= 3 && textRows <= 0.1 * nonMissing) {
        const k = textual[0];
        warnings.push(
          `column ${quoted(c.name)} is numeric but for ${textRows} cell${textRows === 1 ? '' : 's'} such as ${quoted(c.levels[k])} (line ${firstLineWith(codes, k, lineOf)}): read as categorical; if that text means missing, add it with --missing`,
        );
      }
    }
  }
  if (!forceCategorical && c.levels.length > 0) {
    const days = c.levels.map((t) => isoDays(t.trim()));
    if (days.every((d) => !Number.isNaN(d))) {
      const out = new Float64Array(codes.length);
      for (let i = 0; i < codes.length; i++) out[i] = codes[i] < 0 ? NaN : days[codes[i]];
      return { kind: 'numeric', name: c.name, position, values: out, missing: c.missing, dates: true } satisfies NumericColumn;
    }
  }
  return { kind: 'categorical', name: c.name, position, codes, levels: c.levels, missing: c.missing } satisfies CategoricalColumn;
}
