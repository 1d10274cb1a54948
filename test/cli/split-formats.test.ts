/**
 * `split` writes its parts in the input's format, or in the one --format names (issue 14). On the
 * Palmer penguins file (vega-datasets, CC0; Gorman, Williams & Fraser 2014): each Parquet or
 * Arrow part, read back (by foldwise and by apache-arrow's own reader), holds the same rows and
 * values as the CSV part of the same plan and seed.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tableFromIPC } from 'apache-arrow';
import { loadTable } from '../../src/data/load-table.js';
import type { Table } from '../../src/data/types.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());

async function split(data: string, out: string, extra: string[] = []): Promise<string[]> {
  const r = await cli(['split', data, '--target', 'Species', '--plan', 'kfold:3', '--out', join(tmp.dir, out), ...extra]);
  expect(r.code).toBe(0);
  return readdirSync(join(tmp.dir, out)).sort();
}

/** Each column's values as text, row by row (numbers exact, missing empty). */
function cells(t: Table): string[][] {
  return Array.from({ length: t.rows }, (_, r) =>
    t.columns.map((c) => (c.kind === 'categorical' ? (c.codes[r] < 0 ? '' : c.levels[c.codes[r]]) : Number.isNaN(c.values[r]) ? '' : String(c.values[r]))),
  );
}

describe('split --format', () => {
  it('writes Parquet and Arrow parts with the rows and values of the CSV parts', async () => {
    const csv = await split(penguins, 'csv');
    expect(csv).toEqual(['fold-01.csv', 'fold-02.csv', 'fold-03.csv']);
    const pq = await split(penguins, 'pq', ['--format', 'parquet']);
    expect(pq).toEqual(['fold-01.parquet', 'fold-02.parquet', 'fold-03.parquet']);
    const arrow = await split(penguins, 'arrow', ['--format', 'arrow']);
    expect(arrow).toEqual(['fold-01.arrow', 'fold-02.arrow', 'fold-03.arrow']);
    let total = 0;
    for (let i = 0; i < 3; i++) {
      const a = await loadTable({ path: join(tmp.dir, 'csv', csv[i]) });
      const b = await loadTable({ path: join(tmp.dir, 'pq', pq[i]) });
      const c = await loadTable({ path: join(tmp.dir, 'arrow', arrow[i]) });
      expect(b.fingerprint.schema).toEqual(a.fingerprint.schema);
      expect(cells(b)).toEqual(cells(a));
      expect(cells(c)).toEqual(cells(a));
      expect(tableFromIPC(readFileSync(join(tmp.dir, 'arrow', arrow[i]))).numRows).toBe(a.rows);
      total += a.rows;
    }
    expect(total).toBe(344);
  });

  it('writes parts in the input\'s format by default, and CSV from a Parquet input on request', async () => {
    await split(penguins, 'to-pq', ['--format', 'parquet']);
    const input = join(tmp.dir, 'to-pq', 'fold-01.parquet');
    expect(await split(input, 'from-pq')).toEqual(['fold-01.parquet', 'fold-02.parquet', 'fold-03.parquet']);
    expect(await split(input, 'from-pq-csv', ['--format', 'csv'])).toEqual(['fold-01.csv', 'fold-02.csv', 'fold-03.csv']);
    const whole = await loadTable({ path: input });
    let rows = 0;
    for (const f of ['fold-01.csv', 'fold-02.csv', 'fold-03.csv']) {
      const t = await loadTable({ path: join(tmp.dir, 'from-pq-csv', f) });
      expect(t.fingerprint.schema).toEqual(whole.fingerprint.schema);
      rows += t.rows;
    }
    expect(rows).toBe(whole.rows);
    const bad = await cli(['split', penguins, '--target', 'Species', '--out', join(tmp.dir, 'x'), '--format', 'xlsx']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--format "xlsx": expected one of csv, parquet, arrow/);
  });
});
