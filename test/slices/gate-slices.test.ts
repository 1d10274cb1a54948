/**
 * gate --slices and several --metric (issue 17): the family of tests, Holm-adjusted. The
 * previous report is a real eval run on the Palmer penguins file (vega-datasets, CC0; Gorman,
 * Williams & Fraser 2014); the current one is that report with a drop planted in one slice's
 * fold scores (a constructed change, so the right answer is known).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Report } from '../../src/model/report.js';
import type { GateVerdict } from '../../src/model/compare.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const expectGate = schemaCheck('gate.schema.json');

describe('gate --slices', async () => {
  const prev = join(tmp.dir, 'prev.json');
  const e = await cli(['eval', penguins, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:5x2', '--slice', 'Island', '--json', prev, '--no-timing', '--quiet']);
  const report: Report = JSON.parse(readFileSync(prev, 'utf8'));
  const planted = structuredClone(report) as unknown as { slices: { levels: { level: string; learners: { spec: string; folds: { scores: Record<string, number | null> }[] }[] }[] }[] };
  const biscoe = planted.slices[0].levels.find((l) => l.level === 'Biscoe')!;
  const knn = biscoe.learners.find((l) => l.spec === 'knn')!;
  // a drop of 0.2 in accuracy with some spread, in Biscoe only
  knn.folds.forEach((f, i) => (f.scores.accuracy = (f.scores.accuracy as number) - 0.2 - 0.01 * (i % 3)));
  const cur = join(tmp.dir, 'cur.json');
  writeFileSync(cur, JSON.stringify(planted));

  it('fails naming the slice with the planted drop, which the gate on all rows does not see', async () => {
    expect(e.code).toBe(0);
    const all = await cli(['gate', '--previous', prev, '--current', cur, '--learner', 'knn', '--json', '-']);
    expect(all.code).toBe(0);
    const g = await cli(['gate', '--previous', prev, '--current', cur, '--learner', 'knn', '--slices', '--json', '-']);
    expect(g.code).toBe(1);
    const v: GateVerdict = JSON.parse(g.stdout);
    expectGate(v);
    expect(v.verdict).toBe('fail');
    expect(v.family?.failing).toEqual(['accuracy in Island = Biscoe']);
    // 1 test on all rows + 3 islands
    expect(v.family?.tests.length).toBe(4);
    const t = v.family!.tests.find((x) => x.level === 'Biscoe')!;
    expect(Math.abs(t.drop - 0.21)).toBeLessThan(0.002);
    // Holm: the smallest p is multiplied by the family size 4
    expect(Math.abs(t.adjustedP - Math.min(1, 4 * t.p))).toBeLessThan(1e-12);
    const md = await cli(['gate', '--previous', prev, '--current', cur, '--learner', 'knn', '--slices']);
    expect(md.stdout).toMatch(/\*\*Failing:\*\* accuracy in Island = Biscoe/);
  });

  it('passes an unchanged run over every slice and metric; several --metric make one family', async () => {
    const g = await cli(['gate', '--previous', prev, '--current', prev, '--learner', 'knn', '--slices', '--metric', 'accuracy', '--metric', 'macro-f1', '--json', '-']);
    expect(g.code).toBe(0);
    const v: GateVerdict = JSON.parse(g.stdout);
    expectGate(v);
    expect(v.family?.failing).toEqual([]);
    // two metrics on all rows; per island accuracy always, macro-f1 only where every class appears
    expect(v.family!.tests.filter((t) => t.column === undefined).map((t) => t.metric)).toEqual(['accuracy', 'macro-f1']);
    expect(v.family!.notGated.some((n) => n.startsWith('macro-f1 in Island = Torgersen'))).toBe(true);
  });

  it('refuses --slices on reports without slices (exit 2)', async () => {
    const plain = join(tmp.dir, 'plain.json');
    await cli(['eval', penguins, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:5', '--json', plain, '--no-timing', '--quiet']);
    const g = await cli(['gate', '--previous', plain, '--current', plain, '--slices']);
    expect(g.code).toBe(2);
    expect(g.stderr).toMatch(/gate --slices: the previous report has no slices/);
  });
});
