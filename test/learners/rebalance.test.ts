/**
 * rebalance=equal (issue 25, item 18): class weights n_max / n_k in forest, tree and logistic.
 * Outside reference: weighting a row by a whole number m is the same fit as listing that row m
 * times (the weighted likelihood and weighted impurity are sums over rows; King & Zeng 2001,
 * "Logistic regression in rare events data", sec. 4.2), so the weighted fit is checked against
 * the unweighted fit of the replicated rows. The metrics are the project's own, unchanged.
 */
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { classWeights } from '../../src/learners/class-balance.js';
import { forest } from '../../src/learners/forest.js';
import { logistic } from '../../src/learners/logistic.js';
import { tree } from '../../src/learners/tree.js';
import type { Matrix, Params, Target } from '../../src/learning.js';
import { balancedAccuracy } from '../../src/metrics/balanced-accuracy.js';
import { macroRecall } from '../../src/metrics/macro-recall.js';
import { createRng } from '../../src/rng.js';

const ctx = (seed: number) => ({ rng: createRng(seed), seed });

/** Seeded imbalanced two-feature problem: class 1 (about `share` of the rows) sits up and right. */
function imbalanced(n: number, share: number, seed: number): { X: Matrix; codes: Int32Array } {
  const rng = createRng(seed);
  const data = new Float64Array(n * 3);
  const codes = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const c = rng.next() < share ? 1 : 0;
    codes[i] = c;
    data[i * 3] = rng.next() * 4 + (c ? 1.2 : 0);
    data[i * 3 + 1] = rng.next() * 4 + (c ? 1.2 : 0);
    data[i * 3 + 2] = rng.next();
  }
  return { X: { rows: n, cols: 3, data }, codes };
}

/** The rows with every row of class 1 listed m times. */
function replicate(X: Matrix, codes: Int32Array, m: number): { X: Matrix; codes: Int32Array } {
  const rows: number[] = [];
  for (let i = 0; i < X.rows; i++) for (let r = 0; r < (codes[i] === 1 ? m : 1); r++) rows.push(i);
  const data = new Float64Array(rows.length * X.cols);
  rows.forEach((i, k) => data.set(X.data.subarray(i * X.cols, (i + 1) * X.cols), k * X.cols));
  return { X: { rows: rows.length, cols: X.cols, data }, codes: Int32Array.from(rows, (i) => codes[i]) };
}

/** Exactly 4 rows of class 0 for each row of class 1 (so the weight is the whole number 4). */
function ratioFour(n: number, seed: number): { X: Matrix; codes: Int32Array } {
  const { X, codes } = imbalanced(n, 0.2, seed);
  for (let i = 0; i < n; i++) codes[i] = i % 5 === 0 ? 1 : 0;
  for (let i = 0; i < n; i++) if (codes[i] === 1) X.data[i * 3] += 1.5;
  return { X, codes };
}

const target = (codes: Int32Array): Target => ({ task: 'classification', codes, classes: ['common', 'rare'] });

describe('rebalance: class weights', () => {
  it('weighs a row of class k n_max / n_k, absent classes 0', () => {
    const codes = Int32Array.from([0, 0, 0, 0, 0, 0, 1, 1, 1, 3]);
    expect(Array.from(classWeights('tree', 'equal', codes, 4)!)).toEqual([1, 2, 0, 6]);
    expect(classWeights('tree', 'none', codes, 4)).toBeNull();
    expect(() => classWeights('forest', 'equal', null, 1)).toThrow(UsageError);
  });

  it('tree: the weighted tree is the tree of the replicated rows (same probabilities)', () => {
    // 200 rows: fewer distinct values than bins, so both fits cut between every pair of values
    const { X, codes } = ratioFour(200, 3);
    const rep = replicate(X, codes, 4);
    const Q = imbalanced(300, 0.2, 4).X;
    const variants: Params[] = [{}, { 'min-leaf': 3 }, { depth: 3 }];
    for (const params of variants) {
      const weighted = tree.fit(X, target(codes), { ...params, rebalance: 'equal' }, ctx(1)).probabilities!(Q);
      const copied = tree.fit(rep.X, target(rep.codes), params, ctx(1)).probabilities!(Q);
      expect(weighted.length).toBe(600);
      expect(rep.X.rows).toBe(200 + 3 * 40);
      expect(Array.from(weighted)).toEqual(Array.from(copied));
    }
    // and rebalance changes the tree (it is not a no-op on imbalanced rows)
    const plain = tree.fit(X, target(codes), { depth: 3 }, ctx(1)).probabilities!(Q);
    const weighted = tree.fit(X, target(codes), { depth: 3, rebalance: 'equal' }, ctx(1)).probabilities!(Q);
    expect(Array.from(plain)).not.toEqual(Array.from(weighted));
  });

  it('logistic: the weighted fit gives the probabilities of the replicated rows (l2 = 0, the MLE)', () => {
    // with l2 = 0 the fit does not depend on the standardisation, which is fitted on the rows given
    const { X, codes } = ratioFour(300, 5);
    const rep = replicate(X, codes, 4);
    const Q = imbalanced(100, 0.2, 6).X;
    const weighted = logistic.fit(X, target(codes), { l2: 0, rebalance: 'equal' }, ctx(1)).probabilities!(Q);
    const copied = logistic.fit(rep.X, target(rep.codes), { l2: 0 }, ctx(1)).probabilities!(Q);
    expect(weighted.length).toBe(200);
    let worst = 0;
    for (let i = 0; i < weighted.length; i++) worst = Math.max(worst, Math.abs(weighted[i] - copied[i]));
    expect(worst).toBeLessThan(1e-8);
  });

  it('forest: on 5% positives, equal weights raise hold-out balanced accuracy and macro recall (same seed); deterministic', () => {
    const train = imbalanced(2000, 0.05, 7);
    const test = imbalanced(4000, 0.05, 8);
    const score = (rebalance: string) => {
      const m = forest.fit(train.X, target(train.codes), { trees: 40, 'min-leaf': 20, rebalance }, ctx(2));
      const predicted = m.predict(test.X) as Int32Array;
      return { bal: balancedAccuracy({ actual: test.codes, predicted, classes: 2 }), rec: macroRecall({ actual: test.codes, predicted, classes: 2 }), predicted };
    };
    const none = score('none');
    const equal = score('equal');
    expect(equal.bal).toBeGreaterThan(none.bal + 0.05);
    expect(equal.rec).toBeGreaterThan(none.rec + 0.05);
    expect(Array.from(score('equal').predicted)).toEqual(Array.from(equal.predicted));
  });

  it('refuses rebalance on regression and unknown values, naming the option', () => {
    const X: Matrix = { rows: 4, cols: 1, data: Float64Array.from([1, 2, 3, 4]) };
    const y: Target = { task: 'regression', values: Float64Array.from([1, 2, 3, 4]) };
    expect(() => forest.fit(X, y, { rebalance: 'equal' }, ctx(1))).toThrow('forest: option "rebalance" applies to classification only');
    expect(() => tree.fit(X, target(Int32Array.from([0, 1, 0, 1])), { rebalance: 'inverse' }, ctx(1))).toThrow(
      'tree: option "rebalance" must be one of none, equal, got "inverse"',
    );
  });
});
