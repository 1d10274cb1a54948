/**
 * Fold-local preprocessing never reads a test row, checked through the runner (issue 4): every
 * `fitPrep` call made by `evaluate` is instrumented so the table rows it reads are recorded, and
 * every learner fit is wrapped so the rows it is given are recorded. For each fold of the plan
 * (rebuilt with `planFor`, the same call evaluate makes, from the same seed) the preprocessing
 * must read exactly that fold's training rows and none of its test rows, and the learner must
 * get one matrix row and one target per training row, the targets of the training rows. With
 * `--final`, the last fit may read training and validation rows but never the holdout rows.
 *
 * Data: the Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014),
 * which has missing measurements, so imputation is fitted on every fold; and the synthetic frame
 * of test/hostile/fixtures.ts (known generating process) for a forward plan on dates.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem, type Problem } from '../../src/data/problem.js';
import type { Column } from '../../src/data/types.js';
import type { Learner, Matrix, Target } from '../../src/learning.js';
import { parsePlan } from '../../src/plans/index.js';
import { evaluate, type EvaluateOptions } from '../../src/run/evaluate.js';
import { planFor } from '../../src/plans/plan-for.js';
import { baseFrame, csvText } from '../hostile/fixtures.js';
import { penguinsCsv } from '../helpers/penguins.js';

interface PrepCall {
  readonly train: Int32Array;
  readonly problemRows: Int32Array;
  readonly read: Set<number>;
}
interface FitCall {
  readonly rows: number;
  readonly y: Target;
}
const prepCalls: PrepCall[] = [];
const fitCalls: FitCall[] = [];

/** A column whose value (or code) array records every row index read. */
function instrumented(col: Column, read: Set<number>): Column {
  const spy = <T extends Float64Array | Int32Array>(array: T): T =>
    new Proxy(array, {
      get(target, key) {
        if (typeof key === 'string' && /^\d+$/.test(key)) read.add(Number(key));
        const v = Reflect.get(target, key, target);
        return typeof v === 'function' ? v.bind(target) : v;
      },
    });
  return col.kind === 'numeric' ? { ...col, values: spy(col.values) } : { ...col, codes: spy(col.codes) };
}

vi.mock('../../src/prep/fold-prep.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/prep/fold-prep.js')>();
  return {
    ...real,
    fitPrep: (problem: Problem, train: Int32Array, impute?: 'median' | 'mean') => {
      const read = new Set<number>();
      prepCalls.push({ train: Int32Array.from(train), problemRows: problem.rows, read });
      return real.fitPrep({ ...problem, features: problem.features.map((c) => instrumented(c, read)) }, train, impute);
    },
  };
});

vi.mock('../../src/learners/index.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/learners/index.js')>();
  return {
    ...real,
    getLearner: (name: string): Learner => {
      const learner = real.getLearner(name);
      return {
        ...learner,
        fit: (X: Matrix, y: Target, params, ctx) => {
          fitCalls.push({ rows: X.rows, y });
          return learner.fit(X, y, params, ctx);
        },
      };
    },
  };
});

beforeEach(() => {
  prepCalls.length = 0;
  fitCalls.length = 0;
});

function targetsAt(y: Target, idx: Int32Array): number[] {
  return Array.from(idx, (i) => (y.task === 'classification' ? y.codes[i] : y.values[i]));
}
function targetsOf(y: Target): number[] {
  return Array.from(y.task === 'classification' ? y.codes : y.values);
}

async function check(csv: string, options: EvaluateOptions): Promise<void> {
  const table = await loadCsv({ text: csv, name: 'data.csv' });
  const report = evaluate(table, { ...options, seed: 11, timing: false });
  const problem = defineProblem(table, options);
  const { plan } = planFor(problem, parsePlan(String(options.plan)), options.stratify, 11);
  const learners = report.learners.length;
  const finalFits = options.final ? 1 : 0;
  expect(plan.folds.length).toBeGreaterThan(0);
  expect(prepCalls.length).toBe(plan.folds.length + finalFits);
  expect(fitCalls.length).toBe((plan.folds.length + finalFits) * learners);

  plan.folds.forEach((fold, j) => {
    const call = prepCalls[j];
    expect(Array.from(call.train)).toEqual(Array.from(fold.train));
    const trainRows = new Set(Array.from(fold.train, (i) => problem.rows[i]));
    const testRows = Array.from(fold.test, (i) => problem.rows[i]);
    // reads exactly the training rows: every one (imputation and scaling need them) and no other
    expect([...call.read].sort((a, b) => a - b)).toEqual([...trainRows].sort((a, b) => a - b));
    expect(testRows.filter((r) => call.read.has(r))).toEqual([]);
    for (let l = 0; l < learners; l++) {
      const fit = fitCalls[j * learners + l];
      expect(fit.rows).toBe(fold.train.length);
      expect(targetsOf(fit.y)).toEqual(targetsAt(problem.target, fold.train));
    }
  });
  if (options.final) {
    const last = prepCalls[prepCalls.length - 1];
    const held = Array.from(plan.holdout!, (i) => problem.rows[i]);
    expect(held.length).toBeGreaterThan(0);
    expect(held.filter((r) => last.read.has(r))).toEqual([]);
    expect(last.read.size).toBe(plan.folds[0].train.length + plan.folds[0].test.length);
  }
}

describe('the runner fits preprocessing and learners on training rows only (instrumented)', () => {
  const penguins = penguinsCsv();
  it('stratified 5-fold x 2 on the penguins, with kNN and the baseline', async () => {
    await check(penguins, { target: 'Species', plan: 'kfold:5x2', learners: ['knn'] });
  });
  it('grouped 3-fold by island on the penguins', async () => {
    await check(penguins, { target: 'Species', drop: ['Sex'], group: 'Island', plan: 'kfold:3', learners: ['knn:k=3'] });
  });
  it('shuffled splits on the penguins, regression on body mass', async () => {
    await check(penguins, { target: 'Body Mass (g)', plan: 'resplit:4@0.3', learners: ['knn'] });
  });
  it('holdout with --final: the final fit never reads the holdout rows', async () => {
    await check(penguins, { target: 'Species', plan: 'holdout:0.6/0.2/0.2', final: true, learners: ['knn'] });
  });
  it('forward folds on dates (synthetic frame)', async () => {
    await check(csvText(baseFrame(40)), { target: 'y', order: 'd', plan: 'forward:3', learners: ['knn:k=1'] });
  });
});
