/**
 * The options of the `boost` learner: their kinds, limits, defaults with the reason for each,
 * and the settings object the fit reads them into. Every option is checked against its spec
 * before any fit (resolveParams, then readOptions again inside fit); `checkTask` adds the one
 * rule that needs the task: `loss` other than `auto` is for regression only.
 */
import { UsageError } from '../../errors.js';
import { MAX_BINS } from '../cart/bins.js';
import { numberOption, readOptions, stringOption } from '../cart/options.js';
import type { ParamSpec, Params, Task } from '../../learning.js';

export const REGRESSION_LOSSES = ['squared', 'absolute', 'huber'] as const;
export type RegressionLoss = (typeof REGRESSION_LOSSES)[number];
export const STOP_THEN = ['refit', 'keep'] as const;

/** Most leaves a tree may have; bounds the histograms kept while a tree grows. */
export const MAX_LEAVES = 1024;

export const BOOST_PARAMS: readonly ParamSpec[] = [
  {
    name: 'rounds',
    kind: 'int',
    min: 0,
    max: 100000,
    default: 200,
    simpler: 'lower',
    doc:
      'boosting rounds (one tree per round, one per class for more than two classes); 0 gives the base score alone. ' +
      'Default 200: with step 0.1 held-out loss usually flattens within a few hundred rounds on tables of thousands of rows (common practice); use stop to choose it',
  },
  {
    name: 'step',
    kind: 'number',
    min: 0,
    max: 1,
    minExclusive: true,
    default: 0.1,
    simpler: 'lower',
    doc:
      'learning rate: each tree is added scaled by step. Default 0.1: Friedman (2001, sec. 5) found shrinkage of 0.1 or less ' +
      'gives clearly better held-out error than 1, at the price of more rounds',
  },
  {
    name: 'depth',
    kind: 'int',
    min: 1,
    max: 32,
    default: 6,
    simpler: 'lower',
    doc: 'deepest level a leaf may sit at. Default 6: a cap that keeps the leaf budget from going into one long chain; leaves is the main size control',
  },
  {
    name: 'leaves',
    kind: 'int',
    min: 2,
    max: MAX_LEAVES,
    default: 8,
    simpler: 'lower',
    doc:
      'most leaves per tree; trees grow best split first. Default 8: Hastie, Tibshirani & Friedman (2009, sec. 10.11) report ' +
      'that 4 to 8 leaves work well for boosting; 8 allows interactions of up to 7 features',
  },
  {
    name: 'leaf-rows',
    kind: 'int',
    min: 1,
    default: 5,
    simpler: 'higher',
    doc: 'fewest training rows in a leaf. Default 5: a leaf value from fewer rows is mostly noise, yet small classes can still be split off',
  },
  {
    name: 'leaf-hessian',
    kind: 'number',
    min: 0,
    default: 0.001,
    simpler: 'higher',
    doc:
      'smallest sum of second derivatives (hessian) in a leaf. Default 0.001: only refuses leaves whose logistic rows are ' +
      'all nearly certain, where -G/(H+ridge) would be unstable; rows already bound leaf size',
  },
  {
    name: 'ridge',
    kind: 'number',
    min: 0,
    default: 1,
    simpler: 'higher',
    doc: 'L2 penalty on leaf values (lambda in -G/(H+lambda), Chen & Guestrin 2016). Default 1: a pull towards 0 the size of one row\'s hessian under squared loss',
  },
  {
    name: 'row-share',
    kind: 'number',
    min: 0,
    max: 1,
    minExclusive: true,
    default: 1,
    simpler: 'lower',
    doc: 'share of training rows drawn without replacement for each round (Friedman 2002, stochastic gradient boosting). Default 1: no draw, so a fit is a pure function of the data unless asked',
  },
  {
    name: 'feature-share',
    kind: 'number',
    min: 0,
    max: 1,
    minExclusive: true,
    default: 1,
    simpler: 'lower',
    doc: 'share of features drawn without replacement for each round (at least one). Default 1: every feature, as in Friedman (2001)',
  },
  {
    name: 'bins',
    kind: 'int',
    min: 2,
    max: MAX_BINS,
    default: MAX_BINS,
    simpler: 'lower',
    doc: `most quantile bins per feature, fixed on the training rows (2..${MAX_BINS}). Default ${MAX_BINS}: the most one byte holds, the same as forest`,
  },
  {
    name: 'loss',
    kind: 'choice',
    choices: ['auto', ...REGRESSION_LOSSES],
    default: 'auto',
    doc:
      'regression loss: squared, absolute or huber; auto is squared for regression and log-loss for classes (logistic for two, softmax for more). ' +
      'Default auto: squared error is what RMSE scores',
  },
  {
    name: 'huber-quantile',
    kind: 'number',
    min: 0,
    max: 1,
    minExclusive: true,
    default: 0.9,
    doc: 'loss=huber only: each round the Huber threshold is this quantile of the absolute residuals. Default 0.9: the value Friedman (2001, sec. 4.4) used',
  },
  {
    name: 'stop',
    kind: 'int',
    min: 0,
    default: 0,
    doc:
      'early stopping: 0 is off; N > 0 chooses the number of rounds (at most rounds) on an inner validation split of the training fold, ' +
      'stopping after N rounds without a lower validation loss. Default 0: rounds then means what it says and tune shares work over it',
  },
  {
    name: 'stop-share',
    kind: 'number',
    min: 0,
    max: 0.5,
    minExclusive: true,
    default: 0.2,
    doc: 'stop > 0 only: share of the training fold held out for choosing the round, stratified by class (by target quintile for regression). Default 0.2: one fifth, like one fold of 5-fold',
  },
  {
    name: 'stop-then',
    kind: 'choice',
    choices: STOP_THEN,
    default: 'refit',
    doc: 'stop > 0 only: refit on the whole training fold for the chosen number of rounds, or keep the model of the inner split cut at that round. Default refit: it uses every training row',
  },
];

export interface BoostSettings {
  readonly rounds: number;
  readonly step: number;
  readonly depth: number;
  readonly leaves: number;
  readonly leafRows: number;
  readonly leafHessian: number;
  readonly ridge: number;
  readonly rowShare: number;
  readonly featureShare: number;
  readonly bins: number;
  readonly loss: 'auto' | RegressionLoss;
  readonly huberQuantile: number;
  readonly stop: number;
  readonly stopShare: number;
  readonly stopThen: 'refit' | 'keep';
}

/** The refusal of an option that does not fit the task, or undefined. */
export function taskProblem(params: Params, task: Task): string | undefined {
  const loss = params.loss;
  if (task === 'classification' && loss !== undefined && loss !== 'auto') {
    return `boost: option "loss" must be auto for classification (log-loss: logistic for two classes, softmax for more), got ${JSON.stringify(loss)}`;
  }
  return undefined;
}

/** Checks and completes the options; throws UsageError naming the option and its limit. */
export function readBoostSettings(params: Params, task: Task): BoostSettings {
  const o = readOptions('boost', BOOST_PARAMS, params);
  const problem = taskProblem(Object.fromEntries(o), task);
  if (problem) throw new UsageError(problem);
  return {
    rounds: numberOption(o, 'rounds'),
    step: numberOption(o, 'step'),
    depth: numberOption(o, 'depth'),
    leaves: numberOption(o, 'leaves'),
    leafRows: numberOption(o, 'leaf-rows'),
    leafHessian: numberOption(o, 'leaf-hessian'),
    ridge: numberOption(o, 'ridge'),
    rowShare: numberOption(o, 'row-share'),
    featureShare: numberOption(o, 'feature-share'),
    bins: numberOption(o, 'bins'),
    loss: stringOption(o, 'loss') as BoostSettings['loss'],
    huberQuantile: numberOption(o, 'huber-quantile'),
    stop: numberOption(o, 'stop'),
    stopShare: numberOption(o, 'stop-share'),
    stopThen: stringOption(o, 'stop-then') as BoostSettings['stopThen'],
  };
}
