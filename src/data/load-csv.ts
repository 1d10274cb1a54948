/**
 * Streams a CSV into typed columns.
 *
 * Bytes flow once: each chunk updates the SHA-256 fingerprint, is checked to be UTF-8 without
 * NUL bytes, and goes to the byte scanner (`csv-scan.ts`), which hands every field to its
 * column as bytes. A column starts on the numeric path, parsing decimal text straight into a
 * growing Float64Array; it switches to dictionary coding at its first cell that is neither a
 * number nor a missing token, or from the start when it is listed with --categorical
 * (`column-build.ts`). At the end each column is typed by the README's rules: numeric when
 * every non-missing text is a decimal number, dates when every one is a date of one shape
 * (`dates.ts`), categorical otherwise. A column that switched after some numbers and ends
 * categorical gets the texts of those rows from a second read of the source (the file again;
 * for a stream, the bytes kept from the first read). No array of row objects is ever made.
 */
import { createHash } from 'node:crypto';
import { isUtf8 } from 'node:buffer';
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { InputError } from '../errors.js';
import { ColumnBuilder, DECIMAL, INFINITE_WORD, PreSwitchCodes, trimmed } from './column-build.js';
import { ByteDict, hashBytes } from './byte-dict.js';
import { CsvScanner, type ScanSink } from './csv-scan.js';
import { readDates, type DateOrder } from './dates.js';
import { quoted } from './quote.js';
import type { CategoricalColumn, Column, NumericColumn, Table, TypeBreak } from './types.js';
import { type Alloc, PLAIN, allocFor, trimmedI32 } from './alloc.js';

export { isoDays } from './dates.js';
export { quoted } from './quote.js';

export const DEFAULT_MISSING = ['', 'NA', 'NaN', '?', 'null'] as const;

export interface LoadOptions {
  /** field separator, one ASCII character (default ","); never guessed */
  readonly delimiter?: string;
  /** cell texts that mean "missing" (compared after trimming spaces) */
  readonly missing?: readonly string[];
  /** columns read as categorical even when every value is a number */
  readonly categorical?: readonly string[];
  /** the order of day, month and year in N/N/YYYY and N-N-YYYY dates (--date-format) */
  readonly dateFormat?: DateOrder;
  /** called as bytes are read: bytes so far and the total (undefined when unknown, as for stdin) */
  readonly onProgress?: (bytes: number, total: number | undefined) => void;
  /**
   * put the numeric columns and the line numbers in SharedArrayBuffers (for a table bound for
   * worker threads: src/data/alloc.ts); the values are the same
   */
  readonly shared?: boolean;
}

/** Where the CSV comes from: a file path, an already open byte stream (stdin), or text. */
export type CsvSource =
  | { readonly path: string }
  | { readonly stream: Readable; readonly name: string }
  | { readonly text: string; readonly name: string };

/** Bytes read from a file at a time. */
const CHUNK = 1 << 20;

/** Count of "\n" bytes in `chunk[from, to)`. */
function newlinesIn(chunk: Uint8Array, from: number, to: number): number {
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

/** How many bytes at the end of `chunk` begin a character the chunk does not finish. */
function unfinishedTail(chunk: Uint8Array): number {
  for (let back = 1; back <= Math.min(3, chunk.length); back++) {
    const b = chunk[chunk.length - back];
    if ((b & 0xc0) === 0x80) continue;
    return sequenceLength(b) > back ? back : 0;
  }
  return 0;
}

/**
 * Checks chunks for NUL bytes and well-formed UTF-8 as they pass (a character may be split
 * between chunks); fails naming the byte offset and line.
 */
class ByteCheck {
  /** bytes checked so far */
  bytes = 0;
  private carry: Buffer = Buffer.alloc(0);
  constructor(private readonly sourceName: string) {}

  /** `line`: the line the scanner is on at the start of the chunk. */
  check(chunk: Buffer, line: number): void {
    const nul = chunk.indexOf(0);
    if (nul >= 0) {
      throw new InputError(
        `${this.sourceName}: byte ${this.bytes + nul} is a NUL byte (line ${line + newlinesIn(chunk, 0, nul)}); this looks like a binary file, not a CSV text file; give a CSV saved as UTF-8 text`,
      );
    }
    let body = chunk;
    if (this.carry.length) {
      const need = sequenceLength(this.carry[0]) - this.carry.length;
      const joint = Buffer.concat([this.carry, chunk.subarray(0, need)]);
      const bad = firstBadUtf8(joint);
      if (bad >= 0 || joint.length < this.carry.length + need) {
        if (bad >= 0) throw this.bad(line, this.bytes - this.carry.length + bad);
        this.carry = joint; // still unfinished: a chunk of fewer bytes than the character needs
        this.bytes += chunk.length;
        return;
      }
      body = chunk.subarray(need);
      this.carry = Buffer.alloc(0);
    }
    const tail = unfinishedTail(body);
    const main = body.subarray(0, body.length - tail);
    if (!isUtf8(main)) {
      const at = firstBadUtf8(main);
      const offset = at < 0 ? main.length - 1 : at;
      throw this.bad(line + newlinesIn(chunk, 0, chunk.length - body.length + offset), this.bytes + chunk.length - body.length + offset);
    }
    if (tail) {
      const rest = body.subarray(body.length - tail);
      if (firstBadUtf8(rest) >= 0) throw this.bad(line + newlinesIn(chunk, 0, chunk.length), this.bytes + chunk.length - tail);
      this.carry = Buffer.from(rest);
    }
    this.bytes += chunk.length;
  }

  end(line: number): void {
    if (this.carry.length) {
      throw new InputError(`${this.sourceName}: is not valid UTF-8 (line ${line}: the file ends inside a character); save the file as UTF-8`);
    }
  }

  private bad(line: number, byte: number): InputError {
    return new InputError(`${this.sourceName}: is not valid UTF-8 (line ${line}, byte ${byte}); save the file as UTF-8`);
  }
}

async function openSource(source: CsvSource): Promise<{ stream: AsyncIterable<Buffer | string>; name: string; size?: number }> {
  if ('text' in source) {
    const bytes = Buffer.from(source.text, 'utf8');
    return { stream: [bytes] as unknown as AsyncIterable<Buffer>, name: source.name, size: bytes.length };
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
  return { stream: createReadStream(name, { highWaterMark: CHUNK }), name, size: info.size };
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
  if (delimiter.charCodeAt(0) > 0x7f) {
    throw new InputError(`--delimiter ${quoted(delimiter)}: expected an ASCII character (one byte); re-save the file with a comma, semicolon or tab between fields`);
  }
  return { delimiter, missing: new Set((options.missing ?? DEFAULT_MISSING).map((t) => t.trim())) };
}

function asBuffer(piece: Buffer | Uint8Array | string): Buffer {
  if (typeof piece === 'string') return Buffer.from(piece, 'utf8');
  return Buffer.isBuffer(piece) ? piece : Buffer.from(piece.buffer, piece.byteOffset, piece.byteLength);
}

/** Row line numbers, growing as rows arrive. */
class Lines {
  data: Int32Array;
  length = 0;
  constructor(private readonly alloc: Alloc) {
    this.data = alloc.i32(1024);
  }
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = this.alloc.i32(Math.ceil(this.data.length * 1.5));
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  reserve(n: number): void {
    if (n > this.data.length) {
      const next = this.alloc.i32(n);
      next.set(this.data.subarray(0, this.length));
      this.data = next;
    }
  }
  view(): Int32Array {
    return trimmedI32(this.alloc, this.data, this.length);
  }
}

/** The first pass: columns on the numeric path or in dictionary coding, and row lines. */
class TableSink implements ScanSink {
  cols: ColumnBuilder[] = [];
  readonly lines: Lines;
  /** rows expected, estimated from the first chunk and the file size */
  capacity = 1024;
  private readonly missingBytes = new ByteDict();
  constructor(
    private readonly name: string,
    private readonly forced: ReadonlySet<string>,
    private readonly missing: ReadonlySet<string>,
    private readonly alloc: Alloc = PLAIN,
  ) {
    this.lines = new Lines(alloc);
    for (const t of missing) {
      const b = Buffer.from(t, 'utf8');
      const h = hashBytes(b, 0, b.length);
      if (this.missingBytes.get(b, 0, b.length, h) < 0) this.missingBytes.add(b, 0, b.length, h);
    }
  }
  header(names: string[]): void {
    checkHeader(this.name, names);
    for (const f of this.forced) {
      if (!names.includes(f)) throw new InputError(`--categorical ${quoted(f)}: no such column in ${this.name}`);
    }
    this.cols = names.map((n) => new ColumnBuilder(n, this.forced.has(n), this.missing, this.missingBytes, this.capacity, this.alloc));
    this.lines.reserve(this.capacity);
  }
  cell(j: number, buf: Uint8Array, start: number, end: number): void {
    this.cols[j].add(buf as Buffer, start, end);
  }
  row(line: number): void {
    this.lines.push(line);
  }
}

/** Loads a CSV into a Table. Throws InputError naming the file, line or column on bad input. */
export async function loadCsv(source: CsvSource, options: LoadOptions = {}): Promise<Table> {
  const { delimiter, missing } = checkOptions(options);
  const { stream, name, size } = await openSource(source);
  const sink = new TableSink(name, new Set(options.categorical ?? []), missing, allocFor(options.shared));
  const scanner = new CsvScanner(delimiter.charCodeAt(0), sink, name);
  const hash = createHash('sha256');
  const check = new ByteCheck(name);
  // a stream cannot be read twice: keep its bytes in case a column needs a second pass
  const kept: Buffer[] | undefined = 'stream' in source ? [] : undefined;
  let bytes = 0;
  try {
    for await (const piece of stream) {
      const chunk = asBuffer(piece);
      hash.update(chunk);
      check.check(chunk, scanner.line);
      if (bytes === 0 && size !== undefined && chunk.length > 0) {
        // size the column buffers once: rows in the file ~ line ends in the first chunk, scaled
        sink.capacity = Math.min(2 ** 28, Math.ceil((newlinesIn(chunk, 0, chunk.length) * size) / chunk.length * 1.02) + 16);
      }
      scanner.push(chunk);
      kept?.push(chunk);
      bytes += chunk.length;
      options.onProgress?.(bytes, size);
    }
    check.end(scanner.line);
    scanner.end();
  } catch (e) {
    if ('destroy' in stream && typeof stream.destroy === 'function') (stream as Readable).destroy();
    throw e instanceof InputError ? e : fileError(name, e);
  }
  if (bytes === 0) throw new InputError(`${name}: the file is empty; expected a header row and data rows`);
  if (scanner.width === 0) throw new InputError(`${name}: has no header row; expected a header row and data rows`);
  const rows = scanner.rows;
  if (rows === 0) throw new InputError(`${name}: has a header but no data rows`);

  const warnings: string[] = [];
  const mixed = lineEndWarning(name, scanner.ends);
  if (mixed) warnings.push(mixed);
  const lineOf = sink.lines.view();
  const ctx: FinishContext = { name, rows, lineOf, warnings, dateFormat: options.dateFormat };
  const decided = sink.cols.map((c, position) => decide(ctx, c, position));
  const deferred = decided.flatMap((d, j) => (d === SECOND_PASS ? [{ j, pre: new PreSwitchCodes(sink.cols[j], rows, missing, name, lineOf) }] : []));
  if (deferred.length) await secondPass(source, kept, delimiter, name, deferred);
  const columns: Column[] = decided.map((d, position) => {
    if (d !== SECOND_PASS) return d;
    const c = sink.cols[position];
    const { codes, levels } = deferred.find((x) => x.j === position)!.pre.finish();
    c.dropValues();
    return categorical(c, position, codes, levels, breakOf(c));
  });
  for (const c of columns) if (c.kind === 'categorical') whiteSpaceWarning(c, lineOf, warnings);
  const byName = new Map<string, Column>();
  for (const c of columns) byName.set(c.name, c);
  return {
    source: name,
    rows,
    columns,
    byName,
    lines: lineOf,
    warnings,
    delimiter,
    fingerprint: {
      sha256: hash.digest('hex'),
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

function lineEndWarning(name: string, ends: { lf: number; crlf: number; cr: number }): string | undefined {
  const kinds = (['lf', 'crlf', 'cr'] as const).filter((k) => ends[k] > 0).sort((a, b) => ends[a] - ends[b]);
  if (kinds.length < 2) return undefined;
  const label = { lf: 'LF', crlf: 'CRLF', cr: 'CR' } as const;
  const [first, second] = kinds;
  return `${name}: mixed line ends: line ${ends[first]} ends with ${label[first]}, line ${ends[second]} with ${label[second]}; each LF, CRLF and lone CR is read as one line end, never as part of a value`;
}

interface FinishContext {
  readonly name: string;
  readonly rows: number;
  readonly lineOf: Int32Array;
  readonly warnings: string[];
  readonly dateFormat?: DateOrder;
}

const SECOND_PASS = Symbol('second pass');

/** What a level text is to the numeric rule. */
const NUMBER = 0;
const TOO_LARGE = 1;
const INFINITE = 2;
const TEXT = 3;

function levelKind(text: string): number {
  const t = trimmed(text);
  if (DECIMAL.test(t)) return Number.isFinite(Number(t)) ? NUMBER : TOO_LARGE;
  return INFINITE_WORD.test(t) ? INFINITE : TEXT;
}

/** The first cells that broke each column's type, found while deciding (for breakOf). */
const breaks = new WeakMap<ColumnBuilder, TypeBreak>();

function breakOf(c: ColumnBuilder): TypeBreak | undefined {
  return breaks.get(c);
}

/** Lines of the first `max` rows after the switch whose code satisfies `pick`. */
function firstCells(c: ColumnBuilder, lineOf: Int32Array, pick: (code: number) => boolean, max: number): { line: number; text: string }[] {
  const out: { line: number; text: string }[] = [];
  for (let r = 0; r < c.codeLength && out.length < max; r++) {
    const k = c.codes[r];
    if (k >= 0 && pick(k)) out.push({ line: lineOf[c.switchRow + r], text: c.levels[k] });
  }
  return out;
}

function numericColumn(c: ColumnBuilder, position: number, values: Float64Array, extra: Partial<NumericColumn> = {}): NumericColumn {
  return { kind: 'numeric', name: c.name, position, values, missing: c.missing, ...extra };
}

function categorical(c: ColumnBuilder, position: number, codes: Int32Array, levels: readonly string[], typeBreak?: TypeBreak): CategoricalColumn {
  return { kind: 'categorical', name: c.name, position, codes, levels, missing: c.missing, ...(typeBreak ? { breaks: typeBreak } : {}) };
}

/** Codes for all rows of a column whose rows before the switch were all missing. */
function fullCodes(c: ColumnBuilder, rows: number): Int32Array {
  if (c.switchRow === 0 && c.codeLength === rows) return c.codes.length - rows <= rows / 16 ? c.codes.subarray(0, rows) : c.codes.slice(0, rows);
  const out = new Int32Array(rows).fill(-1, 0, c.switchRow);
  out.set(c.codes.subarray(0, c.codeLength), c.switchRow);
  return out;
}

/** Types one column by the README's rules; SECOND_PASS when it ends categorical after numbers. */
function decide(ctx: FinishContext, c: ColumnBuilder, position: number): Column | typeof SECOND_PASS {
  const { name, rows, lineOf, warnings } = ctx;
  if (c.numeric) {
    if (c.numbers > 0) {
      if (c.bigIntegers) warnings.push(`column ${quoted(c.name)} has integers beyond 2^53; they are read as the nearest double`);
      return numericColumn(c, position, c.numericValues());
    }
    c.dropValues();
    return categorical(c, position, new Int32Array(rows).fill(-1), []);
  }
  if (!c.forced) {
    const kinds = c.levels.map(levelKind);
    const count = (kind: number): number => kinds.filter((k) => k === kind).length;
    const firstLine = (kind: number): number => firstCells(c, lineOf, (k) => kinds[k] === kind, 1)[0].line;
    const firstText = (kind: number): string => c.levels[kinds.indexOf(kind)];
    const hasNumbers = c.numbers > 0 || count(NUMBER) > 0;
    if (count(TEXT) === 0 && count(TOO_LARGE) > 0) {
      throw new InputError(
        `${name}: line ${firstLine(TOO_LARGE)}, column ${quoted(c.name)}: ${quoted(trimmed(firstText(TOO_LARGE)))} is too large for a double; fix the value or list it with --missing`,
      );
    }
    if (count(TEXT) === 0 && count(INFINITE) > 0 && hasNumbers) {
      throw new InputError(`${name}: line ${firstLine(INFINITE)}, column ${quoted(c.name)}: ${quoted(firstText(INFINITE))} is not a finite number; fix it or list it with --missing`);
    }
    const nonMissing = rows - c.missing;
    const textual = kinds.filter((k) => k !== NUMBER).length;
    if (hasNumbers && textual > 0) {
      let textRows = 0;
      for (let r = 0; r < c.codeLength; r++) if (c.codes[r] >= 0 && kinds[c.codes[r]] !== NUMBER) textRows++;
      if (textual <= 3 && textRows <= 0.1 * nonMissing) {
        const cells = firstCells(c, lineOf, (k) => kinds[k] !== NUMBER, 3);
        const k = kinds.findIndex((x) => x !== NUMBER);
        warnings.push(
          `column ${quoted(c.name)} is numeric but for ${textRows} cell${textRows === 1 ? '' : 's'} such as ${quoted(c.levels[k])} (line ${firstCells(c, lineOf, (x) => x === k, 1)[0].line}): read as categorical; if that text means missing, add it with --missing`,
        );
        breaks.set(c, { expected: 'numbers', cells: textRows, examples: cells });
      }
    }
    if (c.numbers === 0 && c.levels.length > 0) {
      const texts = c.levels.map(trimmed);
      const cellsOf = (bad: readonly number[]): number => {
        const isBad = new Uint8Array(c.levels.length);
        for (const k of bad) isBad[k] = 1;
        let n = 0;
        for (let r = 0; r < c.codeLength; r++) if (c.codes[r] >= 0 && isBad[c.codes[r]]) n++;
        return n;
      };
      const verdict = readDates(texts, ctx.dateFormat, (bad) => bad.length <= 3 && cellsOf(bad) <= 0.1 * nonMissing);
      if (verdict.kind === 'dates') {
        const out = new Float64Array(rows).fill(NaN, 0, c.switchRow);
        for (let r = 0; r < c.codeLength; r++) out[c.switchRow + r] = c.codes[r] < 0 ? NaN : verdict.days[c.codes[r]];
        return numericColumn(c, position, out, { dates: true, dateReading: verdict.shape.read });
      }
      if (verdict.kind === 'broken') {
        const isBad = new Set(verdict.bad);
        const cells = firstCells(c, lineOf, (k) => isBad.has(k), 3);
        const n = cellsOf(verdict.bad);
        warnings.push(
          `column ${quoted(c.name)} holds dates (${verdict.shape.read}) but for ${n} cell${n === 1 ? '' : 's'} such as ${quoted(cells[0].text)} (line ${cells[0].line}), which ${n === 1 ? 'is' : 'are'} not a date that exists: read as categorical; fix the cell or list the text with --missing`,
        );
        breaks.set(c, { expected: 'dates', cells: n, examples: cells });
      } else if (verdict.kind === 'ambiguous') {
        const example = c.levels[verdict.example];
        const fits = verdict.fits.length === 1 ? `; every value fits only ${verdict.fits[0]}` : '';
        const sep = verdict.fits[0]?.[1] ?? (example.includes('/') ? '/' : '-');
        warnings.push(
          `column ${quoted(c.name)} holds dates such as ${quoted(example)} whose day and month order the file does not say: read as categorical; give --date-format d${sep}m${sep}y or m${sep}d${sep}y to read them as dates${fits}`,
        );
      }
    }
  }
  if (c.numbers > 0) return SECOND_PASS;
  return categorical(c, position, fullCodes(c, rows), c.levels, breakOf(c));
}

/** Reads the source again for the texts of rows before each deferred column's switch. */
async function secondPass(
  source: CsvSource,
  kept: Buffer[] | undefined,
  delimiter: string,
  name: string,
  deferred: readonly { j: number; pre: PreSwitchCodes }[],
): Promise<void> {
  const wanted: (PreSwitchCodes | undefined)[] = [];
  for (const d of deferred) wanted[d.j] = d.pre;
  let open = deferred.length;
  const done = new Error('enough rows');
  const sink: ScanSink = {
    header: () => {},
    cell: (j, buf, s, e) => {
      const p = wanted[j];
      if (p?.wanted) p.add(buf as Buffer, s, e);
    },
    row: () => {
      for (let j = 0; j < wanted.length; j++) {
        const p = wanted[j];
        if (p && !p.wanted) {
          wanted[j] = undefined;
          open--;
        }
      }
      if (open === 0) throw done;
    },
  };
  const scanner = new CsvScanner(delimiter.charCodeAt(0), sink, name);
  const chunks: AsyncIterable<Buffer | string> | Iterable<Buffer> =
    kept ?? ('text' in source ? [Buffer.from(source.text, 'utf8')] : createReadStream((source as { path: string }).path, { highWaterMark: CHUNK }));
  try {
    for await (const piece of chunks) scanner.push(asBuffer(piece));
    scanner.end();
  } catch (e) {
    if (e === done) return;
    throw e instanceof InputError ? e : fileError(name, e);
  }
  if (open > 0) throw new InputError(`${name}: changed while it was being read (it has fewer rows on the second read); load it again when nothing writes to it`);
}

/** Warns when two levels of a categorical column differ only by white space around them. */
function whiteSpaceWarning(c: CategoricalColumn, lineOf: Int32Array, warnings: string[]): void {
  const levels = c.levels;
  if (!levels.some((t) => trimmed(t) !== t)) return;
  const seen = new Map<string, number>();
  let pairs = 0;
  let first: [number, number] | undefined;
  for (let k = 0; k < levels.length; k++) {
    const t = levels[k].trim();
    const before = seen.get(t);
    if (before === undefined) seen.set(t, k);
    else {
      pairs++;
      first ??= [before, k];
    }
  }
  if (!first) return;
  const [a, b] = first;
  let line = -1;
  for (let i = 0; i < c.codes.length; i++) {
    if (c.codes[i] === b) {
      line = lineOf[i];
      break;
    }
  }
  warnings.push(
    `column ${quoted(c.name)} has values that differ only by white space around them (${pairs} level${pairs === 1 ? '' : 's'} repeating another), such as ${quoted(levels[a])} and ${quoted(levels[b])} (line ${line}): they are read as different values; remove the spaces in the file if they mean the same`,
  );
}
