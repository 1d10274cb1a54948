/**
 * The main job: a resampling plan over a problem, fold-local preprocessing, every learner fitted
 * on each fold's training rows and scored on its test rows, then per-metric summaries across
 * folds and on the pooled out-of-fold predictions (for regression also a bounded sample of
 * those predictions, pooled-sample.ts).
 *
 * The work is split in three: `prepareRun` validates and plans, `runTasks` (or a worker pool,
 * shards, a journal) produces one result per task, and `assembleReport` turns the results into
 * the report. Assembly depends only on the results, never on where or in which order they were
 * made, so every way of running gives the same report.
 *
 * Randomness: the plan's generator is derived from (seed, "plan"); each fit gets a seed derived
 * from (seed, "fit", learner spec, repeat, fold).
 */
import type { TaskRecord } from '../model/record.js';
import { performance } from 'node:perf_hooks';
import { dataSection } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { InputError } from '../errors.js';
import type { Target } from '../learning.js';
import { CONFUSION_CLASS_LIMIT, confusionMatrix, costMatrixOf, costRows, foldedConfusion, metricFor } from '../metrics/index.js';
import type { Metric } from '../metrics/types.js';
import type { ReportThreshold } from '../model/threshold.js';
import { learnerThreshold, type CutFold } from '../threshold/scores.js';
import type { FoldScores, LearnerReport, Report, ReportAudit, ScoreSummary } from '../model/report.js';
import { withComparisons } from '../compare/within-report.js';
import { summarize } from '../stats/index.js';
import { REPORT_SCHEMA, VERSION } from '../version.js';
import { foldLabel } from '../model/fold-label.js';
import { learnerCurves } from '../curves/build.js';
import { assignmentOf } from './assignment.js';
import { pooledRefused, scoreNote } from '../stats/score-notes.js';
import { pooledSample } from './pooled-sample.js';
import { sliceColumnsOf, type SliceColumn } from '../slices/slice-columns.js';
import { sliceReports } from '../slices/slice-report.js';
import { prepareRun, withAudit, type EvaluateOptions, type Prepared } from './prepare.js';
import { concatPredictions, concatTargets, scoreOf, type Prediction } from '../metrics/scoring.js';
import { importanceFrameOf, type ImportanceFrame } from './importance.js';
import { learnerImportance } from './importance-summary.js';
import { runTasks, splitRows, subsetTarget, taskList, type TaskResult } from './tasks.js';

export { checkSeed, DEFAULT_PLAN, DEFAULT_SEED, prepareRun, type EvaluateOptions, type Prepared } from './prepare.js';

function meanOf(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

/**
 * Everything of the report that is known before any fit: the same for every shard of a run, so
 * shards can carry it and `merge` can assemble a report without the data.
 */
export interface ReportFrame {
  readonly data: Report['data'];
  readonly plan: Report['plan'];
  readonly settings: Report['settings'];
  readonly metrics: readonly string[];
  readonly warnings: readonly string[];
  /** the quick audit's findings (absent in parts of older versions) */
  readonly audit?: ReportAudit;
  readonly learners: readonly { readonly name: string; readonly spec: string; readonly params: Report['learners'][number]['params'] }[];
  /** --slice: the level of every data row per slice column (absent without --slice, and in parts of older versions) */
  readonly slices?: readonly SliceColumn[];
  /** --importance: the metric, repeats and inputs (absent without it) */
  readonly importance?: ImportanceFrame;
  /** --threshold: the rule, the positive class and the inner folds (absent without it) */
  readonly threshold?: ReportThreshold;
}

export type { TaskRecord };

export function frameOf(prepared: Prepared): ReportFrame {
  const { problem, plan, planSpec, metrics, candidates } = prepared;
  return {
    data: dataSection(problem),
    plan: {
      kind: planSpec.kind,
      text: prepared.planText,
      folds: plan.foldsPerRepeat,
      repeats: plan.repeats,
      stratified: prepared.stratified,
      ...(problem.groupName !== undefined ? { group: problem.groupName } : {}),
      ...(problem.orderName !== undefined ? { order: problem.orderName } : {}),
      seed: prepared.seed,
      ...(plan.holdout ? { holdoutRows: plan.holdout.length, finalScored: prepared.final } : {}),
      assignment: assignmentOf(plan.folds.map((f) => ({ repeat: f.repeat, fold: f.fold, rows: Float64Array.from(f.test, (u) => problem.rows[u]) }))),
    },
    settings: { impute: prepared.impute, ...(prepared.costs ? { costs: { sha256: prepared.costs.sha256, classes: [...prepared.costs.classes], matrix: costRows(prepared.costs) } } : {}) },
    metrics: metrics.map((m) => m.name),
    warnings: prepared.warnings,
    ...(prepared.audit ? { audit: prepared.audit } : {}),
    learners: candidates.map((c) => ({ name: c.learner.name, spec: c.spec, params: { ...c.params } })),
    ...(prepared.slice ? { slices: sliceColumnsOf(prepared.table, prepared.slice.names, prepared.slice.bins) } : {}),
    ...(prepared.threshold ? { threshold: { rule: prepared.threshold.text, positive: problem.target.task === 'classification' ? problem.target.classes[1] : '', innerFolds: prepared.threshold.innerFolds, ...(prepared.threshold.timeOrdered ? { timeOrdered: true as const } : {}) } } : {}),
    ...(prepared.importance ? { importance: importanceFrameOf(prepared.importance, problem.features.map((f) => f.name)) } : {}),
  };
}

/**
 * Pairs each task of the run (or of the `only` ones) with its result (in any order). Throws InputError when a result is
 * missing or has the wrong length (a journal or shard that does not belong to the run).
 */
export function recordsOf(prepared: Prepared, results: readonly TaskResult[], only?: ReadonlySet<string>): TaskRecord[] {
  const byId = new Map(results.map((r) => [r.id, r]));
  const targets = new Map<number, Target>();
  const places = new Map<number, { rows: Int32Array; lines: Int32Array }>();
  const tasks = taskList(prepared).filter((t) => !only || only.has(t.id));
  return tasks.map((t) => {
    const { train, test } = splitRows(prepared, t.foldIndex);
    const r = byId.get(t.id);
    if (!r) throw new InputError(`the results of task ${t.id} are missing`);
    if (!r.failed && r.predicted.length !== test.length) throw new InputError(`task ${t.id} has ${r.predicted.length} predictions for ${test.length} test rows`);
    let actual = targets.get(t.foldIndex);
    if (!actual) targets.set(t.foldIndex, (actual = subsetTarget(prepared.problem.target, test)));
    const f = t.foldIndex >= 0 ? prepared.plan.folds[t.foldIndex] : { repeat: 0, fold: 0 };
    let where = places.get(t.foldIndex);
    if (!where) {
      const rows = Int32Array.from(test, (u) => prepared.problem.rows[u]);
      where = { rows, lines: Int32Array.from(rows, (r) => prepared.problem.table.lines[r]) };
      places.set(t.foldIndex, where);
    }
    return {
      id: t.id,
      candidateIndex: t.candidateIndex,
      foldIndex: t.foldIndex,
      repeat: f.repeat,
      fold: f.fold,
      trainRows: train.length,
      actual,
      predicted: r.predicted,
      ...(r.probs ? { probs: r.probs } : {}),
      fitMs: r.fitMs,
      predictMs: r.predictMs,
      ...(r.failed ? { failed: r.failed } : {}),
      rows: where.rows,
      lines: where.lines,
      ...(r.notes ? { notes: r.notes } : {}),
      ...(r.drops ? { drops: r.drops } : {}),
      ...(r.own ? { own: r.own } : {}),
      ...(r.threshold ? { threshold: r.threshold } : {}),
    };
  });
}

/** Evaluates learners on a loaded table, in this thread. Pure apart from reading the clock. */
export function evaluate(table: Table, options: EvaluateOptions): Report {
  const started = performance.now();
  const prepared = withAudit(prepareRun(table, options), options);
  const results = runTasks(prepared, taskList(prepared));
  return assembleReport(frameOf(prepared), recordsOf(prepared, results), options.timing === false ? undefined : performance.now() - started);
}

/**
 * Builds the report from the frame and one record per task, in the run's task order (fold by
 * fold, learners in order within a fold). Scores are computed here, from actual and predicted
 * values, so a report assembled from shards equals the report of a single run.
 */
export function assembleReport(frame: ReportFrame, records: readonly TaskRecord[], totalMs?: number): Report {
  const costs = frame.settings.costs ? costMatrixOf(frame.settings.costs) : undefined;
  const metrics: Metric[] = frame.metrics.map((m) => metricFor(m, costs));
  const warnings: string[] = [...frame.warnings];
  const perLearner = frame.learners.map(() => ({
    folds: [] as FoldScores[],
    preds: [] as Prediction[],
    actual: [] as Target[],
    times: { fitMs: 0, predictMs: 0 },
    fold: [] as TaskRecord[],
    final: undefined as
      | { trainRows: number; testRows: number; scores: Record<string, number | null>; failed?: string; notes?: Readonly<Record<string, number>> }
      | undefined,
  }));
  for (const r of records) {
    const l = perLearner[r.candidateIndex];
    l.times.fitMs += r.fitMs;
    l.times.predictMs += r.predictMs;
    const scores: Record<string, number | null> = {};
    for (const m of metrics) scores[m.name] = r.failed ? null : scoreOf(m, r.actual, r);
    const testRows = r.actual.task === 'classification' ? r.actual.codes.length : r.actual.values.length;
    if (r.foldIndex < 0) {
      l.final = { trainRows: r.trainRows, testRows, scores, ...(r.failed ? { failed: r.failed } : {}), ...(r.notes ? { notes: r.notes } : {}) };
      continue;
    }
    if (r.failed) {
      // a failed fold is listed with null scores and left out of the pooled predictions
      l.folds.push({ repeat: r.repeat, fold: r.fold, trainRows: r.trainRows, testRows, scores, failed: r.failed });
      continue;
    }
    l.preds.push(r);
    l.actual.push(r.actual);
    l.fold.push(r);
    l.folds.push({ repeat: r.repeat, fold: r.fold, trainRows: r.trainRows, testRows, scores, ...(r.notes ? { notes: r.notes } : {}) });
  }
  const classes = frame.data.classes?.length ?? 0;

  const learners: LearnerReport[] = frame.learners.map((c, li) => {
    const { folds, preds, actual } = perLearner[li];
    const scored = folds.filter((f) => !f.failed);
    const failed = folds.filter((f) => f.failed).map((f) => `${foldLabel(f)}: ${f.failed}`);
    const sized = scored.length ? scored : folds;
    const trainMean = meanOf(sized.map((f) => f.trainRows));
    const testMean = meanOf(sized.map((f) => f.testRows));
    const summary: Record<string, ScoreSummary | null> = {};
    const pooled: Record<string, number | null> = {};
    if (failed.length) {
      const list = failed.slice(0, 3).join('; ');
      warnings.push(
        `${c.spec} failed in ${failed.length} of ${folds.length} folds (${list}${failed.length > 3 ? '; …' : ''}); its scores use the other folds, and the gate does not compare this report`,
      );
    }
    const pooledActual = preds.length ? concatTargets(actual) : undefined;
    const pooledPred = preds.length ? concatPredictions(preds, classes) : undefined;
    const noProba = pooledPred ? metrics.filter((m) => m.needsProba && !pooledPred.probs).map((m) => m.name) : [];
    if (noProba.length) warnings.push(`${c.spec} gives no class probabilities, so ${noProba.join(', ')} ${noProba.length === 1 ? 'is' : 'are'} not reported for it`);
    for (const m of metrics) {
      const values = scored.map((f) => f.scores[m.name]).filter((v): v is number => v !== null);
      const undefinedFolds = scored.length - values.length;
      if (undefinedFolds > 0 && undefinedFolds < scored.length) {
        warnings.push(`${c.spec}: ${m.name} is undefined in ${undefinedFolds} of ${scored.length} folds; its summary uses the other folds`);
      }
      summary[m.name] = values.length ? summarize(values, { testRows: testMean, trainRows: trainMean }, 0.95, m) : null;
      const note = scoreNote(m, sized);
      if (note) warnings.push(`${c.spec}: ${note}`);
      pooled[m.name] = pooledActual && pooledPred && !pooledRefused(m, sized) ? scoreOf(m, pooledActual, pooledPred) : null;
    }
    const final = perLearner[li].final;
    const report: LearnerReport = {
      name: c.name,
      spec: c.spec,
      params: { ...c.params },
      folds,
      summary,
      pooled,
      ...(pooledActual?.task === 'classification' && pooledPred ? pooledConfusion(pooledActual.codes, pooledPred.predicted as Int32Array, classes, frame.data.classes ?? []) : {}),
      ...(final ? { final } : {}),
      ...(curvesOf(preds, actual, frame.data.classes, { testRows: testMean, trainRows: trainMean })),
      ...(pooledActual?.task === 'regression' && pooledPred ? { pooledSample: pooledSample(pooledActual.values, pooledPred.predicted) } : {}),
      ...(frame.threshold ? thresholdOf(perLearner[li].fold, metrics, { testRows: testMean, trainRows: trainMean }, warnings, c.spec) : {}),
      ...(frame.importance ? { importance: learnerImportance(frame.importance, c.name, folds, perLearner[li].fold, { testRows: testMean, trainRows: trainMean }, warnings, c.spec) } : {}),
    };
    return report;
  });

  const report: Report = {
    schema: REPORT_SCHEMA,
    tool: { name: 'foldwise', version: VERSION },
    command: 'eval',
    data: frame.data,
    plan: frame.plan,
    settings: frame.settings,
    metrics: frame.metrics,
    warnings: [...new Set(warnings)],
    ...(frame.audit ? { audit: frame.audit } : {}),
    learners,
    ...(frame.slices?.length ? { slices: sliceReports(frame.slices, records, frame.learners, metrics, frame.data.classes) } : {}),
    ...(frame.threshold ? { threshold: frame.threshold } : {}),
    ...(frame.importance
      ? {
          importance: {
            metric: frame.importance.metric,
            higherIsBetter: frame.importance.higherIsBetter,
            repeats: frame.importance.repeats,
            clusters: frame.importance.clusters,
            inputs: frame.importance.inputs,
          },
        }
      : {}),
    ...(totalMs === undefined
      ? {}
      : {
          timing: {
            totalMs,
            learners: frame.learners.map((c, li) => ({ spec: c.spec, ...perLearner[li].times })),
          },
        }),
  };
  return withComparisons(report);
}

/** The pooled confusion matrix of a learner: whole up to CONFUSION_CLASS_LIMIT classes, folded beyond (src/metrics/folded-confusion.ts). */
function pooledConfusion(actual: Int32Array, predicted: Int32Array, classes: number, names: readonly string[]): Pick<LearnerReport, 'confusion' | 'confusionFolded'> {
  if (classes <= CONFUSION_CLASS_LIMIT) return { confusion: confusionMatrix(actual, predicted, classes) };
  const f = foldedConfusion(actual, predicted, classes);
  return { confusionFolded: { classes: f.kept.map((c) => names[c]), otherClasses: f.otherClasses, matrix: f.matrix, otherCorrect: f.otherCorrect } };
}

/** The curves of a classifier whose every scored fold has probabilities (src/curves/); nothing otherwise. */
function curvesOf(
  preds: readonly Prediction[],
  actual: readonly Target[],
  classNames: readonly string[] | undefined,
  sizes: { testRows: number; trainRows: number },
): Pick<LearnerReport, 'curves'> {
  if (!classNames || classNames.length < 2 || preds.length === 0) return {};
  const folds: { actual: Int32Array; proba: Float64Array }[] = [];
  for (let i = 0; i < preds.length; i++) {
    const a = actual[i];
    const proba = preds[i].probs;
    if (a.task !== 'classification' || !proba) return {};
    folds.push({ actual: a.codes, proba });
  }
  return { curves: learnerCurves(folds, classNames, sizes) };
}

/** --threshold: a learner's section when every scored fold has probabilities and a threshold; a warning otherwise. */
function thresholdOf(
  records: readonly TaskRecord[],
  metrics: readonly Metric[],
  sizes: { testRows: number; trainRows: number },
  warnings: string[],
  spec: string,
): Pick<LearnerReport, 'threshold'> {
  const folds: CutFold[] = [];
  for (const r of records) {
    if (!r.probs || !r.threshold || r.actual.task !== 'classification') {
      warnings.push(
        r.probs
          ? `${spec}: --threshold: the inner split of fold ${foldLabel(r)} held one class only, so no threshold is reported for this learner`
          : `${spec} gives no class probabilities, so --threshold is not applied to it`,
      );
      return {};
    }
    folds.push({ repeat: r.repeat, fold: r.fold, actual: r.actual.codes, probs: r.probs, threshold: r.threshold.value, met: r.threshold.met });
  }
  if (!folds.length) return {};
  const unmet = folds.filter((f) => !f.met).length;
  if (unmet) warnings.push(`${spec}: --threshold: the rule was not met inside ${unmet} of ${folds.length} folds; those folds use the threshold closest to meeting it`);
  return { threshold: learnerThreshold(folds, metrics, sizes) };
}
