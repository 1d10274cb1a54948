/**
 * `tune --predictions FILE`: the outer-fold predictions of the tuned procedure (each outer fold's
 * pick, refitted on the outer training rows) and of the baseline on the same outer folds, and
 * the holdout predictions of the recommendation, as task records for the predictions file
 * (src/run/predictions-out.ts). The learner column says `tuned` or `baseline`; the `pick` column
 * names the candidate each outer fold picked, so `foldwise score` on the file gives the tuned
 * estimate and its comparison with the baseline.
 */
import type { Problem } from '../data/problem.js';
import { dataSection } from '../data/problem.js';
import type { Target } from '../learning.js';
import type { ReportFrame, TaskRecord } from '../run/evaluate.js';
import type { Prediction } from '../metrics/scoring.js';

export interface TunePredictions {
  readonly problem: Problem;
  readonly outer: {
    readonly repeat: number;
    readonly fold: number;
    /** used-row indices of the outer test rows */
    readonly test: Int32Array;
    readonly trainRows: number;
    readonly pick: string;
    readonly tuned: Prediction;
    readonly baseline: Prediction;
    readonly actual: Target;
  }[];
  holdout?: { readonly test: Int32Array; readonly trainRows: number; readonly pick: string; readonly tuned: Prediction; readonly actual: Target };
}

/** The frame and records of the predictions file: learners `baseline` (0) and `tuned` (1). */
export function tuneRecords(p: TunePredictions, metrics: readonly string[]): { frame: ReportFrame; records: TaskRecord[] } {
  const { problem } = p;
  const frame: ReportFrame = {
    data: dataSection(problem),
    plan: { kind: 'given', text: 'tune outer plan', folds: 1, repeats: 1, stratified: false, seed: 0 },
    settings: { impute: 'unknown' },
    metrics,
    warnings: [],
    learners: [
      { name: 'baseline', spec: 'baseline', params: {} },
      { name: 'tuned', spec: 'tuned', params: {} },
    ],
  };
  const place = (test: Int32Array): { rows: Int32Array; lines: Int32Array } => {
    const rows = Int32Array.from(test, (u) => problem.rows[u]);
    return { rows, lines: Int32Array.from(rows, (r) => problem.table.lines[r]) };
  };
  const records: TaskRecord[] = [];
  p.outer.forEach((o, i) => {
    const where = place(o.test);
    const common = { foldIndex: i, repeat: o.repeat, fold: o.fold, trainRows: o.trainRows, actual: o.actual, fitMs: 0, predictMs: 0, ...where };
    const of = (pr: Prediction) => ({ predicted: pr.predicted, ...(pr.probs ? { probs: pr.probs } : {}) });
    records.push({ id: `r${o.repeat}.f${o.fold}:baseline`, candidateIndex: 0, ...common, ...of(o.baseline) });
    records.push({ id: `r${o.repeat}.f${o.fold}:tuned`, candidateIndex: 1, ...common, ...of(o.tuned), pick: o.pick });
  });
  if (p.holdout) {
    const h = p.holdout;
    records.push({
      id: 'final:tuned',
      candidateIndex: 1,
      foldIndex: -1,
      repeat: 0,
      fold: 0,
      trainRows: h.trainRows,
      actual: h.actual,
      predicted: h.tuned.predicted,
      ...(h.tuned.probs ? { probs: h.tuned.probs } : {}),
      fitMs: 0,
      predictMs: 0,
      ...place(h.test),
      pick: h.pick,
    });
  }
  return { frame, records };
}
