/**
 * `forest`: random forest for classification and regression (Breiman 2001, "Random Forests",
 * Machine Learning 45:5-32, free: https://www.stat.berkeley.edu/~breiman/randomforest2001.pdf).
 *
 * Each of `trees` CART trees is grown on its own bootstrap sample of the training rows (n draws
 * with replacement by default; `sample` sets a fraction or a count of draws, see
 * cart/sample-size.ts), choosing every split among a fresh random draw of features (`features`).
 * Classification: probability of class k = mean over trees of the leaf's share of class k;
 * the predicted class is the most probable one (lowest code on a tie). Regression: the mean of
 * the trees' leaf means. Impurity: Gini or entropy for classes, variance for values.
 * Features are binned on the training rows (at most `bins` quantile bins each; a feature with
 * no more distinct values than that keeps every exhaustive-CART threshold).
 *
 * Randomness: tree t uses createRng(deriveSeed(ctx.seed, "forest", "tree", t)) for both its
 * bootstrap sample and its feature draws; ctx.rng is not used. So the same seed gives the same
 * forest, and the first k trees of a forest are the k-tree forest (see predictPrefix).
 * Missing values: fit throws InputError on NaN or infinite features (impute first); predict
 * sends NaN to the left child (x <= threshold is taken as "not x > threshold").
 * Model extras: importance() (mean decrease in impurity, summing to 1), predictPrefix(X, k),
 * probabilitiesPrefix(X, k), treeSizes(); see cart/model.ts.
 * When the runner says it will only predict the fold's test rows (ctx.predictOnly), the fit adds
 * each tree's outputs for those rows as it grows and then forgets the tree (fitCartOnFold): the
 * same predictions bit for bit, with one tree in memory instead of the forest (cart/fold-model.ts).
 */
import type { FitContext, Learner, Matrix, Model, ParamSpec, Params, Target } from '../learning.js';
import { MAX_BINS } from './cart/bins.js';
import { parseFeatureCount } from './cart/feature-count.js';
import { type CartSettings, fitCart, fitCartOnFold } from './cart/fit-trees.js';
import { foldModel } from './cart/fold-model.js';
import { partsFromJSON } from './cart/flat-forest.js';
import { type CartModel, isCartModel, makeModel } from './cart/model.js';
import { numberOption, readOptions, stringOption } from './cart/options.js';
import { parseSampleSize } from './cart/sample-size.js';
import { REBALANCE_SPEC } from './class-balance.js';

export type { CartModel } from './cart/model.js';
export { isCartModel };

export const FOREST_PARAMS: readonly ParamSpec[] = [
  {
    name: 'trees',
    kind: 'int',
    min: 1,
    default: 200,
    simpler: 'lower',
    doc: 'number of trees',
  },
  {
    name: 'depth',
    kind: 'int',
    min: 1,
    default: 32,
    simpler: 'lower',
    doc: 'maximum depth of a tree (a cap: trees stop earlier when their leaves are pure)',
  },
  {
    name: 'min-leaf',
    kind: 'int',
    min: 1,
    default: 1,
    simpler: 'higher',
    doc: 'minimum number of training rows in a leaf, counting bootstrap repeats',
  },
  {
    name: 'features',
    kind: 'text',
    default: 'breiman',
    parse: parseFeatureCount,
    doc:
      'features drawn at each split: breiman (sqrt(p) for classification, p/3 for regression), ' +
      'sqrt, log2, all, frac:F (0 < F <= 1) or count:M (M >= 1, capped at p)',
  },
  {
    name: 'impurity',
    kind: 'choice',
    choices: ['gini', 'entropy'],
    default: 'gini',
    doc: 'split impurity for classification (regression always uses variance)',
  },
  {
    name: 'bins',
    kind: 'int',
    min: 2,
    max: MAX_BINS,
    default: MAX_BINS,
    simpler: 'lower',
    doc: `most quantile bins per feature, fixed on the training rows (2..${MAX_BINS})`,
  },
  {
    name: 'sample',
    kind: 'text',
    default: '1',
    parse: parseSampleSize,
    doc:
      'bootstrap draws per tree: a fraction F (0 < F <= 1) of the training rows, rounded, or a ' +
      'count N >= 2 (capped at the row count); 1 = as many draws as rows',
  },
  REBALANCE_SPEC,
];

export const forest: Learner = {
  name: 'forest',
  tasks: ['classification', 'regression'],
  params: FOREST_PARAMS,
  needsScaling: false,
  doc: 'random forest (Breiman 2001): bootstrap samples, random features at every split',
  fit(X: Matrix, y: Target, params: Params, ctx: FitContext): Model {
    const o = readOptions('forest', FOREST_PARAMS, params);
    const crit = stringOption(o, 'impurity');
    const settings: CartSettings = {
      trees: numberOption(o, 'trees'),
      depth: numberOption(o, 'depth'),
      minLeaf: numberOption(o, 'min-leaf'),
      features: stringOption(o, 'features'),
      impurity: crit === 'entropy' ? 'entropy' : 'gini',
      bins: numberOption(o, 'bins'),
      bootstrap: true,
      sample: stringOption(o, 'sample'),
      rebalance: stringOption(o, 'rebalance'),
    };
    // the runner only predicts the fold's test rows: predict them tree by tree, keep no trees
    if (ctx.predictOnly && ctx.fold) return foldModel('forest', fitCartOnFold('forest', X, y, settings, ctx, ctx.fold.test), ctx.fold);
    return makeModel(fitCart('forest', X, y, settings, ctx));
  },
  load(json: unknown): CartModel {
    return makeModel(partsFromJSON(json, 'forest'));
  },
};
