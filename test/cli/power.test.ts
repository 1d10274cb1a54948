/**
 * `foldwise power`: repeats advice from a report (issue 17). The advice is recomputed here from
 * the report's own fold scores by an independent path: the noncentral t power written with
 * jstat directly, and the Nadeau & Bengio (2003) variance factor written out.
 */
import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { join } from 'node:path';
import { readFileSync } from 'node:fs';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());

function powerOf(delta: number, J: number, testRows: number, trainRows: number, variance: number, alpha = 0.05): number {
  const se = Math.sqrt((1 / J + testRows / trainRows) * variance);
  const crit = jStat.studentt.inv(1 - alpha, J - 1);
  return 1 - jStat.noncentralt.cdf(crit, J - 1, delta / se);
}

describe('foldwise power', () => {
  it('recommends the fewest repeats whose 80%-power drop is at most the one asked for', async () => {
    const json = join(tmp.dir, 'r.json');
    const e = await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:5x2', '--json', json, '--quiet']);
    expect(e.code).toBe(0);
    const report = JSON.parse(readFileSync(json, 'utf8')) as Report;
    const knn = report.learners.find((l) => l.spec === 'knn')!;
    const scores = knn.folds.map((f) => f.scores.accuracy!);
    expect(scores.length).toBe(10);
    const m = scores.reduce((a, b) => a + b, 0) / scores.length;
    const variance = (2 * scores.reduce((a, b) => a + (b - m) ** 2, 0)) / (scores.length - 1);
    const testRows = knn.folds.reduce((s, f) => s + f.testRows, 0) / 10;
    const trainRows = knn.folds.reduce((s, f) => s + f.trainRows, 0) / 10;
    // pick a drop the plan can reach with some repeats: 1.5 times the MDD of the plan as it is
    const r = await cli(['power', json, '--drop', '0.5', '--json', '-']);
    expect(r.code).toBe(0);
    const first = JSON.parse(r.stdout);
    expect(first.varianceFrom).toBe('twice-fold-variance');
    expect(Math.abs(first.variance - variance)).toBeLessThan(1e-15);
    expect(Math.abs(powerOf(first.mddNow, 10, testRows, trainRows, variance) - 0.8)).toBeLessThan(1e-6);
    const drop = Math.max(first.limit * 1.2, 1e-6);
    const a = JSON.parse((await cli(['power', json, '--drop', String(drop), '--json', '-'])).stdout);
    expect(a.repeats).toBeGreaterThanOrEqual(1);
    expect(powerOf(drop, 5 * a.repeats, testRows, trainRows, variance)).toBeGreaterThanOrEqual(0.8 - 1e-9);
    if (a.repeats > 1) expect(powerOf(drop, 5 * (a.repeats - 1), testRows, trainRows, variance)).toBeLessThan(0.8);
    expect(a.timeMs[1]).toBeGreaterThanOrEqual(a.timeMs[0]);
  });

  it('says when no number of repeats reaches the drop, and refuses a plan without repeats', async () => {
    const json = join(tmp.dir, 'r2.json');
    expect((await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:5', '--json', json, '--quiet'])).code).toBe(0);
    const r = await cli(['power', json, '--drop', '0.000001']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/No number of repeats gets there/);
    const h = join(tmp.dir, 'h.json');
    expect((await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'holdout:0.6/0.4/0', '--json', h, '--quiet'])).code).toBe(0);
    const bad = await cli(['power', h, '--drop', '0.02']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/has no repeats to add/);
  });
});

describe('what the gate and the comparisons can detect', () => {
  it('the verdict states the drop it catches with the asked power, recomputed from the report by jstat (noncentral t)', async () => {
    const json = join(tmp.dir, 'g.json');
    expect((await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'knn:k=9', '--plan', 'kfold:5x2', '--json', json, '--quiet', '--no-timing'])).code).toBe(0);
    const r = await cli(['gate', '--previous', json, '--current', json, '--learner', 'knn', '--current-learner', 'knn:k=9', '--metric', 'log-loss', '--max-drop', '1', '--json', '-']);
    expect(r.code).toBe(0);
    const v = JSON.parse(r.stdout);
    expect(v.detectable).not.toBeNull();
    // two learners on the same folds (k = 5 against k = 9); recompute from the verdict's own
    // numbers: SE = (drop - dropBound) / t_{df, 1-alpha}
    const se = (v.drop - v.dropBound) / jStat.studentt.inv(1 - v.alpha, v.df);
    expect(se).toBeGreaterThan(0);
    const reached = 1 - jStat.noncentralt.cdf(jStat.studentt.inv(1 - v.alpha, v.df), v.df, v.detectable.mdd / se);
    expect(Math.abs(reached - 0.8)).toBeLessThan(1e-6);
    expect(v.detectable.drop).toBe(v.maxDrop + v.detectable.mdd);
  });

  it('every comparison in a report carries its minimal detectable difference (two-sided 0.05, power 0.8)', async () => {
    const json = join(tmp.dir, 'c.json');
    expect((await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:5x2', '--json', json, '--quiet', '--no-timing'])).code).toBe(0);
    const report = JSON.parse(readFileSync(json, 'utf8')) as Report;
    const pairs = report.comparisons!.pairs;
    expect(pairs.length).toBeGreaterThan(0);
    let checked = 0;
    for (const p of pairs) {
      if (p.mdd === null) continue;
      const a = report.learners.find((l) => l.spec === p.learner)!.folds.map((f) => f.scores[report.comparisons!.metric]!);
      const b = report.learners.find((l) => l.spec === p.reference)!.folds.map((f) => f.scores[report.comparisons!.metric]!);
      const d = a.map((x, i) => x - b[i]);
      const m = d.reduce((s, x) => s + x, 0) / d.length;
      const v = d.reduce((s, x) => s + (x - m) ** 2, 0) / (d.length - 1);
      // accuracy's variance is floored (README, "The report"): the MDD uses the larger of the two
      expect(powerOf(p.mdd, d.length, p.testRows, p.trainRows, v, 0.025)).toBeGreaterThanOrEqual(0.8 - 1e-6);
      checked++;
    }
    expect(checked).toBeGreaterThan(0);
  });
});
