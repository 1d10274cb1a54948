/**
 * Scoring at a chosen threshold (`--threshold`): the outer test rows of each fold are called
 * positive when the probability of the positive class (the second class) is at least the
 * threshold that fold's inner split chose, and the positive class's precision, recall and F1
 * and the report's label metrics (those that need no probabilities) are computed on them,
 * beside the same figures at 0.5. Summaries across folds are the report's (Nadeau-Bengio
 * corrected intervals, the metric's range and floor).
 */
import type { Metric } from '../metrics/types.js';
import type { LearnerThreshold, ThresholdFold } from '../model/threshold.js';
import type { ScoreSummary } from '../model/summary.js';
import { summarize } from '../stats/index.js';

export const DEFAULT_CUT = 0.5;

/** One outer fold as scoring at a threshold needs it. */
export interface CutFold {
  readonly repeat: number;
  readonly fold: number;
  /** actual class codes of the test rows (0 or 1) */
  readonly actual: Int32Array;
  /** rows x 2 probabilities */
  readonly probs: Float64Array;
  /** the threshold chosen on this fold's inner split (+Infinity: nothing positive) */
  readonly threshold: number;
  readonly met: boolean;
}

/** The class calls at threshold t: 1 when the positive probability is at least t. */
export function callsAt(probs: Float64Array, t: number): Int32Array {
  const n = probs.length / 2;
  const out = new Int32Array(n);
  for (let i = 0; i < n; i++) out[i] = probs[2 * i + 1] >= t ? 1 : 0;
  return out;
}

/** Precision, recall and F1 of class 1; null where the denominator is 0 (F1 is 0 when there are positives but no true positive). */
export function positiveFigures(actual: Int32Array, called: Int32Array): { precision: number | null; recall: number | null; f1: number | null } {
  let tp = 0;
  let fp = 0;
  let fn = 0;
  for (let i = 0; i < actual.length; i++) {
    if (called[i] === 1) {
      if (actual[i] === 1) tp++;
      else fp++;
    } else if (actual[i] === 1) fn++;
  }
  return {
    precision: tp + fp > 0 ? tp / (tp + fp) : null,
    recall: tp + fn > 0 ? tp / (tp + fn) : null,
    f1: tp + fp + fn > 0 ? (2 * tp) / (2 * tp + fp + fn) : null,
  };
}

const FIGURES = ['precision', 'recall', 'f1'] as const;
const UNIT = { range: [0, 1] as const, proportion: false, rank: false };

function scoresAt(f: CutFold, t: number, metrics: readonly Metric[]): { figures: ReturnType<typeof positiveFigures>; scores: Record<string, number | null> } {
  const called = callsAt(f.probs, t);
  const scores: Record<string, number | null> = {};
  for (const m of metrics) {
    if (m.task !== 'classification' || m.needsProba) continue;
    const v = m.fn({ actual: f.actual, predicted: called, classes: 2, probs: f.probs });
    scores[m.name] = Number.isFinite(v) ? v : null;
  }
  return { figures: positiveFigures(f.actual, called), scores };
}

function summaries(rows: readonly { figures: ReturnType<typeof positiveFigures>; scores: Record<string, number | null> }[], metrics: readonly Metric[], sizes: { testRows: number; trainRows: number }): Record<string, ScoreSummary | null> {
  const out: Record<string, ScoreSummary | null> = {};
  const one = (values: (number | null)[], rules: typeof UNIT | Metric): ScoreSummary | null => {
    const ok = values.filter((v): v is number => v !== null);
    return ok.length ? summarize(ok, sizes, 0.95, rules) : null;
  };
  for (const k of FIGURES) out[k] = one(rows.map((r) => r.figures[k]), UNIT);
  for (const m of metrics) if (m.task === 'classification' && !m.needsProba) out[m.name] = one(rows.map((r) => r.scores[m.name]), m);
  return out;
}

/** A learner's --threshold section from its scored outer folds (in the run's order). */
export function learnerThreshold(folds: readonly CutFold[], metrics: readonly Metric[], sizes: { testRows: number; trainRows: number }): LearnerThreshold {
  const at = folds.map((f) => scoresAt(f, f.threshold, metrics));
  const base = folds.map((f) => scoresAt(f, DEFAULT_CUT, metrics));
  const cuts = folds.map((f) => Math.min(f.threshold, 1));
  const perFold: ThresholdFold[] = folds.map((f, i) => ({
    repeat: f.repeat,
    fold: f.fold,
    threshold: Number.isFinite(f.threshold) ? f.threshold : null,
    met: f.met,
    ...at[i].figures,
    scores: at[i].scores,
  }));
  return {
    folds: perFold,
    spread: cuts.length ? summarize(cuts, sizes, 0.95, UNIT) : null,
    summary: summaries(at, metrics, sizes),
    atDefault: summaries(base, metrics, sizes),
  };
}
