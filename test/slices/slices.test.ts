/**
 * --slice on eval and score (issue 17). Outside references: the Palmer penguins file shipped in
 * vega-datasets (CC0; Gorman, Williams & Fraser 2014), the Hyndman & Fan (1996) definition 7 of
 * sample quantiles worked by hand, and the predictions file itself: every slice score is
 * recomputed here from the lines of `eval --predictions`, without foldwise's metric code.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import type { Report } from '../../src/model/report.js';
import { binnedSlice, levelSlice } from '../../src/slices/slice-columns.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';
import { figureOf, tags } from '../helpers/html.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const expectValid = schemaCheck('report.schema.json');

describe('slice columns', () => {
  it('numeric: quantile edges by Hyndman & Fan definition 7, worked by hand', () => {
    // x = 1..8, p = 0.25, 0.5, 0.75: h = 7p = 1.75, 3.5, 5.25 -> x(1.75) = 2.75, 4.5, 6.25 (0-based x_h)
    const s = binnedSlice('x', Float64Array.from([8, 1, 2, 3, 4, 5, 6, 7, Number.NaN]), 4);
    expect(s.edges).toEqual([1, 2.75, 4.5, 6.25, 8]);
    expect(s.levels).toEqual(['[1, 2.75)', '[2.75, 4.5)', '[4.5, 6.25)', '[6.25, 8]', '(missing)']);
    expect(s.codes).toEqual([3, 0, 0, 1, 1, 2, 2, 3, 4]);
  });

  it('numeric: tied edges merge, so a column with few values gives fewer bins', () => {
    const s = binnedSlice('x', Float64Array.from([0, 0, 0, 0, 0, 0, 1, 2]), 4);
    // quantiles at 0.25 and 0.5 are 0 (the lowest value: no edge), at 0.75 it is 0.25
    expect(s.levels).toEqual(['[0, 0.25)', '[0.25, 2]']);
    expect(s.codes).toEqual([0, 0, 0, 0, 0, 0, 1, 1]);
  });

  it('categorical: one level per value, missing as "(missing)"; too many levels refused', () => {
    const s = levelSlice('c', ['a', 'b'], Int32Array.from([1, -1, 0]));
    expect(s.levels).toEqual(['a', 'b', '(missing)']);
    expect(s.codes).toEqual([1, 2, 0]);
    expect(() => levelSlice('id', Array.from({ length: 101 }, (_, i) => `v${i}`), Int32Array.from([0]))).toThrow(/101 levels, at most 100/);
  });
});

interface Line {
  repeat: string;
  fold: string;
  learner: string;
  actual: string;
  predicted: string;
  island: string;
}

describe('eval --slice and score --slice on the penguins', async () => {
  const json = join(tmp.dir, 'e.json');
  const csv = join(tmp.dir, 'p.csv');
  const args = ['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:5x2', '--metric', 'accuracy', '--metric', 'macro-recall'];
  const e = await cli([...args, '--slice', 'Island', '--slice', 'Body Mass (g)', '--json', json, '--predictions', csv, '--predictions-keep', 'Island', '--no-timing', '--quiet']);
  const report: Report = JSON.parse(readFileSync(json, 'utf8'));

  it('is schema-valid and slices by a dropped column and by quantile bins of a feature', () => {
    expect(e.code).toBe(0);
    expectValid(report);
    expect(report.slices?.map((s) => [s.column, s.kind])).toEqual([['Island', 'levels'], ['Body Mass (g)', 'bins']]);
    // the three islands of the Palmer archipelago in the file (Gorman et al. 2014)
    expect(report.slices![0].levels.map((l) => l.level).sort()).toEqual(['Biscoe', 'Dream', 'Torgersen']);
    // 342 of 344 rows have a body mass: four bins of about 85 rows each and the missing
    const mass = report.slices![1];
    expect(mass.levels.length).toBe(5);
    expect(mass.levels.map((l) => l.rows).reduce((a, b) => a + b, 0)).toBe(344);
    // the 2 rows without a body mass: fewer than 5 test rows in every fold, reported, not scored
    const missing = mass.levels[4];
    expect(missing.level).toBe('(missing)');
    expect(missing.rows).toBe(2);
    expect(missing.scoredFolds).toBe(0);
    expect(missing.learners[1].folds.length).toBe(10);
    for (const f of missing.learners[1].folds) expect([f.short, f.scores.accuracy]).toEqual(['rows', null]);
    expect(missing.learners[1].summary.accuracy).toBeNull();
  });

  it('every slice score equals the accuracy recomputed from the predictions file by hand', () => {
    const parsed = Papa.parse<Record<string, string>>(readFileSync(csv, 'utf8'), { header: true, skipEmptyLines: true }).data;
    const lines: Line[] = parsed.map((r) => ({ repeat: r.repeat, fold: r.fold, learner: r.learner, actual: r.actual, predicted: r.predicted_class, island: r.Island }));
    expect(lines.length).toBe(2 * 2 * 344);
    const island = report.slices![0];
    let checked = 0;
    for (const level of island.levels) {
      for (const l of level.learners) {
        for (const f of l.folds) {
          const mine = lines.filter((x) => x.learner === l.spec && x.island === level.level && Number(x.repeat) === f.repeat + 1 && Number(x.fold) === f.fold + 1);
          expect(f.rows).toBe(mine.length);
          if (mine.length < 5) {
            expect(f.short).toBe('rows');
            expect(f.scores.accuracy).toBeNull();
            continue;
          }
          const acc = mine.filter((x) => x.actual === x.predicted).length / mine.length;
          expect(Math.abs((f.scores.accuracy as number) - acc)).toBeLessThan(1e-12);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(40);
  });

  it('a class-averaged metric is not scored where the slice lacks a class (Torgersen has only Adelie penguins)', () => {
    const t = report.slices![0].levels.find((l) => l.level === 'Torgersen')!;
    const f = t.learners[0].folds.find((x) => !x.short)!;
    expect(f.missingClasses).toEqual(['Chinstrap', 'Gentoo']);
    expect(f.scores['macro-recall']).toBeNull();
    expect(f.scores.accuracy).not.toBeNull();
    expect(t.learners[0].summary['macro-recall']).toBeNull();
  });

  it('compares the pairs of learners per slice, as the report does', () => {
    const lv = report.slices![0].levels.find((l) => l.level === 'Biscoe')!;
    expect(lv.comparisons?.pairs.map((p) => [p.learner, p.reference])).toEqual([['knn', 'baseline']]);
    const b = lv.learners[0].folds.filter((f) => !f.short).length;
    expect(lv.comparisons!.pairs[0].folds).toBe(b);
  });

  it('score --slice on the predictions file gives the same slices (levels matched by name)', async () => {
    const s = await cli(['score', csv, '--slice', 'Island', '--metric', 'accuracy', '--metric', 'macro-recall', '--json', '-']);
    expect(s.code).toBe(0);
    const scored: Report = JSON.parse(s.stdout);
    expectValid(scored);
    const byName = new Map(scored.slices![0].levels.map((l) => [l.level, l]));
    expect(byName.size).toBe(3);
    for (const lv of report.slices![0].levels) {
      const o = byName.get(lv.level)!;
      expect(o.learners.map((l) => l.folds)).toEqual(lv.learners.map((l) => l.folds));
      expect(o.learners.map((l) => l.summary)).toEqual(lv.learners.map((l) => l.summary));
    }
  });

  it('Markdown: one table per slice column, short levels said so', async () => {
    const md = await cli([...args, '--slice', 'Island', '--markdown', '-', '--no-timing', '--quiet']);
    expect(md.code).toBe(0);
    expect(md.stdout).toMatch(/## accuracy by Island\n/);
    expect(md.stdout).toMatch(/\| Torgersen \| 52 \| \d+ of 10 \|/);
  });

  it('HTML: a slice chart per column, one mark per learner and scored level at its mean, short levels in words', async () => {
    const page = await cli([...args, '--slice', 'Island', '--slice', 'Body Mass (g)', '--html', '-', '--no-timing', '--quiet']);
    expect(page.code).toBe(0);
    const one = figureOf(page.stdout, 'slice-chart-1');
    const marks = tags(one, 'g').filter((g) => g.get('class') === 'slice-mark');
    // 3 islands x 2 learners (baseline and knn)
    expect(marks.length).toBe(6);
    for (const m of marks) {
      const lv = report.slices![0].levels.find((l) => l.level === m.get('data-level'))!;
      const l = lv.learners.find((x) => x.spec === m.get('data-learner'))!;
      expect(Math.abs(Number(m.get('data-mean')) - l.summary.accuracy!.mean)).toBeLessThan(1e-9);
    }
    expect(figureOf(page.stdout, 'slice-chart-2')).toMatch(/too few rows/);
  });

  it('shards and merge give the same slices as one run, byte for byte (the frame carries the slice columns)', async () => {
    const one = await cli([...args, '--slice', 'Island', '--slice', 'Body Mass (g)', '--json', '-', '--jobs', '1', '--no-timing', '--quiet']);
    const parts = [1, 2].map((i) => join(tmp.dir, `part-${i}.json`));
    for (const [i, part] of parts.entries()) {
      const r = await cli([...args, '--slice', 'Island', '--slice', 'Body Mass (g)', '--shard', `${i + 1}/2`, '--json', part, '--jobs', '1', '--no-timing', '--quiet']);
      expect(r.code).toBe(0);
    }
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.code).toBe(0);
    expect(JSON.parse(merged.stdout).slices.length).toBe(2);
    expect(merged.stdout).toBe(one.stdout);
  });

  it('bad --slice and --slice-bins are refused with exit 2, naming the option', async () => {
    const a = await cli([...args, '--slice', 'Islnd', '--quiet']);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/--slice Islnd: no such column .*did you mean "Island"/);
    const b = await cli([...args, '--slice', 'Species', '--quiet']);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/--slice Species: is the target/);
    const c = await cli([...args, '--slice', 'Island', '--slice-bins', '1', '--quiet']);
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/--slice-bins 1: expected a whole number from 2 to 20/);
  });
});
