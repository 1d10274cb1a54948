/**
 * The problem and plan the main thread built, moved into shared memory for the workers
 * (src/run/share-run.ts): the values stay the same, in the same objects; a worker's prepareRun
 * uses them instead of deriving its own; and eval's workers are handed them. Data: the Palmer
 * penguins file shipped in the npm package vega-datasets (CC0; Gorman, Williams & Fraser 2014).
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { identityOf } from '../../src/run/identity.js';
import { runTaskSet } from '../../src/run/execute.js';
import { prepareRun, type EvaluateOptions } from '../../src/run/prepare.js';
import { problemFromShared, shareRunInPlace } from '../../src/run/share-run.js';
import { runTasks, taskList, type TaskResult } from '../../src/run/tasks.js';
import { penguinsCsv } from '../helpers/penguins.js';

const options: EvaluateOptions = { target: 'Species', drop: ['Island'], group: 'Sex', plan: 'kfold:3', learners: ['knn'], seed: 7 };
const table = () => loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
const isShared = (a: { buffer: ArrayBufferLike }) => a.buffer instanceof SharedArrayBuffer;

describe('shareRunInPlace', () => {
  it('moves the rows, target, groups and folds into shared memory, values and objects unchanged', async () => {
    const p = prepareRun(await table(), options);
    const before = { rows: Array.from(p.problem.rows), groups: Array.from(p.problem.groups!), folds: p.plan.folds.map((f) => [Array.from(f.train), Array.from(f.test)]) };
    const y = p.problem.target;
    if (y.task !== 'classification') throw new Error('Species is a class');
    const codes = Array.from(y.codes);
    const folds = p.plan.folds;
    expect(isShared(p.problem.rows)).toBe(false);
    const shared = shareRunInPlace(p.problem, { plan: p.plan, stratified: p.stratified });
    expect(isShared(p.problem.rows) && isShared(p.problem.groups!) && isShared(y.codes)).toBe(true);
    expect(p.problem.target).toBe(y);
    expect(p.plan.folds).toBe(folds);
    expect(folds).toHaveLength(3);
    for (const f of folds) expect(isShared(f.train) && isShared(f.test)).toBe(true);
    expect(Array.from(p.problem.rows)).toEqual(before.rows);
    expect(Array.from(p.problem.groups!)).toEqual(before.groups);
    expect(Array.from(y.codes)).toEqual(codes);
    expect(folds.map((f) => [Array.from(f.train), Array.from(f.test)])).toEqual(before.folds);
    // the shared part names the features; the worker takes the columns from its table
    expect(shared.problem.featureNames).toEqual(p.problem.features.map((c) => c.name));
    expect('table' in shared.problem || 'features' in shared.problem).toBe(false);
    const t2 = await table();
    const rebuilt = problemFromShared(t2, structuredClone(shared.problem));
    expect(rebuilt.features.map((c) => c)).toEqual(shared.problem.featureNames.map((n) => t2.byName.get(n)));
    expect(rebuilt.table).toBe(t2);
  });

  it('prepareRun with a shared run uses its plan and problem instead of building its own', async () => {
    const own = prepareRun(await table(), options);
    const t = await table();
    const p = prepareRun(t, options);
    const shared = shareRunInPlace(p.problem, { plan: p.plan, stratified: p.stratified });
    const again = prepareRun(t, options, structuredClone(shared));
    expect(taskList(again).map((x) => x.id)).toEqual(taskList(own).map((x) => x.id));
    expect(again.plan.folds.map((f) => Array.from(f.test))).toEqual(own.plan.folds.map((f) => Array.from(f.test)));
    // a plan that differs from what this thread would build is the one taken: fold 1's sides swapped
    const f0 = shared.planned.plan.folds[0];
    const swapped = { ...shared, planned: { ...shared.planned, plan: { ...shared.planned.plan, folds: [{ ...f0, train: f0.test, test: f0.train }, ...shared.planned.plan.folds.slice(1)] } } };
    const taken = prepareRun(t, options, swapped);
    expect(taken.plan.folds[0].test.length).toBe(own.plan.folds[0].train.length);
  });

  it("eval's workers are handed the shared run: a swapped fold is what they predict", async () => {
    const t = await table();
    const p = prepareRun(t, options);
    const all = taskList(p);
    const f0 = p.plan.folds[0];
    const share = () => {
      const s = shareRunInPlace(p.problem, { plan: p.plan, stratified: p.stratified });
      const g = s.planned.plan.folds[0];
      return { ...s, planned: { ...s.planned, plan: { ...s.planned.plan, folds: [{ ...g, train: g.test, test: g.train }, ...s.planned.plan.folds.slice(1)] } } };
    };
    const set = { all, identity: identityOf(p), classification: true, runHere: (ts: Parameters<typeof runTasks>[1], done: (r: TaskResult) => void) => void runTasks(p, ts, done), share };
    const { ordered } = await runTaskSet<TaskResult>(t, options, set, { jobs: 2 });
    const first = all.findIndex((x) => x.foldIndex === 0);
    expect(first).toBeGreaterThanOrEqual(0);
    expect(ordered).toHaveLength(all.length);
    // predictions for the swapped fold's test rows: its training rows here
    expect(ordered[first].predicted.length).toBe(f0.train.length);
    expect(f0.train.length).not.toBe(f0.test.length);
  });
});
