/**
 * The Model object of the `tree` and `forest` learners, over a FlatForestParts.
 *
 * Besides the Learner interface's predict / probabilities / toJSON it offers:
 *   importance()                  mean decrease in impurity per feature, summing to 1 (all zeros
 *                                 when no tree has a split)
 *   predictPrefix(X, k)           predictions from the first k trees only (1 <= k <= treeCount)
 *   probabilitiesPrefix(X, k)      probabilities from the first k trees (classification)
 * so that a grid over tree counts can be scored from prefixes of one fitted forest: the first k
 * trees of a forest of T trees are exactly the forest of k trees with the same seed, since every
 * tree has its own generator (see forest.ts).
 * A regression model has no probabilities / probabilitiesPrefix property at all.
 */
import type { Matrix, Model, Task } from '../../learning.js';
import { type CartKind, type FlatForestParts, partsToJSON, predictPrefixOf, probaPrefix } from './flat-forest.js';

export interface CartModel extends Model {
  readonly kind: CartKind;
  readonly task: Task;
  readonly treeCount: number;
  readonly featureCount: number;
  readonly classCount: number;
  /** resolved settings the model was fitted with */
  readonly settings: ReadonlyMap<string, number | string>;
  predict(X: Matrix): Int32Array | Float64Array;
  probabilities?(X: Matrix): Float64Array;
  predictPrefix(X: Matrix, trees: number): Int32Array | Float64Array;
  probabilitiesPrefix?(X: Matrix, trees: number): Float64Array;
  /** mean decrease in impurity per feature, normalised to sum 1 (a fresh copy) */
  importance(): Float64Array;
  /** node count of each tree */
  treeSizes(): Int32Array;
  toJSON(): Record<string, unknown>;
}

/** True for models of the `tree` and `forest` learners (which support tree-count prefixes). */
export function isCartModel(model: Model): model is CartModel {
  const m = model as Partial<CartModel>;
  return typeof m.predictPrefix === 'function' && typeof m.importance === 'function' && typeof m.treeCount === 'number';
}

export function makeModel(parts: FlatForestParts): CartModel {
  const T = parts.roots.length;
  const base = {
    kind: parts.kind,
    task: parts.task,
    treeCount: T,
    featureCount: parts.featureCount,
    classCount: parts.classCount,
    settings: parts.settings,
    predict: (X: Matrix) => predictPrefixOf(parts, X, T),
    predictPrefix: (X: Matrix, trees: number) => predictPrefixOf(parts, X, trees),
    importance: () => parts.importance.slice(),
    treeSizes: () => {
      const sizes = new Int32Array(T);
      for (let t = 0; t < T; t++) sizes[t] = (t + 1 < T ? parts.roots[t + 1] : parts.feature.length) - parts.roots[t];
      return sizes;
    },
    toJSON: () => partsToJSON(parts),
  };
  if (parts.task === 'regression') return base;
  return {
    ...base,
    probabilities: (X: Matrix) => probaPrefix(parts, X, T),
    probabilitiesPrefix: (X: Matrix, trees: number) => probaPrefix(parts, X, trees),
  };
}
