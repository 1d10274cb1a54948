/**
 * The foldwise core API. Everything here is pure of the process: nothing prints or exits.
 *
 *   import { loadCsv, evaluate } from 'foldwise';
 *   const table = await loadCsv({ path: 'data.csv' });
 *   const report = evaluate(table, { target: 'grade', plan: 'kfold:10', seed: 1 });
 */
export { DEFAULT_MISSING, loadCsv, type CsvSource, type LoadOptions } from './data/load-csv.js';
export { loadTable, type DataFormat } from './data/load-table.js';
export { defineProblem, type Problem, type ProblemOptions } from './data/problem.js';
export type { Column, Fingerprint, Table } from './data/types.js';
export { EXIT_BAD_INPUT, EXIT_OK, EXIT_REGRESSION, FoldwiseError, InputError, RegressionError, UsageError } from './errors.js';
export { LEARNERS, getLearner } from './learners/index.js';
export type { Learner, Matrix, Model, Params, ParamSpec, Target, Task } from './learning.js';
export { METRICS, getMetric } from './metrics/index.js';
export { buildPlan, formatPlan, parsePlan } from './plans/index.js';
export type { BuiltPlan, Fold, PlanSpec } from './plans/types.js';
export { applyPrep, fitPrep } from './prep/fold-prep.js';
export { renderJson } from './report/json.js';
export { renderMarkdown } from './report/markdown.js';
export type { LearnerReport, PooledSample, Report, ReportAudit, ScoreSummary } from './model/report.js';
export { evaluate, type EvaluateOptions } from './run/evaluate.js';
export { createRng, deriveSeed, type Rng } from './rng.js';
export { splitTable } from './run/split.js';
export { REPORT_SCHEMA, VERSION } from './version.js';
