import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem } from '../../src/data/problem.js';
import { forest } from '../../src/learners/forest.js';
import { getLearner } from '../../src/learners/index.js';
import { formatSpec, parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import { createRng, deriveSeed } from '../../src/rng.js';
import { SplitData, subsetTarget } from '../../src/run/tasks.js';
import { newWorkCount, predictAll } from '../../src/search/fold-work.js';
import type { SearchCandidate } from '../../src/search/space.js';
import { penguinsCsv } from '../helpers/penguins.js';

// The Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014).
const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
const problem = defineProblem(table, { target: 'Species', drop: ['Island', 'Sex'] });
const n = problem.rows.length;
const test = Int32Array.from({ length: n }, (_, i) => i).filter((i) => i % 4 === 0);
const train = Int32Array.from({ length: n }, (_, i) => i).filter((i) => i % 4 !== 0);

function candidates(specs: string[]): SearchCandidate[] {
  return specs.map((text, id) => {
    const parsed = parseLearnerSpec(text);
    const learner = getLearner(parsed.name);
    const params = resolveParams(learner, parsed, 'classification');
    return { id, learner, spec: formatSpec(learner, params), params };
  });
}

describe('predictAll: shared work gives exactly the predictions of separate fits', () => {
  const split = new SplitData(problem, train, test, 'median');
  const y = problem.target;
  const splitSeed = 12345;

  it('kNN: one neighbour search for a grid of k and vote, identical to fitting each', () => {
    const cands = candidates(['knn:k=1', 'knn:k=4', 'knn:k=9,vote=inverse', 'knn:k=30', 'knn:k=2,vote=inverse']);
    const work = newWorkCount();
    const preds = predictAll(split, y, cands, splitSeed, work);
    expect(work.fits).toBe(1);
    expect(work.plainFits).toBe(5);
    expect(preds.length).toBe(5);
    const Xtr = split.matrix('train', true);
    const Xte = split.matrix('test', true);
    for (const [i, c] of cands.entries()) {
      const model = c.learner.fit(Xtr, subsetTarget(y, train), c.params, { rng: createRng(1), seed: 1 });
      expect(Array.from(preds[i].predicted)).toEqual(Array.from(model.predict(Xte)));
      expect(Array.from(preds[i].probs!)).toEqual(Array.from(model.probabilities!(Xte)));
    }
  });

  it('forest: one forest per value of the other options, smaller tree counts from its prefix', () => {
    const cands = candidates(['forest:trees=3,depth=3', 'forest:trees=8,depth=3', 'forest:trees=5,depth=6', 'forest:trees=2,depth=6']);
    const work = newWorkCount();
    const preds = predictAll(split, y, cands, splitSeed, work);
    expect(work.fits).toBe(2); // depth=3 and depth=6
    const Xtr = split.matrix('train', false);
    const Xte = split.matrix('test', false);
    // every fit of a learner on a split uses deriveSeed(splitSeed, learner name): the reference
    // is the forest of exactly t trees fitted with that seed (forest.ts: the first t trees of a
    // forest are the t-tree forest with the same seed)
    const seed = deriveSeed(splitSeed, 'forest');
    for (const [i, c] of cands.entries()) {
      const model = forest.fit(Xtr, subsetTarget(y, train), c.params, { rng: createRng(seed), seed });
      expect(Array.from(preds[i].predicted)).toEqual(Array.from(model.predict(Xte)));
      expect(Array.from(preds[i].probs!)).toEqual(Array.from(model.probabilities!(Xte)));
    }
  });

  it('mixes learners in one call, keeping candidate order; other learners are fitted one by one', () => {
    const cands = candidates(['tree:depth=2', 'knn:k=3', 'forest:trees=4', 'baseline', 'knn:k=7', 'forest:trees=2']);
    const work = newWorkCount();
    const preds = predictAll(split, y, cands, splitSeed, work);
    expect(work.fits).toBe(4); // tree, baseline, one knn search, one forest
    expect(work.plainFits).toBe(6);
    expect(preds.every((p) => p.predicted.length === test.length)).toBe(true);
    const tree = cands[0];
    const seed = deriveSeed(splitSeed, 'tree');
    const m = tree.learner.fit(split.matrix('train', false), subsetTarget(y, train), tree.params, { rng: createRng(seed), seed });
    expect(Array.from(preds[0].predicted)).toEqual(Array.from(m.predict(split.matrix('test', false))));
  });
});
