/**
 * Parquet and Arrow IPC input (issue 14). The files are written by independent writers, never
 * by foldwise: `hyparquet-writer` for Parquet and `apache-arrow`'s own IPC writer for Arrow,
 * with nulls, dictionary-encoded strings, dates, timestamps, booleans and integer columns.
 * The end-to-end check runs eval on the Palmer penguins file (vega-datasets, CC0; Gorman,
 * Williams & Fraser 2014) from CSV, Parquet and Arrow and expects the same report apart from
 * data.path and data.sha256.
 */
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import * as A from 'apache-arrow';
import { parquetWriteBuffer } from 'hyparquet-writer';
import { loadTable } from '../../src/data/load-table.js';
import type { CategoricalColumn, NumericColumn, Table } from '../../src/data/types.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { PENGUINS_JSON, penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const DAY = 86_400_000;

function num(t: Table, name: string): NumericColumn {
  const c = t.byName.get(name);
  expect(c?.kind).toBe('numeric');
  return c as NumericColumn;
}
function cat(t: Table, name: string): CategoricalColumn {
  const c = t.byName.get(name);
  expect(c?.kind).toBe('categorical');
  return c as CategoricalColumn;
}
function textsOf(c: CategoricalColumn): (string | null)[] {
  return Array.from(c.codes, (k) => (k < 0 ? null : c.levels[k]));
}

// the same six rows in both formats; a string column repeating few values (dictionary-encoded)
const x = [1.5, null, -2.25, 4, 1e300, 0.1];
const count = [3, 7, null, -12, 0, 2147483647];
const big = [1n, null, 9007199254740993n, -4n, 5n, 6n];
const grade = ['b', 'a', null, 'b', 'NA', 'a'];
const ok = [true, false, null, true, true, false];
const when = [new Date(Date.UTC(2024, 0, 1)), null, new Date(Date.UTC(1969, 11, 31)), new Date(Date.UTC(2000, 1, 29)), new Date(Date.UTC(2024, 0, 1)), new Date(0)];
const stamp = [new Date(Date.UTC(2024, 0, 1, 12)), new Date(Date.UTC(2024, 0, 2, 6)), null, new Date(0), new Date(DAY / 4), new Date(-DAY)];
const whenDays = [19723, NaN, -1, 11016, 19723, 0];
const stampDays = [19723.5, 19724.25, NaN, 0, 0.25, -1];

function parquetFile(): Buffer {
  const ab = parquetWriteBuffer({
    columnData: [
      { name: 'x', data: x },
      { name: 'count', data: count },
      { name: 'big', data: big },
      { name: 'grade', data: grade },
      { name: 'ok', data: ok },
      { name: 'when', data: when.map((d) => (d === null ? null : Math.round(d.getTime() / DAY))) },
      { name: 'stamp', data: stamp.map((d) => (d === null ? null : BigInt(d.getTime()))) },
    ],
    schema: [
      { name: 'root', num_children: 7 },
      { name: 'x', type: 'DOUBLE', repetition_type: 'OPTIONAL' },
      { name: 'count', type: 'INT32', repetition_type: 'OPTIONAL' },
      { name: 'big', type: 'INT64', repetition_type: 'OPTIONAL' },
      { name: 'grade', type: 'BYTE_ARRAY', converted_type: 'UTF8', repetition_type: 'OPTIONAL' },
      { name: 'ok', type: 'BOOLEAN', repetition_type: 'OPTIONAL' },
      { name: 'when', type: 'INT32', converted_type: 'DATE', repetition_type: 'OPTIONAL' },
      { name: 'stamp', type: 'INT64', converted_type: 'TIMESTAMP_MILLIS', repetition_type: 'OPTIONAL' },
    ],
  });
  return Buffer.from(ab);
}

function arrowFile(format: 'file' | 'stream' = 'file'): Buffer {
  const t = new A.Table({
    x: A.vectorFromArray(x, new A.Float64()),
    count: A.vectorFromArray(count, new A.Int32()),
    big: A.vectorFromArray(big, new A.Int64()),
    grade: A.vectorFromArray(grade, new A.Dictionary(new A.Utf8(), new A.Int32())),
    ok: A.vectorFromArray(ok, new A.Bool()),
    when: A.vectorFromArray(when, new A.DateDay()),
    stamp: A.vectorFromArray(stamp, new A.TimestampMillisecond()),
  });
  return Buffer.from(A.tableToIPC(t, format));
}

function expectSame(a: ArrayLike<number>, b: readonly number[]): void {
  expect(a.length).toBe(b.length);
  for (let i = 0; i < b.length; i++) expect(Object.is(a[i], b[i]) || a[i] === b[i]).toBe(true);
}

describe.each([
  ['Parquet (hyparquet-writer)', 'typed.parquet', parquetFile],
  ['Arrow IPC file (apache-arrow writer)', 'typed.arrow', () => arrowFile('file')],
  ['Arrow IPC stream (apache-arrow writer)', 'typed.arrows', () => arrowFile('stream')],
])('%s', (_label, file, make) => {
  const bytes = make();
  const path = tmp.file(file, bytes);
  it('types each column from the file and keeps nulls as missing', async () => {
    const t = await loadTable({ path });
    expect(t.rows).toBe(6);
    expect(t.columns.map((c) => c.name)).toEqual(['x', 'count', 'big', 'grade', 'ok', 'when', 'stamp']);
    expectSame(num(t, 'x').values, [1.5, NaN, -2.25, 4, 1e300, 0.1]);
    expect(num(t, 'x').missing).toBe(1);
    expectSame(num(t, 'count').values, [3, 7, NaN, -12, 0, 2147483647]);
    expectSame(num(t, 'big').values, [1, NaN, 9007199254740992, -4, 5, 6]);
    expect(t.warnings.some((w) => w.includes('"big"') && w.includes('2^53'))).toBe(true);
    // strings: levels in order of first appearance, null and the missing token "NA" missing
    const g = cat(t, 'grade');
    expect(g.levels).toEqual(['b', 'a']);
    expect(textsOf(g)).toEqual(['b', 'a', null, 'b', null, 'a']);
    expect(g.missing).toBe(2);
    expect(textsOf(cat(t, 'ok'))).toEqual(['true', 'false', null, 'true', 'true', 'false']);
    const w = num(t, 'when');
    expect(w.dates).toBe(true);
    expect(w.dateReading).toMatch(/days since 1970/);
    expectSame(w.values, whenDays);
    const s = num(t, 'stamp');
    expect(s.dates).toBe(true);
    expectSame(s.values, stampDays);
    expect(t.fingerprint.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(t.fingerprint.schema).toEqual([
      ['x', 'numeric'], ['count', 'numeric'], ['big', 'numeric'], ['grade', 'categorical'], ['ok', 'categorical'], ['when', 'numeric'], ['stamp', 'numeric'],
    ]);
  });
  it('with shared: true puts the numeric columns and lines in shared memory, with the same values (for worker threads)', async () => {
    const plain = await loadTable({ path });
    const shared = await loadTable({ path }, { shared: true });
    const numeric = shared.columns.filter((c): c is NumericColumn => c.kind === 'numeric');
    expect(numeric.map((c) => c.name)).toEqual(['x', 'count', 'big', 'when', 'stamp']);
    for (const c of numeric) {
      expect(c.values.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(Array.from(c.values)).toEqual(Array.from(num(plain, c.name).values));
    }
    expect(shared.lines.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Array.from(shared.lines)).toEqual(Array.from(plain.lines));
    expect(num(plain, 'x').values.buffer).not.toBeInstanceOf(SharedArrayBuffer);
  });

  it('applies --categorical and --missing as for a CSV', async () => {
    const t = await loadTable({ path }, { categorical: ['count', 'when'], missing: ['', 'b'] });
    expect(textsOf(cat(t, 'count'))).toEqual(['3', '7', null, '-12', '0', '2147483647']);
    expect(textsOf(cat(t, 'when'))).toEqual(['2024-01-01', null, '1969-12-31', '2000-02-29', '2024-01-01', '1970-01-01']);
    expect(textsOf(cat(t, 'grade'))).toEqual([null, 'a', null, null, 'NA', 'a']);
    await expect(loadTable({ path }, { categorical: ['nope'] })).rejects.toThrow(/--categorical "nope": no such column/);
  });
  it('refuses a truncated file with one line, exit 2', async () => {
    const cut = tmp.file(`cut-${file}`, bytes.subarray(0, Math.floor(bytes.length * 0.6)));
    const r = await cli(['eval', cut, '--target', 'ok', '--no-timing', '--quiet']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain(cut);
    expect(r.stderr).toMatch(/truncated or damaged|damaged/);
  });
});

describe('format detection', () => {
  it('refuses a .parquet or .arrow name whose bytes are text, and reads a Parquet file whatever its name', async () => {
    const fake = tmp.file('fake.parquet', 'a,b\n1,2\n');
    const r = await cli(['eval', fake, '--target', 'b', '--no-timing', '--quiet']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/the name says Parquet but the file does not start with the Parquet magic bytes/);
    const fakeArrow = tmp.file('fake.arrow', 'a,b\n1,2\n');
    await expect(loadTable({ path: fakeArrow })).rejects.toThrow(/the name says Arrow IPC/);
    const renamed = tmp.file('data.bin', parquetFile());
    expect((await loadTable({ path: renamed })).rows).toBe(6);
  });
  it('refuses a file of garbage after the Parquet magic bytes with one line', async () => {
    const junk = tmp.file('junk.parquet', Buffer.concat([Buffer.from('PAR1'), Buffer.alloc(64, 7), Buffer.from('PAR1')]));
    const r = await cli(['audit', junk, '--target', 'x']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/is not a readable Parquet file/);
  });
});

/** The penguins as typed columns: measurements as doubles, body mass as integers, strings with nulls. */
function penguinRows(): Record<string, string | number | null>[] {
  return JSON.parse(readFileSync(PENGUINS_JSON, 'utf8'));
}
const numericCols = ['Beak Length (mm)', 'Beak Depth (mm)', 'Flipper Length (mm)'];
const textCols = ['Species', 'Island', 'Sex'];

function penguinsParquet(): Buffer {
  const rows = penguinRows();
  const names = Object.keys(rows[0]);
  return Buffer.from(
    parquetWriteBuffer({
      columnData: names.map((n) => ({
        name: n,
        data: rows.map((r) => r[n]),
        type: textCols.includes(n) ? 'STRING' : n === 'Body Mass (g)' ? 'INT32' : 'DOUBLE',
      })),
      rowGroupSize: 100,
    }),
  );
}
function penguinsArrow(): Buffer {
  const rows = penguinRows();
  const names = Object.keys(rows[0]);
  const cols: Record<string, A.Vector> = {};
  for (const n of names) {
    const data = rows.map((r) => r[n]);
    cols[n] = textCols.includes(n)
      ? A.vectorFromArray(data as (string | null)[], new A.Dictionary(new A.Utf8(), new A.Int32()))
      : A.vectorFromArray(data as (number | null)[], n === 'Body Mass (g)' ? new A.Int32() : new A.Float64());
  }
  return Buffer.from(A.tableToIPC(new A.Table(cols), 'file'));
}

describe('penguins from CSV, Parquet and Arrow', () => {
  it('eval gives identical reports apart from data.path and data.sha256', async () => {
    expect(numericCols.length).toBe(3);
    const paths = [tmp.file('penguins.csv', penguinsCsv()), tmp.file('penguins.parquet', penguinsParquet()), tmp.file('penguins.feather', penguinsArrow())];
    const reports: Report[] = [];
    for (const p of paths) {
      const out = join(tmp.dir, `${p.split('/').pop()}.json`);
      const r = await cli(['eval', p, '--target', 'Species', '--learner', 'knn', '--learner', 'forest:trees=5', '--plan', 'kfold:3x2', '--json', out, '--no-timing', '--quiet']);
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      reports.push(JSON.parse(readFileSync(out, 'utf8')));
    }
    const shas = new Set(reports.map((r) => r.data.sha256));
    expect(shas.size).toBe(3);
    const strip = (r: Report): unknown => ({ ...r, data: { ...r.data, path: '', sha256: '' } });
    expect(reports[0].learners.length).toBe(3);
    expect(strip(reports[1])).toEqual(strip(reports[0]));
    expect(strip(reports[2])).toEqual(strip(reports[0]));
  });
});
