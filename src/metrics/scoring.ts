/**
 * Predictions and their scores, shared by eval and tune: a metric on one test part (an undefined
 * or non-finite score is null; a probability metric is null for a model without probabilities),
 * and the concatenations that pooled out-of-fold scores are computed on.
 */
import type { Target } from '../learning.js';
import type { Metric } from './types.js';

export interface Prediction {
  readonly predicted: Int32Array | Float64Array;
  readonly probs?: Float64Array;
  /** the model's notes about the fit (Model.notes), where the caller keeps them (tune's outer refits) */
  readonly notes?: Readonly<Record<string, number>>;
}

export function scoreOf(metric: Metric, actual: Target, pred: Prediction): number | null {
  let v: number;
  if (metric.task === 'classification') {
    if (actual.task !== 'classification') return null;
    if (metric.needsProba && !pred.probs) return null;
    v = metric.fn({ actual: actual.codes, predicted: pred.predicted as Int32Array, classes: actual.classes.length, probs: pred.probs });
  } else {
    if (actual.task !== 'regression') return null;
    v = metric.fn({ actual: actual.values, predicted: pred.predicted as Float64Array });
  }
  return Number.isFinite(v) ? v : null;
}

/** Concatenates predictions in order (for pooled scores). */
export function concatPredictions(parts: readonly Prediction[], classes: number): Prediction {
  const n = parts.reduce((s, p) => s + p.predicted.length, 0);
  const predicted = parts[0].predicted instanceof Int32Array ? new Int32Array(n) : new Float64Array(n);
  const withProba = parts.every((p) => p.probs);
  const probs = withProba ? new Float64Array(n * classes) : undefined;
  let at = 0;
  for (const p of parts) {
    predicted.set(p.predicted as never, at);
    if (probs) probs.set(p.probs!, at * classes);
    at += p.predicted.length;
  }
  return probs ? { predicted, probs } : { predicted };
}

/** Targets concatenated over parts, in order. */
export function concatTargets(parts: readonly Target[]): Target {
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
