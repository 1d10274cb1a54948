/**
 * Hand-built eval reports for the unit tests of gate.ts, gate-family.ts and plan-power.ts: plain
 * objects of the report contract (src/model/report.ts), with invented fold scores (for tests
 * only). Nothing here calls into src/compare, so building a fixture at a test file's top level
 * reaches no mutant.
 */
import type { FoldScores, LearnerReport, Report, SliceFold, SliceLearner, SliceReport } from '../../src/model/report.js';
import type { LoadedReport } from '../../src/compare/read-report.js';

export interface FoldOptions {
  /** folds per repeat: fold i is (repeat floor(i / k), fold i mod k); default 5 */
  readonly k?: number;
  /** per-fold sizes (default 80 train, 20 test on every fold) */
  readonly trainRows?: readonly number[] | number;
  readonly testRows?: readonly number[] | number;
  /** fold indices that failed (every score null, `failed` set) */
  readonly failed?: readonly number[];
}

const at = (v: readonly number[] | number | undefined, i: number, dflt: number): number =>
  v === undefined ? dflt : typeof v === 'number' ? v : v[i];

/** Folds of one learner from per-metric score columns of equal length. */
export function foldsOf(scores: Readonly<Record<string, readonly (number | null)[]>>, o: FoldOptions = {}): FoldScores[] {
  const metrics = Object.keys(scores);
  const n = scores[metrics[0]].length;
  const k = o.k ?? 5;
  const out: FoldScores[] = [];
  for (let i = 0; i < n; i++) {
    const failed = o.failed?.includes(i) ?? false;
    const s: Record<string, number | null> = {};
    for (const m of metrics) s[m] = failed ? null : scores[m][i];
    out.push({
      repeat: Math.floor(i / k),
      fold: i % k,
      trainRows: at(o.trainRows, i, 80),
      testRows: at(o.testRows, i, 20),
      scores: s,
      ...(failed ? { failed: 'exit code 1' } : {}),
    });
  }
  return out;
}

const meanOf = (xs: readonly number[]): number => xs.reduce((a, b) => a + b, 0) / xs.length;

/** A learner with its summary means computed from its folds (null when no fold has the metric). */
export function learnerOf(spec: string, folds: readonly FoldScores[], name = spec.split(':')[0]): LearnerReport {
  const summary: Record<string, { n: number; mean: number; median: number; sd: null; min: number; max: number; q1: number; q3: number; ci95: null } | null> = {};
  const metrics = folds.length ? Object.keys(folds[0].scores) : [];
  for (const m of metrics) {
    const v = folds.map((f) => f.scores[m]).filter((x): x is number => typeof x === 'number');
    summary[m] = v.length ? { n: v.length, mean: meanOf(v), median: v[0], sd: null, min: v[0], max: v[0], q1: v[0], q3: v[0], ci95: null } : null;
  }
  return { name, spec, params: {}, folds, summary, pooled: {} };
}

export interface ReportOptions {
  readonly metrics?: readonly string[];
  readonly task?: 'classification' | 'regression';
  readonly sha256?: string;
  readonly seed?: number;
  readonly planText?: string;
  readonly kind?: string;
  readonly folds?: number;
  readonly repeats?: number;
  readonly version?: string;
  readonly slices?: readonly SliceReport[];
  readonly timing?: Report['timing'];
}

export function reportOf(learners: readonly LearnerReport[], o: ReportOptions = {}): Report {
  const task = o.task ?? 'classification';
  return {
    schema: 'foldwise-report/2',
    tool: { name: 'foldwise', version: o.version ?? '1.0.0' },
    command: 'eval',
    data: {
      path: 'data.csv',
      sha256: o.sha256 ?? 'a'.repeat(64),
      rows: 100,
      columns: 4,
      rowsUsed: 100,
      excludedRows: 0,
      target: 'y',
      task,
      ...(task === 'classification' ? { classes: ['no', 'yes'] } : {}),
      features: ['x1', 'x2', 'x3'],
      dropped: [],
    },
    plan: {
      kind: o.kind ?? 'kfold',
      text: o.planText ?? 'kfold:5',
      folds: o.folds ?? 5,
      repeats: o.repeats ?? 1,
      stratified: task === 'classification',
      seed: o.seed ?? 1,
    },
    settings: { impute: 'none' },
    metrics: o.metrics ?? (task === 'classification' ? ['macro-f1', 'accuracy'] : ['rmse', 'mae']),
    warnings: [],
    learners,
    ...(o.slices ? { slices: o.slices } : {}),
    ...(o.timing ? { timing: o.timing } : {}),
  };
}

export const loaded = (path: string, report: Report): LoadedReport => ({ path, text: JSON.stringify(report), report });

/** Slice folds: the learner's whole-fold sizes, `rows` test rows in the slice, `short` where the score is null. */
export function sliceFoldsOf(scores: Readonly<Record<string, readonly (number | null)[]>>, o: FoldOptions & { readonly rows?: number } = {}): SliceFold[] {
  return foldsOf(scores, o).map((f) => {
    const short = Object.values(f.scores).every((v) => v === null);
    return { ...f, rows: short ? 1 : (o.rows ?? 10), ...(short ? { short: 'rows' as const } : {}) };
  });
}

export const sliceLearnerOf = (spec: string, folds: readonly SliceFold[]): SliceLearner => ({ name: spec.split(':')[0], spec, folds, summary: {} });

export function sliceOf(column: string, levels: readonly { level: string; learners: readonly SliceLearner[] }[], o: { edges?: readonly number[]; minRows?: number } = {}): SliceReport {
  return {
    column,
    kind: o.edges ? 'bins' : 'levels',
    ...(o.edges ? { edges: o.edges } : {}),
    minRows: o.minRows ?? 5,
    levels: levels.map((l) => ({ level: l.level, rows: 50, scoredFolds: 5, learners: l.learners })),
  };
}
