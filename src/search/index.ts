/** Hyperparameter search with nested selection (`foldwise tune`). */
export { tune, DEFAULT_INNER_PLAN, DEFAULT_OUTER_PLAN, DEFAULT_SEARCH, TUNE_SCHEMA, type TuneOptions } from './tune.js';
export { parseSearchSpace, planSearch, searchCandidates, DEFAULT_MAX_CANDIDATES, MAX_CANDIDATES_LIMIT } from './space.js';
export type { SearchCandidate, SearchLimits, SearchPlan, SearchSpace, SpecSpace } from './space.js';
export { parseAxis, MAX_AXIS_VALUES, type Axis } from './value-syntax.js';
export { compareComplexity, complexityRanks, describeRanks } from './complexity.js';
export { innerStat, pickCandidate, PICK_RULES, type InnerStat, type Pick, type PickRule } from './pick.js';
export { planOver, allRows, stratifies } from './plan-over.js';
export { splitHoldout, checkHoldoutFraction } from './holdout-split.js';
export { predictAll, newWorkCount, type WorkCount } from './fold-work.js';
export { edgeOfWarning, edgeWarnings } from './edges.js';
