/**
 * The numeric fast path and its switch to dictionary coding (issue 14), and the byte scanner's
 * rules across chunk boundaries. The oracle in each check is computed in the test from the
 * texts themselves: the distinct texts of a column in order of first appearance (the level
 * rule the README states), and ECMAScript's own Number(text) for the value of a decimal.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Readable } from 'node:stream';
import { loadCsv } from '../../src/data/load-csv.js';
import { fastDecimal } from '../../src/data/column-build.js';
import { eachRecord } from '../../src/data/records.js';
import type { Table } from '../../src/data/types.js';
import { tempFolder } from '../helpers/tmp.js';

const text = (t: string) => ({ text: t, name: 'mem.csv' });

/** Distinct texts in order of first appearance, and each row's code (-1 for missing). */
function firstAppearance(texts: readonly string[], missing: ReadonlySet<string>): { levels: string[]; codes: number[] } {
  const index = new Map<string, number>();
  const codes = texts.map((t) => {
    if (missing.has(t.trim())) return -1;
    let k = index.get(t);
    if (k === undefined) index.set(t, (k = index.size));
    return k;
  });
  return { levels: [...index.keys()], codes };
}

function chunked(bytes: Buffer, size: number): Readable {
  const parts: Buffer[] = [];
  for (let i = 0; i < bytes.length; i += size) parts.push(bytes.subarray(i, i + size));
  return Readable.from(parts);
}

describe('numeric fast path and the switch to dictionary coding', () => {
  // 1,000,000 rows: x is a number on every row but row 900,000 (0-based), written in several
  // spellings of the same value ("1.50", "1.5", "015e-1") that are distinct levels once the
  // column is categorical
  const N = 1_000_000;
  const SWITCH = 900_000;
  const spell = (i: number): string => (i === SWITCH ? 'late text' : i % 7 === 0 ? 'NA' : i % 3 === 0 ? '1.50' : i % 3 === 1 ? '1.5' : `${i % 11}`);
  const xs = Array.from({ length: N }, (_, i) => spell(i));
  const csv = `x,y\n${xs.map((x, i) => `${x},${i % 2}`).join('\n')}\n`;
  const expected = firstAppearance(xs, new Set(['', 'NA', 'NaN', '?', 'null']));

  const check = (t: Table) => {
    expect(t.rows).toBe(N);
    const x = t.byName.get('x')!;
    expect(x.kind).toBe('categorical');
    if (x.kind !== 'categorical') return;
    expect(x.levels).toEqual(expected.levels);
    expect(x.codes.length).toBe(N);
    let same = 0;
    for (let i = 0; i < N; i++) if (x.codes[i] === expected.codes[i]) same++;
    expect(same).toBe(N);
    expect(x.missing).toBe(expected.codes.filter((c) => c < 0).length);
    const y = t.byName.get('y')!;
    expect(y.kind).toBe('numeric');
  };

  it('a text cell on row 900,000 of a numeric column: levels are the texts, in order of first appearance (text source)', async () => {
    check(await loadCsv(text(csv)));
  });

  it('the same from a file and from a stream in small chunks (the second pass reads the file again, or the kept bytes)', async () => {
    const tmp = tempFolder();
    check(await loadCsv({ path: tmp.file('late.csv', csv) }));
    check(await loadCsv({ stream: chunked(Buffer.from(csv), 65_536), name: 'stdin' }));
  });

  it('missing tokens keep a column numeric; a text cell after them switches it', async () => {
    const t = await loadCsv(text('a,b,c\n1,NA,x\nNA,2,\n?,3,4\n2.5,,5\n'));
    const a = t.byName.get('a')!;
    expect(a.kind === 'numeric' && Array.from(a.values)).toEqual([1, NaN, NaN, 2.5]);
    expect(a.missing).toBe(2);
    const b = t.byName.get('b')!;
    expect(b.kind === 'numeric' && Array.from(b.values)).toEqual([NaN, 2, 3, NaN]);
    const c = t.byName.get('c')!;
    expect(c.kind).toBe('categorical');
    expect(c.kind === 'categorical' && c.levels).toEqual(['x', '4', '5']);
    expect(c.kind === 'categorical' && Array.from(c.codes)).toEqual([0, -1, 1, 2]);
    // --missing replaces the tokens: NA is then text and makes the column categorical
    const own = await loadCsv(text('a\n1\nNA\n-\n'), { missing: ['', '-'] });
    const oa = own.byName.get('a')!;
    expect(oa.kind === 'categorical' && oa.levels).toEqual(['1', 'NA']);
    expect(oa.missing).toBe(1);
  });

  it('a column of missing cells then ISO dates is a date column; numbers then a date is categorical', async () => {
    const t = await loadCsv(text('d,e\n,1\nNA,2\n1970-01-02,2000-03-01\n'));
    const d = t.byName.get('d')!;
    expect(d.kind === 'numeric' && d.dates).toBe(true);
    expect(d.kind === 'numeric' && Array.from(d.values)).toEqual([NaN, NaN, 1]);
    const e = t.byName.get('e')!;
    expect(e.kind === 'categorical' && e.levels).toEqual(['1', '2', '2000-03-01']);
  });

  it('--categorical columns keep every text as a level, numbers included', async () => {
    const t = await loadCsv(text('a,b\n1.50,1\n1.5,2\n1.50,3\n,4\n'), { categorical: ['a'] });
    const a = t.byName.get('a')!;
    expect(a.kind === 'categorical' && a.levels).toEqual(['1.50', '1.5']);
    expect(a.kind === 'categorical' && Array.from(a.codes)).toEqual([0, 1, 0, -1]);
  });

  it('1e309 in a column that is categorical anyway is a level, not an error (issue 25, item 19)', async () => {
    const t = await loadCsv(text('a,b\n1e309,1\nred,2\n3,3\n'));
    const a = t.byName.get('a')!;
    expect(a.kind === 'categorical' && a.levels).toEqual(['1e309', 'red', '3']);
    // a column of numbers and 1e309 alone still stops, naming the cell
    await expect(loadCsv(text('a,b\n1,1\n1e309,2\n'))).rejects.toThrow(/line 3, column "a": "1e309" is too large for a double/);
  });

  it('fastDecimal gives the double Number(text) gives, or NaN to defer to it (ECMAScript Number as the reference)', () => {
    const decimal = fc
      .tuple(
        fc.constantFrom('', '+', '-'),
        fc.stringMatching(/^[0-9]{0,18}$/),
        fc.option(fc.stringMatching(/^[0-9]{0,18}$/)),
        fc.option(fc.tuple(fc.constantFrom('e', 'E'), fc.constantFrom('', '+', '-'), fc.stringMatching(/^[0-9]{0,4}$/))),
      )
      .map(([s, a, b, e]) => `${s}${a}${b === null ? '' : `.${b}`}${e === null ? '' : e.join('')}`);
    fc.assert(
      fc.property(decimal, (t) => {
        const bytes = Buffer.from(t);
        const v = fastDecimal(bytes, 0, bytes.length);
        const ok = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(t);
        if (!ok) return Number.isNaN(v);
        return Number.isNaN(v) || Object.is(v, Number(t));
      }),
      { numRuns: 20_000, seed: 14 },
    );
    // the fast path takes the common spellings
    for (const t of ['0', '-0', '1.5', '-0.1234', '.5', '5.', '1e5', '123456789012345', '2.5E-3']) {
      expect(Object.is(fastDecimal(Buffer.from(t), 0, t.length), Number(t))).toBe(true);
    }
  });
});

describe('loading into shared memory (shared: true, for worker threads)', () => {
  // 30,000 rows from a stream of small chunks (no file size, so the buffers grow as rows come),
  // a column that switches to coded levels, one of missing cells only, and a date column
  const N = 30_000;
  const rows = Array.from({ length: N }, (_, i) => `${(i * 0.37) % 13},${i === 20_000 ? 'word' : i},,2024-01-${String((i % 28) + 1).padStart(2, '0')},${i % 3}`);
  const csv = `a,b,gone,when,y\n${rows.join('\n')}\n`;
  it('gives the same table, with its numeric columns and lines in SharedArrayBuffers', async () => {
    const plain = await loadCsv({ stream: chunked(Buffer.from(csv), 4096), name: 'stdin' });
    const shared = await loadCsv({ stream: chunked(Buffer.from(csv), 4096), name: 'stdin' }, { shared: true });
    expect(shared.columns.map((c) => c.kind)).toEqual(plain.columns.map((c) => c.kind));
    expect(shared.columns.map((c) => c.kind)).toEqual(['numeric', 'categorical', 'categorical', 'numeric', 'numeric']);
    for (const c of shared.columns) {
      const p = plain.byName.get(c.name)!;
      if (c.kind === 'numeric' && p.kind === 'numeric') {
        expect(c.values.length).toBe(N);
        expect(Array.from(c.values)).toEqual(Array.from(p.values));
        // a date column is rebuilt from its levels in ordinary memory (moved to shared memory later, by shareTableInPlace)
        if (!c.dates) expect(c.values.buffer).toBeInstanceOf(SharedArrayBuffer);
      } else if (c.kind === 'categorical' && p.kind === 'categorical') {
        expect(c.levels).toEqual(p.levels);
        expect(Array.from(c.codes)).toEqual(Array.from(p.codes));
      }
    }
    expect(shared.lines.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Array.from(shared.lines)).toEqual(Array.from(plain.lines));
    expect(plain.lines.buffer).not.toBeInstanceOf(SharedArrayBuffer);
  });
});

describe('the byte scanner', () => {
  it('gives the same table whatever the chunk boundaries (quotes, CRLF, multi-byte characters)', async () => {
    const csv = 'a,b,c\r\n"x, ""y""\r\nz",1,é\r\n"",2,"ü,"\r\nplain,3,"a""b"\r\n"end""",4,x\r\n';
    const whole = await loadCsv(text(csv));
    const bytes = Buffer.from(csv);
    expect(whole.rows).toBe(4);
    const a = whole.byName.get('a')!;
    expect(a.kind === 'categorical' && a.levels).toEqual(['x, "y"\r\nz', 'plain', 'end"']);
    expect(a.missing).toBe(1);
    for (let size = 1; size <= bytes.length; size++) {
      const t = await loadCsv({ stream: chunked(bytes, size), name: 'mem.csv' });
      expect(t.columns).toEqual(whole.columns);
      expect(Array.from(t.lines)).toEqual(Array.from(whole.lines));
    }
  });

  it('reads one 5 MB quoted field that spans many chunks', async () => {
    const big = 'q'.repeat(5_000_000);
    const t = await loadCsv({ stream: chunked(Buffer.from(`a,b\n"${big}",1\nshort,2\n`), 65_536), name: 'stdin' });
    const a = t.byName.get('a')!;
    expect(a.kind === 'categorical' && a.levels.map((l) => l.length)).toEqual([5_000_000, 5]);
  });

  it('refuses a malformed closing quote and an unterminated quote, naming the row line', async () => {
    await expect(loadCsv(text('a,b\n1,2\n"ab"c,1\n'))).rejects.toThrow(/mem\.csv: line 3: trailing quote on quoted field is malformed/);
    await expect(loadCsv(text('a,b\n1,2\n"abc,1\n'))).rejects.toThrow(/mem\.csv: line 3: quoted field unterminated/);
  });
});

describe('line ends and white space (issue 26)', () => {
  it('a file with LF and some CRLF lines keeps class P one class, and says the line ends are mixed', async () => {
    const t = await loadCsv(text('x,y\n1,P\n2,Q\r\n3,P\n4,P\r\n5,R\n'));
    const y = t.byName.get('y')!;
    expect(y.kind === 'categorical' && y.levels).toEqual(['P', 'Q', 'R']);
    expect(t.warnings.join('\n')).toMatch(/mem\.csv: mixed line ends: line 1 ends with LF, line 3 with CRLF; each LF, CRLF and lone CR is read as one line end/);
    const plain = await loadCsv(text('x,y\r\n1,P\r\n'));
    expect(plain.warnings).toEqual([]);
  });

  it('split re-reads the same rows as the loader from a file with mixed line ends', async () => {
    const csv = 'x,y\r\n1,P\n2,Q\r\n3,P\n';
    const t = await loadCsv(text(csv));
    const seen: string[][] = [];
    eachRecord(csv, ',', (fields, row) => {
      if (row >= 0) seen.push(fields);
    });
    expect(seen.length).toBe(t.rows);
    expect(seen).toEqual([
      ['1', 'P'],
      ['2', 'Q'],
      ['3', 'P'],
    ]);
  });

  it('warns when two levels differ only by white space around them', async () => {
    const t = await loadCsv(text('x,y\n1,P\n2," P"\n3,Q\n'));
    expect(t.warnings.join('\n')).toMatch(/column "y" has values that differ only by white space around them \(1 level repeating another\), such as "P" and " P" \(line 3\)/);
  });
});
