/**
 * The shared work of one split (an inner fold, an outer fold, or all search rows against the
 * holdout): every candidate's predictions on the split's test rows, doing each piece of work
 * once.
 *
 * - Preprocessing: the split's SplitData (src/run/tasks.ts) fits imputation, scaling and one-hot
 *   encoding once on the training rows; every candidate reads the same matrices.
 * - kNN: the neighbours of every test row are found once, for the largest k of the candidates
 *   (capped at the training rows), with `nearest`; each (k, vote) candidate is scored from
 *   the first k entries of that list by `predictFromNeighbours`, which gives exactly knn's own
 *   predictions (see src/learners/knn.ts).
 * - Forest: candidates that differ only in `trees` share one forest of the largest tree count;
 *   a candidate with t trees is scored from the first t trees (predictPrefix /
 *   probabilitiesPrefix). Because every tree has its own generator derived from the fit seed
 *   (src/learners/forest.ts), the first t trees are exactly the forest of t trees fitted with
 *   that seed.
 * - Boost: candidates that differ only in `rounds` (and have stop=0) share one model of the
 *   largest round count; a candidate with r rounds is scored from the scores after r rounds,
 *   which one walk over the trees gives for every r at once (scoresAt). Every round draws from
 *   its own generator derived from the fit seed (src/learners/boost/fit.ts), so the first r
 *   rounds are exactly the model of r rounds fitted with that seed. With stop > 0 the rounds
 *   are chosen inside the fit, so those candidates are fitted one by one.
 * - Every other learner is fitted once per candidate.
 *
 * Seeds: every fit of learner L on this split uses deriveSeed(splitSeed, L), the same for all
 * candidates of L, so candidates are compared on common random numbers, and the prefix rule
 * above holds.
 */
import { performance } from 'node:perf_hooks';
import { boost } from '../learners/boost/learner.js';
import { isBoostModel, outputsOf } from '../learners/boost/model.js';
import { forest } from '../learners/forest.js';
import { isCartModel } from '../learners/cart/model.js';
import { KNN_VOTES, knn, nearest, predictFromNeighbours } from '../learners/knn.js';
import type { Learner, Params, Target } from '../learning.js';
import { notesOf } from '../run/notes.js';
import { createRng, deriveSeed } from '../rng.js';
import { type SplitData, subsetTarget } from '../run/tasks.js';
import type { Prediction } from '../metrics/scoring.js';
import type { SearchCandidate } from './space.js';

/** Counts of the work done, against what a plain loop over candidates would do. */
export interface WorkCount {
  /** model fits and neighbour searches actually run */
  fits: number;
  /** fits a plain loop (one per candidate and split) would run */
  plainFits: number;
  fitMs: number;
  predictMs: number;
}

export function newWorkCount(): WorkCount {
  return { fits: 0, plainFits: 0, fitMs: 0, predictMs: 0 };
}

function fitSeed(splitSeed: number, learner: Learner): number {
  return deriveSeed(splitSeed, learner.name);
}

function knnGroup(split: SplitData, yTrain: Target, cands: readonly SearchCandidate[], out: Prediction[], at: readonly number[], work: WorkCount): void {
  const t0 = performance.now();
  const Xtrain = split.matrix('train', knn.needsScaling);
  const Xtest = split.matrix('test', knn.needsScaling);
  const K = Math.min(Math.max(...cands.map((c) => Number(c.params.k))), Xtrain.rows);
  const { index, dist2 } = nearest(Xtrain, Xtest, K);
  const t1 = performance.now();
  const y = yTrain.task === 'classification' ? Float64Array.from(yTrain.codes) : yTrain.values;
  const classes = yTrain.task === 'classification' ? yTrain.classes.length : 0;
  const list = { index, dist2, stride: K, rows: Xtest.rows };
  cands.forEach((c, j) => {
    const vote = String(c.params.vote) as (typeof KNN_VOTES)[number];
    out[at[j]] = predictFromNeighbours(list, y, Xtrain.rows, classes, Number(c.params.k), vote);
  });
  work.fits += 1;
  work.fitMs += t1 - t0;
  work.predictMs += performance.now() - t1;
}

/** Params without `trees`, as a key: candidates with the same key share one forest. */
function forestKey(params: Params): string {
  return JSON.stringify(forest.params.filter((p) => p.name !== 'trees').map((p) => params[p.name]));
}

function forestGroup(split: SplitData, yTrain: Target, cands: readonly SearchCandidate[], out: Prediction[], at: readonly number[], seed: number, work: WorkCount): void {
  const Xtrain = split.matrix('train', forest.needsScaling);
  const Xtest = split.matrix('test', forest.needsScaling);
  const maxTrees = Math.max(...cands.map((c) => Number(c.params.trees)));
  const t0 = performance.now();
  const model = forest.fit(Xtrain, yTrain, { ...cands[0].params, trees: maxTrees }, { rng: createRng(seed), seed });
  const t1 = performance.now();
  if (!isCartModel(model)) throw new Error('internal: forest gave a model without tree prefixes');
  cands.forEach((c, j) => {
    const t = Number(c.params.trees);
    const predicted = t === maxTrees ? model.predict(Xtest) : model.predictPrefix(Xtest, t);
    const probs = t === maxTrees ? model.probabilities?.(Xtest) : model.probabilitiesPrefix?.(Xtest, t);
    out[at[j]] = probs ? { predicted, probs } : { predicted };
  });
  work.fits += 1;
  work.fitMs += t1 - t0;
  work.predictMs += performance.now() - t1;
}

/** Params without `rounds`, as a key: candidates with the same key share one boosted model. */
function boostKey(params: Params): string {
  return JSON.stringify(boost.params.filter((p) => p.name !== 'rounds').map((p) => params[p.name]));
}

function boostGroup(split: SplitData, yTrain: Target, cands: readonly SearchCandidate[], out: Prediction[], at: readonly number[], seed: number, work: WorkCount): void {
  const Xtrain = split.matrix('train', boost.needsScaling);
  const Xtest = split.matrix('test', boost.needsScaling);
  const maxRounds = Math.max(...cands.map((c) => Number(c.params.rounds)));
  const t0 = performance.now();
  const model = boost.fit(Xtrain, yTrain, { ...cands[0].params, rounds: maxRounds }, { rng: createRng(seed), seed });
  const t1 = performance.now();
  if (!isBoostModel(model)) throw new Error('internal: boost gave a model without round prefixes');
  const rounds = cands.map((c) => Number(c.params.rounds));
  const scores = model.scoresAt(Xtest, rounds);
  cands.forEach((_, j) => {
    out[at[j]] = outputsOf(model.parts, scores[j], Xtest.rows);
  });
  work.fits += 1;
  work.fitMs += t1 - t0;
  work.predictMs += performance.now() - t1;
}

function plainFit(split: SplitData, yTrain: Target, c: SearchCandidate, seed: number, work: WorkCount): Prediction {
  const Xtrain = split.matrix('train', c.learner.needsScaling);
  const Xtest = split.matrix('test', c.learner.needsScaling);
  const t0 = performance.now();
  const model = c.learner.fit(Xtrain, yTrain, c.params, { rng: createRng(seed), seed, fold: split.view('search', c.learner.needsScaling) });
  const t1 = performance.now();
  const predicted = model.predict(Xtest);
  const probs = model.probabilities?.(Xtest);
  const notes = notesOf(model.notes?.());
  work.fits += 1;
  work.fitMs += t1 - t0;
  work.predictMs += performance.now() - t1;
  return { predicted, ...(probs ? { probs } : {}), ...(notes ? { notes } : {}) };
}

/**
 * Predictions of every candidate on the split's test rows, in candidate order. `splitSeed` is
 * the split's own seed; `y` the problem's whole target.
 */
export function predictAll(split: SplitData, y: Target, cands: readonly SearchCandidate[], splitSeed: number, work: WorkCount): Prediction[] {
  const yTrain = subsetTarget(y, split.train);
  const out = new Array<Prediction>(cands.length);
  work.plainFits += cands.length;
  const knnAt: number[] = [];
  const forests = new Map<string, number[]>();
  const boosts = new Map<string, number[]>();
  cands.forEach((c, i) => {
    if (c.learner === knn) knnAt.push(i);
    else if (c.learner === boost && Number(c.params.stop) === 0) {
      const key = boostKey(c.params);
      const list = boosts.get(key);
      if (list) list.push(i);
      else boosts.set(key, [i]);
    }
    else if (c.learner === forest) {
      const key = forestKey(c.params);
      const list = forests.get(key);
      if (list) list.push(i);
      else forests.set(key, [i]);
    } else out[i] = plainFit(split, yTrain, c, fitSeed(splitSeed, c.learner), work);
  });
  if (knnAt.length) knnGroup(split, yTrain, knnAt.map((i) => cands[i]), out, knnAt, work);
  for (const at of forests.values()) forestGroup(split, yTrain, at.map((i) => cands[i]), out, at, fitSeed(splitSeed, forest), work);
  for (const at of boosts.values()) boostGroup(split, yTrain, at.map((i) => cands[i]), out, at, fitSeed(splitSeed, boost), work);
  return out;
}
