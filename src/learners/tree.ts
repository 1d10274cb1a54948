/**
 * `tree`: one CART tree (Breiman, Friedman, Olshen & Stone 1984, "Classification and Regression
 * Trees", Wadsworth), grown from the same code as `forest` (cart/grow.ts) on all training rows,
 * considering every feature at every node. Classification leaves give class shares as
 * probabilities; regression leaves give the mean. No pruning: the tree grows until its leaves
 * are pure, `depth` is reached or a leaf would hold fewer than `min-leaf` rows.
 * Thresholds lie halfway between neighbouring training values; features with more than `bins`
 * distinct values are first cut into `bins` quantile bins (see cart/bins.ts).
 * The tree uses no randomness: ties between equally good splits go to the lowest feature
 * index, then the lowest threshold. Missing values: fit throws InputError on NaN or infinite
 * features; predict sends NaN to the left child.
 */
import type { FitContext, Learner, Matrix, ParamSpec, Params, Target } from '../learning.js';
import { fitCart } from './cart/fit-trees.js';
import { partsFromJSON } from './cart/flat-forest.js';
import { type CartModel, makeModel } from './cart/model.js';
import { numberOption, readOptions, stringOption } from './cart/options.js';
import { FOREST_PARAMS } from './forest.js';

const shared = (name: string): ParamSpec => {
  const spec = FOREST_PARAMS.find((s) => s.name === name);
  if (!spec) throw new Error(`internal: no forest option ${name}`);
  return spec;
};

export const TREE_PARAMS: readonly ParamSpec[] = [
  shared('depth'),
  { ...shared('min-leaf'), doc: 'minimum number of training rows in a leaf' } as ParamSpec,
  shared('impurity'),
  shared('bins'),
  shared('rebalance'),
];

export const tree: Learner = {
  name: 'tree',
  tasks: ['classification', 'regression'],
  params: TREE_PARAMS,
  needsScaling: false,
  doc: 'one CART decision tree (Breiman et al. 1984), unpruned, capped by depth and leaf size',
  fit(X: Matrix, y: Target, params: Params, ctx: FitContext): CartModel {
    const o = readOptions('tree', TREE_PARAMS, params);
    const crit = stringOption(o, 'impurity');
    return makeModel(
      fitCart(
        'tree',
        X,
        y,
        {
          trees: 1,
          depth: numberOption(o, 'depth'),
          minLeaf: numberOption(o, 'min-leaf'),
          features: 'all',
          impurity: crit === 'entropy' ? 'entropy' : 'gini',
          bins: numberOption(o, 'bins'),
          bootstrap: false,
          rebalance: stringOption(o, 'rebalance'),
        },
        ctx,
      ),
    );
  },
  load(json: unknown): CartModel {
    return makeModel(partsFromJSON(json, 'tree'));
  },
};
