/**
 * The sample of pooled out-of-fold predictions that regression reports carry (`pooledSample`,
 * src/run/pooled-sample.ts): the rule itself on hand-worked cases, and on real runs over the
 * Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014), body
 * mass as the target. The sample is checked against the data (the actual values are the
 * file's body masses), against the report's own pooled rmse (root of the mean squared error,
 * the textbook definition), against the predictions recorded in a shard part, and for byte
 * identity across --jobs and merged shards.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { PartialReport } from '../../src/run/partial.js';
import { POOLED_SAMPLE_MAX, pooledSample } from '../../src/run/pooled-sample.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { PENGUINS_JSON, penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { schemaCheck } from '../helpers/schema.js';

const expectValid = schemaCheck('report.schema.json');

const range = (n: number): number[] => Array.from({ length: n }, (_, i) => i);

describe('the sampling rule', () => {
  it('keeps every pair, in order, when there are at most 1,000', () => {
    expect(POOLED_SAMPLE_MAX).toBe(1000);
    const a = range(342).map((i) => i * 10);
    const p = range(342).map((i) => i * 10 + 1);
    const s = pooledSample(a, p);
    expect(s.total).toBe(342);
    expect(s.actual).toEqual(a);
    expect(s.predicted).toEqual(p);
    const exact = pooledSample(range(1000), range(1000));
    expect(exact.actual).toEqual(range(1000));
    expect(pooledSample([], [])).toEqual({ total: 0, actual: [], predicted: [] });
  });

  it('takes floor(j * n / m) for j = 0 .. m-1 beyond the bound (worked by hand)', () => {
    // n = 10, m = 4: positions floor(0), floor(2.5), floor(5), floor(7.5) = 0, 2, 5, 7
    expect(pooledSample(range(10), range(10).map((i) => 100 + i), 4)).toEqual({ total: 10, actual: [0, 2, 5, 7], predicted: [100, 102, 105, 107] });
    // n = 2,500, m = 1,000: gaps of 2 and 3 alternate (positions 0, 2, 5, 7, 10, ...)
    const s = pooledSample(range(2500), range(2500));
    expect(s.total).toBe(2500);
    expect(s.actual.length).toBe(1000);
    expect(s.actual.slice(0, 6)).toEqual([0, 2, 5, 7, 10, 12]);
    expect(s.actual[999]).toBe(2497);
  });

  it('is bounded at 1,000, evenly spaced and deterministic for any size', () => {
    for (const n of [1001, 1026, 1999, 3420, 123457, 2 ** 20 + 3]) {
      const a = Float64Array.from(range(n));
      const s = pooledSample(a, a);
      expect(s.total).toBe(n);
      expect(s.actual.length).toBe(1000);
      expect(s.predicted).toEqual(s.actual);
      expect(s.actual[0]).toBe(0);
      const gaps = s.actual.slice(1).map((v, i) => v - s.actual[i]);
      expect(gaps.length).toBe(999);
      const lo = Math.floor(n / 1000);
      for (const g of gaps) expect(g === lo || g === lo + 1).toBe(true);
      // the last position is the largest below n that the rule reaches
      expect(s.actual[999]).toBe(Math.floor((999 * n) / 1000));
      expect(pooledSample(a, a)).toEqual(s);
    }
  });

  it('refuses pairs of different lengths and a bound below 1', () => {
    expect(() => pooledSample([1, 2], [1])).toThrow(/2 actual values but 1 predictions/);
    expect(() => pooledSample([1], [1], 0)).toThrow(/at least 1/);
  });
});

describe('the sample in regression reports (penguins body mass)', async () => {
  const tmp = tempFolder();
  const penguins = tmp.file('penguins.csv', penguinsCsv());
  const base = ['eval', penguins, '--target', 'Body Mass (g)', '--learner', 'knn', '--learner', 'forest:trees=10', '--no-timing', '--quiet'];
  const masses = (JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, number | null>[]).map((r) => r['Body Mass (g)']).filter((v): v is number => v !== null);

  it('holds every pooled prediction of a single k-fold, and they give the report\'s pooled rmse', async () => {
    const r = await cli([...base, '--plan', 'kfold:5', '--jobs', '1', '--json', '-']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expectValid(report);
    expect(report.data.rowsUsed).toBe(342); // 344 penguins, 2 without a body mass
    expect(masses.length).toBe(342);
    expect(report.learners.length).toBe(3);
    for (const l of report.learners) {
      const s = l.pooledSample!;
      expect(s.total).toBe(342);
      expect(s.actual.length).toBe(342);
      expect(s.predicted.length).toBe(342);
      // each row is tested once: the actual values are the file's body masses
      expect([...s.actual].sort((a, b) => a - b)).toEqual([...masses].sort((a, b) => a - b));
      const rmse = Math.sqrt(s.actual.reduce((acc, a, i) => acc + (a - s.predicted[i]) ** 2, 0) / s.total);
      expect(Math.abs(rmse - l.pooled.rmse!)).toBeLessThan(1e-9 * l.pooled.rmse!);
      expect(l.confusion).toBeUndefined();
    }
  });

  it('takes evenly spaced positions of the pooled order (folds in run order, rows in test order) beyond 1,000', async () => {
    const args = [...base, '--plan', 'kfold:5x3', '--jobs', '1'];
    const r = await cli([...args, '--json', '-']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expectValid(report);
    // the predictions themselves, as one shard of one records them task by task in run order
    const partPath = join(tmp.dir, 'all.part.json');
    expect((await cli([...args, '--shard', '1/1', '--json', partPath])).code).toBe(0);
    const part = JSON.parse(readFileSync(partPath, 'utf8')) as PartialReport;
    expect(part.records.length).toBe(15 * 3);
    report.learners.forEach((l, li) => {
      const mine = part.records.filter((t) => t.candidateIndex === li && t.foldIndex >= 0);
      expect(mine.length).toBe(15);
      const actual = mine.flatMap((t) => t.actual);
      const predicted = mine.flatMap((t) => t.predicted);
      expect(actual.length).toBe(342 * 3);
      const s = l.pooledSample!;
      expect(s.total).toBe(1026);
      expect(s.actual.length).toBe(1000);
      expect(s.predicted.length).toBe(1000);
      for (let j = 0; j < 1000; j++) {
        const i = Math.floor((j * 1026) / 1000);
        expect(s.actual[j]).toBe(actual[i]);
        expect(s.predicted[j]).toBe(predicted[i]);
      }
    });
  });

  it('is the same, byte for byte, with --jobs 2 and from merged shards', async () => {
    const args = [...base, '--plan', 'kfold:5x3'];
    const one = await cli([...args, '--jobs', '1', '--json', '-']);
    const two = await cli([...args, '--jobs', '2', '--json', '-']);
    expect(one.code).toBe(0);
    expect(two.code).toBe(0);
    expect(one.stdout).toContain('"pooledSample"');
    expect(two.stdout).toBe(one.stdout);
    const parts: string[] = [];
    for (const i of [1, 2, 3]) {
      const out = join(tmp.dir, `reg-part-${i}.json`);
      expect((await cli([...args, '--jobs', '1', '--shard', `${i}/3`, '--json', out])).code).toBe(0);
      parts.push(out);
    }
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(one.stdout);
  });
});
