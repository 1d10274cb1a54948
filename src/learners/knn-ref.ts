/**
 * `knn-ref`: the design's reference k-nearest neighbours (npm ml-knn), kept to cross-check our
 * own `knn`. It takes only nested number arrays, has no regression and no probabilities, and
 * its kd-tree visits every point (measured 25-46x slower than brute force at 10k-50k rows).
 */
import { InputError } from '../errors.js';
import { refKnn, rowsOf } from './reference-libs.js';
import type { Learner, Matrix } from '../learning.js';

interface SavedKnnRef {
  readonly learner: 'knn-ref';
  readonly model: unknown;
}

export const knnRef: Learner = {
  name: 'knn-ref',
  tasks: ['classification'],
  params: [{ name: 'k', kind: 'int', min: 1, max: 100_000, default: 5, simpler: 'higher', doc: 'number of neighbours' }],
  needsScaling: true,
  doc: 'reference k-nearest neighbours from ml-knn (classification only; slow; for cross-checks)',
  fit(X, y, params) {
    if (y.task !== 'classification') throw new InputError('knn-ref: classification only');
    if (X.rows === 0) throw new InputError('knn-ref: no training rows');
    const KNN = refKnn();
    const model = new KNN(rowsOf(X), Array.from(y.codes), { k: Math.min(Number(params.k), X.rows) });
    const saved: SavedKnnRef = { learner: 'knn-ref', model: JSON.parse(JSON.stringify(model.toJSON())) };
    return { predict: (Q: Matrix) => Int32Array.from(model.predict(rowsOf(Q))), toJSON: () => saved };
  },
  load(json) {
    const saved = json as SavedKnnRef;
    if (saved?.learner !== 'knn-ref') throw new InputError('knn-ref: not a saved knn-ref model');
    const model = refKnn().load(saved.model);
    return { predict: (Q: Matrix) => Int32Array.from(model.predict(rowsOf(Q))), toJSON: () => saved };
  },
};
