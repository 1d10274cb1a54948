/**
 * Tests of the `tree` learner (one CART tree, src/learners/tree.ts).
 * References: the npm package ml-cart (DecisionTreeClassifier), a general-purpose CART
 * implementation; the CART definitions of Breiman, Friedman, Olshen & Stone (1984) recomputed
 * by brute force here; seeded synthetic data with a known generating process.
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { tree } from '../../src/learners/tree.js';
import type { Matrix, Target } from '../../src/learning.js';
import { type Rng, createRng } from '../../src/rng.js';

// ml-cart ships no type declarations: load it through require and type the part we use.
interface CartNode {
  splitColumn?: number;
  splitValue?: number;
  distribution?: number[][];
  left?: CartNode;
  right?: CartNode;
}
interface CartClassifier {
  train(X: number[][], y: number[]): void;
  predict(X: number[][]): number[];
  toJSON(): { root: CartNode };
}
const require = createRequire(import.meta.url);
const { DecisionTreeClassifier } = require('ml-cart') as {
  DecisionTreeClassifier: new (options: Record<string, unknown>) => CartClassifier;
};

const ctx = (seed: number) => ({ rng: createRng(seed), seed });

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

function matrix(rows: number[][]): Matrix {
  const p = rows.length ? rows[0].length : 0;
  const data = new Float64Array(rows.length * p);
  rows.forEach((r, i) => data.set(r, i * p));
  return { rows: rows.length, cols: p, data };
}

function classes(codes: number[], C: number): Target {
  return { task: 'classification', codes: Int32Array.from(codes), classes: Array.from({ length: C }, (_, k) => `c${k}`) };
}

interface TreeJson {
  feature: number[];
  threshold: number[];
  left: number[];
  right: number[];
  offset: number[];
  values: number[];
  roots: number[];
}

/** The leaf a row reaches, walking the JSON form independently of the library code. */
function leafOf(j: TreeJson, x: ArrayLike<number>): number {
  let node = j.roots[0];
  while (j.feature[node] >= 0) node = x[j.feature[node]] > j.threshold[node] ? j.right[node] : j.left[node];
  return node;
}

function depthOf(j: TreeJson): number {
  const depth = new Array<number>(j.feature.length).fill(0);
  let max = 0;
  for (let i = 0; i < j.feature.length; i++) {
    if (j.feature[i] >= 0) {
      depth[j.left[i]] = depth[i] + 1;
      depth[j.right[i]] = depth[i] + 1;
      max = Math.max(max, depth[i] + 1);
    }
  }
  return max;
}

/** Two groups on feature 0: class 0 in [0, 1), class 1 in [2, 3); feature 1 is noise. */
function separable(seed: number, n: number): { rows: number[][]; codes: number[] } {
  const rng = createRng(seed);
  const rows: number[][] = [];
  const codes: number[] = [];
  for (let i = 0; i < n; i++) {
    const c = i % 2;
    rows.push([c === 0 ? rng.next() : 2 + rng.next(), 3 * rng.next()]);
    codes.push(c);
  }
  return { rows, codes };
}

/** Two classes split by a circle and a diagonal, no label noise; p = 4 (two noise features). */
function curved(seed: number, n: number): { rows: number[][]; codes: number[] } {
  const rng = createRng(seed);
  const rows: number[][] = [];
  const codes: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = [gauss(rng), gauss(rng), gauss(rng), gauss(rng)];
    rows.push(x);
    codes.push(x[0] * x[0] + x[1] * x[1] < 1.4 || x[0] + x[1] > 2 ? 1 : 0);
  }
  return { rows, codes };
}

/** k folds, stratified: rows of each class shuffled, then dealt round-robin. */
function stratifiedFolds(codes: number[], k: number, seed: number): number[] {
  const rng = createRng(seed);
  const fold = new Array<number>(codes.length).fill(-1);
  const byClass = new Map<number, number[]>();
  codes.forEach((c, i) => {
    const list = byClass.get(c) ?? [];
    list.push(i);
    byClass.set(c, list);
  });
  let next = 0;
  for (const c of [...byClass.keys()].sort((a, b) => a - b)) {
    const list = byClass.get(c) as number[];
    for (let i = list.length - 1; i > 0; i--) {
      const j = rng.int(i + 1);
      [list[i], list[j]] = [list[j], list[i]];
    }
    for (const i of list) fold[i] = next++ % k;
  }
  return fold;
}

describe('tree: one split that separates the classes (reference: ml-cart)', () => {
  const { rows, codes } = separable(11, 40);
  const max0 = Math.max(...rows.filter((_, i) => codes[i] === 0).map((r) => r[0]));
  const min1 = Math.min(...rows.filter((_, i) => codes[i] === 1).map((r) => r[0]));

  it('ours: a depth-1 tree on feature 0, threshold halfway between the groups, pure leaves', () => {
    for (const impurity of ['gini', 'entropy']) {
      const j = tree.fit(matrix(rows), classes(codes, 2), { impurity }, ctx(1)).toJSON() as unknown as TreeJson;
      expect(j.feature.length).toBe(3);
      expect(j.feature[0]).toBe(0);
      expect(depthOf(j)).toBe(1);
      expect(j.threshold[0]).toBeGreaterThan(max0);
      expect(j.threshold[0]).toBeLessThan(min1);
      // Breiman et al. (1984) ch. 2 take the midpoint between neighbouring values
      expect(Math.abs(j.threshold[0] - (max0 + min1) / 2)).toBeLessThan(1e-12);
      const l = j.left[0];
      const r = j.right[0];
      expect(j.values.slice(j.offset[l], j.offset[l] + 2)).toEqual([1, 0]);
      expect(j.values.slice(j.offset[r], j.offset[r] + 2)).toEqual([0, 1]);
    }
  });

  it('ml-cart finds the same split (same column, threshold between the groups, leaf children)', () => {
    const ref = new DecisionTreeClassifier({});
    ref.train(rows, codes);
    const root = (JSON.parse(JSON.stringify(ref.toJSON())) as { root: CartNode }).root;
    expect(root.splitColumn).toBe(0);
    expect(root.splitValue as number).toBeGreaterThan(max0);
    expect(root.splitValue as number).toBeLessThan(min1);
    expect(root.left?.splitColumn).toBeUndefined();
    expect(root.right?.splitColumn).toBeUndefined();
    // ml-cart's leaf distribution is a row of class shares over classes 0..max label in the leaf
    // (summed as 1/n steps, so 1 only to rounding)
    const left = root.left?.distribution as number[][];
    const right = root.right?.distribution as number[][];
    expect(left[0].length).toBe(1);
    expect(Math.abs(left[0][0] - 1)).toBeLessThan(1e-12);
    expect(right[0].length).toBe(2);
    expect(right[0][0]).toBe(0);
    expect(Math.abs(right[0][1] - 1)).toBeLessThan(1e-12);
    // both take the midpoint, so the thresholds agree
    const ours = tree.fit(matrix(rows), classes(codes, 2), {}, ctx(1)).toJSON() as unknown as TreeJson;
    expect(Math.abs(ours.threshold[0] - (root.splitValue as number))).toBeLessThan(1e-12);
  });
});

describe('tree: root split equals the exhaustive Gini search (Breiman et al. 1984; ml-cart)', () => {
  /** Brute force over every feature and every midpoint: the largest Gini decrease. */
  function bruteRoot(rows: number[][], codes: number[], C: number): { feature: number; threshold: number } {
    const n = rows.length;
    const gini = (idx: number[]) => {
      const cnt = new Array<number>(C).fill(0);
      for (const i of idx) cnt[codes[i]]++;
      return idx.length === 0 ? 0 : 1 - cnt.reduce((s, c) => s + (c / idx.length) ** 2, 0);
    };
    const all = rows.map((_, i) => i);
    const parent = gini(all);
    let best = { feature: -1, threshold: NaN, gain: -Infinity };
    for (let f = 0; f < rows[0].length; f++) {
      const vals = [...new Set(rows.map((r) => r[f]))].sort((a, b) => a - b);
      for (let k = 0; k + 1 < vals.length; k++) {
        const t = (vals[k] + vals[k + 1]) / 2;
        const L = all.filter((i) => rows[i][f] <= t);
        const R = all.filter((i) => rows[i][f] > t);
        const gain = parent - (L.length / n) * gini(L) - (R.length / n) * gini(R);
        if (gain > best.gain + 1e-12) best = { feature: f, threshold: t, gain };
      }
    }
    return best;
  }

  it('on three seeded sets of 60 rows, 3 features, 3 classes', () => {
    for (const seed of [21, 22, 23]) {
      const rng = createRng(seed);
      const rows: number[][] = [];
      const codes: number[] = [];
      for (let i = 0; i < 60; i++) {
        const x = [gauss(rng), gauss(rng), gauss(rng)];
        rows.push(x);
        codes.push(x[0] + 0.5 * gauss(rng) > 0.4 ? 2 : x[1] > 0 ? 1 : 0);
      }
      const brute = bruteRoot(rows, codes, 3);
      const j = tree.fit(matrix(rows), classes(codes, 3), {}, ctx(1)).toJSON() as unknown as TreeJson;
      expect(j.feature[0]).toBe(brute.feature);
      expect(Math.abs(j.threshold[0] - brute.threshold)).toBeLessThan(1e-12);
      const ref = new DecisionTreeClassifier({});
      ref.train(rows, codes);
      const root = ref.toJSON().root;
      expect(root.splitColumn).toBe(brute.feature);
      expect(Math.abs((root.splitValue as number) - brute.threshold)).toBeLessThan(1e-12);
    }
  });
});

describe('tree vs ml-cart: accuracy on a seeded set (10-fold cross-validation)', () => {
  it('ours is as accurate as ml-cart or more', () => {
    const { rows, codes } = curved(5, 300);
    const fold = stratifiedFolds(codes, 10, 99);
    let oursRight = 0;
    let refRight = 0;
    for (let k = 0; k < 10; k++) {
      const trainIdx = codes.map((_, i) => i).filter((i) => fold[i] !== k);
      const testIdx = codes.map((_, i) => i).filter((i) => fold[i] === k);
      expect(testIdx.length).toBeGreaterThan(0);
      const m = tree.fit(
        matrix(trainIdx.map((i) => rows[i])),
        classes(trainIdx.map((i) => codes[i]), 2),
        {},
        ctx(k),
      );
      const pred = m.predict(matrix(testIdx.map((i) => rows[i])));
      const ref = new DecisionTreeClassifier({});
      ref.train(trainIdx.map((i) => rows[i]), trainIdx.map((i) => codes[i]));
      const refPred = ref.predict(testIdx.map((i) => rows[i]));
      testIdx.forEach((i, t) => {
        if (pred[t] === codes[i]) oursRight++;
        if (refPred[t] === codes[i]) refRight++;
      });
    }
    const ours = oursRight / rows.length;
    const refAcc = refRight / rows.length;
    expect(ours).toBeGreaterThanOrEqual(refAcc);
    expect(ours).toBeGreaterThan(0.8);
  });
});

describe('tree: regression', () => {
  it('recovers a step function exactly (known generating process)', () => {
    const rng = createRng(4);
    const rows: number[][] = [];
    const y: number[] = [];
    for (let i = 0; i < 200; i++) {
      const x = [rng.next(), rng.next()];
      rows.push(x);
      y.push(x[0] < 0.3 ? -2 : x[0] < 0.7 ? 5 : 1);
    }
    const m = tree.fit(matrix(rows), { task: 'regression', values: Float64Array.from(y) }, {}, ctx(1));
    expect(m.probabilities).toBeUndefined();
    const pred = m.predict(matrix(rows));
    expect(Array.from(pred)).toEqual(y);
    const j = m.toJSON() as unknown as TreeJson;
    expect(j.feature.length).toBe(5); // two splits on feature 0, three leaves
    expect(j.feature.filter((f) => f >= 0)).toEqual([0, 0]);
  });
});

describe('tree: caps, determinism, round trip', () => {
  const { rows, codes } = curved(8, 400);
  const X = matrix(rows);
  const y = classes(codes, 2);

  it('depth is a cap and every leaf holds at least min-leaf training rows', () => {
    for (const [depth, minLeaf] of [
      [2, 1],
      [32, 10],
      [5, 3],
    ]) {
      const j = tree.fit(X, y, { depth, 'min-leaf': minLeaf }, ctx(1)).toJSON() as unknown as TreeJson;
      expect(depthOf(j)).toBeLessThanOrEqual(depth);
      const count = new Map<number, number>();
      for (const r of rows) {
        const leaf = leafOf(j, r);
        count.set(leaf, (count.get(leaf) ?? 0) + 1);
      }
      const leaves = j.feature.filter((f) => f < 0).length;
      expect(count.size).toBe(leaves);
      for (const c of count.values()) expect(c).toBeGreaterThanOrEqual(minLeaf);
    }
  });

  it('a fully grown tree fits noise-free training data exactly', () => {
    const pred = tree.fit(X, y, {}, ctx(1)).predict(X);
    expect(Array.from(pred)).toEqual(codes);
  });

  it('uses no randomness: any seed gives the same tree', () => {
    const a = JSON.stringify(tree.fit(X, y, {}, ctx(1)).toJSON());
    const b = JSON.stringify(tree.fit(X, y, {}, ctx(987654)).toJSON());
    expect(a).toBe(b);
  });

  it('toJSON / load through JSON text gives identical predictions and probabilities', () => {
    const m = tree.fit(X, y, { depth: 6 }, ctx(1));
    const back = tree.load(JSON.parse(JSON.stringify(m.toJSON())));
    const test = matrix(curved(9, 200).rows);
    expect(Array.from(back.predict(test))).toEqual(Array.from(m.predict(test)));
    expect(Array.from(back.probabilities?.(test) ?? [])).toEqual(Array.from(m.probabilities?.(test) ?? [1]));
    const r = tree.fit(X, { task: 'regression', values: Float64Array.from(rows.map((x) => x[0] * 3 + x[2])) }, {}, ctx(1));
    const rb = tree.load(JSON.parse(JSON.stringify(r.toJSON())));
    expect(Array.from(rb.predict(test))).toEqual(Array.from(r.predict(test)));
  });

  it('load rejects a forest model and malformed JSON', () => {
    const j = tree.fit(X, y, { depth: 3 }, ctx(1)).toJSON() as Record<string, unknown>;
    expect(() => tree.load({ ...j, kind: 'forest' })).toThrow(InputError);
    expect(() => tree.load({ ...j, left: (j.left as number[]).map(() => 0) })).toThrow(/children of node 0/);
    expect(() => tree.load('tree')).toThrow(InputError);
  });
});

describe('tree: missing values', () => {
  const { rows, codes } = separable(11, 40);
  it('fit throws InputError naming the row and column of a NaN', () => {
    const bad = rows.map((r) => r.slice());
    bad[6][1] = NaN;
    expect(() => tree.fit(matrix(bad), classes(codes, 2), {}, ctx(1))).toThrow(InputError);
    expect(() => tree.fit(matrix(bad), classes(codes, 2), {}, ctx(1))).toThrow('feature column 2 of row 7 is NaN');
  });
  it('predict sends NaN to the left child (documented rule)', () => {
    const m = tree.fit(matrix(rows), classes(codes, 2), {}, ctx(1));
    // the left group (feature 0 below the threshold) is class 0
    expect(Array.from(m.predict(matrix([[NaN, 1], [2.5, 1]])))).toEqual([0, 1]);
  });
});

describe('tree: options', () => {
  const { rows, codes } = separable(11, 20);
  const fit = (params: Record<string, number | string>) => () => tree.fit(matrix(rows), classes(codes, 2), params, ctx(1));
  it('rejects invalid values with messages naming the option and its limit', () => {
    expect(fit({ depth: 0 })).toThrow(UsageError);
    expect(fit({ depth: 0 })).toThrow('tree: option "depth" must be an integer >= 1, got 0');
    expect(fit({ 'min-leaf': 2.5 })).toThrow('tree: option "min-leaf" must be an integer >= 1, got 2.5');
    expect(fit({ impurity: 'variance' })).toThrow('tree: option "impurity" must be one of gini, entropy, got "variance"');
    expect(fit({ bins: 256 })).toThrow('tree: option "bins" must be an integer between 2 and 255, got 256');
    expect(fit({ trees: 10 })).toThrow('tree: unknown option "trees"');
  });
});
