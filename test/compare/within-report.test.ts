import jStat from 'jstat';
import { readFileSync } from 'node:fs';
import { mean, sampleVariance } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from './synthetic.js';
import { schemaCheck } from '../helpers/schema.js';
import { agrestiFloor } from '../helpers/intervals.js';

const expectValid = schemaCheck('report.schema.json');

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const regression = tmp.file('regression.csv', syntheticCsv('regression', 200, 11));
const FEATURES = ['--drop', 'Island', '--drop', 'Sex'];

async function evalJson(args: string[]): Promise<Report> {
  const r = await cli(['eval', ...args, '--json', '-', '--no-timing']);
  expect(r.code).toBe(0);
  return JSON.parse(r.stdout) as Report;
}

let shared: Promise<Report> | undefined;
/** One 5x2-fold report with knn and knn:k=1, shared by the tests that only read it. */
const fiveByTwo = (): Promise<Report> =>
  (shared ??= evalJson([penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--learner', 'knn:k=1', '--plan', 'kfold:5x2']));

function learnerOf(report: Report, spec: string) {
  const l = report.learners.find((x) => x.spec === spec);
  expect(l).toBeDefined();
  return l!;
}

describe('comparisons inside an eval report (Palmer penguins, vega-datasets; Gorman, Williams & Fraser 2014)', () => {
  it('compares every learner with the baseline and with the best, and validates against the schema', async () => {
    const report = await fiveByTwo();
    expectValid(report);
    const c = report.comparisons!;
    expect(c.metric).toBe('accuracy');
    expect(c.higherIsBetter).toBe(true);
    expect(c.level).toBe(0.95);
    const best = [...report.learners].sort((a, b) => b.summary.accuracy!.mean - a.summary.accuracy!.mean)[0];
    const other = report.learners.find((l) => l.name !== 'baseline' && l !== best)!;
    // two learners against the baseline, the non-best one against the best: three pairs
    expect(c.pairs.map((p) => [p.learner, p.reference, p.against.join('+')]).sort()).toEqual(
      [
        [best.spec, 'baseline', 'baseline'],
        [other.spec, 'baseline', 'baseline'],
        [other.spec, best.spec, 'best'],
      ].sort(),
    );
    // kNN on the four measurements is far above the majority class (152/344): wins every fold
    const vsBase = c.pairs.find((p) => p.learner === 'knn' && p.reference === 'baseline')!;
    expect(vsBase.direction).toBe('better');
    expect([vsBase.wins, vsBase.ties, vsBase.losses]).toEqual([10, 0, 0]);
    expect(vsBase.p!).toBeLessThan(0.001);
    expect(vsBase.folds).toBe(10);
    expect(vsBase.df).toBe(9);
  });

  it('carries figures that jstat and simple-statistics reproduce from the fold scores in the JSON', async () => {
    const report = await fiveByTwo();
    const pairs = report.comparisons!.pairs;
    expect(pairs.length).toBe(3);
    for (const p of pairs) {
      const l = learnerOf(report, p.learner);
      const r = learnerOf(report, p.reference);
      expect(l.folds.length).toBe(10);
      const d = l.folds.map((f, i) => {
        expect([f.repeat, f.fold]).toEqual([r.folds[i].repeat, r.folds[i].fold]);
        return f.scores.accuracy! - r.folds[i].scores.accuracy!;
      });
      const j = d.length;
      const ratio = mean(l.folds.map((f) => f.testRows)) / mean(l.folds.map((f) => f.trainRows));
      // Nadeau & Bengio (2003): t = mean(d) / sqrt(max((1/J + n_test/n_train) s_d^2, floor)),
      // df = J - 1, with the binomial floor of a paired difference of accuracies over the
      // n_test + n_train rows of a split (issue 24 part 2)
      const rows = mean(l.folds.map((f) => f.testRows + f.trainRows));
      const se = Math.sqrt(Math.max((1 / j + ratio) * sampleVariance(d), agrestiFloor(Math.abs(mean(d)), rows)));
      const t = mean(d) / se;
      expect(Math.abs(p.diff - mean(d))).toBeLessThan(1e-12);
      expect(Math.abs(p.t! - t)).toBeLessThan(1e-9);
      expect(Math.abs(p.p! - 2 * jStat.studentt.cdf(-Math.abs(t), j - 1))).toBeLessThan(1e-9);
      const half = jStat.studentt.inv(0.975, j - 1) * se;
      // clipped to the range of a difference of accuracies, [-1, 1]
      expect(Math.abs(p.ci95![0] - Math.max(-1, mean(d) - half))).toBeLessThan(1e-9);
      expect(Math.abs(p.ci95![1] - Math.min(1, mean(d) + half))).toBeLessThan(1e-9);
      expect(Math.abs(p.learnerMean - l.summary.accuracy!.mean)).toBeLessThan(1e-12);
      expect(Math.abs(p.referenceMean - r.summary.accuracy!.mean)).toBeLessThan(1e-12);
      expect(p.wins).toBe(d.filter((x) => x > 0).length);
      expect(p.losses).toBe(d.filter((x) => x < 0).length);
      expect(p.ties).toBe(d.filter((x) => x === 0).length);
      // Wilcoxon: zero differences dropped, T+ + T- = n(n+1)/2 (Wilcoxon 1945)
      const n = d.filter((x) => x !== 0).length;
      expect(p.wilcoxon.n).toBe(n);
      expect(p.wilcoxon.tPlus + p.wilcoxon.tMinus).toBe((n * (n + 1)) / 2);
    }
  });

  it('shows one compact comparison table in the Markdown report', async () => {
    const r = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--no-timing']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('## accuracy: paired comparisons on the same folds');
    expect(r.stdout).toContain('| learner | vs | difference | 95% interval (corrected) | t | p | Wilcoxon p | detectable | wins/ties/losses |');
    expect(r.stdout).toMatch(/\| knn \| baseline \| \+0\.\d{4} \| \+0\.\d{4} to \+0\.\d{4} \| [\d.]+ \| < 0\.0001 \| [\d.]+ \| 0\.\d{4} \| 10\/0\/0 \|/);
    expect(r.stdout).toContain('difference = learner minus reference over 10 paired folds (accuracy: higher is better)');
  });

  it('leaves the comparisons out with one learner, and compares only against the best without a baseline', async () => {
    const one = await evalJson([penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--no-baseline']);
    expectValid(one);
    expect(one.comparisons).toBeUndefined();
    const two = await evalJson([penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--learner', 'knn:k=1', '--no-baseline']);
    expectValid(two);
    expect(two.comparisons!.pairs.length).toBe(1);
    expect(two.comparisons!.pairs[0].against).toEqual(['best']);
  });
});

describe('comparisons with a single scored fold (holdout plan)', () => {
  it('gives the difference and the Wilcoxon figures but no t, df, p or interval', async () => {
    const report = await evalJson([penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', 'holdout:0.6/0.2/0.2']);
    expectValid(report);
    const p = report.comparisons!.pairs[0];
    expect(p.folds).toBe(1);
    expect(p).toMatchObject({ ci95: null, t: null, df: null, p: null });
    const knn = learnerOf(report, 'knn').folds[0].scores.accuracy!;
    const base = learnerOf(report, 'baseline').folds[0].scores.accuracy!;
    expect(Math.abs(p.diff - (knn - base))).toBeLessThan(1e-12);
    expect(p.wilcoxon.n).toBe(1);
  });
});

describe('comparisons on a seeded synthetic regression (y = 2 x1 - x2 + 0.3 e)', () => {
  it('keeps diff in the metric units: a lower rmse than the baseline is a negative diff, direction "better"', async () => {
    const report = await evalJson([regression, '--target', 'y', '--learner', 'knn', '--metric', 'rmse']);
    expectValid(report);
    const p = report.comparisons!.pairs[0];
    expect(report.comparisons!.higherIsBetter).toBe(false);
    expect([p.learner, p.reference]).toEqual(['knn', 'baseline']);
    expect(p.diff).toBeLessThan(0);
    expect(p.direction).toBe('better');
    // the signal (sd of 2 x1 - x2 is sqrt(5) = 2.24) dwarfs the noise (0.3): knn wins every fold
    expect([p.wins, p.losses]).toEqual([10, 0]);
    expect(p.ci95![1]).toBeLessThan(0);
  });
});
