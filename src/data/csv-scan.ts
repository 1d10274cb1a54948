/**
 * A CSV scanner over raw bytes (RFC 4180 with the tolerances listed below), resumable across
 * chunks: its whole state lives in the object, so a field that spans many chunks is scanned
 * once and kept as a list of pieces (one 50 MB field costs linear time, not quadratic).
 *
 * - Fields are separated by a one-byte delimiter; a field that starts with `"` is quoted: it
 *   ends at the next lone `"`, `""` inside it is one quote, and it may hold delimiters and line
 *   breaks. After the closing quote only spaces or tabs may come before the delimiter or the
 *   line end; anything else is an error naming the row's line. A `"` inside an unquoted field
 *   is kept as text.
 * - A row ends at LF, CRLF or a lone CR outside quotes. The scanner records the first line
 *   ending of each kind so the loader can say when a file mixes them (the CR of a CRLF is
 *   never part of a cell, so `P` stays `P` whatever the line ends are).
 * - Blank lines are skipped (before the header always; after it when the header has more than
 *   one column; in a one-column file a blank line is a row with an empty cell). Nothing after
 *   the last line end is a row.
 *
 * The scanner hands each field to a sink as bytes `[start, end)` of a buffer (quotes removed,
 * `""` unescaped), so a number can be parsed without making a string. It decodes only the
 * header row into strings itself.
 */
import { InputError } from '../errors.js';

const LF = 10;
const CR = 13;
const QUOTE = 34;
const SPACE = 32;
const TAB = 9;

const START = 0;
const UNQUOTED = 1;
const QUOTED = 2;
/** inside a quoted field, the previous chunk ended on a quote: `""` or the closing quote */
const QUOTE_SEEN = 3;
const AFTER_CLOSE = 4;

export interface ScanSink {
  /** the header row (BOM removed); returns nothing, throws to refuse it */
  header(names: string[]): void;
  /** field j (< header width) of the current data row: bytes [start, end) of buf */
  cell(j: number, buf: Uint8Array, start: number, end: number): void;
  /** the current data row is complete and has as many fields as the header; it began on `line` */
  row(line: number): void;
}

/** First line (1-based) that ended with each kind of line end, 0 when none did. */
export interface LineEnds {
  lf: number;
  crlf: number;
  cr: number;
}

export class CsvScanner {
  /** line number the scanner is on (1-based, counting line breaks inside quoted fields) */
  line = 1;
  /** data rows handed to the sink */
  rows = 0;
  /** header width, 0 until the header is read */
  width = 0;
  readonly ends: LineEnds = { lf: 0, crlf: 0, cr: 0 };
  private state = START;
  private skipLF = false;
  private quoted = false;
  private pieces: Uint8Array[] = [];
  private piecesLength = 0;
  private j = 0;
  private rowLine = 1;
  private headerNames: string[] | null = [];

  /** 1 for the bytes that end an unquoted field: the delimiter, LF and CR */
  private readonly stops = new Uint8Array(256);

  constructor(
    private readonly delimiter: number,
    private readonly sink: ScanSink,
    private readonly sourceName: string,
  ) {
    this.stops[delimiter] = this.stops[LF] = this.stops[CR] = 1;
  }

  /** Scans one chunk; throws InputError on a malformed quote or a row of the wrong width. */
  push(buf: Uint8Array): void {
    const n = buf.length;
    const d = this.delimiter;
    let state = this.state;
    let i = 0;
    let start = 0;
    while (i < n) {
      if (state === START) {
        const b = buf[i];
        if (this.skipLF) {
          this.skipLF = false;
          if (b === LF) {
            if (this.ends.crlf === 0) this.ends.crlf = this.line - 1;
            i++;
            continue;
          }
          if (this.ends.cr === 0) this.ends.cr = this.line - 1;
        }
        if (b === QUOTE) {
          this.quoted = true;
          state = QUOTED;
          start = ++i;
          continue;
        }
        this.quoted = false;
        state = UNQUOTED;
        start = i;
      }
      if (state === UNQUOTED) {
        let k = i;
        let b = 0;
        const stops = this.stops;
        while (k < n) {
          b = buf[k];
          if (stops[b] === 1) break;
          k++;
        }
        if (k === n) {
          this.keep(buf, start, n);
          i = n;
          break;
        }
        i = k + 1;
        state = START;
        if (b === d) {
          this.field(buf, start, k);
          continue;
        }
        // a line end: a blank line is no row (but a one-column file's blank line is an empty cell)
        const blank = this.j === 0 && k === start && this.piecesLength === 0;
        if (!(blank && (this.headerNames !== null || this.width > 1))) this.field(buf, start, k);
        this.lineEnd(b, blank);
        continue;
      }
      if (state === QUOTED) {
        const q = indexOfByte(buf, QUOTE, i);
        if (q < 0) {
          this.countLF(buf, i, n);
          this.keep(buf, start, n);
          i = n;
          break;
        }
        this.countLF(buf, i, q);
        if (q + 1 === n) {
          this.keep(buf, start, q);
          state = QUOTE_SEEN;
          i = n;
          break;
        }
        if (buf[q + 1] === QUOTE) {
          this.keep(buf, start, q + 1);
          start = i = q + 2;
          continue;
        }
        this.keep(buf, start, q);
        state = AFTER_CLOSE;
        i = q + 1;
        continue;
      }
      if (state === QUOTE_SEEN) {
        if (buf[i] === QUOTE) {
          this.keep(QUOTE_BYTE, 0, 1);
          start = ++i;
          state = QUOTED;
          continue;
        }
        state = AFTER_CLOSE;
      }
      // AFTER_CLOSE
      const b = buf[i];
      if (b === d) {
        this.field(buf, i, i);
        state = START;
        i++;
        continue;
      }
      if (b === LF || b === CR) {
        this.field(buf, i, i);
        this.lineEnd(b, false);
        state = START;
        i++;
        continue;
      }
      if (b === SPACE || b === TAB) {
        i++;
        continue;
      }
      throw new InputError(`${this.sourceName}: line ${this.rowLine}: trailing quote on quoted field is malformed; check the quoting of that row`);
    }
    this.state = state;
  }

  /** The end of the input: finishes a last row that has no line end. */
  end(): void {
    if (this.skipLF) {
      this.skipLF = false;
      if (this.ends.cr === 0) this.ends.cr = this.line - 1;
    }
    const state = this.state;
    if (state === QUOTED) {
      throw new InputError(`${this.sourceName}: line ${this.rowLine}: quoted field unterminated; check the quoting of that row`);
    }
    if (state === START && this.j === 0) return;
    this.field(EMPTY, 0, 0);
    this.finishRow();
    this.state = START;
  }

  private lineEnd(b: number, blank: boolean): void {
    if (b === CR) this.skipLF = true;
    else if (this.ends.lf === 0) this.ends.lf = this.line;
    if (blank && (this.headerNames !== null || this.width > 1)) {
      this.line++;
      this.rowLine = this.line;
      return;
    }
    this.finishRow();
  }

  private finishRow(): void {
    const fields = this.j;
    const rowLine = this.rowLine;
    this.j = 0;
    this.line++;
    this.rowLine = this.line;
    if (this.headerNames !== null) {
      const names = this.headerNames;
      if (names.length) names[0] = names[0].replace(/^\uFEFF/, '');
      this.headerNames = null;
      this.width = names.length;
      this.sink.header(names);
      return;
    }
    if (fields !== this.width) {
      throw new InputError(
        `${this.sourceName}: line ${rowLine} has ${fields} field${fields === 1 ? '' : 's'}, the header has ${this.width}; fix the row or check --delimiter`,
      );
    }
    this.rows++;
    this.sink.row(rowLine);
  }

  private keep(buf: Uint8Array, start: number, end: number): void {
    if (end > start) {
      this.pieces.push(buf.subarray(start, end));
      this.piecesLength += end - start;
    }
  }

  private field(buf: Uint8Array, start: number, end: number): void {
    let b = buf;
    let s = start;
    let e = end;
    if (this.pieces.length) {
      this.keep(buf, start, end);
      b = this.pieces.length === 1 ? this.pieces[0] : concat(this.pieces, this.piecesLength);
      s = 0;
      e = b.length;
      this.pieces = [];
      this.piecesLength = 0;
    }
    const j = this.j++;
    if (this.headerNames !== null) this.headerNames.push(Buffer.from(b.buffer, b.byteOffset + s, e - s).toString('utf8'));
    else if (j < this.width) this.sink.cell(j, b, s, e);
  }

  private countLF(buf: Uint8Array, from: number, to: number): void {
    for (let k = indexOfByte(buf, LF, from); k >= 0 && k < to; k = indexOfByte(buf, LF, k + 1)) this.line++;
  }
}

const EMPTY = Buffer.alloc(0);
const QUOTE_BYTE = Buffer.of(QUOTE);

function indexOfByte(buf: Uint8Array, byte: number, from: number): number {
  return buf.indexOf(byte, from);
}

function concat(pieces: readonly Uint8Array[], length: number): Buffer {
  const out = Buffer.allocUnsafe(length);
  let at = 0;
  for (const p of pieces) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}
