/**
 * Everything a run decides before fitting anything: the problem, the plan, the metrics and the
 * learners, all validated. It is a pure function of the table and the options, so a worker
 * thread or another shard that prepares the same run gets the same tasks.
 */
import { baselineConstantFor } from '../learners/baseline.js';
import { defineProblem, type Problem, type ProblemOptions } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { quoted } from '../data/load-csv.js';
import { UsageError } from '../errors.js';
import { defaultLearnerSpecs, formatSpec, getLearner, parseLearnerSpec, resolveParams } from '../learners/index.js';
import { defaultMetrics, getMetric, metricFor, parseCostMatrix, type CostMatrix } from '../metrics/index.js';
import type { Metric } from '../metrics/types.js';
import { formatPlan, parsePlan } from '../plans/index.js';
import type { PlanSpec } from '../plans/types.js';
import type { Impute } from '../prep/fold-prep.js';
import { quickSuspects } from '../audit/quick-audit.js';
import type { ReportAudit } from '../model/report.js';
import { planFor } from '../plans/plan-for.js';
import { problemFromShared, type SharedRun } from './share-run.js';
import { checkSliceBins, checkSliceNames, DEFAULT_SLICE_BINS } from '../slices/slice-columns.js';
import { checkImportanceRepeats, DEFAULT_IMPORTANCE_REPEATS, importanceInputs, type ImportancePlan } from './importance.js';
import type { Candidate, OnFoldError, TaskContext } from './tasks.js';
import type { ThresholdPlan } from './threshold-inner.js';
import { parseThresholdRule } from '../threshold/rule.js';
import { DEFAULT_INNER_FOLDS, MAX_INNER_FOLDS } from '../threshold/inner-folds.js';

import { checkSeed, DEFAULT_PLAN, DEFAULT_SEED } from '../plans/defaults.js';

export { checkSeed, DEFAULT_PLAN, DEFAULT_SEED };

export interface EvaluateOptions extends ProblemOptions {
  /** plan text such as "kfold:10" or a parsed spec (default kfold:10) */
  readonly plan?: string | PlanSpec;
  /** stratify classification plans by class (default true) */
  readonly stratify?: boolean;
  /** learner specs such as "knn:k=3" (default: the task's default list) */
  readonly learners?: readonly string[];
  /** evaluate the baseline beside the learners (default true) */
  readonly baseline?: boolean;
  /** metric names, headline first (default: the task's default list) */
  readonly metrics?: readonly string[];
  /** integer seed, 0 to 2^32-1 (default 1) */
  readonly seed?: number;
  readonly impute?: Impute;
  /** score the holdout part of a holdout plan */
  readonly final?: boolean;
  /** include wall-clock timings (default true) */
  readonly timing?: boolean;
  /** run the quick data audit first and record its findings in the report's `audit` (default true) */
  readonly audit?: boolean;
  /** a failed fold of a command: learner stops the run (fail, default) or is recorded (skip) */
  readonly onFoldError?: OnFoldError;
  /** --slice: columns to score every metric per level of (src/slices/) */
  readonly slice?: readonly string[];
  /** --slice-bins: quantile bins of a numeric slice column (default 4) */
  readonly sliceBins?: number;
  /** permutation importance of every feature on each fold's test rows (src/run/importance.ts) */
  readonly importance?: boolean;
  /** shuffles per input and fold (default 5) */
  readonly importanceRepeats?: number;
  /** also shuffle the audit's correlated clusters, each as one input */
  readonly importanceClusters?: boolean;
  /** --threshold RULE (two-class targets): choose a threshold on an inner split of each outer training fold (src/threshold/) */
  readonly threshold?: string;
  /** --threshold-folds: inner folds of that split (default 5) */
  readonly thresholdFolds?: number;
  /** --costs FILE: the cost matrix's file name and text, for the `cost` metric (src/metrics/cost-matrix.ts) */
  readonly costs?: CostsText;
}

/** A cost matrix file as read: its name (for messages) and its text. */
export interface CostsText {
  readonly file: string;
  readonly text: string;
}

export interface Prepared extends TaskContext {
  readonly table: Table;
  readonly planSpec: PlanSpec;
  readonly planText: string;
  readonly stratified: boolean;
  readonly metrics: readonly Metric[];
  readonly warnings: readonly string[];
  /** the quick audit's findings, set by withAudit (absent when it was not called) */
  readonly audit?: ReportAudit;
  /** --slice columns (checked) and --slice-bins; absent without --slice */
  readonly slice?: { readonly names: readonly string[]; readonly bins: number };
  /** --costs: the cost matrix in the target's class order (absent without it) */
  readonly costs?: CostMatrix;
}

function resolveCandidates(problem: Problem, options: EvaluateOptions, headline: string): Candidate[] {
  const specs = options.learners?.length ? options.learners : defaultLearnerSpecs(problem.task);
  const list: Candidate[] = [];
  // the automatic baseline is the best constant for the headline metric (see learners/baseline.ts)
  const auto = problem.task === 'regression' && baselineConstantFor(headline) === 'median' ? 'baseline:constant=median' : 'baseline';
  const withBaseline = options.baseline !== false ? [auto, ...specs.filter((s) => s.trim() !== 'baseline')] : specs;
  for (const text of withBaseline) {
    const parsed = parseLearnerSpec(text);
    const learner = getLearner(parsed.name);
    const params = resolveParams(learner, parsed, problem.task);
    const spec = formatSpec(learner, params);
    if (list.some((c) => c.spec === spec)) throw new UsageError(`--learner ${text}: the same learner and options are given twice (${spec})`);
    list.push({ learner, spec, params });
  }
  return list;
}

/**
 * The metrics by name (default: the task's list), checked against the task, headline first;
 * `cost` bound to the run's cost matrix (a UsageError without one).
 */
export function resolveMetrics(problem: Problem, names: readonly string[] | undefined, costs?: CostMatrix): Metric[] {
  const list = names?.length ? names : defaultMetrics(problem.task);
  const out: Metric[] = [];
  for (const name of list) {
    const m = getMetric(name);
    if (m.task !== problem.task) throw new UsageError(`--metric ${name}: a ${m.task} metric, but the task is ${problem.task}`);
    if (!out.some((o) => o.name === m.name)) out.push(metricFor(m.name, costs));
  }
  return out;
}

/**
 * --costs FILE read against the target (every class once on each axis) and checked against the
 * metrics: a matrix needs a classification target and `--metric cost` (a matrix nothing reads is
 * refused, not ignored).
 */
export function readRunCosts(problem: Problem, costs: CostsText | undefined, metrics: readonly string[] | undefined): CostMatrix | undefined {
  if (costs === undefined) return undefined;
  const y = problem.target;
  if (y.task !== 'classification') throw new UsageError(`--costs ${costs.file}: a cost matrix is for classification, but ${quoted(problem.targetName)} is numeric (a regression target)`);
  const matrix = parseCostMatrix(costs.text, costs.file, y.classes);
  if (!metrics?.includes('cost')) throw new UsageError(`--costs ${costs.file}: add --metric cost to score by the matrix (first, to make it the headline)`);
  return matrix;
}

/**
 * Runs the quick audit (leakage, duplicates straddling folds, id-like columns...) and records
 * its findings in `audit`, or `{ ran: false }` when `options.audit` is false. Run once, in the
 * thread that writes the report (workers do not need it).
 */
export function withAudit(prepared: Prepared, options: EvaluateOptions): Prepared {
  if (options.audit === false) return { ...prepared, audit: { ran: false, suspects: [] } };
  const suspects = quickSuspects(prepared.problem, {
    plan: prepared.planSpec,
    stratify: options.stratify,
    seed: prepared.seed,
    planned: { plan: prepared.plan, stratified: prepared.stratified },
  });
  return { ...prepared, audit: { ran: true, suspects } };
}

/**
 * Validates the options against the table and builds the plan; fits nothing. A worker thread
 * passes the problem and plan the main thread built and shared (share-run.ts) instead of
 * deriving its own copies; everything else is checked and resolved the same way.
 */
export function prepareRun(table: Table, options: EvaluateOptions, shared?: SharedRun): Prepared {
  const seed = checkSeed(options.seed ?? DEFAULT_SEED);
  const problem = shared ? problemFromShared(table, shared.problem) : defineProblem(table, options);
  const planSpec = typeof options.plan === 'object' ? options.plan : parsePlan(options.plan ?? DEFAULT_PLAN);
  const costs = readRunCosts(problem, options.costs, options.metrics);
  const metrics = resolveMetrics(problem, options.metrics, costs);
  const candidates = resolveCandidates(problem, options, metrics[0].name);
  const impute = options.impute ?? 'median';
  if (options.final && planSpec.kind !== 'holdout') throw new UsageError(`--final: only a holdout plan has a final part (the plan is ${formatPlan(planSpec)})`);
  const { plan, stratified } = shared ? shared.planned : planFor(problem, planSpec, options.stratify, seed);
  if (!options.importance && (options.importanceRepeats !== undefined || options.importanceClusters)) {
    throw new UsageError(`${options.importanceClusters ? '--importance-clusters' : '--importance-repeats'}: give --importance too`);
  }
  const importance: ImportancePlan | undefined = options.importance
    ? {
        metric: metrics[0],
        repeats: checkImportanceRepeats(options.importanceRepeats ?? DEFAULT_IMPORTANCE_REPEATS),
        clusters: Boolean(options.importanceClusters),
        inputs: importanceInputs(problem, Boolean(options.importanceClusters)),
      }
    : undefined;
  const threshold = thresholdPlanOf(problem, options, planSpec);
  const warnings: string[] = [...table.warnings, ...plan.warnings];
  if (problem.excludedRows > 0) {
    warnings.push(`${problem.excludedRows} row${problem.excludedRows === 1 ? '' : 's'} with a missing target (${quoted(problem.targetName)}) left out`);
  }
  if (planSpec.kind === 'loo') {
    if (problem.groups !== undefined) {
      // leave-one-group-out: a fold tests one whole group, not one row
      const n = problem.rows.length;
      const g = plan.foldsPerRepeat;
      warnings.push(
        `leave-one-group-out: each fold scores one group of ${quoted(problem.groupName ?? '')} (${g} folds, ${(n / g).toFixed(1)} rows a fold on average), so the per-fold spread mixes group sizes; read the pooled scores beside it`,
      );
    } else {
      warnings.push('leave-one-out: each fold scores one row, so per-fold spread is degenerate; read the pooled scores');
    }
  }
  const sliceNames = options.slice ?? [];
  checkSliceNames(table, sliceNames, problem.targetName);
  const sliceBins = checkSliceBins(options.sliceBins ?? DEFAULT_SLICE_BINS);
  return {
    table,
    problem,
    plan,
    planSpec,
    planText: formatPlan(planSpec),
    stratified,
    metrics,
    candidates,
    impute,
    seed,
    final: Boolean(options.final && plan.holdout),
    onFoldError: options.onFoldError ?? 'fail',
    ...(importance ? { importance } : {}),
    ...(threshold ? { threshold } : {}),
    ...(costs ? { costs } : {}),
    warnings,
    ...(sliceNames.length ? { slice: { names: sliceNames, bins: sliceBins } } : {}),
  };
}

/** --threshold and --threshold-folds, checked: two classes only, 2 to 20 inner folds; in time order under a forward plan. */
export function thresholdPlanOf(problem: Problem, options: Pick<EvaluateOptions, 'threshold' | 'thresholdFolds'>, planSpec: PlanSpec): ThresholdPlan | undefined {
  if (options.threshold === undefined) {
    if (options.thresholdFolds !== undefined) throw new UsageError('--threshold-folds: give --threshold too');
    return undefined;
  }
  const rule = parseThresholdRule(options.threshold);
  const y = problem.target;
  if (y.task !== 'classification' || y.classes.length !== 2) {
    const what = y.task === 'classification' ? `has ${y.classes.length} classes` : 'is numeric (a regression target)';
    throw new UsageError(`--threshold ${options.threshold}: a threshold needs a two-class target, but ${quoted(problem.targetName)} ${what}; use it on a two-class target or leave it out`);
  }
  const k = options.thresholdFolds ?? DEFAULT_INNER_FOLDS;
  if (!Number.isInteger(k) || k < 2 || k > MAX_INNER_FOLDS) throw new UsageError(`--threshold-folds ${k}: expected a whole number from 2 to ${MAX_INNER_FOLDS}`);
  return { rule, text: options.threshold.trim(), innerFolds: k, timeOrdered: planSpec.kind === 'forward' };
}
