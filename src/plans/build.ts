/**
 * Builds a plan spec into folds over the rows of a PlanInput: checks the spec and the input,
 * then hands over to the plan's builder. The only randomness is `input.rng` (Fisher-Yates
 * shuffles and `rng.int`), so one seed gives one set of folds.
 */
import { checkPlanInput } from './input.js';
import { formatPlan } from './format.js';
import { buildForward } from './forward.js';
import { buildHoldout } from './holdout.js';
import { buildKfold } from './kfold.js';
import { buildLoo } from './loo.js';
import { buildShuffle } from './shuffle.js';
import { checkPlanSpec } from './spec.js';
import type { BuiltPlan, PlanInput, PlanSpec } from './types.js';

export function buildPlan(spec: PlanSpec, input: PlanInput): BuiltPlan {
  checkPlanSpec(spec, formatPlan(spec) ?? '');
  checkPlanInput(input);
  switch (spec.kind) {
    case 'kfold':
      return buildKfold(spec, input);
    case 'loo':
      return buildLoo(input);
    case 'shuffle':
      return buildShuffle(spec, input);
    case 'holdout':
      return buildHoldout(spec, input);
    case 'forward':
      return buildForward(spec, input);
  }
}
