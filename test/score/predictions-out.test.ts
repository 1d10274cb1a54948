/**
 * Out-of-fold predictions as an output (issue 15): `eval --predictions FILE` writes one line per
 * (test row, repeat, learner); the report's per-fold scores are recomputed here from that file
 * alone; the bytes are the same whatever --jobs, after shards and merge, and after a journal
 * resume. Data: the Palmer penguins file (vega-datasets, CC0; Gorman, Williams & Fraser 2014).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { getMetric } from '../../src/metrics/index.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguinsText = penguinsCsv();
const penguins = tmp.file('penguins.csv', penguinsText);
const species = ['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:5x2', '--no-timing', '--quiet'];
const mass = ['eval', penguins, '--target', 'Body Mass (g)', '--drop', 'Island', '--learner', 'knn', '--learner', 'linear', '--plan', 'kfold:4', '--no-timing', '--quiet'];

function parse(text: string): { header: string[]; rows: string[][] } {
  const all = Papa.parse<string[]>(text.trimEnd(), { header: false }).data;
  return { header: all[0], rows: all.slice(1) };
}

async function evalWith(args: string[], name: string): Promise<{ report: Report; text: string }> {
  const json = join(tmp.dir, `${name}.json`);
  const csv = join(tmp.dir, `${name}.csv`);
  const r = await cli([...args, '--json', json, '--predictions', csv]);
  expect(r.stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
  expect(r.code).toBe(0);
  return { report: JSON.parse(readFileSync(json, 'utf8')) as Report, text: readFileSync(csv, 'utf8') };
}

describe('eval --predictions: the file', () => {
  it('has one line per (test row, repeat, learner), with the line and row of each test row in the input', async () => {
    const { report, text } = await evalWith(species, 'species');
    const { header, rows } = parse(text);
    const classes = report.data.classes!;
    expect(header).toEqual(['line', 'row', 'repeat', 'fold', 'role', 'learner', 'actual', 'predicted_class', 'train_rows', ...classes.map((c) => `prob:${c}`)]);
    // 3 learners (baseline, knn, forest) x 2 repeats x every used row
    expect(rows.length).toBe(3 * 2 * report.data.rowsUsed);
    // the input's own lines: line L of the CSV holds data row L - 2 (one header line, no line breaks in fields)
    const input = penguinsText.split('\n');
    const speciesAt = input[0].split(',').indexOf('Species');
    expect(speciesAt).toBeGreaterThanOrEqual(0);
    for (const r of rows.slice(0, 50)) {
      expect(Number(r[0])).toBe(Number(r[1]) + 2);
      expect(input[Number(r[0]) - 1].split(',')[speciesAt]).toBe(r[6]);
    }
    // probabilities in the report's class order, each row summing to 1
    for (const r of rows.slice(0, 200)) {
      const p = r.slice(9).map(Number);
      expect(p.length).toBe(classes.length);
      expect(Math.abs(p.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-9);
    }
  });

  it('recomputes every metric of every fold of the report from the file alone (classification and regression)', async () => {
    for (const [args, name] of [[species, 'c'], [mass, 'r']] as const) {
      const { report, text } = await evalWith([...args], `re-${name}`);
      const { header, rows } = parse(text);
      const col = (n: string): number => header.indexOf(n);
      const classes = report.data.classes ?? [];
      const probCols = classes.map((c) => col(`prob:${c}`));
      let checked = 0;
      for (const l of report.learners) {
        for (const f of l.folds) {
          const mine = rows.filter((r) => r[col('learner')] === l.spec && Number(r[col('repeat')]) === f.repeat + 1 && Number(r[col('fold')]) === f.fold + 1);
          expect(mine.length).toBe(f.testRows);
          expect(Number(mine[0][col('train_rows')])).toBe(f.trainRows);
          for (const m of report.metrics) {
            const metric = getMetric(m);
            let v: number;
            if (metric.task === 'classification') {
              const code = (s: string): number => classes.indexOf(s);
              v = metric.fn({
                actual: Int32Array.from(mine, (r) => code(r[col('actual')])),
                predicted: Int32Array.from(mine, (r) => code(r[col('predicted_class')])),
                classes: classes.length,
                probs: Float64Array.from(mine.flatMap((r) => probCols.map((j) => Number(r[j])))),
              });
            } else {
              v = metric.fn({ actual: Float64Array.from(mine, (r) => Number(r[col('actual')])), predicted: Float64Array.from(mine, (r) => Number(r[col('predicted_value')])) });
            }
            expect(f.scores[m]).toBe(v);
            checked++;
          }
        }
      }
      expect(checked).toBeGreaterThanOrEqual(3 * 4 * 3);
    }
  });

  it('copies --predictions-keep columns into each line, and refuses an unknown column', async () => {
    const csv = join(tmp.dir, 'keep.csv');
    const r = await cli([...species, '--predictions', csv, '--predictions-keep', 'Island', '--json', join(tmp.dir, 'keep.json')]);
    expect(r.code).toBe(0);
    const { header, rows } = parse(readFileSync(csv, 'utf8'));
    expect(header[header.length - 1]).toBe('Island');
    const input = Papa.parse<string[]>(penguinsText.trimEnd()).data;
    const islandAt = input[0].indexOf('Island');
    for (const row of rows.slice(0, 30)) expect(row[row.length - 1]).toBe(input[Number(row[1]) + 1][islandAt]);
    const bad = await cli([...species, '--predictions', csv, '--predictions-keep', 'Islnd']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--predictions-keep "Islnd": no such column.*Island/);
    expect(bad.stderr.trim().split('\n').length).toBe(1);
  });

  it('writes CSV to standard output with --predictions - (and the report only where a flag says)', async () => {
    const r = await cli([...mass, '--predictions', '-']);
    expect(r.code).toBe(0);
    expect(r.stdout.startsWith('line,row,repeat,fold,role,learner,actual,predicted_value,train_rows\n')).toBe(true);
    expect(r.stdout).not.toContain('# ');
  });
});

describe('eval --predictions: the same bytes however the run is made', () => {
  it('for --jobs 1 and 2, for three shards merged, and for a run resumed from its journal', async () => {
    const one = await cli([...species, '--jobs', '1', '--predictions', '-']);
    const two = await cli([...species, '--jobs', '2', '--predictions', '-']);
    expect(one.code).toBe(0);
    expect(one.stdout.length).toBeGreaterThan(10_000);
    expect(two.stdout).toBe(one.stdout);
    const parts: string[] = [];
    for (const i of [1, 2, 3]) {
      const out = join(tmp.dir, `pp-${i}.json`);
      expect((await cli([...species, '--jobs', '1', '--shard', `${i}/3`, '--json', out])).code).toBe(0);
      parts.push(out);
    }
    const merged = await cli(['merge', ...parts, '--predictions', '-', '--no-timing']);
    expect(merged.stderr).toBe('');
    expect(merged.stdout).toBe(one.stdout);
    const journal = join(tmp.dir, 'pred.journal');
    expect((await cli([...species, '--jobs', '1', '--journal', journal, '--json', join(tmp.dir, 'j.json')])).code).toBe(0);
    const resumed = await cli([...species, '--jobs', '1', '--journal', journal, '--predictions', '-']);
    expect(resumed.stdout).toBe(one.stdout);
  });

  it.each(['parquet', 'arrow'])('as %s too: --jobs 1 and 2, three shards merged, a run resumed from its journal', async (ext) => {
    const bytes = async (args: string[], name: string): Promise<Buffer> => {
      const file = join(tmp.dir, `${name}.${ext}`);
      const r = await cli([...args, '--predictions', file]);
      expect(r.stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
      expect(r.code).toBe(0);
      return readFileSync(file);
    };
    const one = await bytes([...species, '--jobs', '1'], `j1-${ext}`);
    expect(one.length).toBeGreaterThan(10_000);
    expect(one.equals(await bytes([...species, '--jobs', '2'], `j2-${ext}`))).toBe(true);
    const parts: string[] = [];
    for (const i of [1, 2, 3]) {
      const out = join(tmp.dir, `pt-${ext}-${i}.json`);
      expect((await cli([...species, '--jobs', '1', '--shard', `${i}/3`, '--json', out])).code).toBe(0);
      parts.push(out);
    }
    expect(one.equals(await bytes(['merge', ...parts, '--no-timing'], `merged-${ext}`))).toBe(true);
    const journal = join(tmp.dir, `pred-${ext}.journal`);
    expect((await cli([...species, '--jobs', '1', '--journal', journal, '--json', join(tmp.dir, `j-${ext}.json`)])).code).toBe(0);
    expect(one.equals(await bytes([...species, '--jobs', '1', '--journal', journal], `resumed-${ext}`))).toBe(true);
  });

  it('is refused with --shard (the part carries the predictions); a Parquet name writes Parquet (test/score/score-columnar.test.ts)', async () => {
    const s = await cli([...species, '--shard', '1/2', '--json', join(tmp.dir, 'x.json'), '--predictions', join(tmp.dir, 'x.csv')]);
    expect(s.code).toBe(2);
    expect(s.stderr).toMatch(/give --predictions to foldwise merge/);
    const p = await cli([...species, '--predictions', join(tmp.dir, 'x.parquet')]);
    expect(p.code).toBe(0);
    expect(readFileSync(join(tmp.dir, 'x.parquet')).subarray(0, 4).toString('latin1')).toBe('PAR1');
  });
});

describe('tune --predictions', () => {
  it('writes the outer predictions of the tuned procedure and the baseline; score on them gives the tuned estimate and its comparison', async () => {
    const json = join(tmp.dir, 'tune.json');
    const csv = join(tmp.dir, 'tune.csv');
    const r = await cli(['tune', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn:k=1|5', '--plan', 'kfold:4', '--inner', 'kfold:3', '--holdout', '0.2', '--no-timing', '--json', json, '--predictions', csv]);
    expect(r.code).toBe(0);
    const report = JSON.parse(readFileSync(json, 'utf8'));
    const { header, rows } = parse(readFileSync(csv, 'utf8'));
    expect(header).toContain('pick');
    const tuned = rows.filter((x) => x[header.indexOf('learner')] === 'tuned' && x[header.indexOf('role')] === 'test');
    expect(tuned.length).toBe(report.plan.searchRows);
    // each outer fold's pick, as the report names it
    for (const f of report.outer.folds) {
      const mine = tuned.filter((x) => Number(x[header.indexOf('fold')]) === f.fold + 1);
      expect(mine.length).toBe(f.testRows);
      expect(new Set(mine.map((x) => x[header.indexOf('pick')]))).toEqual(new Set([f.pickSpec]));
    }
    expect(rows.filter((x) => x[header.indexOf('role')] === 'holdout').length).toBe(report.holdout.testRows);
    const s = await cli(['score', csv, '--json', '-']);
    expect(s.code).toBe(0);
    const scored = JSON.parse(s.stdout) as Report;
    const t = scored.learners.find((l) => l.spec === 'tuned')!;
    expect(t.summary).toEqual(report.outer.summary);
    expect(t.pooled).toEqual(report.outer.pooled);
    expect(t.final?.scores).toEqual(report.holdout.scores);
  });
});

describe('eval --html draws the regression charts from the run\'s own predictions', () => {
  it('all pooled predictions (1,368) where the JSON report keeps a sample of 1,000, and says so', async () => {
    const html = join(tmp.dir, 'wide.html');
    const json = join(tmp.dir, 'wide.json');
    const r = await cli(['eval', penguins, '--target', 'Body Mass (g)', '--drop', 'Island', '--learner', 'linear', '--plan', 'kfold:4x4', '--no-timing', '--quiet', '--html', html, '--json', json]);
    expect(r.code).toBe(0);
    const report = JSON.parse(readFileSync(json, 'utf8')) as Report;
    const s = report.learners[1].pooledSample!;
    expect(s.total).toBe(4 * report.data.rowsUsed);
    expect(s.total).toBeGreaterThan(1000);
    expect(s.actual.length).toBe(1000);
    const page = readFileSync(html, 'utf8');
    expect(page).toContain(`All ${s.total.toLocaleString('en-US')} pooled out-of-fold predictions of ${report.learners[1].spec}`);
    expect(page).not.toContain('A sample of 1,000');
  });
});
