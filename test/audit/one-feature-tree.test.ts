/**
 * The one-feature tree and level table of the single-feature scores.
 * References: the npm package ml-cart (DecisionTreeClassifier and DecisionTreeRegression, a
 * general-purpose CART), fitted on the same one column with the same depth; with equal class
 * counts our class weights are all 1, so both grow plain Gini (or least-squares) trees and
 * should cut at the same places. Seeded continuous data (no ties, no equal gains).
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { fitLevelTable, predictLevelTable } from '../../src/audit/level-table.js';
import { fitOneFeatureTree, predictOneFeatureTree } from '../../src/audit/one-feature-tree.js';
import { balancedAccuracy, classWeights, rSquared } from '../../src/audit/single-feature-scores.js';
import { InputError } from '../../src/errors.js';
import { createRng } from '../../src/rng.js';
import { gauss } from './synthetic.js';

interface CartModel {
  train(X: number[][], y: number[]): void;
  predict(X: number[][]): number[];
}
const require = createRequire(import.meta.url);
const { DecisionTreeClassifier, DecisionTreeRegression } = require('ml-cart') as {
  DecisionTreeClassifier: new (options: Record<string, unknown>) => CartModel;
  DecisionTreeRegression: new (options: Record<string, unknown>) => CartModel;
};

/** Sorted one-column data: x standard normal, class from a noisy threshold rule (balanced by construction). */
function classData(n: number, seed: number, classes: number): { xs: Float64Array; codes: Int32Array } {
  const rng = createRng(seed);
  const rows = Array.from({ length: n }, (_, i) => {
    const c = i % classes;
    return { x: c + 0.8 * gauss(rng), c };
  }).sort((a, b) => a.x - b.x);
  return { xs: Float64Array.from(rows, (r) => r.x), codes: Int32Array.from(rows, (r) => r.c) };
}

describe('one-feature classification tree (reference: ml-cart DecisionTreeClassifier, gini)', () => {
  for (const [depth, classes, seed] of [
    [1, 2, 1],
    [2, 2, 2],
    [3, 3, 3],
    [3, 4, 4],
  ] as const) {
    it(`predicts like ml-cart at depth ${depth} with ${classes} classes`, () => {
      const { xs, codes } = classData(120 * classes, seed, classes);
      const weights = classWeights(codes, classes, Int32Array.from(codes.keys()));
      expect([...weights]).toEqual(new Array(classes).fill(1));
      const tree = fitOneFeatureTree(xs, { task: 'classification', codes, weights }, { maxDepth: depth, minLeaf: 1 }, 0);
      const cart = new DecisionTreeClassifier({ gainFunction: 'gini', maxDepth: depth, minNumSamples: 1 });
      cart.train(Array.from(xs, (x) => [x]), Array.from(codes));
      const probe = classData(300, seed + 100, classes).xs;
      const ours = Array.from(probe, (x) => predictOneFeatureTree(tree, x));
      const theirs = cart.predict(Array.from(probe, (x) => [x]));
      expect(ours.length).toBe(300);
      expect(ours).toEqual(theirs);
      expect(tree.leaves.length).toBeLessThanOrEqual(2 ** depth);
    });
  }

  it('separates two classes split by a gap perfectly with one cut in the gap', () => {
    const xs = Float64Array.of(1, 2, 3, 10, 11, 12);
    const tree = fitOneFeatureTree(xs, { task: 'classification', codes: Int32Array.of(0, 0, 0, 1, 1, 1), weights: Float64Array.of(1, 1) }, { maxDepth: 3, minLeaf: 1 }, 0);
    expect([...tree.cuts]).toEqual([6.5]);
    expect([...tree.leaves]).toEqual([0, 1]);
    expect(predictOneFeatureTree(tree, NaN)).toBe(0);
  });

  it('class weights let a minority class win leaves (balanced accuracy, not accuracy)', () => {
    // 90 rows of class 0 below 0 and above 1, 10 rows of class 1 in between, mixed with 10 of class 0
    const xs: number[] = [];
    const codes: number[] = [];
    for (let i = 0; i < 45; i++) (xs.push(-1 - i / 45), codes.push(0), xs.push(2 + i / 45), codes.push(0));
    for (let i = 0; i < 20; i++) (xs.push(0.1 + i / 25), codes.push(i % 2 ? 1 : 0));
    const order = xs.map((_, i) => i).sort((a, b) => xs[a] - xs[b]);
    const sx = Float64Array.from(order, (i) => xs[i]);
    const sc = Int32Array.from(order, (i) => codes[i]);
    const w = classWeights(sc, 2, Int32Array.from(sc.keys()));
    const tree = fitOneFeatureTree(sx, { task: 'classification', codes: sc, weights: w }, { maxDepth: 2, minLeaf: 1 }, 0);
    expect(predictOneFeatureTree(tree, 0.5)).toBe(1);
    expect(predictOneFeatureTree(tree, -1.5)).toBe(0);
  });

  it('refuses bad limits', () => {
    const y = { task: 'regression' as const, values: Float64Array.of(1) };
    expect(() => fitOneFeatureTree(Float64Array.of(1), y, { maxDepth: -1, minLeaf: 1 }, 0)).toThrow(InputError);
    expect(() => fitOneFeatureTree(Float64Array.of(1), y, { maxDepth: 2, minLeaf: 0 }, 0)).toThrow(/minLeaf 0/);
  });
});

describe('one-feature regression tree (reference: ml-cart DecisionTreeRegression, least squares)', () => {
  for (const [depth, seed] of [
    [1, 11],
    [2, 12],
    [4, 13],
  ] as const) {
    it(`predicts like ml-cart at depth ${depth}`, () => {
      const rng = createRng(seed);
      const rows = Array.from({ length: 200 }, () => {
        const x = 3 * gauss(rng);
        return { x, y: Math.sin(x) + 0.2 * gauss(rng) };
      }).sort((a, b) => a.x - b.x);
      const xs = Float64Array.from(rows, (r) => r.x);
      const values = Float64Array.from(rows, (r) => r.y);
      const tree = fitOneFeatureTree(xs, { task: 'regression', values }, { maxDepth: depth, minLeaf: 1 }, 0);
      const cart = new DecisionTreeRegression({ gainFunction: 'regression', maxDepth: depth, minNumSamples: 1 });
      cart.train(Array.from(xs, (x) => [x]), Array.from(values));
      const probe = Array.from({ length: 150 }, () => 3 * gauss(rng));
      const ours = probe.map((x) => predictOneFeatureTree(tree, x));
      const theirs = cart.predict(probe.map((x) => [x]));
      expect(ours.length).toBe(150);
      for (let i = 0; i < probe.length; i++) expect(Math.abs(ours[i] - theirs[i])).toBeLessThan(1e-9);
    });
  }
});

describe('level table and the scores', () => {
  it('predicts the majority class per level, the fallback for unseen levels, missing as a level', () => {
    const codes = Int32Array.of(0, 0, 0, 1, 1, -1, -1, 2);
    const y = { task: 'classification' as const, codes: Int32Array.of(1, 1, 0, 0, 0, 1, 1, 0), classes: ['a', 'b'] };
    const train = Int32Array.of(0, 1, 2, 3, 4, 5, 6);
    const table = fitLevelTable(codes, 3, y, train, null, 0);
    expect(predictLevelTable(table, 0)).toBe(1);
    expect(predictLevelTable(table, 1)).toBe(0);
    expect(predictLevelTable(table, -1)).toBe(1);
    expect(predictLevelTable(table, 2)).toBe(0); // level 2 is unseen in training
  });

  it('balanced accuracy is the mean recall; skill 0 at chance and 1 when perfect', () => {
    // recall 1 for class 0 (2/2), 1/2 for class 1: BA 0.75, skill (0.75 - 0.5) / 0.5 = 0.5
    const r = balancedAccuracy(Int32Array.of(0, 0, 1, 1), Float64Array.of(0, 0, 1, 0), 2);
    expect(r.score).toBe(0.75);
    expect(r.skill).toBe(0.5);
    expect(balancedAccuracy(Int32Array.of(1, 1), Float64Array.of(1, 1), 2).score).toBeNull();
  });

  it('R^2 is 1 - SSE / SST and undefined for a constant target', () => {
    expect(rSquared(Float64Array.of(1, 2, 3), Float64Array.of(1, 2, 3))).toBe(1);
    expect(rSquared(Float64Array.of(1, 2, 3), Float64Array.of(2, 2, 2))).toBe(0);
    expect(rSquared(Float64Array.of(5, 5), Float64Array.of(1, 2))).toBeNull();
  });
});
