/**
 * One column while the CSV streams in. A column starts on the numeric path: each cell's bytes
 * are parsed straight into a growing Float64Array (NaN for a missing token). At the first cell
 * that is neither a number nor missing (or from the first row, for a --categorical column) it
 * switches to dictionary coding: from that row on, each cell's text gets a code through a Map.
 * The rows before the switch keep their numbers; if the column ends categorical, the loader
 * reads their texts again (`pass2`) to give them their levels.
 */
import { InputError } from '../errors.js';
import { ByteDict, hashBytes } from './byte-dict.js';
import { quoted } from './quote.js';
import { type Alloc, PLAIN, trimmedF64 } from './alloc.js';

/** A decimal number as text: optional sign, digits with an optional point, optional exponent. */
export const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
export const INFINITE_WORD = /^[+-]?(?:inf|infinity)$/i;

const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * The value of a plain decimal in bytes [s, e) (the DECIMAL syntax, no surrounding spaces),
 * or NaN when the text is not one or needs the general conversion. Exact: with at most 15
 * significant digits the digits form an exact double m, and 10^k for |k| <= 22 is exact, so
 * m * 10^k or m / 10^k is one correctly rounded operation, the same double Number(text) gives
 * (Clinger 1990, "How to read floating point numbers accurately", the fast path).
 */
export function fastDecimal(b: Uint8Array, s: number, e: number): number {
  let i = s;
  if (i >= e) return NaN;
  let c = b[i];
  const neg = c === 45;
  if (neg || c === 43) {
    if (++i === e) return NaN;
  }
  let m = 0;
  let digits = 0;
  let scale = 0;
  let any = false;
  for (; i < e; i++) {
    c = b[i] - 48;
    if (c < 0 || c > 9) break;
    m = m * 10 + c;
    if (m !== 0) digits++;
    any = true;
  }
  if (i < e && b[i] === 46) {
    for (i++; i < e; i++) {
      c = b[i] - 48;
      if (c < 0 || c > 9) break;
      m = m * 10 + c;
      if (m !== 0) digits++;
      scale--;
      any = true;
    }
  }
  if (!any || digits > 15) return NaN;
  if (i < e) {
    c = b[i];
    if (c !== 101 && c !== 69) return NaN;
    i++;
    let eneg = false;
    if (i < e && (b[i] === 45 || b[i] === 43)) eneg = b[i++] === 45;
    let x = 0;
    let xd = 0;
    for (; i < e; i++) {
      c = b[i] - 48;
      if (c < 0 || c > 9) return NaN;
      x = x * 10 + c;
      if (++xd > 4) return NaN;
    }
    if (xd === 0) return NaN;
    scale += eneg ? -x : x;
  }
  let v: number;
  if (scale === 0) v = m;
  else if (scale > 0 && scale <= 22) v = m * POW10[scale];
  else if (scale < 0 && scale >= -22) v = m / POW10[-scale];
  else return NaN;
  return neg ? -v : v;
}

/** The text with surrounding spaces (and other characters up to U+0020) trimmed, cheaply when there are none. */
export function trimmed(text: string): string {
  return text.length > 0 && (text.charCodeAt(0) <= 32 || text.charCodeAt(text.length - 1) <= 32) ? text.trim() : text;
}

const INITIAL = 1024;

export class ColumnBuilder {
  /** true while on the numeric path */
  numeric: boolean;
  values: Float64Array;
  /** rows on the numeric path (all rows while `numeric`) */
  length = 0;
  /** first row in dictionary coding, -1 while numeric */
  switchRow = -1;
  /** non-missing numbers before the switch */
  numbers = 0;
  codes: Int32Array<ArrayBuffer> = new Int32Array(0);
  codeLength = 0;
  private readonly dict = new ByteDict();
  readonly levels: string[] = [];
  missing = 0;
  bigIntegers = false;

  constructor(
    readonly name: string,
    readonly forced: boolean,
    private readonly missingTokens: ReadonlySet<string>,
    /** the missing tokens as bytes, for cells without surrounding white space */
    private readonly missingBytes: ByteDict,
    /** rows expected (from the file size), to size the buffers once */
    capacity = INITIAL,
    /** where the numbers go (shared memory for a table bound for worker threads) */
    private readonly alloc: Alloc = PLAIN,
  ) {
    this.numeric = !forced;
    this.values = forced ? new Float64Array(0) : alloc.f64(Math.max(16, capacity));
    if (forced) this.toDictionary(capacity);
  }

  add(buf: Buffer, s: number, e: number): void {
    if (this.numeric) {
      const v = fastDecimal(buf, s, e);
      if (v === v) {
        this.pushValue(v);
        this.numbers++;
        return;
      }
      const text = s === e ? '' : buf.toString('utf8', s, e);
      const t = trimmed(text);
      if (this.missingTokens.has(t)) {
        this.pushValue(NaN);
        this.missing++;
        return;
      }
      if (DECIMAL.test(t)) {
        const x = Number(t);
        if (Number.isFinite(x)) {
          if (Number.isInteger(x) && Math.abs(x) > Number.MAX_SAFE_INTEGER) this.bigIntegers = true;
          this.pushValue(x);
          this.numbers++;
          return;
        }
      }
      this.toDictionary(Math.max(INITIAL, this.values.length - this.length));
    }
    this.addCode(buf, s, e);
  }

  private addCode(buf: Buffer, s: number, e: number): void {
    if (this.codeLength === this.codes.length) this.codes = grow32(this.codes);
    const h = hashBytes(buf, s, e);
    let missing: boolean;
    if (s < e && buf[s] > 32 && buf[e - 1] > 32) missing = this.missingBytes.size > 0 && this.missingBytes.get(buf, s, e, h) >= 0;
    else missing = this.missingTokens.has(s === e ? '' : buf.toString('utf8', s, e).trim());
    if (missing) {
      this.codes[this.codeLength++] = -1;
      this.missing++;
      return;
    }
    let code = this.dict.get(buf, s, e, h);
    if (code < 0) {
      code = this.dict.add(buf, s, e, h);
      this.levels.push(s === e ? '' : buf.toString('utf8', s, e));
    }
    this.codes[this.codeLength++] = code;
  }

  private pushValue(v: number): void {
    if (this.length === this.values.length) {
      const next = this.alloc.f64(Math.ceil(this.values.length * 1.5) + 16);
      next.set(this.values);
      this.values = next;
    }
    this.values[this.length++] = v;
  }

  private toDictionary(capacity: number): void {
    this.numeric = false;
    this.switchRow = this.length;
    // keep only the numbers read so far (needed to type the column and to check a second pass)
    this.values = this.length === 0 ? new Float64Array(0) : this.values.slice(0, this.length);
    this.codes = new Int32Array(Math.max(16, capacity));
  }

  /**
   * The numbers of a column that stayed numeric, as many as rows: a view when the buffer is at
   * most 1/16 longer (no copy of the whole column at the end), a copy otherwise.
   */
  numericValues(): Float64Array {
    return trimmedF64(this.alloc, this.values, this.length);
  }

  /** Frees the number buffer once a column ends categorical. */
  dropValues(): void {
    this.values = new Float64Array(0);
  }
}

function grow32(a: Int32Array): Int32Array<ArrayBuffer> {
  const next = new Int32Array(Math.max(1024, Math.ceil(a.length * 1.5)));
  next.set(a);
  return next;
}

/**
 * Codes for the rows of a switched column before its switch, from their texts read again, in
 * order of first appearance, followed by the levels met after the switch. Checks that each
 * text is the number the first pass read (a file that changed between the passes is refused).
 */
export class PreSwitchCodes {
  readonly codes: Int32Array;
  readonly dict = new Map<string, number>();
  readonly levels: string[] = [];
  private row = 0;
  constructor(
    private readonly col: ColumnBuilder,
    total: number,
    private readonly missingTokens: ReadonlySet<string>,
    private readonly source: string,
    private readonly lines: Int32Array,
  ) {
    this.codes = new Int32Array(total);
  }
  /** true while rows before the switch are still wanted */
  get wanted(): boolean {
    return this.row < this.col.switchRow;
  }
  add(buf: Buffer, s: number, e: number): void {
    const line = this.lines[this.row];
    const text = s === e ? '' : buf.toString('utf8', s, e);
    const t = trimmed(text);
    const expected = this.col.values[this.row];
    if (this.missingTokens.has(t)) {
      if (!Number.isNaN(expected)) throw this.changed(line);
      this.codes[this.row++] = -1;
      return;
    }
    if (Number(t) !== expected) throw this.changed(line);
    let code = this.dict.get(text);
    if (code === undefined) {
      code = this.levels.length;
      this.dict.set(text, code);
      this.levels.push(text);
    }
    this.codes[this.row++] = code;
  }
  /** Appends the rows after the switch, renumbering their codes. */
  finish(): { codes: Int32Array; levels: string[] } {
    const c = this.col;
    const remap = new Int32Array(c.levels.length);
    for (let k = 0; k < c.levels.length; k++) {
      let code = this.dict.get(c.levels[k]);
      if (code === undefined) {
        code = this.levels.length;
        this.dict.set(c.levels[k], code);
        this.levels.push(c.levels[k]);
      }
      remap[k] = code;
    }
    for (let r = 0; r < c.codeLength; r++) this.codes[c.switchRow + r] = c.codes[r] < 0 ? -1 : remap[c.codes[r]];
    return { codes: this.codes, levels: this.levels };
  }
  private changed(line: number): Error {
    return new InputError(`${this.source}: line ${line}, column ${quoted(this.col.name)} changed while it was being read; load it again when nothing writes to it`);
  }
}
