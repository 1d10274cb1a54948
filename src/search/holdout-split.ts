/**
 * `--holdout F`: a final part of the rows set aside before any selection, scored once by the
 * recommended candidate (Hastie, Tibshirani & Friedman, Elements of Statistical Learning, 2nd
 * ed., sec. 7.2: the test set is kept "in a vault" until the end of the analysis).
 *
 * Random plans: the part is one stratified (classification, unless turned off) or grouped
 * random split of the plans module (`resplit:1@F`, so its sizes follow the same apportioning:
 * about F n_c rows of each class, whole groups when a group column is given), from the
 * generator deriveSeed(seed, "holdout").
 * Forward (time-ordered) outer plans: the latest share F of the rows by the order column, moved
 * later so that rows with equal order values stay on one side.
 */
import type { Problem } from '../data/problem.js';
import { InputError, UsageError } from '../errors.js';
import type { PlanSpec } from '../plans/types.js';
import { createRng, deriveSeed } from '../rng.js';
import { allRows, planOver } from './plan-over.js';

export interface HoldoutSplit {
  /** rows the search may use, ascending */
  readonly search: Int32Array;
  /** rows set aside, ascending */
  readonly holdout: Int32Array;
}

/** Checks --holdout F: a fraction strictly between 0 and 1. */
export function checkHoldoutFraction(f: number): number {
  if (!(Number.isFinite(f) && f > 0 && f < 1)) throw new UsageError(`--holdout ${f}: expected a fraction above 0 and below 1 (such as 0.2)`);
  return f;
}

export function splitHoldout(problem: Problem, fraction: number, outer: PlanSpec, stratify: boolean | undefined, seed: number): HoldoutSplit {
  const f = checkHoldoutFraction(fraction);
  const n = problem.rows.length;
  if (outer.kind === 'forward' && problem.order) {
    const order = problem.order;
    const sorted = Array.from(allRows(n)).sort((a, b) => order[a] - order[b] || a - b);
    let cut = n - Math.round(f * n);
    while (cut > 0 && cut < n && order[sorted[cut]] === order[sorted[cut - 1]]) cut++;
    if (cut <= 0 || cut >= n) {
      throw new InputError(`--holdout ${f}: the latest ${f} of ${n} rows by order leaves no rows on one side; change F or use more rows`);
    }
    const search = Int32Array.from(sorted.slice(0, cut)).sort();
    const holdout = Int32Array.from(sorted.slice(cut)).sort();
    return { search, holdout };
  }
  let plan;
  try {
    plan = planOver(problem, { kind: 'resplit', splits: 1, testFraction: f }, allRows(n), stratify, createRng(deriveSeed(seed, 'holdout'))).plan;
  } catch (e) {
    if (e instanceof InputError) throw new InputError(`--holdout ${f}: ${e.message.replace(/^--plan \S+ /, 'the split ')}`);
    throw e;
  }
  return { search: plan.folds[0].train, holdout: plan.folds[0].test };
}
