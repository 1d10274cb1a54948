/**
 * Seeded byte-level mutations of a valid CSV for the fuzz run: bit flips and random bytes,
 * deleted or doubled delimiters and quotes, truncated lines and files, inserted NUL, BOM, CR
 * and LF bytes, bad and good multi-byte UTF-8, odd number texts (huge, infinite, beyond 2^53,
 * hexadecimal...), duplicated, deleted and swapped lines, header names that clash or look like
 * code, empty cells and quoted line breaks. Every mutation is a pure function of the bytes and
 * the generator, so a case is replayed from its seed alone.
 */
import type { Rng } from '../../src/rng.js';

export interface Mutation {
  readonly name: string;
  readonly apply: (bytes: Buffer, rng: Rng) => Buffer;
}

const b = (text: string): Buffer => Buffer.from(text, 'utf8');

function insertAt(bytes: Buffer, at: number, piece: Buffer): Buffer {
  return Buffer.concat([bytes.subarray(0, at), piece, bytes.subarray(at)]);
}

function positionsOf(bytes: Buffer, byte: number): number[] {
  const out: number[] = [];
  for (let i = bytes.indexOf(byte); i >= 0; i = bytes.indexOf(byte, i + 1)) out.push(i);
  return out;
}

function pick<T>(items: readonly T[], rng: Rng): T {
  return items[rng.int(items.length)];
}

/** [start, end) of each line, without its "\n". */
function lineSpans(bytes: Buffer): [number, number][] {
  const spans: [number, number][] = [];
  let start = 0;
  for (const nl of positionsOf(bytes, 10)) {
    spans.push([start, nl]);
    start = nl + 1;
  }
  if (start < bytes.length) spans.push([start, bytes.length]);
  return spans;
}

/** [start, end) of each field of the text between delimiters and line breaks (quotes ignored). */
function fieldSpans(bytes: Buffer): [number, number][] {
  const spans: [number, number][] = [];
  let start = 0;
  for (let i = 0; i <= bytes.length; i++) {
    if (i === bytes.length || bytes[i] === 44 || bytes[i] === 10 || bytes[i] === 13) {
      spans.push([start, i]);
      start = i + 1;
    }
  }
  return spans;
}

function replaceSpan(bytes: Buffer, [s, e]: [number, number], piece: Buffer): Buffer {
  return Buffer.concat([bytes.subarray(0, s), piece, bytes.subarray(e)]);
}

/** Number texts from the loader's edge cases: overflow, infinity words, 2^53 + 1, other notations. */
export const ODD_NUMBERS = [
  '1e309', '-1e309', '1e-400', '9007199254740993', '-9007199254740993', '123456789012345678901234567890',
  'Infinity', '-Infinity', 'inf', 'NaN', '-0', '+0', '0x1F', '1_000', ' 12 ', '+5', '.5', '5.', '1e5', '1E+05',
  '١٢', '1,5', '--1', '1e', 'e1', '', 'NA', '?', 'null', 'TRUE',
];

const PIECES = {
  nul: Buffer.from([0]),
  bom: Buffer.from([0xef, 0xbb, 0xbf]),
  cr: b('\r'),
  lf: b('\n'),
  crlf: b('\r\n'),
  badLead: Buffer.from([0xc3]),
  ff: Buffer.from([0xff]),
  surrogate: Buffer.from([0xed, 0xa0, 0x80]),
  overlong: Buffer.from([0xc0, 0xaf]),
  accented: b('é'),
  greek: b('δ'),
  emoji: b('😀'),
};

export const MUTATIONS: readonly Mutation[] = [
  {
    name: 'flip-bit',
    apply: (x, r) => {
      if (!x.length) return x;
      const y = Buffer.from(x);
      y[r.int(y.length)] ^= 1 << r.int(8);
      return y;
    },
  },
  {
    name: 'random-byte',
    apply: (x, r) => {
      if (!x.length) return x;
      const y = Buffer.from(x);
      y[r.int(y.length)] = r.int(256);
      return y;
    },
  },
  {
    name: 'delete-delimiter',
    apply: (x, r) => {
      const at = positionsOf(x, 44);
      if (!at.length) return x;
      const i = pick(at, r);
      return Buffer.concat([x.subarray(0, i), x.subarray(i + 1)]);
    },
  },
  {
    name: 'double-delimiter',
    apply: (x, r) => {
      const at = positionsOf(x, 44);
      return at.length ? insertAt(x, pick(at, r), b(',')) : x;
    },
  },
  {
    name: 'delete-quote',
    apply: (x, r) => {
      const at = positionsOf(x, 34);
      if (!at.length) return x;
      const i = pick(at, r);
      return Buffer.concat([x.subarray(0, i), x.subarray(i + 1)]);
    },
  },
  { name: 'insert-quote', apply: (x, r) => insertAt(x, r.int(x.length + 1), b('"')) },
  { name: 'quote-a-field-open', apply: (x, r) => (x.length ? replaceSpan(x, pick(fieldSpans(x), r), b('"unclosed')) : x) },
  {
    name: 'truncate-line',
    apply: (x, r) => {
      const spans = lineSpans(x);
      if (!spans.length) return x;
      const [s, e] = pick(spans, r);
      return Buffer.concat([x.subarray(0, s + r.int(e - s + 1)), x.subarray(e)]);
    },
  },
  { name: 'truncate-file', apply: (x, r) => x.subarray(0, r.int(x.length + 1)) },
  ...(['nul', 'bom', 'cr', 'lf', 'crlf', 'badLead', 'ff', 'surrogate', 'overlong', 'accented', 'greek', 'emoji'] as const).map((k) => ({
    name: `insert-${k}`,
    apply: (x: Buffer, r: Rng) => insertAt(x, r.int(x.length + 1), PIECES[k]),
  })),
  { name: 'bom-at-start', apply: (x) => Buffer.concat([PIECES.bom, x]) },
  // latin1 maps bytes to characters one to one, so these keep every other byte as it is
  { name: 'crlf-everywhere', apply: (x) => Buffer.from(x.toString('latin1').replace(/\n/g, '\r\n'), 'latin1') },
  { name: 'cr-only', apply: (x) => Buffer.from(x.toString('latin1').replace(/\n/g, '\r'), 'latin1') },
  { name: 'odd-number', apply: (x, r) => (x.length ? replaceSpan(x, pick(fieldSpans(x), r), b(pick(ODD_NUMBERS, r))) : x) },
  {
    name: 'odd-number-column',
    apply: (x, r) => {
      // the same odd text in one field of every line after the header, so a whole column turns
      const spans = lineSpans(x);
      const text = pick(ODD_NUMBERS, r);
      const col = r.int(5);
      let out = x;
      for (let li = spans.length - 1; li >= 1; li--) {
        if (r.next() < 0.5) continue;
        const [s, e] = spans[li];
        const fields = fieldSpans(out.subarray(s, e));
        if (col < fields.length) out = replaceSpan(out, [s + fields[col][0], s + fields[col][1]], b(text));
      }
      return out;
    },
  },
  { name: 'huge-field', apply: (x, r) => (x.length ? replaceSpan(x, pick(fieldSpans(x), r), b('w'.repeat(1000 + r.int(20000)))) : x) },
  { name: 'empty-field', apply: (x, r) => (x.length ? replaceSpan(x, pick(fieldSpans(x), r), b('')) : x) },
  { name: 'quoted-line-break', apply: (x, r) => (x.length ? replaceSpan(x, pick(fieldSpans(x), r), b('"two\nlines, and ""quotes"""')) : x) },
  {
    name: 'duplicate-line',
    apply: (x, r) => {
      const spans = lineSpans(x);
      if (!spans.length) return x;
      const [s, e] = pick(spans, r);
      return insertAt(x, e, Buffer.concat([b('\n'), x.subarray(s, e)]));
    },
  },
  {
    name: 'delete-line',
    apply: (x, r) => {
      const spans = lineSpans(x);
      if (!spans.length) return x;
      const [s, e] = pick(spans, r);
      return Buffer.concat([x.subarray(0, s), x.subarray(Math.min(x.length, e + 1))]);
    },
  },
  {
    name: 'swap-lines',
    apply: (x, r) => {
      const spans = lineSpans(x);
      if (spans.length < 2) return x;
      const i = r.int(spans.length);
      const j = r.int(spans.length);
      if (i === j) return x;
      const lines = spans.map(([s, e]) => x.subarray(s, e));
      [lines[i], lines[j]] = [lines[j], lines[i]];
      return Buffer.concat(lines.flatMap((l, k) => (k < lines.length - 1 ? [l, b('\n')] : [l, ...(x[x.length - 1] === 10 ? [b('\n')] : [])])));
    },
  },
  {
    name: 'header-name',
    apply: (x, r) => {
      const spans = lineSpans(x);
      if (!spans.length) return x;
      const fields = fieldSpans(x.subarray(spans[0][0], spans[0][1]));
      const f = pick(fields, r);
      const name = pick(['a', 'y', 'z', '__proto__', 'constructor', 'toString', '', ' ', '--target', 'y ', 'Y', '"q"', 'a"b'], r);
      return replaceSpan(x, [spans[0][0] + f[0], spans[0][0] + f[1]], b(name));
    },
  },
  { name: 'blank-lines', apply: (x, r) => insertAt(x, pick([0, ...positionsOf(x, 10)], r), b('\n\n')) },
  { name: 'only-header', apply: (x) => x.subarray(0, Math.max(0, x.indexOf(10) + 1)) },
];

export interface Mutant {
  readonly bytes: Buffer;
  /** names of the mutations applied, in order */
  readonly applied: readonly string[];
}

/** Applies 1 to 3 random mutations to `base`. */
export function mutate(base: Buffer, rng: Rng): Mutant {
  let bytes = base;
  const applied: string[] = [];
  const count = 1 + rng.int(3);
  for (let m = 0; m < count; m++) {
    const mutation = pick(MUTATIONS, rng);
    bytes = mutation.apply(bytes, rng);
    applied.push(mutation.name);
  }
  return { bytes, applied };
}
