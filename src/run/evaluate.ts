/**
 * The main job: a resampling plan over a problem, fold-local preprocessing, every learner fitted
 * on each fold's training rows and scored on its test rows, then per-metric summaries across
 * folds and on the pooled out-of-fold predictions.
 *
 * The work is split in three: `prepareRun` validates and plans, `runTasks` (or a worker pool,
 * shards, a journal) produces one result per task, and `assembleReport` turns the results into
 * the report. Assembly depends only on the results, never on where or in which order they were
 * made, so every way of running gives the same report.
 *
 * Randomness: the plan's generator is derived from (seed, "plan"); each fit gets a seed derived
 * from (seed, "fit", learner spec, repeat, fold).
 */
import { performance } from 'node:perf_hooks';
import type { Table } from '../data/types.js';
import { InputError } from '../errors.js';
import type { Target } from '../learners/types.js';
import { confusionMatrix } from '../metrics/index.js';
import type { Metric } from '../metrics/types.js';
import type { Fold } from '../plans/types.js';
import type { FoldScores, LearnerReport, Report, ScoreSummary } from '../report/types.js';
import { summarize } from '../stats/index.js';
import { REPORT_SCHEMA, VERSION } from '../version.js';
import { prepareRun, type EvaluateOptions, type Prepared } from './prepare.js';
import { runTasks, splitRows, subsetTarget, taskList, type TaskResult } from './tasks.js';

export { checkSeed, DEFAULT_PLAN, DEFAULT_SEED, prepareRun, type EvaluateOptions, type Prepared } from './prepare.js';

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

function meanOf(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

/** Evaluates learners on a loaded table, in this thread. Pure apart from reading the clock. */
export function evaluate(table: Table, options: EvaluateOptions): Report {
  const started = performance.now();
  const prepared = prepareRun(table, options);
  const results = runTasks(prepared, taskList(prepared));
  return assembleReport(prepared, results, options.timing === false ? undefined : performance.now() - started);
}

/**
 * Builds the report from one result per task (in any order). Throws InputError when a task's
 * result is missing or has the wrong length (a journal or shard that does not belong to the run).
 */
export function assembleReport(prepared: Prepared, results: readonly TaskResult[], totalMs?: number): Report {
  const { table, problem, plan, planSpec, metrics, candidates } = prepared;
  const y = problem.target;
  const byId = new Map(results.map((r) => [r.id, r]));
  const get = (id: string, rows: number): TaskResult => {
    const r = byId.get(id);
    if (!r) throw new InputError(`the results of task ${id} are missing`);
    if (r.predicted.length !== rows) throw new InputError(`task ${id} has ${r.predicted.length} predictions for ${rows} test rows`);
    return r;
  };
  const warnings: string[] = [...prepared.warnings];
  const tasks = taskList(prepared);
  const perLearner = candidates.map(() => ({
    folds: [] as FoldScores[],
    preds: [] as Prediction[],
    times: { fitMs: 0, predictMs: 0 },
  }));
  const actualParts: Target[] = [];
  const finalParts: ({ trainRows: number; testRows: number; scores: Record<string, number | null> } | undefined)[] = candidates.map(() => undefined);
  const testTargets = new Map<number, Target>();
  for (const t of tasks) {
    const { train, test } = splitRows(prepared, t.foldIndex);
    let yTest = testTargets.get(t.foldIndex);
    if (!yTest) {
      yTest = subsetTarget(y, test);
      testTargets.set(t.foldIndex, yTest);
      if (t.foldIndex >= 0) actualParts.push(yTest);
    }
    const r = get(t.id, test.length);
    const li = t.candidateIndex;
    perLearner[li].times.fitMs += r.fitMs;
    perLearner[li].times.predictMs += r.predictMs;
    const scores: Record<string, number | null> = {};
    for (const m of metrics) scores[m.name] = score(m, yTest, r);
    if (t.foldIndex < 0) {
      finalParts[li] = { trainRows: train.length, testRows: test.length, scores };
      continue;
    }
    const fold = plan.folds[t.foldIndex];
    perLearner[li].preds.push(r);
    perLearner[li].folds.push({ repeat: fold.repeat, fold: fold.fold, trainRows: train.length, testRows: test.length, scores });
  }

  const trainMean = meanOf(plan.folds.map((f: Fold) => f.train.length));
  const testMean = meanOf(plan.folds.map((f: Fold) => f.test.length));
  const pooledActual = concatTargets(actualParts);
  const classes = y.task === 'classification' ? y.classes.length : 0;

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
  const stratified = prepared.stratified;
  const seed = prepared.seed;
  const impute = prepared.impute;

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
      text: prepared.planText,
      folds: plan.foldsPerRepeat,
      repeats: plan.repeats,
      stratified,
      ...(problem.groupName !== undefined ? { group: problem.groupName } : {}),
      ...(problem.orderName !== undefined ? { order: problem.orderName } : {}),
      seed,
      ...(plan.holdout ? { holdoutRows: plan.holdout.length, finalScored: prepared.final } : {}),
    },
    settings: { impute },
    metrics: metrics.map((m) => m.name),
    warnings: [...new Set(warnings)],
    learners,
    ...(totalMs === undefined
      ? {}
      : {
          timing: {
            totalMs,
            learners: candidates.map((c, li) => ({ spec: c.spec, ...perLearner[li].times })),
          },
        }),
  };
  return report;
}
