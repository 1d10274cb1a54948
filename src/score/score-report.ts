/**
 * `foldwise score`: the report of an eval run, computed from a predictions file instead of from
 * fits. The file's groups become task records and go through the same assembly as a run
 * (src/run/evaluate.ts `assembleReport`): the same metrics, per-fold summaries, pooled scores,
 * corrected intervals and paired comparisons, so a file written by `eval --predictions` scores
 * back to the run's own numbers.
 *
 * The corrected interval needs each fold's training size. It comes from the file's train_rows
 * column (foldwise's files), from --train-rows N, or, failing both, it is assumed to be k-fold
 * over the rows present: a fold trains on the other folds of its repeat. The report's `source`
 * says which, and a warning says so when it was assumed.
 */
import { createHash } from 'node:crypto';
import { UsageError } from '../errors.js';
import type { Target } from '../learning.js';
import { costRows, type CostMatrix, defaultMetrics, getMetric, parseCostMatrix } from '../metrics/index.js';
import type { Report, ReportSource } from '../model/report.js';
import { assignmentOf } from '../run/assignment.js';
import { assembleReport, type ReportFrame, type TaskRecord } from '../run/evaluate.js';
import { classOrder, readPredictions, type PredictionFields, type ReadPredictions, type ScoreColumns } from './read-predictions.js';
import { binnedSlice, DEFAULT_SLICE_BINS, levelSlice, type SliceColumn } from '../slices/slice-columns.js';

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * A slice column from the texts of a predictions file's lines: numeric when every non-empty
 * text is a number (then quantile bins, edges fixed on all lines of the file), levels otherwise
 * (in foldwise's class order); an empty text is missing.
 */
function sliceOfTexts(name: string, texts: readonly string[], bins: number): SliceColumn {
  const present = texts.filter((t) => t.trim() !== '');
  if (present.length && present.every((t) => NUMBER.test(t.trim()))) {
    return binnedSlice(name, Float64Array.from(texts, (t) => (t.trim() === '' ? Number.NaN : Number(t))), bins);
  }
  const levels = classOrder(present);
  const at = new Map(levels.map((l, i) => [l, i]));
  return levelSlice(name, levels, texts.map((t) => (t.trim() === '' ? -1 : at.get(t)!)));
}

export interface ScoreOptions extends ScoreColumns {
  readonly metrics?: readonly string[];
  /** --slice-bins for numeric --slice columns (default 4) */
  readonly sliceBins?: number;
  /** the training rows of every fold, when the file does not say */
  readonly trainRows?: number;
  /** --costs FILE: the cost matrix's name and text, for the cost metric */
  readonly costs?: { readonly file: string; readonly text: string };
  /** --threshold T (two-class predictions with probabilities): also score every fold with the positive class called at probability >= T, beside 0.5 */
  readonly threshold?: number;
}

/** --threshold T: refused for predictions that are not two-class or carry no probabilities (one line, exit 2). */
function checkThreshold(read: ReadPredictions, t: number | undefined): void {
  if (t === undefined) return;
  if (!(t > 0 && t < 1)) throw new UsageError(`--threshold ${t}: a threshold is a probability of the positive class strictly between 0 and 1`);
  if (read.task !== 'classification' || !read.classes) throw new UsageError(`--threshold ${t}: a threshold needs two-class predictions, but these are for regression; leave it out`);
  if (read.classes.length !== 2) throw new UsageError(`--threshold ${t}: a threshold needs two-class predictions, but these have ${read.classes.length} classes; leave it out`);
  if (!read.groups.some((g) => g.probs)) throw new UsageError(`--threshold ${t}: a threshold is applied to the probability of ${read.classes[1]}, but the file gives no probabilities; name their columns with --prob or --prob-columns`);
}

function learnerName(spec: string): string {
  const colon = spec.search(/[:;]/);
  return colon < 0 ? spec : spec.slice(0, colon);
}

function checkMetrics(read: ReadPredictions, names: readonly string[] | undefined): string[] {
  const list = names?.length ? [...names] : defaultMetrics(read.task);
  for (const m of list) {
    const metric = getMetric(m);
    if (metric.task !== read.task) throw new UsageError(`--metric ${m}: a ${metric.task} metric, but the predictions are for ${read.task}`);
  }
  return list;
}

/** --costs read against the file's classes; refused for regression and without --metric cost (as eval refuses them). */
function costsFor(read: ReadPredictions, costs: ScoreOptions['costs'], metrics: readonly string[]): CostMatrix | undefined {
  if (!costs) return undefined;
  if (read.task !== 'classification' || !read.classes) throw new UsageError(`--costs ${costs.file}: a cost matrix is for classification, but the predictions are for ${read.task}`);
  const matrix = parseCostMatrix(costs.text, costs.file, read.classes);
  if (!metrics.includes('cost')) throw new UsageError(`--costs ${costs.file}: add --metric cost to score by the matrix (first, to make it the headline)`);
  return matrix;
}

/** Builds the report of a predictions file's text. */
export function scoreReport(text: string | PredictionFields, file: string, opts: ScoreOptions = {}): Report {
  const read = readPredictions(text, file, opts);
  const metrics = checkMetrics(read, opts.metrics);
  const costs = costsFor(read, opts.costs, metrics);
  checkThreshold(read, opts.threshold);
  const test = read.groups.filter((g) => !g.holdout);
  const trainFrom: ReportSource['trainRows'] = read.hasTrainRows ? 'file' : opts.trainRows !== undefined ? 'option' : 'assumed-kfold';
  const warnings: string[] = [];

  // rows per repeat for the first learner, for the assumed k-fold training sizes
  const rowsInRepeat = new Map<number, number>();
  for (const g of test) if (g.learner === 0) rowsInRepeat.set(g.repeat, (rowsInRepeat.get(g.repeat) ?? 0) + g.actual.length);
  const trainOf = (g: (typeof read.groups)[number]): number => {
    if (g.trainRows !== undefined) return g.trainRows;
    if (opts.trainRows !== undefined) return opts.trainRows;
    if (g.holdout) return Math.max(1, ...rowsInRepeat.values());
    return Math.max(1, (rowsInRepeat.get(g.repeat) ?? 0) - g.actual.length);
  };
  if (trainFrom === 'assumed-kfold') {
    warnings.push(
      'the predictions file gives no training sizes: each fold is assumed to have trained on the other folds of its repeat (k-fold); give --train-rows N if it did not, since the corrected intervals depend on it',
    );
  }

  const folds = [...new Map(test.map((g) => [`${g.repeat}.${g.fold}`, g])).values()];
  const foldsPerRepeat = Math.max(...[...new Set(folds.map((g) => g.repeat))].map((r) => folds.filter((g) => g.repeat === r).length));
  const repeats = new Set(folds.map((g) => g.repeat)).size;
  const first = test.filter((g) => g.learner === 0);
  const assignment = read.hasRows ? assignmentOf(first.map((g) => ({ repeat: g.repeat, fold: g.fold, rows: g.rows }))) : undefined;
  const holdoutRows = read.groups.find((g) => g.holdout)?.actual.length;

  // --slice: every line of the file gets an index; the slice columns are indexed by it
  const slices = (opts.slice ?? []).map((name, k) => sliceOfTexts(name, read.groups.flatMap((g) => g.sliceTexts[k]), opts.sliceBins ?? DEFAULT_SLICE_BINS));
  const starts: number[] = [];
  read.groups.reduce((at, g) => (starts.push(at), at + g.actual.length), 0);

  const frame: ReportFrame = {
    data: {
      path: file,
      sha256: typeof text === 'string' ? createHash('sha256').update(text).digest('hex') : text.sha256,
      rows: read.lines,
      columns: read.columns,
      rowsUsed: first.filter((g) => g.repeat === 0).reduce((s, g) => s + g.actual.length, 0),
      excludedRows: 0,
      target: read.actualName,
      task: read.task,
      ...(read.classes ? { classes: read.classes } : {}),
      features: [],
      dropped: [],
    },
    plan: {
      kind: 'given',
      text: `folds given by ${file}`,
      folds: foldsPerRepeat,
      repeats,
      stratified: false,
      seed: 0,
      ...(holdoutRows !== undefined ? { holdoutRows, finalScored: true } : {}),
      ...(assignment ? { assignment } : {}),
    },
    settings: { impute: 'unknown', ...(costs ? { costs: { sha256: costs.sha256, classes: [...costs.classes], matrix: costRows(costs) } } : {}) },
    metrics,
    warnings,
    learners: read.learners.map((spec) => ({ name: learnerName(spec), spec, params: {} })),
    ...(slices.length ? { slices } : {}),
    ...(opts.threshold !== undefined && read.classes ? { threshold: { rule: String(opts.threshold), positive: read.classes[1], given: true as const } } : {}),
  };

  const classes = read.classes ?? [];
  const records: TaskRecord[] = read.groups.map((g, i) => {
    const actual: Target = read.task === 'classification' ? { task: 'classification', codes: Int32Array.from(g.actual), classes } : { task: 'regression', values: Float64Array.from(g.actual) };
    return {
      id: `${i}`,
      candidateIndex: g.learner,
      foldIndex: g.holdout ? -1 : folds.findIndex((f) => f.repeat === g.repeat && f.fold === g.fold),
      repeat: g.holdout ? 0 : g.repeat,
      fold: g.holdout ? 0 : g.fold,
      trainRows: trainOf(g),
      actual,
      predicted: read.task === 'classification' ? Int32Array.from(g.predicted) : Float64Array.from(g.predicted),
      ...(g.probs ? { probs: Float64Array.from(g.probs) } : {}),
      ...(g.probs && opts.threshold !== undefined ? { threshold: { value: opts.threshold, met: true } } : {}),
      fitMs: 0,
      predictMs: 0,
      ...(slices.length ? { rows: Int32Array.from(g.actual, (_, k) => starts[i] + k) } : {}),
    };
  });
  const report = assembleReport(frame, records);
  const source: ReportSource = { kind: 'predictions', file, foldwise: read.foldwise, trainRows: trainFrom };
  const { schema, tool, command: _eval, ...rest } = report;
  return { schema, tool, command: 'score', source, ...rest };
}
