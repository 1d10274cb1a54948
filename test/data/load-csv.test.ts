import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { isoDays, loadCsv } from '../../src/data/load-csv.js';
import { InputError } from '../../src/errors.js';
import { tempFolder } from '../helpers/tmp.js';
import { penguinsCsv } from '../helpers/penguins.js';

const text = (t: string) => ({ text: t, name: 'mem.csv' });

describe('loadCsv', () => {
  it('reads numeric columns as Float64Array with NaN for missing and categorical as codes', async () => {
    const t = await loadCsv(text('a,b,c\n1,x,2.5\nNA,y,\n3,x,?\n'));
    expect(t.rows).toBe(3);
    const a = t.byName.get('a')!;
    const b = t.byName.get('b')!;
    const c = t.byName.get('c')!;
    expect(a.kind).toBe('numeric');
    if (a.kind === 'numeric') expect(Array.from(a.values)).toEqual([1, NaN, 3]);
    expect(b.kind).toBe('categorical');
    if (b.kind === 'categorical') {
      expect(b.levels).toEqual(['x', 'y']);
      expect(Array.from(b.codes)).toEqual([0, 1, 0]);
    }
    expect(c.missing).toBe(2);
    expect(Array.from(t.lines)).toEqual([2, 3, 4]);
  });

  it('fingerprints the input bytes with SHA-256 (checked against node:crypto on the same bytes)', async () => {
    const csv = '\uFEFFa,b\r\n1,2\r\n';
    const t = await loadCsv(text(csv));
    expect(t.fingerprint.sha256).toBe(createHash('sha256').update(Buffer.from(csv, 'utf8')).digest('hex'));
    expect(t.fingerprint.schema).toEqual([
      ['a', 'numeric'],
      ['b', 'numeric'],
    ]);
    expect(t.columns[0].name).toBe('a'); // BOM stripped
  });

  it('treats __proto__, constructor, hasOwnProperty and toString as ordinary columns', async () => {
    const t = await loadCsv(text('__proto__,constructor,hasOwnProperty,toString\n1,2,3,a\n4,5,6,b\n'));
    expect(t.columns.map((c) => c.name)).toEqual(['__proto__', 'constructor', 'hasOwnProperty', 'toString']);
    const p = t.byName.get('__proto__')!;
    expect(p.kind === 'numeric' && Array.from(p.values)).toEqual([1, 4]);
  });

  it('counts lines through quoted newlines, CRLF and blank lines', async () => {
    const t = await loadCsv(text('a,b\r\n"x\r\ny",1\r\n\r\n"say ""hi""",2\r\n'));
    expect(t.rows).toBe(2);
    expect(Array.from(t.lines)).toEqual([2, 5]);
    const a = t.byName.get('a')!;
    expect(a.kind === 'categorical' && a.levels).toEqual(['x\r\ny', 'say "hi"']);
  });

  it('reads from a stream (standard input)', async () => {
    const t = await loadCsv({ stream: Readable.from([Buffer.from('a,b\n1,'), Buffer.from('2\n')]), name: 'stdin' });
    expect(t.rows).toBe(1);
    expect(t.source).toBe('stdin');
  });

  it('keeps a multi-byte character split across chunks', async () => {
    const bytes = Buffer.from('a,b\né,1\n', 'utf8');
    const t = await loadCsv({ stream: Readable.from([bytes.subarray(0, 5), bytes.subarray(5)]), name: 'stdin' });
    const a = t.byName.get('a')!;
    expect(a.kind === 'categorical' && a.levels).toEqual(['é']);
  });

  it('reads ISO date columns as days since 1970-01-01 UTC', async () => {
    const t = await loadCsv(text('d,y\n1970-01-02,a\n2000-03-01,b\n,a\n'));
    const d = t.byName.get('d')!;
    expect(d.kind === 'numeric' && d.dates).toBe(true);
    // 2000-03-01 is day 11017: 30 years of 365 days plus 7 leap days (1972..1996) = 10957 to
    // 2000-01-01, plus 31 (January) + 29 (February of the leap year 2000) = 11017
    expect(d.kind === 'numeric' && Array.from(d.values)).toEqual([1, 11017, NaN]);
    expect(isoDays('2023-02-30')).toBeNaN();
    expect(isoDays('2023-02-28T12:00')).toBe(isoDays('2023-02-28') + 0.5);
    const mixed = await loadCsv(text('d,y\n2020-01-01,a\nsoon,b\n'));
    expect(mixed.byName.get('d')!.kind).toBe('categorical');
  });

  it('warns when a mostly numeric column has a few text cells', async () => {
    const rows = Array.from({ length: 30 }, (_, i) => `${i},${i % 2}`).join('\n');
    const t = await loadCsv(text(`a,b\n${rows}\nn/a,1\n`));
    expect(t.byName.get('a')!.kind).toBe('categorical');
    expect(t.warnings.join(' ')).toMatch(/column "a" is numeric but for 1 cell such as "n\/a" \(line 32\)/);
  });

  it.each([
    ['', /the file is empty/],
    ['a,b\n', /has a header but no data rows/],
    ['a,b\n1,2\n3\n', /line 3 has 1 field, the header has 2/],
    ['a,b\n1,2\n3,4,5\n', /line 3 has 3 fields, the header has 2/],
    ['a,b,a\n1,2,3\n', /column name "a" appears twice in the header \(columns 1 and 3\)/],
    ['a,,b\n1,2,3\n', /column 2 of the header has no name/],
    ['a,b\n1e309,2\n', /line 2, column "a": "1e309" is too large for a double/],
    ['a,b\n1,2\nInfinity,3\n', /line 3, column "a": "Infinity" is not a finite number/],
  ])('rejects %j', async (csv, message) => {
    await expect(loadCsv(text(csv))).rejects.toThrow(message);
    await expect(loadCsv(text(csv))).rejects.toBeInstanceOf(InputError);
  });

  it('rejects non-UTF-8 bytes and binary data', async () => {
    const bad = Buffer.concat([Buffer.from('a,b\n'), Buffer.from([0xff, 0xfe, 0x2c, 0x31, 0x0a])]);
    await expect(loadCsv({ stream: Readable.from([bad]), name: 'bad.csv' })).rejects.toThrow(/bad\.csv: is not valid UTF-8/);
    const bin = Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00]);
    await expect(loadCsv({ stream: Readable.from([bin]), name: 'bin.csv' })).rejects.toThrow(/bin\.csv: byte 4 is a NUL byte/);
  });

  it('names missing files and folders', async () => {
    const tmp = tempFolder();
    await expect(loadCsv({ path: `${tmp.dir}/nope.csv` })).rejects.toThrow(/nope\.csv: no such file; check the path/);
    await expect(loadCsv({ path: tmp.dir })).rejects.toThrow(/is a directory, not a CSV file/);
  });

  it('reports loading progress up to the file size', async () => {
    const tmp = tempFolder();
    const csv = `a,b\n${Array.from({ length: 20000 }, (_, i) => `${i},${i % 3}`).join('\n')}\n`;
    const path = tmp.file('big.csv', csv);
    const seen: [number, number | undefined][] = [];
    await loadCsv({ path }, { onProgress: (b, t) => seen.push([b, t]) });
    expect(seen.length).toBeGreaterThan(0);
    expect(seen[seen.length - 1]).toEqual([Buffer.byteLength(csv), Buffer.byteLength(csv)]);
  });

  it('honours --delimiter, --missing and --categorical', async () => {
    const t = await loadCsv(text('a;b\n1;-\n2;3\n'), { delimiter: ';', missing: ['', '-'], categorical: ['a'] });
    expect(t.byName.get('a')!.kind).toBe('categorical');
    expect(t.byName.get('b')!.missing).toBe(1);
    await expect(loadCsv(text('a\n1\n'), { delimiter: ';;' })).rejects.toThrow(/--delimiter ";;": expected one character/);
    await expect(loadCsv(text('a\n1\n'), { categorical: ['zz'] })).rejects.toThrow(/--categorical "zz": no such column/);
  });

  it('loads the Palmer penguins file with its documented counts (vega-datasets; Gorman et al. 2014)', async () => {
    const t = await loadCsv(text(penguinsCsv()));
    // 344 rows and 7 columns, as the package's datapackage.json describes the file
    expect(t.rows).toBe(344);
    expect(t.columns.length).toBe(7);
    for (const name of ['Beak Length (mm)', 'Beak Depth (mm)', 'Flipper Length (mm)', 'Body Mass (g)']) {
      const c = t.byName.get(name)!;
      expect(c.kind).toBe('numeric');
      expect(c.missing).toBe(2); // two missing values in each numeric column
    }
    const species = t.byName.get('Species')!;
    expect(species.kind).toBe('categorical');
    if (species.kind === 'categorical') {
      const counts = new Map<string, number>();
      for (const c of species.codes) counts.set(species.levels[c], (counts.get(species.levels[c]) ?? 0) + 1);
      expect(Object.fromEntries(counts)).toEqual({ Adelie: 152, Gentoo: 124, Chinstrap: 68 });
    }
    const sex = t.byName.get('Sex')!;
    expect(sex.missing).toBe(10); // ten empty cells; the one "." is a level of its own
  });
});
