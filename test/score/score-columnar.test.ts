/**
 * `--predictions FILE.parquet|FILE.arrow` and `foldwise score` on them (issues 14 and 15): the
 * same columns as the CSV, and the round trip eval --predictions -> score gives the eval
 * report's summaries to the last digit, on the Palmer penguins file (vega-datasets, CC0;
 * Gorman, Williams & Fraser 2014). The written files are read back with the Arrow project's
 * own reader (apache-arrow) and hyparquet, not only with foldwise's loader.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tableFromIPC } from 'apache-arrow';
import { parquetReadObjects } from 'hyparquet';
import Papa from 'papaparse';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());

async function evalWith(args: string[], ext: string): Promise<{ report: Report; file: string }> {
  const json = join(tmp.dir, `run-${ext}.json`);
  const file = join(tmp.dir, `pred.${ext}`);
  const r = await cli([...args, '--json', json, '--predictions', file, '--no-timing', '--quiet']);
  expect(r.stderr.split('\n').filter((l) => l && !l.startsWith('foldwise: warning: '))).toEqual([]);
  expect(r.code).toBe(0);
  return { report: JSON.parse(readFileSync(json, 'utf8')), file };
}

async function score(file: string): Promise<Report> {
  const s = await cli(['score', file, '--json', '-']);
  expect(s.stderr).toBe('');
  expect(s.code).toBe(0);
  return JSON.parse(s.stdout);
}

function expectSameSummaries(scored: Report, report: Report): void {
  expect(scored.learners.length).toBe(report.learners.length);
  expect(scored.learners.length).toBeGreaterThan(1);
  for (let i = 0; i < scored.learners.length; i++) {
    expect(scored.learners[i].spec).toBe(report.learners[i].spec);
    expect(scored.learners[i].folds).toEqual(report.learners[i].folds);
    expect(scored.learners[i].summary).toEqual(report.learners[i].summary);
    expect(scored.learners[i].pooled).toEqual(report.learners[i].pooled);
  }
  expect(scored.comparisons).toEqual(report.comparisons);
  expect(scored.plan.assignment).toBe(report.plan.assignment);
}

const classification = ['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=5', '--plan', 'kfold:3x2'];
const regression = ['eval', penguins, '--target', 'Body Mass (g)', '--drop', 'Island', '--learner', 'knn', '--learner', 'linear', '--plan', 'kfold:4'];

describe('predictions as Arrow and Parquet', () => {
  it('hold the CSV file\'s columns and values (read with apache-arrow and hyparquet)', async () => {
    const csv = await evalWith(classification, 'csv');
    const arrow = await evalWith(classification, 'arrow');
    const parquet = await evalWith(classification, 'parquet');
    const parsed = Papa.parse<string[]>(readFileSync(csv.file, 'utf8').trim(), { header: false });
    const [header, ...rows] = parsed.data;
    expect(rows.length).toBe(2 * 344 * 3); // 344 penguins, 2 repeats, 3 learners (the baseline too)
    const t = tableFromIPC(readFileSync(arrow.file));
    expect(t.schema.fields.map((f) => f.name)).toEqual(header);
    expect(t.numRows).toBe(rows.length);
    const objects = await parquetReadObjects({ file: new Uint8Array(readFileSync(parquet.file)).buffer });
    expect(Object.keys(objects[0])).toEqual(header);
    expect(objects.length).toBe(rows.length);
    // every field the same text as in the CSV (numbers: shortest round-trip text; empty for null)
    const text = (v: unknown): string => (v === null || v === undefined ? '' : String(v));
    const cols = header.map((h) => t.getChild(h)!);
    for (const i of [0, 1, 500, rows.length - 1]) {
      expect(cols.map((c) => text(c.get(i)))).toEqual(rows[i]);
      expect(header.map((h) => text(objects[i][h]))).toEqual(rows[i]);
    }
  });

  it.each(['arrow', 'parquet'])('eval --predictions x.%s, then score: the same summaries as the eval report (classification)', async (ext) => {
    const { report, file } = await evalWith(classification, ext);
    const scored = await score(file);
    expect(scored.source).toEqual({ kind: 'predictions', file, foldwise: true, trainRows: 'file' });
    expectSameSummaries(scored, report);
  });

  it('eval --predictions x.arrow, then score: the same summaries as the eval report (regression)', async () => {
    const { report, file } = await evalWith(regression, 'arrow');
    expectSameSummaries(await score(file), report);
  });

  it('score of a truncated Arrow predictions file is one line, exit 2', async () => {
    const { file } = await evalWith(regression, 'feather');
    const cut = tmp.file('cut.arrow', readFileSync(file).subarray(0, 300));
    const s = await cli(['score', cut, '--json', '-']);
    expect(s.code).toBe(2);
    expect(s.stderr.trim().split('\n')).toHaveLength(1);
    expect(s.stderr).toMatch(/not a readable Arrow IPC file/);
  });
});
