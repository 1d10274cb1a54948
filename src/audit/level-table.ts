/**
 * A per-level table on one categorical feature, for the single-feature scores: each level
 * (missing counted as a level of its own) predicts, for classification, the class of largest
 * weighted count among its training rows (class weights w_k = n / (K n_k), as in
 * one-feature-tree.ts, so that the table aims at balanced accuracy; lowest code on a tie), and
 * for regression the mean target of its training rows. A level never seen in training
 * predicts `fallback`. This is the "one rule" idea of R. C. Holte, "Very simple classification
 * rules perform well on most commonly used datasets", Machine Learning 11, 1993 (free copy:
 * https://link.springer.com/article/10.1023/A:1022631118932).
 */
import type { Target } from '../learning.js';

export interface LevelTable {
  /** prediction per level code; index `levels` is the missing value */
  readonly predictions: Float64Array;
}

/**
 * Fits the table on used rows `train`. `codes` are level codes per used row (-1 missing),
 * `levels` the number of levels, `weights` the class weights (classification only).
 */
export function fitLevelTable(
  codes: Int32Array,
  levels: number,
  y: Target,
  train: Int32Array,
  weights: Float64Array | null,
  fallback: number,
): LevelTable {
  const slots = levels + 1;
  const predictions = new Float64Array(slots).fill(fallback);
  const slotOf = (i: number): number => (codes[i] < 0 ? levels : codes[i]);
  if (y.task === 'classification') {
    const k = y.classes.length;
    const w = weights ?? new Float64Array(k).fill(1);
    const table = new Float64Array(slots * k);
    const seen = new Uint8Array(slots);
    for (const i of train) {
      const s = slotOf(i);
      table[s * k + y.codes[i]] += w[y.codes[i]];
      seen[s] = 1;
    }
    for (let s = 0; s < slots; s++) {
      if (!seen[s]) continue;
      let best = 0;
      for (let c = 1; c < k; c++) if (table[s * k + c] > table[s * k + best]) best = c;
      predictions[s] = best;
    }
    return { predictions };
  }
  const sums = new Float64Array(slots);
  const counts = new Int32Array(slots);
  for (const i of train) {
    const s = slotOf(i);
    sums[s] += y.values[i];
    counts[s]++;
  }
  for (let s = 0; s < slots; s++) if (counts[s] > 0) predictions[s] = sums[s] / counts[s];
  return { predictions };
}

export function predictLevelTable(table: LevelTable, code: number): number {
  const slots = table.predictions.length;
  return table.predictions[code < 0 ? slots - 1 : code];
}
