/**
 * `boost`: gradient-boosted trees for classification and regression (Friedman 2001, "Greedy
 * function approximation: a gradient boosting machine", Ann. Statist. 29(5):1189-1232; leaf
 * values and split gain of Chen & Guestrin 2016, "XGBoost: a scalable tree boosting system",
 * KDD, free: https://arxiv.org/abs/1603.02754).
 *
 * Losses (loss.ts): squared, absolute or Huber for regression; logistic for two classes,
 * softmax for more, with class probabilities. Trees are grown best split first on quantile
 * bins fixed on the training fold (cart/bins.ts) from gradient/hessian histograms with
 * sibling subtraction (histogram.ts, grow.ts); predictions walk the flat node layout of
 * cart/flat-forest.ts (model.ts). Options and their defaults: params.ts.
 *
 * Early stopping (stop > 0, stop.ts): the rounds are chosen on a seeded, stratified inner
 * validation split of the training rows, then the model is refitted on all training rows for
 * that many rounds (stop-then=refit) or the inner model is kept cut at that round (keep). The
 * model's notes() give the chosen round (stopped-at) and the rounds run (rounds-run), which the
 * report lists per fold.
 *
 * Randomness: only from the fit's seed (row and feature draws per round, the inner split);
 * ctx.rng is not used, so the same seed gives the same model, and the first r rounds of a model
 * are the model of r rounds (see model.ts, predictRounds).
 * Missing values: fit throws InputError on NaN or infinite features (impute first); predict
 * sends NaN to the left child.
 */
import type { FitContext, Learner, Matrix, Params, Target } from '../../learning.js';
import { fitBoost } from './fit.js';
import { type BoostModel, boostFromJSON, makeBoostModel } from './model.js';
import { BOOST_PARAMS, readBoostSettings, taskProblem } from './params.js';
import { innerSplit, subsetRows, subsetTargetRows } from './stop.js';

export const boost: Learner = {
  name: 'boost',
  tasks: ['classification', 'regression'],
  params: BOOST_PARAMS,
  needsScaling: false,
  doc: 'gradient-boosted trees (Friedman 2001; second-order leaves, Chen & Guestrin 2016), optional early stopping on an inner split',
  checkParams: taskProblem,
  fit(X: Matrix, y: Target, params: Params, ctx: FitContext): BoostModel {
    const s = readBoostSettings(params, y.task);
    if (s.stop === 0) return makeBoostModel(fitBoost(X, y, s, ctx.seed).parts);
    const split = innerSplit(y, s.stopShare, ctx.seed);
    const inner = fitBoost(subsetRows(X, split.train), subsetTargetRows(y, split.train), s, ctx.seed, {
      X: subsetRows(X, split.valid),
      y: subsetTargetRows(y, split.valid),
      patience: s.stop,
    });
    const chosen = inner.bestRound!;
    const notes = new Map<string, number>([
      ['stopped-at', chosen],
      ['rounds-run', inner.roundsRun!],
      ['validation-rows', split.valid.length],
    ]);
    const parts = s.stopThen === 'keep' ? inner.parts : fitBoost(X, y, { ...s, rounds: chosen }, ctx.seed).parts;
    return makeBoostModel({ ...parts, notes });
  },
  load(json: unknown): BoostModel {
    return makeBoostModel(boostFromJSON(json));
  },
};
