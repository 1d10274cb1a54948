/**
 * A fitted set of trees in flat typed arrays, shared by the `tree` and `forest` learners.
 *
 * All trees' nodes live in one set of arrays; tree t's nodes are roots[t] .. roots[t+1]-1 and
 * every child index is larger than its parent's, which makes a loaded model safe to walk.
 * A row goes to the left child when !(x > threshold): values at or below the threshold, and
 * NaN, go left. A leaf holds classCount class frequencies (classification) or one value
 * (regression). The forest's output is the mean over trees of the leaf outputs: mean class
 * frequencies as probabilities (the predicted class is the most probable one, the lowest code
 * on a tie), the mean leaf value for regression (Breiman 2001, sec. 2 and 11).
 *
 * JSON form (plain numbers only, so JSON.stringify / JSON.parse give back an equal model):
 *   { format: "foldwise-cart", version: 1, kind, task, classCount, featureCount, settings,
 *     roots, feature, threshold, left, right, offset, values, importance }
 */
import { InputError, UsageError } from '../../errors.js';
import { type Matrix, matrixBlock, type Task } from '../../learning.js';
import { NodeStore } from './node-store.js';

export const FORMAT = 'foldwise-cart';
export const FORMAT_VERSION = 1;

export type CartKind = 'forest' | 'tree';

export interface FlatForestParts {
  readonly kind: CartKind;
  readonly task: Task;
  readonly classCount: number;
  readonly featureCount: number;
  /** resolved settings, kept for reports (numbers and strings only) */
  readonly settings: ReadonlyMap<string, number | string>;
  readonly roots: Int32Array;
  readonly feature: Int32Array;
  readonly threshold: Float64Array;
  readonly left: Int32Array;
  readonly right: Int32Array;
  readonly offset: Int32Array;
  readonly values: Float64Array;
  readonly importance: Float64Array;
}

/** The finished flat forest from a NodeStore; importance = mean over trees, scaled to sum 1. */
export function finishForest(
  kind: CartKind,
  task: Task,
  classCount: number,
  settings: ReadonlyMap<string, number | string>,
  store: NodeStore,
): FlatForestParts {
  const n = store.count;
  const importance = store.importance.slice();
  let sum = 0;
  for (let j = 0; j < importance.length; j++) sum += importance[j];
  if (sum > 0) for (let j = 0; j < importance.length; j++) importance[j] /= sum;
  return {
    kind,
    task,
    classCount,
    featureCount: importance.length,
    settings,
    roots: Int32Array.from(store.roots),
    feature: NodeStore.used(store.feature, n),
    threshold: NodeStore.used(store.threshold, n),
    left: NodeStore.used(store.left, n),
    right: NodeStore.used(store.right, n),
    offset: NodeStore.used(store.offset, n),
    values: NodeStore.used(store.values, store.valueCount),
    importance,
  };
}

function checkMatrix(parts: FlatForestParts, X: Matrix): void {
  // a matrix made on demand (X.block) is read in blocks of rows, never built whole
  const length = X.block ? X.rows * X.cols : X.data.length;
  if (!Number.isInteger(X.rows) || !Number.isInteger(X.cols) || X.rows < 0 || length !== X.rows * X.cols) {
    throw new InputError(`${parts.kind}: matrix data length ${length} is not rows x cols = ${X.rows} x ${X.cols}`);
  }
  if (X.cols !== parts.featureCount) {
    throw new InputError(`${parts.kind}: model was fitted on ${parts.featureCount} features, got ${X.cols}`);
  }
}

function checkTreeCount(parts: FlatForestParts, trees: number): void {
  const T = parts.roots.length;
  if (!Number.isInteger(trees) || trees < 1 || trees > T) {
    throw new UsageError(`${parts.kind}: tree count must be an integer between 1 and ${T}, got ${trees}`);
  }
}

/** Rows per block of the prediction: 8192 x 20 doubles is 1.3 MB, beside the trees in cache. */
const PREDICT_BLOCK = 8192;

/**
 * Sum over the first `trees` trees of the leaf outputs, row-major rows x width. The rows are
 * taken in blocks (matrixBlock), every tree over a block before the next block; each output
 * still adds the trees in order 0, 1, ..., so the sums are those of one pass per tree.
 */
function sumLeaves(parts: FlatForestParts, X: Matrix, trees: number, width: number): Float64Array {
  const { roots, feature, threshold, left, right, offset, values } = parts;
  const n = X.rows;
  const p = X.cols;
  const out = new Float64Array(n * width);
  for (let start = 0; start < n; start += PREDICT_BLOCK) {
    const end = Math.min(n, start + PREDICT_BLOCK);
    const x = matrixBlock(X, start, end);
    for (let t = 0; t < trees; t++) {
      const root = roots[t];
      for (let i = start; i < end; i++) {
        const base = (i - start) * p;
        let node = root;
        let f = feature[node];
        while (f >= 0) {
          node = x[base + f] > threshold[node] ? right[node] : left[node];
          f = feature[node];
        }
        const o = offset[node];
        if (width === 1) out[i] += values[o];
        else for (let k = 0; k < width; k++) out[i * width + k] += values[o + k];
      }
    }
  }
  return out;
}

/** The arrays of stored trees that a prediction reads: a finished forest's parts or a NodeStore. */
export type TreeArrays = Pick<FlatForestParts, 'feature' | 'threshold' | 'left' | 'right' | 'offset' | 'values'>;

/**
 * Adds one tree's leaf outputs for every row to `out` (row-major rows x width), reading the rows
 * as codes under the training cuts (bins.ts codeRows, row-major rows x cols) and each split as its
 * bin: node k sends a row right when its code exceeds `bins[k]`, where the stored threshold is
 * cuts[feature][bins[k]]. That is the comparison x > threshold exactly (codeRows), so for trees
 * 0, 1, ... in turn each output adds the same leaf values in the same order as sumLeaves: the
 * sums are bit for bit the same, without rebuilding the raw rows for every tree.
 */
export function addTreeLeavesOnCodes(nodes: TreeArrays, root: number, bins: Int32Array, codes: Uint8Array, rows: number, cols: number, width: number, out: Float64Array): void {
  const { feature, left, right, offset, values } = nodes;
  for (let i = 0; i < rows; i++) {
    const base = i * cols;
    let node = root;
    let f = feature[node];
    while (f >= 0) {
      node = codes[base + f] > bins[node] ? right[node] : left[node];
      f = feature[node];
    }
    const o = offset[node];
    if (width === 1) out[i] += values[o];
    else for (let k = 0; k < width; k++) out[i * width + k] += values[o + k];
  }
}

/** The most probable class of each row of row-major rows x C probabilities (lowest code on a tie). */
export function mostProbable(probs: Float64Array, rows: number, C: number): Int32Array {
  const codes = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    let bestK = 0;
    let bestP = -1;
    for (let k = 0; k < C; k++) {
      const v = probs[i * C + k];
      if (v > bestP) {
        bestP = v;
        bestK = k;
      }
    }
    codes[i] = bestK;
  }
  return codes;
}

/** Class probabilities from the first `trees` trees (classification). */
export function probaPrefix(parts: FlatForestParts, X: Matrix, trees: number): Float64Array {
  checkMatrix(parts, X);
  checkTreeCount(parts, trees);
  const out = sumLeaves(parts, X, trees, parts.classCount);
  for (let i = 0; i < out.length; i++) out[i] /= trees;
  return out;
}

/** Predicted class codes (classification) or values (regression) from the first `trees` trees. */
export function predictPrefixOf(parts: FlatForestParts, X: Matrix, trees: number): Int32Array | Float64Array {
  if (parts.task === 'regression') {
    checkMatrix(parts, X);
    checkTreeCount(parts, trees);
    const out = sumLeaves(parts, X, trees, 1);
    for (let i = 0; i < out.length; i++) out[i] /= trees;
    return out;
  }
  return mostProbable(probaPrefix(parts, X, trees), X.rows, parts.classCount);
}

export function partsToJSON(parts: FlatForestParts): Record<string, unknown> {
  return {
    format: FORMAT,
    version: FORMAT_VERSION,
    kind: parts.kind,
    task: parts.task,
    classCount: parts.classCount,
    featureCount: parts.featureCount,
    settings: [...parts.settings].map(([k, v]) => [k, v]),
    roots: Array.from(parts.roots),
    feature: Array.from(parts.feature),
    threshold: Array.from(parts.threshold),
    left: Array.from(parts.left),
    right: Array.from(parts.right),
    offset: Array.from(parts.offset),
    values: Array.from(parts.values),
    importance: Array.from(parts.importance),
  };
}

/** Checks a model's JSON form and rebuilds it; throws InputError on anything malformed. */
export function partsFromJSON(json: unknown, kind: CartKind): FlatForestParts {
  const bad = (why: string): InputError => new InputError(`${kind}: not a ${kind} model: ${why}`);
  if (typeof json !== 'object' || json === null || Array.isArray(json)) throw bad('expected an object');
  const o = json as Record<string, unknown>;
  const field = (name: string): unknown => (Object.prototype.hasOwnProperty.call(o, name) ? o[name] : undefined);
  if (field('format') !== FORMAT) throw bad(`format must be "${FORMAT}"`);
  if (field('version') !== FORMAT_VERSION) throw bad(`version must be ${FORMAT_VERSION}`);
  if (field('kind') !== kind) throw bad(`kind must be "${kind}", got ${JSON.stringify(field('kind'))}`);
  const task = field('task');
  if (task !== 'classification' && task !== 'regression') throw bad('task must be classification or regression');
  const int = (name: string, min: number): number => {
    const v = field(name);
    if (typeof v !== 'number' || !Number.isInteger(v) || v < min) throw bad(`${name} must be an integer >= ${min}`);
    return v;
  };
  const classCount = int('classCount', 1);
  const featureCount = int('featureCount', 0);
  if (task === 'regression' && classCount !== 1) throw bad('classCount must be 1 for regression');
  const ints = (name: string): Int32Array => {
    const v = field(name);
    if (!Array.isArray(v)) throw bad(`${name} must be an array`);
    const a = new Int32Array(v.length);
    for (let i = 0; i < v.length; i++) {
      const e: unknown = v[i];
      if (typeof e !== 'number' || !Number.isInteger(e) || e < -1 || e > 0x7fffffff) throw bad(`${name}[${i}] must be an integer >= -1`);
      a[i] = e;
    }
    return a;
  };
  const doubles = (name: string): Float64Array => {
    const v = field(name);
    if (!Array.isArray(v)) throw bad(`${name} must be an array`);
    const a = new Float64Array(v.length);
    for (let i = 0; i < v.length; i++) {
      const e: unknown = v[i];
      if (typeof e !== 'number' || Number.isNaN(e)) throw bad(`${name}[${i}] must be a number`);
      a[i] = e;
    }
    return a;
  };
  const roots = ints('roots');
  const feature = ints('feature');
  const threshold = doubles('threshold');
  const left = ints('left');
  const right = ints('right');
  const offset = ints('offset');
  const values = doubles('values');
  const importance = doubles('importance');
  const n = feature.length;
  if (threshold.length !== n || left.length !== n || right.length !== n || offset.length !== n) {
    throw bad('feature, threshold, left, right and offset must have equal lengths');
  }
  if (roots.length < 1) throw bad('roots must list at least one tree');
  if (kind === 'tree' && roots.length !== 1) throw bad('a tree model has exactly one root');
  if (importance.length !== featureCount) throw bad('importance must have featureCount entries');
  for (let t = 0; t < roots.length; t++) {
    const lo = roots[t];
    const hi = t + 1 < roots.length ? roots[t + 1] : n;
    if (t === 0 && lo !== 0) throw bad('roots[0] must be 0');
    // hi > lo for every tree makes roots strictly ascending and each tree non-empty
    if (!(hi > lo)) throw bad('roots must be strictly ascending, each tree with at least one node');
    for (let i = lo; i < hi; i++) {
      if (feature[i] >= 0) {
        if (feature[i] >= featureCount) throw bad(`feature[${i}] is out of range`);
        if (!(left[i] > i && left[i] < hi && right[i] > i && right[i] < hi)) {
          throw bad(`children of node ${i} must lie after it within its tree`);
        }
      } else if (offset[i] < 0 || offset[i] + classCount > values.length) {
        throw bad(`offset of leaf ${i} is out of range`);
      }
    }
  }
  const rawSettings = field('settings');
  const settings = new Map<string, number | string>();
  if (Array.isArray(rawSettings)) {
    for (const pair of rawSettings) {
      if (Array.isArray(pair) && pair.length === 2 && typeof pair[0] === 'string' && (typeof pair[1] === 'number' || typeof pair[1] === 'string')) {
        settings.set(pair[0], pair[1]);
      } else throw bad('settings must be a list of [name, value] pairs');
    }
  } else if (rawSettings !== undefined) throw bad('settings must be a list of [name, value] pairs');
  return { kind, task, classCount, featureCount, settings, roots, feature, threshold, left, right, offset, values, importance };
}
