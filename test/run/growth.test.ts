/**
 * foldwise growth (issue 22): a learning curve on a seeded process with a known ceiling. Two
 * Gaussian classes N(-1, 1) and N(+1, 1) with equal priors: the Bayes rule (sign of x) is right
 * with probability Phi(1) = 0.8413 (standard normal table, NIST/SEMATECH e-Handbook 1.3.6.7.1).
 * The curve of a consistent learner rises toward it and no size beats it beyond noise; the
 * baseline stays near chance. Plus the power-law fit on exact data, and bad --sizes.
 */
import { describe, expect, it } from 'vitest';
import { fitPowerLaw, doublingGain } from '../../src/growth/power-law.js';
import { nestedOrder } from '../../src/growth/subsets.js';
import { createRng } from '../../src/rng.js';
import { cli } from '../helpers/cli.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const BAYES = 0.8413;
const expectGrowth = schemaCheck('growth.schema.json');

function gauss(rng: { next(): number }): number {
  const u = 1 - rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

function twoGaussians(n: number): string {
  const rng = createRng(2203);
  const lines = ['x,noise,class'];
  for (let i = 0; i < n; i++) {
    const up = rng.next() < 0.5;
    lines.push(`${((up ? 1 : -1) + gauss(rng)).toFixed(6)},${gauss(rng).toFixed(6)},${up ? 'up' : 'down'}`);
  }
  return `${lines.join('\n')}\n`;
}
const data = tmp.file('gauss.csv', twoGaussians(1500));

describe('learning curve toward a known Bayes accuracy', () => {
  it('rises toward Phi(1) = 0.8413 and never beats it beyond noise', async () => {
    const r = await cli(['growth', data, '--target', 'class', '--learner', 'knn:k=15', '--plan', 'kfold:5', '--sizes', '0.01,0.03,0.1,0.3,1', '--json', '-']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expectGrowth(report);
    expect(report.metric).toBe('accuracy');
    const knn = report.learners.find((l: { name: string }) => l.name === 'knn');
    expect(knn.points.length).toBe(5);
    const means = knn.points.map((p: { test: { mean: number } }) => p.test.mean);
    for (const p of knn.points) {
      expect(p.folds.length).toBe(5);
      // never beyond the Bayes accuracy beyond noise: the corrected interval reaches it
      expect(p.test.ci95[0]).toBeLessThanOrEqual(BAYES);
    }
    expect(means[4]).toBeGreaterThan(means[0]);
    expect(Math.abs(means[4] - BAYES)).toBeLessThan(0.03);
    // the fitted asymptote a is near the ceiling, the curve rises (b > 0)
    expect(knn.fit.b).toBeGreaterThan(0);
    expect(Math.abs(knn.fit.a - BAYES)).toBeLessThan(0.05);
    // doubling 1200 training rows gains little, and the training score sits above the test score at the smallest size
    expect(Math.abs(knn.doubling.gain)).toBeLessThan(0.02);
    expect(knn.points[4].rows).toBe(1200);
    // common practice: the score on the rows a model saw is optimistic, most so with few rows
    const gap = (p: { train: { mean: number }; test: { mean: number } }): number => p.train.mean - p.test.mean;
    expect(gap(knn.points[0])).toBeGreaterThan(0.1);
    expect(gap(knn.points[0])).toBeGreaterThan(gap(knn.points[4]));
    const base = report.learners.find((l: { name: string }) => l.name === 'baseline');
    expect(Math.abs(base.points[4].test.mean - 0.5)).toBeLessThan(0.06);
  });

  it('Markdown lists every size and the fit, HTML draws both curves with bands; bad sizes are refused with exit 2', async () => {
    const md = await cli(['growth', data, '--target', 'class', '--learner', 'bayes', '--plan', 'kfold:3', '--sizes', '0.1,0.5,1']);
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('## bayes');
    expect(md.stdout).toMatch(/Fitted: accuracy = /);
    const html = await cli(['growth', data, '--target', 'class', '--learner', 'bayes', '--plan', 'kfold:3', '--sizes', '0.1,0.5,1', '--html', '-']);
    expect(html.code).toBe(0);
    expect(html.stdout).toContain('id="growth-2"');
    // one test and one training curve with bands per learner (baseline and bayes)
    expect((html.stdout.match(/class="curve"/g) ?? []).length).toBe(4);
    expect((html.stdout.match(/class="band"/g) ?? []).length).toBe(4);
    const bad = await cli(['growth', data, '--target', 'class', '--sizes', '0.5,0.2']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/^foldwise: --sizes: list the sizes once each, smallest first/);
    const word = await cli(['growth', data, '--target', 'class', '--sizes', '0.1,half']);
    expect(word.code).toBe(2);
    expect(word.stderr).toMatch(/"half" is not a number/);
  });
});

describe('pieces', () => {
  it('fits an exact inverse power law back (a = 0.9, b = 2, c = 0.5)', () => {
    const n = [50, 100, 200, 400, 800, 1600];
    const fit = fitPowerLaw(n, n.map((v) => 0.9 - 2 * v ** -0.5))!;
    expect(Math.abs(fit.a - 0.9)).toBeLessThan(1e-9);
    expect(Math.abs(fit.b - 2)).toBeLessThan(1e-9);
    expect(fit.c).toBe(0.5);
    // score(3200) - score(1600) by hand
    expect(Math.abs(doublingGain(fit, 1600) - (2 * 1600 ** -0.5 - 2 * 3200 ** -0.5))).toBeLessThan(1e-12);
  });

  it('orders a fold so that every prefix is nested and stratified within one row per class', () => {
    const codes = Int32Array.from({ length: 300 }, (_, i) => (i % 3 === 0 ? 1 : 0));
    const train = Int32Array.from({ length: 300 }, (_, i) => i);
    const order = nestedOrder(train, { task: 'classification', codes, classes: ['a', 'b'] }, createRng(7));
    expect(new Set(order).size).toBe(300);
    for (const k of [10, 33, 100, 250]) {
      const ones = Array.from(order.subarray(0, k)).filter((u) => codes[u] === 1).length;
      expect(Math.abs(ones - k / 3), String(k)).toBeLessThanOrEqual(1);
    }
  });
});
