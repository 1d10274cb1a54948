import { describe, expect, it } from 'vitest';
import { KNN_VOTES, knn, nearest, predictFromNeighbours } from '../../src/learners/knn.js';
import { knnRef } from '../../src/learners/knn-ref.js';
import type { Matrix, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

const ctx = { rng: createRng(1), seed: 1 };

/** Features on a coarse integer grid: many equal distances, and queries that copy training rows (distance 0). */
function gridMatrix(rows: number, cols: number, seed: number, levels: number): Matrix {
  const rng = createRng(seed);
  return { rows, cols, data: Float64Array.from({ length: rows * cols }, () => rng.int(levels)) };
}

function rowsOf(X: Matrix, from: number, to: number): Matrix {
  return { rows: to - from, cols: X.cols, data: X.data.slice(from * X.cols, to * X.cols) };
}

describe('predictFromNeighbours: every k and weighting from one neighbour list equals knn itself', () => {
  // The reference here is knn's own predict / probabilities (the brief: the votes and tie rules
  // must equal knn's exactly). Tied data on purpose: coarse grid features make equal distances,
  // copied rows make distance 0 (the 1/d rule's special case), and 3 classes make tied votes.
  const X = gridMatrix(150, 3, 7, 4);
  const Q = { rows: 60, cols: 3, data: Float64Array.from([...rowsOf(X, 0, 20).data, ...gridMatrix(40, 3, 8, 4).data]) };
  const rng = createRng(9);
  const codes = Int32Array.from({ length: 150 }, () => rng.int(3));
  const y: Target = { task: 'classification', codes, classes: ['a', 'b', 'c'] };
  const values = Float64Array.from({ length: 150 }, () => rng.next() * 10);
  const yr: Target = { task: 'regression', values };
  const K = 25;
  const list = { ...nearest(X, Q, K), stride: K, rows: Q.rows };

  it('classification: predictions and probabilities, k = 1..25, equal and inverse votes', () => {
    let checked = 0;
    for (const vote of KNN_VOTES) {
      for (let k = 1; k <= K; k++) {
        const model = knn.fit(X, y, { k, vote }, ctx);
        const shared = predictFromNeighbours(list, Float64Array.from(codes), X.rows, 3, k, vote);
        expect(Array.from(shared.predicted)).toEqual(Array.from(model.predict(Q)));
        expect(Array.from(shared.probs!)).toEqual(Array.from(model.probabilities!(Q)));
        checked++;
      }
    }
    expect(checked).toBe(50);
  });

  it('the test data really has tied votes and zero distances (so the tie rules are exercised)', () => {
    let zero = 0;
    for (let i = 0; i < Q.rows; i++) if (list.dist2[i * K] === 0) zero++;
    expect(zero).toBeGreaterThanOrEqual(20);
    // with k = 2 equal votes and 3 classes, a query whose two neighbours differ has a tied vote
    let tied = 0;
    for (let i = 0; i < Q.rows; i++) if (codes[list.index[i * K]] !== codes[list.index[i * K + 1]]) tied++;
    expect(tied).toBeGreaterThan(10);
  });

  it('regression: the (weighted) mean of the neighbours, identical to knn for every k', () => {
    for (const vote of KNN_VOTES) {
      for (const k of [1, 2, 7, 25]) {
        const model = knn.fit(X, yr, { k, vote }, ctx);
        const shared = predictFromNeighbours(list, values, X.rows, 0, k, vote);
        expect(Array.from(shared.predicted)).toEqual(Array.from(model.predict(Q)));
        expect(shared.probs).toBeUndefined();
      }
    }
  });

  it('caps k at the training rows as knn does, and refuses a k beyond the list', () => {
    const small = rowsOf(X, 0, 6);
    const ySmall: Target = { task: 'classification', codes: codes.slice(0, 6), classes: ['a', 'b', 'c'] };
    const l6 = { ...nearest(small, Q, 6), stride: 6, rows: Q.rows };
    const model = knn.fit(small, ySmall, { k: 40, vote: 'equal' }, ctx);
    expect(Array.from(predictFromNeighbours(l6, Float64Array.from(codes.slice(0, 6)), 6, 3, 40, 'equal').predicted)).toEqual(Array.from(model.predict(Q)));
    expect(() => predictFromNeighbours(list, Float64Array.from(codes), X.rows, 3, 26, 'equal')).toThrow('knn: 26 neighbours asked from a list of 25 per query');
  });

  it('agrees with ml-knn (knn-ref) on untied data for odd k with two classes', () => {
    // continuous features: no distance ties; two classes and odd k: no vote ties, so the
    // independent implementation in ml-knn must give the same classes
    const r = createRng(31);
    const A: Matrix = { rows: 200, cols: 4, data: Float64Array.from({ length: 800 }, () => r.next()) };
    const B: Matrix = { rows: 50, cols: 4, data: Float64Array.from({ length: 200 }, () => r.next()) };
    const c2 = Int32Array.from({ length: 200 }, (_, i) => (A.data[i * 4] + A.data[i * 4 + 1] > 1 ? 1 : 0));
    const t2: Target = { task: 'classification', codes: c2, classes: ['no', 'yes'] };
    const l = { ...nearest(A, B, 15), stride: 15, rows: B.rows };
    for (const k of [1, 5, 15]) {
      const ours = predictFromNeighbours(l, Float64Array.from(c2), A.rows, 2, k, 'equal').predicted;
      const ref = knnRef.fit(A, t2, { k }, ctx).predict(B);
      expect(Array.from(ours)).toEqual(Array.from(ref));
    }
  });
});
