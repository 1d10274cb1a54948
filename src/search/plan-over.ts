/**
 * A resampling plan built over a subset of a problem's rows (the outer training rows of a nested
 * search, or the rows left after a holdout), with the plan's row numbers mapped back to the
 * problem's used-row indices.
 *
 * The plan sees only the subset: its class codes (when stratified), group codes and order values
 * are those of the subset's rows, in the subset's order, so an inner plan can never put an outer
 * test row anywhere. Stratification follows the same rule as planFor (src/run/plan-for.ts):
 * classification unless turned off, never for leave-one-out or forward plans. Over all rows
 * with the generator of planFor the folds are exactly planFor's (the same builder on the same
 * input), so tune's outer folds equal eval's for the same seed.
 */
import type { Problem } from '../data/problem.js';
import { buildPlan } from '../plans/index.js';
import type { BuiltPlan, Fold, PlanSpec } from '../plans/types.js';
import type { Rng } from '../rng.js';

export interface SubsetPlan {
  readonly plan: BuiltPlan;
  readonly stratified: boolean;
}

/** Whether a plan of this kind is stratified for this problem (the planFor rule). */
export function stratifies(problem: Problem, spec: PlanSpec, stratify: boolean | undefined): boolean {
  return problem.target.task === 'classification' && stratify !== false && spec.kind !== 'loo' && spec.kind !== 'forward';
}

/** Builds `spec` over `subset` (ascending used-row indices); folds come back in used-row indices. */
export function planOver(problem: Problem, spec: PlanSpec, subset: Int32Array, stratify: boolean | undefined, rng: Rng): SubsetPlan {
  const y = problem.target;
  const stratified = stratifies(problem, spec, stratify);
  const built = buildPlan(spec, {
    n: subset.length,
    ...(stratified && y.task === 'classification' ? { strata: Int32Array.from(subset, (i) => y.codes[i]), strataNames: y.classes } : {}),
    ...(problem.groups ? { groups: Int32Array.from(subset, (i) => problem.groups![i]) } : {}),
    ...(problem.order ? { order: Float64Array.from(subset, (i) => problem.order![i]) } : {}),
    rng,
  });
  const map = (idx: Int32Array): Int32Array => Int32Array.from(idx, (j) => subset[j]);
  const folds: Fold[] = built.folds.map((f) => ({ repeat: f.repeat, fold: f.fold, train: map(f.train), test: map(f.test) }));
  const plan: BuiltPlan = {
    folds,
    repeats: built.repeats,
    foldsPerRepeat: built.foldsPerRepeat,
    warnings: built.warnings,
    ...(built.holdout ? { holdout: map(built.holdout) } : {}),
  };
  return { plan, stratified };
}

/** 0, 1, ..., n-1 as an Int32Array. */
export function allRows(n: number): Int32Array {
  return Int32Array.from({ length: n }, (_, i) => i);
}
