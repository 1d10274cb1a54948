/**
 * baseline: the regression constant is the training mean (least squared error) or median (least
 * absolute error), and the runner's automatic baseline takes the best one for the headline
 * metric (issue 25, item 17). Data: Palmer penguins body masses (vega-datasets, CC0; Gorman,
 * Williams & Fraser 2014); reference values from simple-statistics (npm).
 */
import { readFileSync } from 'node:fs';
import { mean as ssMean, median as ssMedian } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { baseline, baselineConstantFor } from '../../src/learners/baseline.js';
import type { Matrix, Target } from '../../src/learning.js';
import { METRICS } from '../../src/metrics/index.js';
import * as medianAbsolute from '../../src/metrics/medae.js';
import type { Report } from '../../src/model/report.js';
import { createRng } from '../../src/rng.js';
import { cli } from '../helpers/cli.js';
import { PENGUINS_JSON, penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const ctx = { rng: createRng(1), seed: 1 };
const masses = (JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, number | null>[])
  .map((r) => r['Body Mass (g)'])
  .filter((v): v is number => typeof v === 'number');
const X = (n: number): Matrix => ({ rows: n, cols: 1, data: new Float64Array(n) });
const y = (values: number[]): Target => ({ task: 'regression', values: Float64Array.from(values) });
const constantOf = (values: number[], constant?: string) =>
  baseline.fit(X(values.length), y(values), constant ? { constant } : {}, ctx).predict(X(1))[0];

describe('baseline: the regression constant', () => {
  it('mean (the default) and median agree with simple-statistics on the penguin body masses', () => {
    expect(masses.length).toBe(342); // 344 rows, two without a body mass
    expect(Math.abs(constantOf(masses) - ssMean(masses))).toBeLessThan(1e-9);
    expect(constantOf(masses, 'median')).toBe(ssMedian(masses));
    // odd and even counts: the middle value, or the midpoint of the two middle values
    expect(constantOf([5, 1, 3], 'median')).toBe(3);
    expect(constantOf([4, 1, 3, 10], 'median')).toBe(3.5);
  });

  it('each constant is the best of the two for its own metric (mean: squared error; median: absolute error)', () => {
    const mean = constantOf(masses, 'mean');
    const median = constantOf(masses, 'median');
    expect(mean).not.toBe(median);
    const sse = (c: number) => masses.reduce((s, v) => s + (v - c) ** 2, 0);
    const sae = (c: number) => masses.reduce((s, v) => s + Math.abs(v - c), 0);
    expect(sse(mean)).toBeLessThan(sse(median));
    expect(sae(median)).toBeLessThan(sae(mean));
    // and no nearby constant beats either (a convex function at its minimum)
    for (const d of [-1, -0.01, 0.01, 1]) {
      expect(sse(mean)).toBeLessThanOrEqual(sse(mean + d));
      expect(sae(median)).toBeLessThanOrEqual(sae(median + d));
    }
  });

  it('refuses an unknown constant, naming the option; round-trips through JSON', () => {
    expect(() => constantOf([1, 2], 'mode')).toThrow(UsageError);
    expect(() => constantOf([1, 2], 'mode')).toThrow('baseline: option "constant" must be one of mean, median, got "mode"');
    const m = baseline.fit(X(4), y([4, 1, 3, 10]), { constant: 'median' }, ctx);
    const back = baseline.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.predict(X(2)))).toEqual([3.5, 3.5]);
  });

  it('the headline metric picks the constant: median for the absolute-error metrics, else mean', () => {
    expect(baselineConstantFor('mae')).toBe('median');
    // the median absolute error, whatever its registered name
    const fns: unknown[] = Object.values(medianAbsolute);
    const medianAbs = [...METRICS.values()].filter((m) => fns.includes(m.fn));
    expect(medianAbs.length).toBe(1);
    expect(baselineConstantFor(medianAbs[0].name)).toBe('median');
    expect(baselineConstantFor('rmse')).toBe('mean');
    expect(baselineConstantFor('r2')).toBe('mean');
    expect(baselineConstantFor('accuracy')).toBe('mean');
  });
});

describe('baseline in eval: the best constant for the headline metric', () => {
  const tmp = tempFolder();
  const file = tmp.file('penguins.csv', penguinsCsv());
  const run = async (...args: string[]) => {
    const r = await cli(['eval', file, '--target', 'Body Mass (g)', ...args, '--json', '-', '--no-timing', '--no-audit']);
    expect(r.code).toBe(0);
    return JSON.parse(r.stdout) as Report;
  };

  it('--metric mae: the automatic baseline is the median one, which beats the mean one on MAE over the same folds', async () => {
    const byMae = await run('--learner', 'linear', '--metric', 'mae');
    expect(byMae.learners[0].name).toBe('baseline');
    expect(byMae.learners[0].spec).toBe('baseline:constant=median');
    const byRmse = await run('--learner', 'linear', '--metric', 'rmse');
    expect(byRmse.learners[0].spec).toBe('baseline');
    // the mean baseline on the same plan and seed (so the same folds)
    const meanOnly = await run('--no-baseline', '--learner', 'baseline:constant=mean', '--metric', 'mae');
    expect(meanOnly.learners.length).toBe(1);
    expect(byMae.learners[0].pooled.mae!).toBeLessThan(meanOnly.learners[0].pooled.mae!);
  });
});
