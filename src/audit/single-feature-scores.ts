/**
 * Single-feature scores: how well each feature alone predicts the target out of fold. A
 * feature that alone is near perfect, or far better than every other feature, is the first
 * thing to check for leakage (a column recorded after, or computed from, the outcome).
 *
 * Model: a one-feature tree for a numeric feature (one-feature-tree.ts; depth 3 for
 * classification, 4 for regression; leaves of at least min(5, n_train / 10) rows), a level
 * table for a categorical one (level-table.ts). Each is fitted on the training rows of every
 * fold of repeat 0 of the plan and predicts that fold's test rows; the scores are computed on
 * the pooled out-of-fold predictions. Plans with more than AUDIT_LIMITS.maxScoreFolds folds in
 * a repeat (leave-one-out on many rows) are replaced by kfold:5 built the same way (same seed,
 * stratification and groups), to stay fast; the report names the plan used.
 *
 * Score: balanced accuracy BA = (1/K) sum_k recall_k over the K classes present in the pooled
 * test rows, with skill (BA - 1/K) / (1 - 1/K), so 0 is chance and 1 perfect; for regression
 * R^2 = 1 - SSE / SST around the mean of the pooled test targets, which is its own skill.
 * Sources: K. H. Brodersen et al., "The balanced accuracy and its posterior distribution",
 * ICPR 2010 (free at https://ieeexplore.ieee.org/document/5597285); for R^2 any regression
 * text, e.g. https://en.wikipedia.org/wiki/Coefficient_of_determination.
 *
 * Speed: each numeric feature's present rows are sorted once (feature-data.ts); a fold's
 * training rows in sorted order are that order filtered by a membership mask, O(n) per fold.
 */
import type { Problem } from '../data/problem.js';
import type { Target } from '../learning.js';
import type { Fold } from '../plans/types.js';
import type { FeatureData } from './feature-data.js';
import { fitLevelTable, predictLevelTable } from './level-table.js';
import { fitOneFeatureTree, predictOneFeatureTree, type SortedTarget } from './one-feature-tree.js';
import type { FeatureScore, SingleFeatureScores } from './types.js';

export const TREE_DEPTH = { classification: 3, regression: 4 } as const;

/** Class weights n / (K n_k) over the training rows (0 for a class absent from them). */
export function classWeights(codes: Int32Array, classes: number, train: Int32Array): Float64Array {
  const counts = new Float64Array(classes);
  for (const i of train) counts[codes[i]]++;
  let present = 0;
  for (const c of counts) if (c > 0) present++;
  const w = new Float64Array(classes);
  for (let k = 0; k < classes; k++) w[k] = counts[k] > 0 ? train.length / (present * counts[k]) : 0;
  return w;
}

/** The most frequent class of the training rows (lowest code on a tie), or their mean. */
export function fallbackOf(y: Target, train: Int32Array): number {
  if (y.task === 'regression') {
    let s = 0;
    for (const i of train) s += y.values[i];
    return train.length ? s / train.length : 0;
  }
  const counts = new Float64Array(y.classes.length);
  for (const i of train) counts[y.codes[i]]++;
  let best = 0;
  for (let k = 1; k < counts.length; k++) if (counts[k] > counts[best]) best = k;
  return best;
}

/** Balanced accuracy of predictions, with its skill; nulls when fewer than two classes occur. */
export function balancedAccuracy(actual: Int32Array, predicted: Float64Array, classes: number): { score: number | null; skill: number | null } {
  const total = new Float64Array(classes);
  const hit = new Float64Array(classes);
  for (let i = 0; i < actual.length; i++) {
    total[actual[i]]++;
    if (predicted[i] === actual[i]) hit[actual[i]]++;
  }
  let k = 0;
  let sum = 0;
  for (let c = 0; c < classes; c++) {
    if (total[c] === 0) continue;
    k++;
    sum += hit[c] / total[c];
  }
  if (k < 2) return { score: null, skill: null };
  const ba = sum / k;
  return { score: ba, skill: (ba - 1 / k) / (1 - 1 / k) };
}

/** R^2 of predictions around the mean of the actual values; null when they do not vary. */
export function rSquared(actual: Float64Array, predicted: Float64Array): number | null {
  const n = actual.length;
  if (n === 0) return null;
  let mean = 0;
  for (const v of actual) mean += v;
  mean /= n;
  let sst = 0;
  let sse = 0;
  for (let i = 0; i < n; i++) {
    sst += (actual[i] - mean) ** 2;
    sse += (actual[i] - predicted[i]) ** 2;
  }
  return sst > 0 ? 1 - sse / sst : null;
}

/** What every feature's fits on one fold share: the training mask, class weights, fallback. */
export interface FoldSetup {
  readonly fold: Fold;
  readonly inTrain: Uint8Array;
  readonly weights: Float64Array | null;
  readonly fallback: number;
}

export function foldSetups(y: Target, folds: readonly Fold[], n: number): FoldSetup[] {
  return folds.map((fold) => {
    const inTrain = new Uint8Array(n);
    for (const i of fold.train) inTrain[i] = 1;
    return {
      fold,
      inTrain,
      weights: y.task === 'classification' ? classWeights(y.codes, y.classes.length, fold.train) : null,
      fallback: fallbackOf(y, fold.train),
    };
  });
}

/** Out-of-fold predictions of one feature over the folds, pooled in fold order. */
function outOfFold(f: FeatureData, y: Target, setups: readonly FoldSetup[]): { rows: Int32Array; predicted: Float64Array } {
  const total = setups.reduce((s, x) => s + x.fold.test.length, 0);
  const rows = new Int32Array(total);
  const predicted = new Float64Array(total);
  // read once: `order` is made on first read (feature-data.ts)
  const order = f.kind === 'numeric' ? f.order : new Int32Array(0);
  const width = order.length;
  const buf = { rows: new Int32Array(width), xs: new Float64Array(width), codes: new Int32Array(width), values: new Float64Array(width) };
  let at = 0;
  for (const { fold, inTrain, weights, fallback } of setups) {
    if (f.kind === 'categorical') {
      const table = fitLevelTable(f.codes, f.levels.length, y, fold.train, weights, fallback);
      for (const i of fold.test) {
        rows[at] = i;
        predicted[at++] = predictLevelTable(table, f.codes[i]);
      }
      continue;
    }
    // the fold's training rows in feature order: the presorted order filtered by the mask
    let m = 0;
    for (let j = 0; j < order.length; j++) if (inTrain[order[j]]) buf.rows[m++] = order[j];
    const xs = buf.xs.subarray(0, m);
    for (let j = 0; j < m; j++) xs[j] = f.values[buf.rows[j]];
    let target: SortedTarget;
    let missingPrediction = fallback;
    const missingRows: number[] = [];
    if (m < fold.train.length) for (const i of fold.train) if (Number.isNaN(f.values[i])) missingRows.push(i);
    if (y.task === 'classification') {
      const codes = buf.codes.subarray(0, m);
      for (let j = 0; j < m; j++) codes[j] = y.codes[buf.rows[j]];
      target = { task: 'classification', codes, weights: weights! };
      if (missingRows.length) {
        const t = new Float64Array(y.classes.length);
        for (const i of missingRows) t[y.codes[i]] += weights![y.codes[i]];
        let best = 0;
        for (let k = 1; k < t.length; k++) if (t[k] > t[best]) best = k;
        missingPrediction = best;
      }
    } else {
      const values = buf.values.subarray(0, m);
      for (let j = 0; j < m; j++) values[j] = y.values[buf.rows[j]];
      target = { task: 'regression', values };
      if (missingRows.length) missingPrediction = missingRows.reduce((s, i) => s + y.values[i], 0) / missingRows.length;
    }
    const minLeaf = Math.max(1, Math.min(5, Math.floor(m / 10)));
    const tree = fitOneFeatureTree(xs, target, { maxDepth: TREE_DEPTH[y.task], minLeaf }, missingPrediction);
    for (const i of fold.test) {
      rows[at] = i;
      predicted[at++] = predictOneFeatureTree(tree, f.values[i]);
    }
  }
  return { rows, predicted };
}

/** The out-of-fold score of one feature. */
export function scoreFeature(f: FeatureData, y: Target, setups: readonly FoldSetup[]): FeatureScore {
  const { rows, predicted } = outOfFold(f, y, setups);
  const model = f.kind === 'numeric' ? 'one-feature-tree' : 'level-table';
  if (y.task === 'classification') {
    const actual = new Int32Array(rows.length);
    for (let j = 0; j < rows.length; j++) actual[j] = y.codes[rows[j]];
    const { score, skill } = balancedAccuracy(actual, predicted, y.classes.length);
    return { feature: f.name, model, score, skill };
  }
  const actual = new Float64Array(rows.length);
  for (let j = 0; j < rows.length; j++) actual[j] = y.values[rows[j]];
  const r2 = rSquared(actual, predicted);
  return { feature: f.name, model, score: r2, skill: r2 };
}

/** Scores of every feature over the folds of repeat 0 of `folds` (given by the caller). */
export function singleFeatureScores(problem: Problem, features: readonly FeatureData[], folds: readonly Fold[], planText: string): SingleFeatureScores {
  const setups = foldSetups(problem.target, folds.filter((f) => f.repeat === 0), problem.rows.length);
  return {
    plan: planText,
    metric: problem.task === 'classification' ? 'balanced-accuracy' : 'r2',
    scores: features.map((f) => scoreFeature(f, problem.target, setups)),
  };
}
