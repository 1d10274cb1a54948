import { describe, expect, it } from 'vitest';
import { knn, nearest } from '../../src/learners/knn.js';
import { knnRef } from '../../src/learners/knn-ref.js';
import type { Matrix, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

function randomMatrix(rows: number, cols: number, seed: number): Matrix {
  const rng = createRng(seed);
  return { rows, cols, data: Float64Array.from({ length: rows * cols }, () => rng.next() * 10) };
}
const ctx = { rng: createRng(1), seed: 1 };

describe('knn', () => {
  it('gives the same predictions as ml-knn (knn-ref, the design reference) on untied data', () => {
    // continuous random features: distance ties have probability zero; odd k with 2 classes
    // cannot tie a vote, so the two implementations must agree exactly
    const X = randomMatrix(300, 4, 11);
    const Q = randomMatrix(120, 4, 12);
    const codes = Int32Array.from({ length: 300 }, (_, i) => (X.data[i * 4] + X.data[i * 4 + 1] > 10 ? 1 : 0));
    const y: Target = { task: 'classification', codes, classes: ['no', 'yes'] };
    for (const k of [1, 3, 7]) {
      const ours = knn.fit(X, y, { k, vote: 'equal' }, ctx).predict(Q);
      const ref = knnRef.fit(X, y, { k }, ctx).predict(Q);
      expect(ours.length).toBe(120);
      expect(Array.from(ours)).toEqual(Array.from(ref));
    }
  });

  it('finds the same neighbours as a full sort of all distances', () => {
    const X = randomMatrix(200, 3, 5);
    const Q = randomMatrix(9, 3, 6); // 9 queries: two full blocks of four and one remainder
    const k = 6;
    const { index } = nearest(X, Q, k);
    for (let q = 0; q < Q.rows; q++) {
      const d = Array.from({ length: X.rows }, (_, i) => {
        let s = 0;
        for (let j = 0; j < 3; j++) s += (Q.data[q * 3 + j] - X.data[i * 3 + j]) ** 2;
        return [s, i] as const;
      }).sort((a, b) => a[0] - b[0] || a[1] - b[1]);
      expect(Array.from(index.subarray(q * k, q * k + k))).toEqual(d.slice(0, k).map((e) => e[1]));
    }
  });

  it('breaks ties by the documented rules', () => {
    // training points on a line: 0 (class 0), 2 (class 1), 4 (class 1), -2 (class 0)
    const X: Matrix = { rows: 4, cols: 1, data: Float64Array.from([0, 2, 4, -2]) };
    const y: Target = { task: 'classification', codes: Int32Array.from([0, 1, 1, 0]), classes: ['a', 'b'] };
    // query 1: rows 0 and 1 are equally near; the earlier row (0) takes the single place
    expect(Array.from(knn.fit(X, y, { k: 1, vote: 'equal' }, ctx).predict({ rows: 1, cols: 1, data: Float64Array.from([1]) }))).toEqual([0]);
    // query 1.5 with k=2: one vote each; the tied class of the nearest neighbour (row 1, class 1) wins
    expect(Array.from(knn.fit(X, y, { k: 2, vote: 'equal' }, ctx).predict({ rows: 1, cols: 1, data: Float64Array.from([1.5]) }))).toEqual([1]);
    // inverse votes with an exact match: only the distance-0 neighbour votes
    const m = knn.fit(X, y, { k: 3, vote: 'inverse' }, ctx);
    const at2 = { rows: 1, cols: 1, data: Float64Array.from([2]) };
    expect(Array.from(m.predict(at2))).toEqual([1]);
    expect(Array.from(m.probabilities!(at2))).toEqual([0, 1]);
  });

  it('averages neighbour values for regression, uniformly or by 1/d', () => {
    const X: Matrix = { rows: 3, cols: 1, data: Float64Array.from([0, 1, 3]) };
    const y: Target = { task: 'regression', values: Float64Array.from([10, 20, 40]) };
    const q = { rows: 1, cols: 1, data: Float64Array.from([0.5]) };
    expect(Array.from(knn.fit(X, y, { k: 2, vote: 'equal' }, ctx).predict(q))).toEqual([15]);
    // weights 1/0.5 = 2 each: (2*10 + 2*20) / 4 = 15; with k=3 add 1/2.5 = 0.4 for 40
    const w = knn.fit(X, y, { k: 3, vote: 'inverse' }, ctx).predict(q)[0];
    expect(Math.abs(w - (2 * 10 + 2 * 20 + 0.4 * 40) / 4.4)).toBeLessThan(1e-12);
  });

  it('round-trips through toJSON and load', () => {
    const X = randomMatrix(50, 3, 1);
    const Q = randomMatrix(20, 3, 2);
    const y: Target = { task: 'classification', codes: Int32Array.from({ length: 50 }, (_, i) => i % 3), classes: ['a', 'b', 'c'] };
    const m = knn.fit(X, y, { k: 5, vote: 'inverse' }, ctx);
    const back = knn.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.predict(Q))).toEqual(Array.from(m.predict(Q)));
    expect(Array.from(back.probabilities!(Q))).toEqual(Array.from(m.probabilities!(Q)));
    const ref = knnRef.fit(X, y, { k: 5 }, ctx);
    expect(Array.from(knnRef.load(JSON.parse(JSON.stringify(ref.toJSON()))).predict(Q))).toEqual(Array.from(ref.predict(Q)));
  });
});
