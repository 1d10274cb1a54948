/**
 * Builds the resampling plan of a problem the same way for every command (eval, split, and
 * later tune): stratified by class for classification unless turned off (never for
 * leave-one-out or forward plans, where it means nothing), grouped and ordered when the problem
 * has those columns, from the generator derived from (seed, "plan").
 */
import type { Problem } from '../data/problem.js';
import { buildPlan } from './index.js';
import type { BuiltPlan, PlanSpec } from './types.js';
import { createRng, deriveSeed } from '../rng.js';

export interface PlannedProblem {
  readonly plan: BuiltPlan;
  readonly stratified: boolean;
}

export function planFor(problem: Problem, spec: PlanSpec, stratify: boolean | undefined, seed: number): PlannedProblem {
  const y = problem.target;
  const stratified = y.task === 'classification' && stratify !== false && spec.kind !== 'loo' && spec.kind !== 'forward';
  const plan = buildPlan(spec, {
    n: problem.rows.length,
    ...(stratified && y.task === 'classification' ? { strata: y.codes, strataNames: y.classes } : {}),
    ...(problem.groups ? { groups: problem.groups } : {}),
    ...(problem.order ? { order: problem.order } : {}),
    rng: createRng(deriveSeed(seed, 'plan')),
  });
  return { plan, stratified };
}
