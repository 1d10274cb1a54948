/**
 * The main job: a resampling plan over a problem, fold-local preprocessing, every learner fitted
 * on each fold's training rows and scored on its test rows, then per-metric summaries across
 * folds and on the pooled out-of-fold predictions.
 *
 * Randomness: the plan's generator is derived from (seed, "plan"); each fit gets a seed derived
 * from (seed, "fit", learner spec, repeat, fold), so results do not depend on the order in
 * which learners or folds are run.
 */
import { performance } from 'node:perf_hooks';
import { defineProblem, type Problem, type ProblemOptions } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { UsageError } from '../errors.js';
import { defaultLearnerSpecs, formatSpec, getLearner, parseLearnerSpec, resolveParams } from '../learners/index.js';
import type { Learner, Matrix, Model, Params, Target } from '../learners/types.js';
import { confusionMatrix, defaultMetrics, getMetric } from '../metrics/index.js';
import type { Metric } from '../metrics/types.js';
import { formatPlan, parsePlan } from '../plans/index.js';
import type { Fold, PlanSpec } from '../plans/types.js';
import { applyPrep, fitPrep, type FittedPrep, type Impute } from '../prep/fold-prep.js';
import type { FoldScores, LearnerReport, Report, ScoreSummary } from '../report/types.js';
import { summarize } from '../stats/index.js';
import { REPORT_SCHEMA, VERSION } from '../version.js';
import { planFor } from './plan-for.js';
import { createRng, deriveSeed } from './rng.js';

export const DEFAULT_SEED = 1;
export const DEFAULT_PLAN = 'kfold:10';

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
}

interface Candidate {
  readonly learner: Learner;
  readonly spec: string;
  readonly params: Params;
}

/** Checks a seed: an integer from 0 to 2^32-1. */
export function checkSeed(seed: number): number {
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new UsageError(`--seed ${seed}: expected a whole number from 0 to 4294967295`);
  }
  return seed;
}

function resolveCandidates(problem: Problem, options: EvaluateOptions): Candidate[] {
  const specs = options.learners?.length ? options.learners : defaultLearnerSpecs(problem.task);
  const list: Candidate[] = [];
  const withBaseline = options.baseline !== false ? ['baseline', ...specs.filter((s) => s.trim() !== 'baseline')] : specs;
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

function resolveMetrics(problem: Problem, names: readonly string[] | undefined): Metric[] {
  const list = names?.length ? names : defaultMetrics(problem.task);
  const out: Metric[] = [];
  for (const name of list) {
    const m = getMetric(name);
    if (m.task !== problem.task) throw new UsageError(`--metric ${name}: a ${m.task} metric, but the task is ${problem.task}`);
    if (!out.includes(m)) out.push(m);
  }
  return out;
}

function subsetTarget(y: Target, idx: Int32Array): Target {
  return y.task === 'classification'
    ? { task: 'classification', codes: Int32Array.from(idx, (i) => y.codes[i]), classes: y.classes }
    : { task: 'regression', values: Float64Array.from(idx, (i) => y.values[i]) };
}

interface Prediction {
  readonly predicted: Int32Array | Float64Array;
  readonly proba?: Float64Array;
}

function score(metric: Metric, actual: Target, pred: Prediction): number | null {
  let v: number;
  if (metric.task === 'classification') {
    if (actual.task !== 'classification') return null;
    if (metric.needsProba && !pred.proba) return null;
    v = metric.fn({ actual: actual.codes, predicted: pred.predicted as Int32Array, classes: actual.classes.length, proba: pred.proba });
  } else {
    if (actual.task !== 'regression') return null;
    v = metric.fn({ actual: actual.values, predicted: pred.predicted as Float64Array });
  }
  return Number.isFinite(v) ? v : null;
}

/** Concatenates fold predictions in fold order (for pooled metrics). */
function concatPredictions(parts: readonly Prediction[], classes: number): Prediction {
  const n = parts.reduce((s, p) => s + p.predicted.length, 0);
  const first = parts[0].predicted;
  const predicted = first instanceof Int32Array ? new Int32Array(n) : new Float64Array(n);
  const withProba = parts.every((p) => p.proba);
  const proba = withProba ? new Float64Array(n * classes) : undefined;
  let at = 0;
  for (const p of parts) {
    predicted.set(p.predicted as never, at);
    if (proba) proba.set(p.proba!, at * classes);
    at += p.predicted.length;
  }
  return { predicted, proba };
}

function concatTargets(parts: readonly Target[]): Target {
  const first = parts[0];
  if (first.task === 'classification') {
    const codes = new Int32Array(parts.reduce((s, p) => s + (p.task === 'classification' ? p.codes.length : 0), 0));
    let at = 0;
    for (const p of parts) if (p.task === 'classification') (codes.set(p.codes, at), (at += p.codes.length));
    return { task: 'classification', codes, classes: first.classes };
  }
  const values = new Float64Array(parts.reduce((s, p) => s + (p.task === 'regression' ? p.values.length : 0), 0));
  let at = 0;
  for (const p of parts) if (p.task === 'regression') (values.set(p.values, at), (at += p.values.length));
  return { task: 'regression', values };
}

/** Preprocessed matrices of one split, made lazily: scaled only if some learner needs it. */
class SplitData {
  private readonly cache = new Map<string, Matrix>();
  readonly prep: FittedPrep;
  constructor(
    private readonly problem: Problem,
    readonly train: Int32Array,
    readonly test: Int32Array,
    impute: Impute,
  ) {
    this.prep = fitPrep(problem, train, impute);
  }
  matrix(part: 'train' | 'test', scale: boolean): Matrix {
    const key = `${part}:${scale}`;
    let m = this.cache.get(key);
    if (!m) {
      m = applyPrep(this.problem, this.prep, part === 'train' ? this.train : this.test, scale);
      this.cache.set(key, m);
    }
    return m;
  }
}

interface FitTimes {
  fitMs: number;
  predictMs: number;
}

function fitAndPredict(c: Candidate, split: SplitData, y: Target, seed: number, times: FitTimes): Prediction {
  const Xtrain = split.matrix('train', c.learner.needsScaling);
  const Xtest = split.matrix('test', c.learner.needsScaling);
  const t0 = performance.now();
  const model: Model = c.learner.fit(Xtrain, subsetTarget(y, split.train), c.params, { rng: createRng(seed), seed });
  const t1 = performance.now();
  const predicted = model.predict(Xtest);
  const proba = model.predictProba?.(Xtest);
  times.fitMs += t1 - t0;
  times.predictMs += performance.now() - t1;
  return { predicted, proba };
}

function meanOf(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

/** Evaluates learners on a loaded table. Pure apart from reading the clock for timings. */
export function evaluate(table: Table, options: EvaluateOptions): Report {
  const started = performance.now();
  const seed = checkSeed(options.seed ?? DEFAULT_SEED);
  const problem = defineProblem(table, options);
  const planSpec = typeof options.plan === 'object' ? options.plan : parsePlan(options.plan ?? DEFAULT_PLAN);
  const metrics = resolveMetrics(problem, options.metrics);
  const candidates = resolveCandidates(problem, options);
  const impute = options.impute ?? 'median';
  if (options.final && planSpec.kind !== 'holdout') throw new UsageError(`--final: only a holdout plan has a final part (the plan is ${formatPlan(planSpec)})`);

  const y = problem.target;
  const { plan, stratified } = planFor(problem, planSpec, options.stratify, seed);
  const warnings: string[] = [...table.warnings, ...plan.warnings];
  if (problem.excludedRows > 0) {
    warnings.push(`${problem.excludedRows} row${problem.excludedRows === 1 ? '' : 's'} with a missing target ("${problem.targetName}") left out`);
  }
  if (planSpec.kind === 'loo') {
    warnings.push('leave-one-out: each fold scores one row, so per-fold spread is degenerate; read the pooled scores');
  }
  const perLearner = candidates.map(() => ({
    folds: [] as FoldScores[],
    preds: [] as Prediction[],
    times: { fitMs: 0, predictMs: 0 },
  }));
  const actualParts: Target[] = [];
  for (const fold of plan.folds) {
    const split = new SplitData(problem, fold.train, fold.test, impute);
    const yTest = subsetTarget(y, fold.test);
    actualParts.push(yTest);
    candidates.forEach((c, li) => {
      const s = deriveSeed(seed, 'fit', c.spec, fold.repeat, fold.fold);
      const pred = fitAndPredict(c, split, y, s, perLearner[li].times);
      perLearner[li].preds.push(pred);
      const scores: Record<string, number | null> = {};
      for (const m of metrics) scores[m.name] = score(m, yTest, pred);
      perLearner[li].folds.push({ repeat: fold.repeat, fold: fold.fold, trainRows: fold.train.length, testRows: fold.test.length, scores });
    });
  }

  const trainMean = meanOf(plan.folds.map((f: Fold) => f.train.length));
  const testMean = meanOf(plan.folds.map((f: Fold) => f.test.length));
  const pooledActual = concatTargets(actualParts);
  const classes = y.task === 'classification' ? y.classes.length : 0;

  let finalParts: ({ trainRows: number; testRows: number; scores: Record<string, number | null> } | undefined)[] = candidates.map(() => undefined);
  if (options.final && plan.holdout) {
    const fold = plan.folds[0];
    const fitRows = Int32Array.from([...fold.train, ...fold.test]).sort();
    const split = new SplitData(problem, fitRows, plan.holdout, impute);
    const yHold = subsetTarget(y, plan.holdout);
    finalParts = candidates.map((c, li) => {
      const pred = fitAndPredict(c, split, y, deriveSeed(seed, 'final', c.spec), perLearner[li].times);
      const scores: Record<string, number | null> = {};
      for (const m of metrics) scores[m.name] = score(m, yHold, pred);
      return { trainRows: fitRows.length, testRows: plan.holdout!.length, scores };
    });
  }

  const learners: LearnerReport[] = candidates.map((c, li) => {
    const { folds, preds } = perLearner[li];
    const summary: Record<string, ScoreSummary | null> = {};
    const pooled: Record<string, number | null> = {};
    const pooledPred = concatPredictions(preds, classes);
    const noProba = metrics.filter((m) => m.needsProba && !pooledPred.proba).map((m) => m.name);
    if (noProba.length) warnings.push(`${c.spec} gives no class probabilities, so ${noProba.join(', ')} ${noProba.length === 1 ? 'is' : 'are'} not reported for it`);
    for (const m of metrics) {
      const values = folds.map((f) => f.scores[m.name]).filter((v): v is number => v !== null);
      const undefinedFolds = folds.length - values.length;
      if (undefinedFolds > 0 && undefinedFolds < folds.length) {
        warnings.push(`${c.spec}: ${m.name} is undefined in ${undefinedFolds} of ${folds.length} folds; its summary uses the other folds`);
      }
      summary[m.name] = values.length ? summarize(values, { testRows: testMean, trainRows: trainMean }) : null;
      pooled[m.name] = score(m, pooledActual, pooledPred);
    }
    const report: LearnerReport = {
      name: c.learner.name,
      spec: c.spec,
      params: { ...c.params },
      folds,
      summary,
      pooled,
      ...(pooledActual.task === 'classification'
        ? { confusion: confusionMatrix(pooledActual.codes, pooledPred.predicted as Int32Array, classes) }
        : {}),
      ...(finalParts[li] ? { final: finalParts[li] } : {}),
    };
    return report;
  });

  const report: Report = {
    schema: REPORT_SCHEMA,
    tool: { name: 'foldwise', version: VERSION },
    command: 'eval',
    data: {
      path: table.source,
      sha256: table.fingerprint.sha256,
      rows: table.rows,
      columns: table.columns.length,
      rowsUsed: problem.rows.length,
      excludedRows: problem.excludedRows,
      target: problem.targetName,
      task: problem.task,
      ...(y.task === 'classification' ? { classes: y.classes } : {}),
      features: problem.features.map((f) => f.name),
      dropped: problem.dropped,
    },
    plan: {
      kind: planSpec.kind,
      text: formatPlan(planSpec),
      folds: plan.foldsPerRepeat,
      repeats: plan.repeats,
      stratified,
      ...(problem.groupName !== undefined ? { group: problem.groupName } : {}),
      ...(problem.orderName !== undefined ? { order: problem.orderName } : {}),
      seed,
      ...(plan.holdout ? { holdoutRows: plan.holdout.length, finalScored: Boolean(options.final) } : {}),
    },
    settings: { impute },
    metrics: metrics.map((m) => m.name),
    warnings: [...new Set(warnings)],
    learners,
    ...(options.timing === false
      ? {}
      : {
          timing: {
            totalMs: performance.now() - started,
            learners: candidates.map((c, li) => ({ spec: c.spec, ...perLearner[li].times })),
          },
        }),
  };
  return report;
}
