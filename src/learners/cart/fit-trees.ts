/**
 * Fitting a tree or a forest: input checks, binning, bootstrap samples and the per-tree loop.
 *
 * Forest (Breiman 2001, "Random Forests", Machine Learning 45:5-32, free:
 * https://www.stat.berkeley.edu/~breiman/randomforest2001.pdf): tree t is grown on a bootstrap
 * sample (n draws with replacement from the n training rows, or the `sample` size; kept as
 * per-row draw counts) with a
 * fresh feature draw at every node. Tree t's generator is createRng(deriveSeed(seed, "forest",
 * "tree", t)), so a tree depends only on the fit's seed and its index: not on the order trees
 * are grown in, and the first k trees of a forest of T trees equal the forest of k trees.
 * Tree: one CART tree on all rows with weight 1 and all features at every node; it uses no
 * randomness at all.
 *
 * Features must be finite (NaN or infinite values throw InputError: impute first); at
 * prediction time a NaN goes to the left child. Regression targets are centred on their mean
 * for the split sums; a leaf's value is the weighted mean of the targets as given (exactly the
 * target in a pure leaf).
 */
import { InputError } from '../../errors.js';
import { type Rng, createRng, deriveSeed } from '../../rng.js';
import type { FitContext, Matrix, Target } from '../../learning.js';
import { type BinnedMatrix, binMatrix, codeOf, codeRows } from './bins.js';
import { resolveFeatureCount } from './feature-count.js';
import { resolveSampleSize } from './sample-size.js';
import { classWeights } from '../class-balance.js';
import { type CartKind, type FlatForestParts, addTreeLeavesOnCodes, finishForest } from './flat-forest.js';
import { type Impurity, type GrowTarget, TreeGrower } from './grow.js';
import { NODE_BYTES, NodeStore } from './node-store.js';
import { formatBytes, memoryBudget, modelTooLarge } from '../memory-budget.js';

export interface CartSettings {
  readonly trees: number;
  readonly depth: number;
  readonly minLeaf: number;
  /** canonical `features` value (see feature-count.ts) */
  readonly features: string;
  readonly impurity: 'gini' | 'entropy';
  readonly bins: number;
  readonly bootstrap: boolean;
  /** canonical `sample` value (see sample-size.ts); forest only */
  readonly sample?: string;
  /** `rebalance` (see ../class-balance.ts); none when absent */
  readonly rebalance?: string;
}

/** Checks X and y agree and are usable; returns the classification class count (1 for regression). */
export function checkTrainingData(kind: CartKind, X: Matrix, y: Target): number {
  const { rows: n, cols: p } = X;
  // a matrix made on demand (X.column) is not built here: its columns are read one at a time
  const length = X.column ? n * p : X.data.length;
  if (!Number.isInteger(n) || !Number.isInteger(p) || n < 0 || p < 0 || length !== n * p) {
    throw new InputError(`${kind}: matrix data length ${length} is not rows x cols = ${n} x ${p}`);
  }
  if (n < 1) throw new InputError(`${kind}: no training rows`);
  if (y.task === 'classification') {
    const C = y.classes.length;
    if (C < 1) throw new InputError(`${kind}: the target has no classes`);
    if (y.codes.length !== n) throw new InputError(`${kind}: ${y.codes.length} target codes for ${n} rows`);
    for (let i = 0; i < n; i++) {
      const c = y.codes[i];
      if (c < 0 || c >= C) throw new InputError(`${kind}: target code ${c} of row ${i + 1} is outside 0..${C - 1}`);
    }
    return C;
  }
  if (y.values.length !== n) throw new InputError(`${kind}: ${y.values.length} target values for ${n} rows`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y.values[i])) throw new InputError(`${kind}: target value of row ${i + 1} is ${y.values[i]}; it must be finite`);
  }
  return 1;
}

function tooLarge(kind: CartKind, trees: number, need: string, budget: number): InputError {
  return modelTooLarge(`${kind}: trees=${trees}`, `${need} for the trees alone`, budget, 'ask for fewer trees');
}

interface Grown {
  readonly classCount: number;
  readonly settings: Map<string, number | string>;
  readonly store: NodeStore;
}

/**
 * The per-tree loop shared by fitCart and fitCartOnFold: grows the trees in order into one
 * NodeStore and calls `afterTree(store, t)` after tree t. With `oneAtATime` the caller clears the
 * store after reading each tree, so only the "at least one leaf per tree" check of the whole
 * forest's memory applies to the model kept, and none to this loop.
 */
function growTrees(
  kind: CartKind,
  X: Matrix,
  y: Target,
  s: CartSettings,
  ctx: FitContext,
  oneAtATime: boolean,
  afterTree?: (store: NodeStore, t: number, binned: BinnedMatrix) => void,
): Grown {
  const classCount = checkTrainingData(kind, X, y);
  const n = X.rows;
  const p = X.cols;
  const binned = binMatrix(X, s.bins, kind);
  const mtry = resolveFeatureCount(s.features, p, y.task);
  const impurity: Impurity = y.task === 'regression' ? 'variance' : s.impurity;

  let target: GrowTarget;
  if (y.task === 'classification') {
    target = { kind: 'classes', codes: y.codes, classCount };
  } else {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += y.values[i];
    mean /= n;
    const centred = new Float64Array(n);
    for (let i = 0; i < n; i++) centred[i] = y.values[i] - mean;
    target = { kind: 'values', values: centred, raw: y.values };
  }
  const grower = new TreeGrower(binned, target, { maxDepth: s.depth, minLeaf: s.minLeaf, mtry, impurity });

  const rebalance = s.rebalance ?? 'none';
  const cw = classWeights(kind, rebalance, y.task === 'classification' ? y.codes : null, classCount);
  const draws = s.bootstrap ? resolveSampleSize(s.sample ?? '1', n) : n;
  // memory: every tree holds at least its root leaf; after the first tree the forest's arrays are
  // sized from it (NodeStore.expect), so both estimates are checked before that memory is taken
  const budget = memoryBudget();
  const leafBytes = classCount * 8;
  const atLeast = s.trees * (NODE_BYTES + leafBytes);
  if (!oneAtATime && atLeast > budget) throw tooLarge(kind, s.trees, `at least ${formatBytes(atLeast)} (one leaf per tree)`, budget);
  const store = new NodeStore(p);
  const weights = new Float64Array(n);
  const rows = new Int32Array(n);
  for (let t = 0; t < s.trees; t++) {
    let rng: Rng = ctx.rng;
    let m = n;
    if (s.bootstrap) {
      rng = createRng(deriveSeed(ctx.seed, 'forest', 'tree', t));
      weights.fill(0);
      for (let i = 0; i < draws; i++) weights[rng.int(n)] += 1;
      m = 0;
      for (let i = 0; i < n; i++) if (weights[i] > 0) rows[m++] = i;
    } else {
      weights.fill(1);
      for (let i = 0; i < n; i++) rows[i] = i;
    }
    if (cw && y.task === 'classification') for (let k = 0; k < m; k++) weights[rows[k]] *= cw[y.codes[rows[k]]];
    grower.grow(rows.subarray(0, m), weights, rng, store);
    if (!oneAtATime && t === 0 && s.trees > 1) {
      const estimate = s.trees * store.bytes();
      if (estimate > budget) throw tooLarge(kind, s.trees, `about ${formatBytes(estimate)} (${s.trees} trees the size of the first, ${store.count} nodes)`, budget);
      store.expect(s.trees - 1);
    }
    afterTree?.(store, t, binned);
  }

  const settings = new Map<string, number | string>([
    ['trees', s.trees],
    ['depth', s.depth],
    ['min-leaf', s.minLeaf],
    ['features', s.features],
    ['featuresPerSplit', mtry],
    ['impurity', impurity],
    ['bins', s.bins],
  ]);
  if (rebalance !== 'none') settings.set('rebalance', rebalance);
  if (s.bootstrap) {
    settings.set('sample', s.sample ?? '1');
    settings.set('drawsPerTree', draws);
  }
  return { classCount, settings, store };
}

export function fitCart(kind: CartKind, X: Matrix, y: Target, s: CartSettings, ctx: FitContext): FlatForestParts {
  const { classCount, settings, store } = growTrees(kind, X, y, s, ctx, false);
  return finishForest(kind, y.task, classCount, settings, store);
}

/** What fitCartOnFold leaves: the test rows' mean leaf outputs and the size of the largest tree. */
export interface FoldOutputs {
  readonly task: Target['task'];
  readonly classCount: number;
  /** classification: row-major rows x classes probabilities; regression: one value per row */
  readonly outputs: Float64Array;
  /** nodes of the largest tree, the most the store held at once */
  readonly largestTree: number;
  /** nodes the store had room for at the end (its arrays grow by doubling as a tree needs) */
  readonly nodeRoom: number;
}

/**
 * Grows the same trees as fitCart and adds each tree's leaf outputs for the rows of `test` as soon
 * as it is grown, then forgets the tree: memory holds one tree, not the forest. The outputs are
 * divided by the tree count at the end, as probaPrefix and predictPrefixOf divide the sums, and
 * each sum adds the trees in the same order, so the result is bit for bit what the fitted
 * forest predicts for `test`.
 */
export function fitCartOnFold(kind: CartKind, X: Matrix, y: Target, s: CartSettings, ctx: FitContext, test: Matrix): FoldOutputs {
  if (test.cols !== X.cols) throw new InputError(`${kind}: the test rows have ${test.cols} features, the training rows ${X.cols}`);
  const width = y.task === 'classification' ? y.classes.length : 1;
  const outputs = new Float64Array(test.rows * width);
  let largestTree = 0;
  // the test rows are coded once under the training cuts (not rebuilt as raw rows per tree)
  let testCodes: Uint8Array | undefined;
  let bins = new Int32Array(0);
  const { classCount, store } = growTrees(kind, X, y, s, ctx, true, (store, _t, binned) => {
    largestTree = Math.max(largestTree, store.count);
    testCodes ??= codeRows(test, binned.cuts);
    if (bins.length < store.count) bins = new Int32Array(Math.max(store.count, 2 * bins.length));
    // a split's bin: its threshold is cuts[f][k], and codeOf counts the k cuts strictly below it
    for (let k = 0; k < store.count; k++) {
      const f = store.feature[k];
      if (f >= 0) bins[k] = codeOf(binned.cuts[f], store.threshold[k]);
    }
    addTreeLeavesOnCodes(store, store.roots[0], bins, testCodes, test.rows, test.cols, width, outputs);
    store.clear();
  });
  for (let i = 0; i < outputs.length; i++) outputs[i] /= s.trees;
  return { task: y.task, classCount, outputs, largestTree, nodeRoom: store.feature.length };
}
