/**
 * What every registered learner must do, checked for each one on small seeded synthetic data
 * (the data only exercises the interface; accuracy is checked against references elsewhere):
 * a toJSON/load round trip through JSON text gives equal predictions, the same seed gives
 * identical predictions, probabilities are rows summing to 1, and each declared task works.
 */
import { describe, expect, it } from 'vitest';
import { LEARNERS } from '../../src/learners/index.js';
import { defaultParams } from '../../src/learners/spec.js';
import type { Matrix, Target, Task } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

function data(task: Task, n: number, seed: number): { X: Matrix; y: Target } {
  const rng = createRng(seed);
  const p = 3;
  const X = Float64Array.from({ length: n * p }, () => rng.next() * 4 - 2);
  const f = (i: number) => X[i * p] + 0.5 * X[i * p + 1] + 0.3 * rng.next();
  const m: Matrix = { rows: n, cols: p, data: X };
  if (task === 'regression') return { X: m, y: { task, values: Float64Array.from({ length: n }, (_, i) => f(i)) } };
  return { X: m, y: { task, codes: Int32Array.from({ length: n }, (_, i) => (f(i) > 0.5 ? 2 : f(i) > -0.5 ? 1 : 0)), classes: ['a', 'b', 'c'] } };
}

const learners = [...LEARNERS.values()];

describe('every learner', () => {
  it('is registered', () => {
    expect(learners.map((l) => l.name).sort()).toEqual(['baseline', 'bayes', 'boost', 'forest', 'forest-ref', 'knn', 'knn-ref', 'linear', 'logistic', 'tree']);
  });

  for (const learner of learners) {
    for (const task of learner.tasks) {
      it(`${learner.name} (${task}): round trip, determinism, probabilities`, () => {
        const train = data(task, 80, 1);
        const test = data(task, 30, 2);
        const params = { ...defaultParams(learner), ...(learner.params.some((p) => p.name === 'trees') ? { trees: 5 } : {}) };
        const fit = (seed: number) => learner.fit(train.X, train.y, params, { rng: createRng(seed), seed });
        const m = fit(9);
        const pred = m.predict(test.X);
        expect(pred.length).toBe(30);
        expect(pred instanceof (task === 'classification' ? Int32Array : Float64Array)).toBe(true);
        const back = learner.load(JSON.parse(JSON.stringify(m.toJSON())));
        expect(Array.from(back.predict(test.X))).toEqual(Array.from(pred));
        expect(Array.from(fit(9).predict(test.X))).toEqual(Array.from(pred));
        if (m.probabilities) {
          const p = m.probabilities(test.X);
          expect(p.length).toBe(30 * 3);
          for (let i = 0; i < 30; i++) expect(Math.abs(p[i * 3] + p[i * 3 + 1] + p[i * 3 + 2] - 1)).toBeLessThan(1e-9);
          expect(Array.from(back.probabilities!(test.X))).toEqual(Array.from(p));
        }
      });
    }
  }
});
