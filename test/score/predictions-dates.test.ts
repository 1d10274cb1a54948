/**
 * Dates in streamed typed outputs (Parquet row groups, Arrow record batches of at most 65,536
 * lines), where the first batch may hold whole days only and a later one a time of day.
 *
 * - `--predictions FILE.arrow|FILE.parquet --predictions-keep DATE`: a kept column is written as
 *   dictionary-coded text (README, predictions section), the date as the ISO text of the CSV
 *   file, so a time of day after the first batch changes no type. Checked on an invented file
 *   of 140,000 rows (a date column with times of day only in its last rows, which reach the
 *   predictions file after its first 65,536 lines) read back with apache-arrow's tableFromIPC
 *   and hyparquet's parquetReadObjects: every line's date is the input's text.
 * - the batch writers (`arrowChunks`, `parquetChunks`) given a date column (`kind: 'days'`)
 *   whose type was decided over all rows (`times`, from `hasTimeOfDay`): a first batch of whole
 *   days and a second with a time of day give one millisecond timestamp column, read back with
 *   apache-arrow and hyparquet to the millisecond.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tableFromIPC } from 'apache-arrow';
import { parquetMetadata, parquetReadObjects } from 'hyparquet';
import { beforeAll, describe, expect, it } from 'vitest';
import { arrowChunks, hasTimeOfDay, parquetChunks, type ColumnBatch, loadColumnarWriters } from '../../src/io/write-columnar.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';

// the Parquet and Arrow writers load on demand (src/io/write-columnar.ts)
beforeAll(loadColumnarWriters);

const tmp = tempFolder();
const BATCH = 65_536;
const N = 140_000;
const DAY_MS = 86_400_000;

/** The date text of data row i: whole days, and a time of day in the last 3,000 rows on every 7th row. */
function dateText(i: number): string {
  const day = new Date(Date.UTC(2020, 0, 1) + (i % 1000) * DAY_MS).toISOString().slice(0, 10);
  return i >= N - 3000 && i % 7 === 0 ? `${day}T08:15:30Z` : day;
}

describe('dates after the first batch of a streamed typed file', () => {
  it('--predictions-keep: a date column with a time of day only after the first 65,536 lines reads back as its text (apache-arrow, hyparquet)', async () => {
    const lines = ['t,y,x,d'];
    for (let i = 0; i < N; i++) lines.push(`${i},${i % 3 === 0 ? 'a' : 'b'},${i % 89},${dateText(i)}`);
    const data = tmp.file('dates.csv', `${lines.join('\n')}\n`);
    // forward:1 in the order of t: one fold testing the second half (70,000 rows) in file order, per learner
    const args = ['eval', data, '--target', 'y', '--order', 't', '--drop', 'd', '--plan', 'forward:1', '--learner', 'bayes', '--no-audit', '--no-timing', '--quiet', '--predictions-keep', 'd'];
    for (const ext of ['arrow', 'parquet'] as const) {
      const out = join(tmp.dir, `dates.${ext}`);
      const r = await cli([...args, '--predictions', out, '--json', join(tmp.dir, `dates-${ext}.json`)]);
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      const bytes = readFileSync(out);
      let rows: number[];
      let dates: string[];
      if (ext === 'arrow') {
        const t = tableFromIPC(bytes);
        expect(t.batches.length).toBeGreaterThan(1);
        expect(t.batches[0].numRows).toBe(BATCH);
        rows = Array.from(t.getChild('row')!.toArray() as Int32Array);
        dates = [...t.getChild('d')!].map(String);
      } else {
        const file = new Uint8Array(bytes).buffer;
        const meta = parquetMetadata(file);
        expect(meta.row_groups.length).toBeGreaterThan(1);
        expect(Number(meta.row_groups[0].num_rows)).toBe(BATCH);
        const objects = (await parquetReadObjects({ file })) as { row: number; d: string }[];
        rows = objects.map((o) => o.row);
        dates = objects.map((o) => o.d);
      }
      // two learners (the baseline and bayes) on the 70,000 test rows
      expect(rows.length).toBe(2 * (N / 2));
      expect(dates.length).toBe(rows.length);
      // the premise: no time of day in the first batch, some after it
      expect(dates.slice(0, BATCH).some((d) => d.includes('T'))).toBe(false);
      expect(dates.slice(BATCH).filter((d) => d.includes('T')).length).toBeGreaterThan(100);
      for (let i = 0; i < rows.length; i++) {
        if (dates[i] !== dateText(rows[i])) expect(`${i}: ${dates[i]}`).toBe(`${i}: ${dateText(rows[i])}`);
      }
    }
  });

  it('arrowChunks and parquetChunks: a date column typed over all rows takes a time of day in a later batch', async () => {
    const n = BATCH + 10;
    const days = Float64Array.from({ length: n }, (_, i) => 18_000 + (i % 400) + (i >= BATCH && i % 3 === 0 ? 0.25 + i / 1e6 : 0));
    days[5] = Number.NaN;
    const times = hasTimeOfDay(days);
    expect(times).toBe(true);
    expect(hasTimeOfDay(days.subarray(0, BATCH))).toBe(false);
    const batches = (): ColumnBatch[] =>
      [days.subarray(0, BATCH), days.subarray(BATCH)].map((v, b) => ({
        length: v.length,
        columns: [
          { kind: 'int', name: 'line', values: Int32Array.from(v, (_, i) => b * BATCH + i) },
          { kind: 'days', name: 'when', values: v, times },
        ],
      }));
    const ms = (d: number): number | null => (d === d ? Math.round(d * DAY_MS) : null);

    const arrow = tableFromIPC(Buffer.concat([...arrowChunks(batches())]));
    expect(arrow.batches.length).toBe(2);
    expect(String(arrow.schema.fields[1].type)).toBe('Timestamp<MILLISECOND>');
    const a = [...arrow.getChild('when')!] as (number | bigint | null)[];
    expect(a.length).toBe(n);
    for (let i = 0; i < n; i++) if ((a[i] === null ? null : Number(a[i])) !== ms(days[i])) expect(`${i}: ${a[i]}`).toBe(`${i}: ${ms(days[i])}`);

    const file = new Uint8Array(Buffer.concat([...parquetChunks(batches())])).buffer;
    expect(parquetMetadata(file).row_groups.length).toBe(2);
    const objects = (await parquetReadObjects({ file })) as { when: Date | null }[];
    expect(objects.length).toBe(n);
    for (let i = 0; i < n; i++) {
      const got = objects[i].when === null ? null : objects[i].when!.getTime();
      if (got !== ms(days[i])) expect(`${i}: ${got}`).toBe(`${i}: ${ms(days[i])}`);
    }
  });
});
