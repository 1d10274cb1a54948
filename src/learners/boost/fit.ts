/**
 * The boosting loop: gradient boosting as in Friedman (2001), "Greedy function approximation: a
 * gradient boosting machine", Ann. Statist. 29(5):1189-1232 (Algorithm 1; Algorithm 6 for K
 * classes), with trees grown on the second-order gain of Chen & Guestrin (2016), "XGBoost: a
 * scalable tree boosting system", KDD (free: https://arxiv.org/abs/1603.02754).
 *
 *   F_0 = base score (loss.ts)
 *   for round t = 1..rounds:
 *     draw rows (row-share < 1, without replacement) and features (feature-share < 1)
 *     for each score column k (one, or one per class for softmax; all classes' derivatives are
 *     taken at F_{t-1}):
 *       g, h = derivatives of the loss at F_{t-1}; grow a tree on them (grow.ts)
 *       leaf value = step * (-G / (H + ridge)), or step * Friedman's line search (absolute, huber)
 *       F_t[., k] = F_{t-1}[., k] + the tree's value for every training row
 *
 * Randomness: round t draws from createRng(deriveSeed(seed, "boost", "round", t)), so a round
 * depends only on the fit's seed, its index and the rounds before it: the first r rounds of a
 * fit of R rounds are exactly the fit of r rounds (the prefix rule tune relies on). With
 * row-share and feature-share 1 no generator is made at all.
 *
 * With `watch`, the loop also keeps scores of held-out rows (walked through each new tree on
 * their raw values) and records the mean loss after every round; it stops once `patience`
 * rounds in a row have not lowered the best loss, and reports the best round (0 = base score).
 */
import { InputError } from '../../errors.js';
import { createRng, deriveSeed } from '../../rng.js';
import { binMatrix } from '../cart/bins.js';
import { type FlatForestParts } from '../cart/flat-forest.js';
import { NODE_BYTES, NodeStore } from '../cart/node-store.js';
import { formatBytes, memoryBudget, modelTooLarge } from '../memory-budget.js';
import type { Matrix, Target } from '../../learning.js';
import { BoostGrower } from './grow.js';
import { leafValue } from './histogram.js';
import { type LossName, baseScore, fillDerivatives, leafLineSearch, lossFor, meanLoss, quantile, softmaxRow } from './loss.js';
import type { BoostParts } from './model.js';
import type { BoostSettings } from './params.js';

export interface Watch {
  readonly X: Matrix;
  readonly y: Target;
  readonly patience: number;
}

export interface BoostFit {
  readonly parts: BoostParts;
  /** with a watch: the round of the lowest held-out loss, and the rounds actually run */
  readonly bestRound?: number;
  readonly roundsRun?: number;
}

/** Checks X and y agree and are usable. */
export function checkBoostData(X: Matrix, y: Target): void {
  const { rows: n, cols: p, data } = X;
  if (!Number.isInteger(n) || !Number.isInteger(p) || n < 0 || p < 0 || data.length !== n * p) {
    throw new InputError(`boost: matrix data length ${data.length} is not rows x cols = ${n} x ${p}`);
  }
  if (n < 1) throw new InputError('boost: no training rows');
  if (y.task === 'classification') {
    const C = y.classes.length;
    if (C < 1) throw new InputError('boost: the target has no classes');
    if (y.codes.length !== n) throw new InputError(`boost: ${y.codes.length} target codes for ${n} rows`);
    for (let i = 0; i < n; i++) {
      const c = y.codes[i];
      if (c < 0 || c >= C) throw new InputError(`boost: target code ${c} of row ${i + 1} is outside 0..${C - 1}`);
    }
    return;
  }
  if (y.values.length !== n) throw new InputError(`boost: ${y.values.length} target values for ${n} rows`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y.values[i])) throw new InputError(`boost: target value of row ${i + 1} is ${y.values[i]}; it must be finite`);
  }
}

/** k distinct indices of 0..n-1 drawn uniformly (partial Fisher-Yates), ascending. */
function draw(n: number, k: number, rng: { int(n: number): number }, scratch: Int32Array): Int32Array {
  for (let i = 0; i < n; i++) scratch[i] = i;
  for (let i = 0; i < k; i++) {
    const j = i + rng.int(n - i);
    const t = scratch[i];
    scratch[i] = scratch[j];
    scratch[j] = t;
  }
  return scratch.slice(0, k).sort();
}

const atLeastOne = (share: number, n: number) => Math.min(n, Math.max(1, Math.floor(share * n + 1e-9)));

/** Adds a tree's values (column k) to F for the rows of X, walking raw values. */
function addTree(t: { feature: Int32Array; threshold: Float64Array; left: Int32Array; right: Int32Array; offset: Int32Array; values: Float64Array }, root: number, X: Matrix, F: Float64Array, w: number, k: number): void {
  const { feature, threshold, left, right, offset, values } = t;
  const p = X.cols;
  const x = X.data;
  for (let i = 0; i < X.rows; i++) {
    const b = i * p;
    let node = root;
    let f = feature[node];
    while (f >= 0) {
      node = x[b + f] > threshold[node] ? right[node] : left[node];
      f = feature[node];
    }
    F[i * w + k] += values[offset[node] + k];
  }
}

export function fitBoost(X: Matrix, y: Target, s: BoostSettings, seed: number, watch?: Watch): BoostFit {
  checkBoostData(X, y);
  const n = X.rows;
  const p = X.cols;
  const { loss, width: w } = lossFor(y, s.loss);
  const classCount = y.task === 'classification' ? y.classes.length : 1;
  const all = Int32Array.from({ length: n }, (_, i) => i);
  const base = baseScore(loss, y, all);
  const F = new Float64Array(n * w);
  for (let i = 0; i < n; i++) for (let k = 0; k < w; k++) F[i * w + k] = base[k];
  const gain = new Float64Array(p);
  const settings = new Map<string, number | string>([
    ['rounds', s.rounds],
    ['step', s.step],
    ['depth', s.depth],
    ['leaves', s.leaves],
    ['leaf-rows', s.leafRows],
    ['leaf-hessian', s.leafHessian],
    ['ridge', s.ridge],
    ['row-share', s.rowShare],
    ['feature-share', s.featureShare],
    ['bins', s.bins],
    ['loss', loss],
  ]);
  if (loss === 'huber') settings.set('huber-quantile', s.huberQuantile);
  const finish = (rounds: number, trees: FlatForestParts | undefined, g: Float64Array, notes: Map<string, number>): BoostParts => ({
    task: y.task,
    loss,
    classCount,
    width: w,
    rounds,
    featureCount: p,
    base,
    gain: g,
    settings,
    notes,
    trees,
  });
  if (s.rounds === 0 && !watch) return { parts: finish(0, undefined, gain, new Map()) };

  // memory: every round adds w trees, each of at least one leaf of w values; after the first
  // round the arrays are sized from it (NodeStore.expect), so both estimates come first
  const budget = memoryBudget();
  const atLeast = s.rounds * w * (NODE_BYTES + w * 8);
  if (atLeast > budget) throw tooManyRounds(s.rounds, `at least ${formatBytes(atLeast)} (one leaf per tree, ${w} tree${w === 1 ? '' : 's'} a round)`, budget);
  const binned = binMatrix(X, s.bins, 'boost');
  const grower = new BoostGrower(binned, { depth: s.depth, leaves: s.leaves, leafRows: s.leafRows, leafHessian: s.leafHessian, ridge: s.ridge }, y.task === 'regression');
  const store = new NodeStore(p);
  const g = new Float64Array(n);
  const h = new Float64Array(n);
  const probs = loss === 'softmax' ? new Float64Array(n * w) : undefined;
  const res = loss === 'absolute' || loss === 'huber' ? new Float64Array(n) : undefined;
  const allFeatures = Int32Array.from({ length: p }, (_, j) => j);
  const scratch = new Int32Array(Math.max(n, p));
  const sampleRows = s.rowShare < 1 ? atLeastOne(s.rowShare, n) : n;
  const sampleFeatures = s.featureShare < 1 ? atLeastOne(s.featureShare, p) : p;

  // held-out scores and losses, for early stopping
  const Fv = watch ? new Float64Array(watch.X.rows * w) : undefined;
  const validRows = watch ? Int32Array.from({ length: watch.X.rows }, (_, i) => i) : undefined;
  let watchDelta = 0;
  if (watch && loss === 'huber') {
    for (let i = 0; i < n; i++) res![i] = Math.abs((y as { values: Float64Array }).values[i] - F[i]);
    watchDelta = quantile(res!, n, s.huberQuantile);
  }
  if (Fv) for (let i = 0; i < watch!.X.rows; i++) for (let k = 0; k < w; k++) Fv[i * w + k] = base[k];
  let bestLoss = watch ? meanLoss(loss, watch.y, Fv!, w, validRows!, watchDelta) : Infinity;
  let bestRound = 0;
  let bestGain = gain.slice();
  let roundsRun = 0;

  for (let t = 0; t < s.rounds; t++) {
    const rng = sampleRows < n || sampleFeatures < p ? createRng(deriveSeed(seed, 'boost', 'round', t)) : undefined;
    const sample = sampleRows < n ? draw(n, sampleRows, rng!, scratch) : all;
    const features = sampleFeatures < p ? draw(p, sampleFeatures, rng!, scratch) : allFeatures;
    if (probs) for (let r = 0; r < sample.length; r++) softmaxRow(F, sample[r] * w, w, probs, sample[r] * w);
    let delta = 0;
    if (loss === 'huber') {
      const yv = (y as { values: Float64Array }).values;
      for (let r = 0; r < sample.length; r++) res![r] = Math.abs(yv[sample[r]] - F[sample[r]]);
      delta = quantile(res!, sample.length, s.huberQuantile);
    }
    for (let k = 0; k < w; k++) {
      fillDerivatives(loss, y, F, w, k, sample, g, h, probs, delta);
      const root = store.count;
      const leaves = grower.grow(sample, features, g, h, store, w, gain);
      const rows = grower.rows;
      for (const leaf of leaves) {
        let v: number;
        if (res) {
          const yv = (y as { values: Float64Array }).values;
          const m = leaf.end - leaf.start;
          for (let q = 0; q < m; q++) {
            const i = rows[leaf.start + q];
            res[q] = yv[i] - F[i];
          }
          v = leafLineSearch(loss as 'absolute' | 'huber', res, m, delta);
        } else v = leafValue(leaf.G, leaf.H, s.ridge);
        const o = store.offset[leaf.node];
        for (let q = 0; q < w; q++) store.values[o + q] = 0;
        store.values[o + k] = s.step * v;
      }
      if (sample === all) {
        // every training row sits in exactly one leaf segment
        for (const leaf of leaves) {
          const v = store.values[store.offset[leaf.node] + k];
          for (let q = leaf.start; q < leaf.end; q++) F[rows[q] * w + k] += v;
        }
      } else addTree(store, root, X, F, w, k);
      if (Fv) addTree(store, root, watch!.X, Fv, w, k);
    }
    if (t === 0 && s.rounds > 1) {
      const estimate = s.rounds * store.bytes();
      if (estimate > budget) throw tooManyRounds(s.rounds, `about ${formatBytes(estimate)} (${s.rounds} rounds the size of the first, ${store.count} nodes)`, budget);
      store.expect((s.rounds - 1) * w);
    }
    roundsRun = t + 1;
    if (watch) {
      const l = meanLoss(loss, watch.y, Fv!, w, validRows!, watchDelta);
      if (l < bestLoss) {
        bestLoss = l;
        bestRound = t + 1;
        bestGain = gain.slice();
      } else if (t + 1 - bestRound >= watch.patience) break;
    }
  }
  const keep = watch ? bestRound : s.rounds;
  const treeCount = keep * w;
  const nodeEnd = treeCount < store.roots.length ? store.roots[treeCount] : store.count;
  let valueEnd = 0;
  for (let i = 0; i < nodeEnd; i++) if (store.feature[i] < 0) valueEnd = Math.max(valueEnd, store.offset[i] + w);
  const trees: FlatForestParts | undefined =
    treeCount === 0
      ? undefined
      : {
          kind: 'forest',
          task: y.task,
          classCount: w,
          featureCount: p,
          settings: new Map(),
          roots: Int32Array.from(store.roots.slice(0, treeCount)),
          feature: store.feature.slice(0, nodeEnd),
          threshold: store.threshold.slice(0, nodeEnd),
          left: store.left.slice(0, nodeEnd),
          right: store.right.slice(0, nodeEnd),
          offset: store.offset.slice(0, nodeEnd),
          values: store.values.slice(0, valueEnd),
          importance: watch ? bestGain : gain,
        };
  const parts = finish(keep, trees, watch ? bestGain : gain, new Map());
  return watch ? { parts, bestRound, roundsRun } : { parts };
}

export type { LossName };

function tooManyRounds(rounds: number, need: string, budget: number): InputError {
  return modelTooLarge(`boost: rounds=${rounds}`, `${need} for the trees alone`, budget, 'ask for fewer rounds (or a smaller depth or leaves)');
}
