/**
 * Builds a plan spec into folds over the rows of a PlanInput: checks the spec and the input,
 * then hands over to the plan's builder. The only randomness is `input.rng` (Fisher-Yates
 * shuffles and `rng.int`), so one seed gives one set of folds.
 *
 * Size: every fold holds its own train and test row numbers, so a plan of F folds over n rows
 * holds about F * n of them. Before building, F must be at most MAX_FOLDS and F * n at most
 * MAX_PLAN_ROWS (512 MiB of 32-bit row numbers); a larger plan is a UsageError rather than an
 * out-of-memory crash (`resplit:1000000000@0.2` asks for a billion folds).
 */
import { UsageError } from '../errors.js';
import { checkPlanInput } from './input.js';
import { formatPlan } from './format.js';
import { buildForward } from './forward.js';
import { buildHoldout } from './holdout.js';
import { buildKfold } from './kfold.js';
import { buildLoo } from './loo.js';
import { buildResplit } from './resplit.js';
import { checkPlanSpec } from './spec.js';
import type { BuiltPlan, PlanInput, PlanSpec } from './types.js';

/** Most folds one plan may make (all repeats together). */
export const MAX_FOLDS = 100_000;
/** Most row numbers the folds of one plan may hold together (folds times rows). */
export const MAX_PLAN_ROWS = 2 ** 27;

/** Folds the spec makes on the input (K > n is left to the builders, whose message says so). */
function foldCount(spec: PlanSpec, input: PlanInput): number {
  switch (spec.kind) {
    case 'kfold':
      return Math.min(spec.k, input.n) * spec.repeats;
    case 'loo':
      return input.groups ? new Set(input.groups).size : input.n;
    case 'resplit':
      return spec.splits;
    case 'holdout':
      return 1;
    case 'forward':
      return Math.min(spec.k, input.n);
  }
}

function checkPlanSize(spec: PlanSpec, input: PlanInput): void {
  const folds = foldCount(spec, input);
  const label = `--plan ${formatPlan(spec)}`;
  const fewer = spec.kind === 'loo' ? 'use kfold:K instead' : spec.kind === 'resplit' ? 'use fewer splits' : 'use fewer folds or repeats';
  if (folds > MAX_FOLDS) throw new UsageError(`${label} would make ${folds} folds; at most ${MAX_FOLDS} are allowed; ${fewer}`);
  if (folds * input.n > MAX_PLAN_ROWS) {
    throw new UsageError(
      `${label} would make ${folds} folds of ${input.n} rows each, more than ${MAX_PLAN_ROWS} row numbers in all; ${fewer}`,
    );
  }
}

export function buildPlan(spec: PlanSpec, input: PlanInput): BuiltPlan {
  checkPlanSpec(spec, formatPlan(spec) ?? '');
  checkPlanInput(input);
  checkPlanSize(spec, input);
  switch (spec.kind) {
    case 'kfold':
      return buildKfold(spec, input);
    case 'loo':
      return buildLoo(input);
    case 'resplit':
      return buildResplit(spec, input);
    case 'holdout':
      return buildHoldout(spec, input);
    case 'forward':
      return buildForward(spec, input);
  }
}
