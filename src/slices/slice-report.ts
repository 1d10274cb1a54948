/**
 * Slices of a report: every metric per level of each --slice column, fold by fold, from the
 * task records (each test row's data row) and the slice columns of the frame. Done in report
 * assembly, so eval, shards and merge, journals and `score` give the same slices.
 *
 * Rules, stated in the README:
 * - a fold is scored in a slice only when at least MIN_SLICE_ROWS (5) of its test rows fall in
 *   the slice; otherwise it is listed with its row count, `short: "rows"`, and null scores;
 * - a class-averaged metric (balanced-accuracy, the macro metrics, roc-auc) is left unscored
 *   (null, the classes named under missingClasses) on a fold whose slice lacks a class: an
 *   average over classes with one missing class is not the metric any more;
 * - summaries (src/stats summarize) cover the scored folds; their corrected interval uses the
 *   whole folds' test and training sizes (the larger Nadeau-Bengio factor than the slice's own
 *   test rows would give: wider intervals, stated as conservative);
 * - pairs of learners are compared per slice as in the report (src/compare/within-report.ts),
 *   over the folds scored for both.
 */
import type { Metric } from '../metrics/types.js';
import type { Target } from '../learning.js';
import { reportComparisons } from '../compare/within-report.js';
import type { Report, SliceFold, SliceLearner, SliceLevel, SliceReport } from '../model/report.js';
import { summarize } from '../stats/index.js';
import { scoreOf } from '../metrics/scoring.js';
import type { TaskRecord } from '../model/record.js';
import type { SliceColumn } from './slice-columns.js';

export const MIN_SLICE_ROWS = 5;
const CLASS_AVERAGED = new Set(['balanced-accuracy', 'macro-precision', 'macro-recall', 'macro-f1', 'roc-auc']);

export function isClassAveraged(metric: string): boolean {
  return CLASS_AVERAGED.has(metric);
}

function subsetTarget(t: Target, idx: readonly number[]): Target {
  if (t.task === 'classification') return { task: 'classification', codes: Int32Array.from(idx, (i) => t.codes[i]), classes: t.classes };
  return { task: 'regression', values: Float64Array.from(idx, (i) => t.values[i]) };
}

function subsetPrediction(r: TaskRecord, idx: readonly number[], classes: number): { predicted: Int32Array | Float64Array; probs?: Float64Array } {
  const predicted = r.predicted instanceof Int32Array ? Int32Array.from(idx, (i) => r.predicted[i]) : Float64Array.from(idx, (i) => r.predicted[i]);
  if (!r.probs || classes === 0) return { predicted };
  const probs = new Float64Array(idx.length * classes);
  idx.forEach((i, k) => probs.set(r.probs!.subarray(i * classes, (i + 1) * classes), k * classes));
  return { predicted, probs };
}

interface LearnerInfo {
  readonly name: string;
  readonly spec: string;
}

/** The slice reports of the records (cross-validation folds only; failed folds are left out). */
export function sliceReports(
  slices: readonly SliceColumn[],
  records: readonly TaskRecord[],
  learners: readonly LearnerInfo[],
  metrics: readonly Metric[],
  classNames: readonly string[] | undefined,
): SliceReport[] {
  const classes = classNames?.length ?? 0;
  const folds = records.filter((r) => r.foldIndex >= 0 && !r.failed && r.rows);
  return slices.map((s) => {
    const levels: SliceLevel[] = s.levels.map((level, li) => {
      const sliceLearners: SliceLearner[] = learners.map((l, ci) => {
        const own = folds.filter((r) => r.candidateIndex === ci);
        const sliceFolds: SliceFold[] = own.map((r) => {
          const idx: number[] = [];
          for (let i = 0; i < r.rows!.length; i++) if (s.codes[r.rows![i]] === li) idx.push(i);
          const testRows = r.actual.task === 'classification' ? r.actual.codes.length : r.actual.values.length;
          const base = { repeat: r.repeat, fold: r.fold, trainRows: r.trainRows, testRows, rows: idx.length };
          const scores: Record<string, number | null> = {};
          if (idx.length < MIN_SLICE_ROWS) {
            for (const m of metrics) scores[m.name] = null;
            return { ...base, scores, short: 'rows' as const };
          }
          const actual = subsetTarget(r.actual, idx);
          const pred = subsetPrediction(r, idx, classes);
          let missing: string[] = [];
          if (actual.task === 'classification' && classes > 0) {
            const seen = new Set(actual.codes);
            missing = (classNames ?? []).filter((_, c) => !seen.has(c));
          }
          for (const m of metrics) scores[m.name] = missing.length && isClassAveraged(m.name) ? null : scoreOf(m, actual, pred);
          const unscored = missing.length && metrics.some((m) => isClassAveraged(m.name));
          return { ...base, scores, ...(unscored ? { missingClasses: missing } : {}) };
        });
        const summary: Record<string, SliceLearner['summary'][string]> = {};
        for (const m of metrics) {
          const scored = sliceFolds.filter((f) => f.scores[m.name] !== null);
          const values = scored.map((f) => f.scores[m.name] as number);
          summary[m.name] = values.length
            ? summarize(values, {
                testRows: scored.reduce((a, f) => a + f.testRows, 0) / scored.length,
                trainRows: scored.reduce((a, f) => a + f.trainRows, 0) / scored.length,
              })
            : null;
        }
        return { name: l.name, spec: l.spec, folds: sliceFolds, summary };
      });
      const first = sliceLearners[0]?.folds ?? [];
      const rows = first.filter((f) => f.repeat === (first[0]?.repeat ?? 0)).reduce((a, f) => a + f.rows, 0);
      const scoredFolds = first.filter((f) => !f.short).length;
      // the report's comparison rules, on a report made of this slice's learners
      const comparisons = reportComparisons({ metrics: metrics.map((m) => m.name), learners: sliceLearners } as unknown as Report);
      return { level, rows, scoredFolds, learners: sliceLearners, ...(comparisons ? { comparisons } : {}) };
    });
    return { column: s.column, kind: s.kind, ...(s.edges ? { edges: s.edges } : {}), minRows: MIN_SLICE_ROWS, levels };
  });
}
