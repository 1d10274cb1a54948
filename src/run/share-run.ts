/**
 * The arrays a run derives from the table (the problem's rows, target, groups and order, and the
 * plan's folds), moved into SharedArrayBuffers in place so that worker threads reuse them instead
 * of deriving their own copies. At 10^6 rows they are about 20 MB per thread (the rows and the
 * class codes, 4 MB each, and the folds' row lists, 4 MB per fold of kfold:3). A worker rebuilds
 * only the small parts (feature columns by name from the shared table); the plan and the problem
 * are those the main thread built, so every thread runs the same tasks on the same rows.
 */
import type { Problem } from '../data/problem.js';
import type { Table } from '../data/types.js';
import type { Target } from '../learning.js';
import type { PlannedProblem } from '../plans/plan-for.js';
import type { BuiltPlan, Fold } from '../plans/types.js';
import { shared as toShared } from './share.js';

/** The problem without the table and its columns: those the worker has already. */
export interface SharedProblem extends Omit<Problem, 'table' | 'features'> {
  readonly featureNames: readonly string[];
}

export interface SharedRun {
  readonly problem: SharedProblem;
  readonly planned: PlannedProblem;
}

type Mutable<T> = { -readonly [K in keyof T]: T[K] };

/**
 * Moves the problem's and the plan's arrays into shared memory, in the objects themselves (so
 * this thread does not hold them twice), and returns what a worker needs to rebuild both.
 * The values are unchanged; only where they live.
 */
export function shareRunInPlace(problem: Problem, planned: PlannedProblem): SharedRun {
  const p = problem as Mutable<Problem>;
  p.rows = toShared(problem.rows);
  const y = problem.target as Mutable<Target>;
  if (y.task === 'classification') y.codes = toShared(y.codes);
  else y.values = toShared(y.values);
  if (problem.groups) p.groups = toShared(problem.groups);
  if (problem.order) p.order = toShared(problem.order);
  for (const f of planned.plan.folds as Mutable<Fold>[]) {
    f.train = toShared(f.train);
    f.test = toShared(f.test);
  }
  const plan = planned.plan as Mutable<BuiltPlan>;
  if (plan.holdout) plan.holdout = toShared(plan.holdout);
  const { table: _table, features, ...rest } = problem;
  return { problem: { ...rest, featureNames: features.map((c) => c.name) }, planned };
}

/** The problem a worker rebuilds from a SharedRun and its copy of the shared table. */
export function problemFromShared(table: Table, shared: SharedProblem): Problem {
  const { featureNames, ...rest } = shared;
  const features = featureNames.map((name) => {
    const c = table.byName.get(name);
    if (!c) throw new Error(`internal: feature column ${name} is not in the shared table`);
    return c;
  });
  return { ...rest, table, features };
}
