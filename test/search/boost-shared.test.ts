/**
 * tune's shared work for `boost`: candidates that differ only in `rounds` are scored from one
 * model of the largest round count (prefix scoring), and give exactly the predictions of
 * separate fits. Data: the Palmer penguins file shipped by vega-datasets (CC0; Gorman,
 * Williams & Fraser 2014), and a regression target from its numeric columns.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem } from '../../src/data/problem.js';
import { boost } from '../../src/learners/boost/learner.js';
import { getLearner } from '../../src/learners/index.js';
import { formatSpec, parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import type { Task } from '../../src/learning.js';
import { createRng, deriveSeed } from '../../src/rng.js';
import { SplitData, subsetTarget } from '../../src/run/tasks.js';
import { newWorkCount, predictAll } from '../../src/search/fold-work.js';
import type { SearchCandidate } from '../../src/search/space.js';
import { penguinsCsv } from '../helpers/penguins.js';

const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });

function candidates(specs: string[], task: Task): SearchCandidate[] {
  return specs.map((text, id) => {
    const parsed = parseLearnerSpec(text);
    const learner = getLearner(parsed.name);
    const params = resolveParams(learner, parsed, task);
    return { id, learner, spec: formatSpec(learner, params), params };
  });
}

describe('predictAll: boost candidates over rounds share one fit', () => {
  for (const [task, target] of [
    ['classification', 'Species'],
    ['regression', 'Body Mass (g)'],
  ] as const) {
    it(`${task}: one fit per value of the other options, identical to fitting each`, () => {
      const problem = defineProblem(table, { target, drop: ['Island', 'Sex', ...(task === 'regression' ? ['Species'] : [])] });
      const n = problem.rows.length;
      const test = Int32Array.from({ length: n }, (_, i) => i).filter((i) => i % 4 === 0);
      const train = Int32Array.from({ length: n }, (_, i) => i).filter((i) => i % 4 !== 0);
      const split = new SplitData(problem, train, test, 'median');
      const specs = ['boost:rounds=5,row-share=0.7', 'boost:rounds=40,row-share=0.7', 'boost:rounds=0,row-share=0.7', 'boost:rounds=12,leaves=4', 'boost:rounds=25,leaves=4', 'boost:rounds=9,stop=3', 'boost:rounds=30,stop=3'];
      const cands = candidates(specs, task);
      const work = newWorkCount();
      const preds = predictAll(split, problem.target, cands, 99, work);
      expect(work.fits).toBe(4); // row-share=0.7, leaves=4, and each stop=3 one alone
      expect(work.plainFits).toBe(7);
      const seed = deriveSeed(99, 'boost');
      const Xtr = split.matrix('train', false);
      const Xte = split.matrix('test', false);
      expect(cands.length).toBe(7);
      for (const [i, c] of cands.entries()) {
        const m = boost.fit(Xtr, subsetTarget(problem.target, train), c.params, { rng: createRng(seed), seed });
        expect(Array.from(preds[i].predicted)).toEqual(Array.from(m.predict(Xte)));
        if (task === 'classification') expect(Array.from(preds[i].probs!)).toEqual(Array.from(m.probabilities!(Xte)));
        else expect(preds[i].probs).toBeUndefined();
      }
    });
  }
});
