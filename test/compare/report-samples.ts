/**
 * Hand-built eval reports for the unit tests of src/compare (no CLI run): the smallest objects
 * that validate against schema/report.schema.json, with fold scores written out in the test.
 * Invented numbers, for tests only. Summary means are the plain mean of the non-null fold scores
 * (written out here, not taken from src/); the other summary fields only fill the schema.
 */
import type { FoldScores, LearnerReport, Report } from '../../src/model/report.js';
import { REPORT_SCHEMA } from '../../src/version.js';

export const SHA_A = 'a'.repeat(64);
export const SHA_B = 'b'.repeat(64);

/** Fold j of repeat 0 (or of `repeat`), with the given scores of one or more metrics. */
export function fold(foldIndex: number, scores: Record<string, number | null>, sizes: { trainRows?: number; testRows?: number; repeat?: number } = {}): FoldScores {
  return { repeat: sizes.repeat ?? 0, fold: foldIndex, trainRows: sizes.trainRows ?? 80, testRows: sizes.testRows ?? 20, scores };
}

/** Folds 0..n-1 of repeat 0 with one metric's scores. */
export function foldsOf(metric: string, values: readonly (number | null)[], sizes: { trainRows?: number; testRows?: number } = {}): FoldScores[] {
  return values.map((v, j) => fold(j, { [metric]: v }, sizes));
}

function plainMean(xs: readonly number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

/** A learner with these folds; its summary mean of each metric is the mean of the non-null fold scores. */
export function learner(spec: string, folds: readonly FoldScores[], extra: Partial<LearnerReport> = {}): LearnerReport {
  const metrics = new Set(folds.flatMap((f) => Object.keys(f.scores)));
  const summary: Record<string, LearnerReport['summary'][string]> = {};
  const pooled: Record<string, number | null> = {};
  for (const m of metrics) {
    const xs = folds.map((f) => f.scores[m]).filter((v): v is number => typeof v === 'number');
    if (!xs.length) {
      summary[m] = null;
      pooled[m] = null;
      continue;
    }
    const mean = plainMean(xs);
    summary[m] = { n: xs.length, mean, median: mean, sd: null, min: Math.min(...xs), max: Math.max(...xs), q1: mean, q3: mean, ci95: null };
    pooled[m] = mean;
  }
  return { name: spec.split(':')[0], spec, params: {}, folds, summary, pooled, ...extra };
}

/** A classification report over `learners` scoring `metrics` (headline first). */
export function makeReport(learners: readonly LearnerReport[], metrics: readonly string[] = ['accuracy'], over: Partial<Report> = {}): Report {
  return {
    schema: REPORT_SCHEMA,
    tool: { name: 'foldwise', version: '1.0.0' },
    command: 'eval',
    data: {
      path: 'data.csv',
      sha256: SHA_A,
      rows: 100,
      columns: 4,
      rowsUsed: 100,
      excludedRows: 0,
      target: 'y',
      task: 'classification',
      classes: ['no', 'yes'],
      features: ['x1', 'x2', 'x3'],
      dropped: [],
    } as Report['data'],
    plan: { kind: 'kfold', text: 'kfold:5', folds: 5, repeats: 1, stratified: true, seed: 1 },
    settings: { impute: 'median' },
    metrics,
    warnings: [],
    learners,
    ...over,
  };
}

/** A deep copy of a report with free-form edits (the way a hand-edited file differs). */
// free-form edits of a parsed report, as in test/compare/match.test.ts
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Loose = Record<string, any>;
export function tweak(r: Report, f: (x: Loose) => void): Report {
  const copy = structuredClone(r) as unknown as Loose;
  f(copy);
  return copy as unknown as Report;
}
