/**
 * Resampling plans: `parsePlan(text)` reads a spec such as `kfold:5x3`, `formatPlan(spec)`
 * writes its canonical text, and `buildPlan(spec, input)` makes the folds.
 */
export { parsePlan } from './parse.js';
export { formatPlan } from './format.js';
export { buildPlan } from './build.js';
export { checkPlanSpec, DEFAULT_KFOLD_K, HOLDOUT_SUM_TOLERANCE, PLAN_FORMS } from './spec.js';
export { buildKfold } from './kfold.js';
export { buildLoo } from './loo.js';
export { buildResplit } from './resplit.js';
export { buildHoldout } from './holdout.js';
export { buildForward } from './forward.js';
export { PLAN_KINDS } from './types.js';
export type { BuiltPlan, Fold, PlanInput, PlanKind, PlanSpec } from './types.js';
