/**
 * Tests of the `forest` learner (random forest, src/learners/forest.ts).
 * References: the npm package ml-random-forest (RandomForestClassifier), the design's reference
 * library; the Palmer penguins data shipped by the npm package vega-datasets (CC0; Gorman,
 * Williams & Fraser 2014, PLoS ONE 9(3):e90081); seeded synthetic data with a known
 * generating process; the published definitions (Breiman 2001; Liaw & Wiener 2002).
 */
import { readFileSync } from 'node:fs';
import { totalmem } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { RandomForestClassifier } from 'ml-random-forest';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { parseFeatureCount, resolveFeatureCount } from '../../src/learners/cart/feature-count.js';
import { parseSampleSize, resolveSampleSize } from '../../src/learners/cart/sample-size.js';
import { forest, isCartModel } from '../../src/learners/forest.js';
import type { Matrix, Target } from '../../src/learning.js';
import { type Rng, createRng } from '../../src/rng.js';

const ctx = (seed: number) => ({ rng: createRng(seed), seed });

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

function matrix(rows: readonly number[][]): Matrix {
  const p = rows.length ? rows[0].length : 0;
  const data = new Float64Array(rows.length * p);
  rows.forEach((r, i) => data.set(r, i * p));
  return { rows: rows.length, cols: p, data };
}

function classes(codes: readonly number[], C: number): Target {
  return { task: 'classification', codes: Int32Array.from(codes), classes: Array.from({ length: C }, (_, k) => `c${k}`) };
}

/** k folds, stratified: rows of each class shuffled, then dealt round-robin. */
function stratifiedFolds(codes: readonly number[], k: number, seed: number): number[] {
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

/** Pooled out-of-fold accuracy of ours and of ml-random-forest with the same number of trees. */
function foldAccuracy(rows: number[][], codes: number[], C: number, k: number, trees: number): { ours: number; ref: number } {
  const fold = stratifiedFolds(codes, k, 2024);
  let ours = 0;
  let ref = 0;
  for (let f = 0; f < k; f++) {
    const tr = codes.map((_, i) => i).filter((i) => fold[i] !== f);
    const te = codes.map((_, i) => i).filter((i) => fold[i] === f);
    expect(te.length).toBeGreaterThan(0);
    const m = forest.fit(matrix(tr.map((i) => rows[i])), classes(tr.map((i) => codes[i]), C), { trees }, ctx(100 + f));
    const pred = m.predict(matrix(te.map((i) => rows[i])));
    // ml-random-forest: noOOB (its out-of-bag pass throws on small data), integer labels,
    // maxFeatures 1.0 = all features per tree (its default), bootstrap samples (its default)
    const rf = new RandomForestClassifier({ nEstimators: trees, noOOB: true, seed: 100 + f, maxFeatures: 1.0 });
    rf.train(tr.map((i) => rows[i]), tr.map((i) => codes[i]));
    const refPred = rf.predict(te.map((i) => rows[i]));
    te.forEach((i, t) => {
      if (pred[t] === codes[i]) ours++;
      if (refPred[t] === codes[i]) ref++;
    });
  }
  return { ours: ours / codes.length, ref: ref / codes.length };
}

function penguins(): { rows: number[][]; codes: number[] } {
  const file = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'node_modules', 'vega-datasets', 'data', 'penguins.json');
  const all = JSON.parse(readFileSync(file, 'utf8')) as Record<string, unknown>[];
  const cols = ['Beak Length (mm)', 'Beak Depth (mm)', 'Flipper Length (mm)', 'Body Mass (g)'];
  const species = new Map<string, number>();
  const rows: number[][] = [];
  const codes: number[] = [];
  for (const r of all) {
    if (!cols.every((c) => typeof r[c] === 'number')) continue;
    const s = String(r.Species);
    if (!species.has(s)) species.set(s, species.size);
    rows.push(cols.map((c) => r[c] as number));
    codes.push(species.get(s) as number);
  }
  return { rows, codes };
}

/** Two classes: a nonlinear rule on features 0-2 with 5% label noise; features 3-5 are noise. */
function synthetic(seed: number, n: number): { rows: number[][]; codes: number[] } {
  const rng = createRng(seed);
  const rows: number[][] = [];
  const codes: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = Array.from({ length: 6 }, () => gauss(rng));
    const c = x[0] + x[1] * x[2] > 0.2 ? 1 : 0;
    rows.push(x);
    codes.push(rng.next() < 0.05 ? 1 - c : c);
  }
  return { rows, codes };
}

describe('forest vs ml-random-forest (10-fold cross-validation, 30 trees each)', () => {
  it('Palmer penguins, species from the four measurements: accuracy within 0.02 of the reference or better', () => {
    const { rows, codes } = penguins();
    // 344 rows in the file, 2 with a missing measurement (counted from the file)
    expect(rows.length).toBe(342);
    const { ours, ref } = foldAccuracy(rows, codes, 3, 10, 30);
    expect(ours).toBeGreaterThanOrEqual(ref - 0.02);
    expect(ours).toBeGreaterThan(0.9);
  });

  it('a seeded synthetic set (300 rows, 6 features): accuracy within 0.02 of the reference or better', () => {
    const { rows, codes } = synthetic(31, 300);
    const { ours, ref } = foldAccuracy(rows, codes, 2, 10, 30);
    expect(ours).toBeGreaterThanOrEqual(ref - 0.02);
  });
});

describe('forest: regression', () => {
  it('out-of-fold RMSE on linear signal plus noise lies between 0.95 and 1.25 noise sd', () => {
    // y = 3 x0 + 2 x1 - 2 x2 + e, x ~ U(0,1)^3, e ~ N(0, 0.5^2), n = 2000, 5 folds.
    // Lower bound: no method beats the noise on average; the RMSE of the noise itself over 2000
    // rows has a relative sd of about 1/sqrt(2n) = 0.016, so 0.95 sd leaves 3 of those.
    // Upper bound: predicting the mean gives sqrt(var f + sd^2) = sqrt(17/12 + 0.25) = 2.6 sd; a
    // forest on 1600 training rows in 3 dimensions should leave an estimation error (bias of its
    // axis-parallel steps plus variance) well under the noise variance: 1.25 sd allows
    // 0.56 sd^2 of it. (Measured when written: 1.07 sd.)
    const sd = 0.5;
    const n = 2000;
    const rng = createRng(77);
    const rows: number[][] = [];
    const y: number[] = [];
    for (let i = 0; i < n; i++) {
      const x = [rng.next(), rng.next(), rng.next()];
      rows.push(x);
      y.push(3 * x[0] + 2 * x[1] - 2 * x[2] + sd * gauss(rng));
    }
    const k = 5;
    let sse = 0;
    for (let f = 0; f < k; f++) {
      const tr = y.map((_, i) => i).filter((i) => i % k !== f);
      const te = y.map((_, i) => i).filter((i) => i % k === f);
      const m = forest.fit(matrix(tr.map((i) => rows[i])), { task: 'regression', values: Float64Array.from(tr.map((i) => y[i])) }, {}, ctx(f));
      expect(m.probabilities).toBeUndefined();
      const pred = m.predict(matrix(te.map((i) => rows[i])));
      te.forEach((i, t) => {
        sse += (pred[t] - y[i]) ** 2;
      });
    }
    const rmse = Math.sqrt(sse / n);
    expect(rmse).toBeGreaterThanOrEqual(0.95 * sd);
    expect(rmse).toBeLessThanOrEqual(1.25 * sd);
  });
});

describe('forest: seeds, prefixes, round trip', () => {
  const { rows, codes } = synthetic(41, 400);
  const X = matrix(rows);
  const y = classes(codes, 2);
  const test = matrix(synthetic(42, 300).rows);

  it('same seed gives identical forests and predictions; a different seed a different forest', () => {
    const a = forest.fit(X, y, { trees: 20 }, ctx(5));
    const b = forest.fit(X, y, { trees: 20 }, ctx(5));
    const c = forest.fit(X, y, { trees: 20 }, ctx(6));
    expect(JSON.stringify(a.toJSON())).toBe(JSON.stringify(b.toJSON()));
    expect(Array.from(a.probabilities?.(test) ?? [])).toEqual(Array.from(b.probabilities?.(test) ?? [1]));
    expect(JSON.stringify(a.toJSON())).not.toBe(JSON.stringify(c.toJSON()));
    expect(Array.from(a.probabilities?.(test) ?? [])).not.toEqual(Array.from(c.probabilities?.(test) ?? []));
  });

  it('the seed is taken from ctx.seed, not from the state of ctx.rng', () => {
    const a = forest.fit(X, y, { trees: 5 }, { rng: createRng(1), seed: 9 });
    const b = forest.fit(X, y, { trees: 5 }, { rng: createRng(2), seed: 9 });
    expect(JSON.stringify(a.toJSON())).toBe(JSON.stringify(b.toJSON()));
  });

  it('the first k trees of a forest are the k-tree forest; prefixes score with them alone', () => {
    const big = forest.fit(X, y, { trees: 12 }, ctx(3));
    const small = forest.fit(X, y, { trees: 5 }, ctx(3));
    expect(isCartModel(big)).toBe(true);
    expect(isCartModel(small)).toBe(true);
    // narrowing only: both were asserted above, so this never skips the checks below
    if (!isCartModel(big) || !isCartModel(small)) throw new Error('forest: expected tree-prefix models');
    expect(big.treeCount).toBe(12);
    expect(Array.from(big.predictPrefix(test, 5))).toEqual(Array.from(small.predict(test)));
    expect(Array.from(big.probabilitiesPrefix?.(test, 5) ?? [])).toEqual(Array.from(small.probabilities?.(test) ?? [1]));
    expect(Array.from(big.predictPrefix(test, 12))).toEqual(Array.from(big.predict(test)));
    expect(Array.from(big.treeSizes().slice(0, 5))).toEqual(Array.from(small.treeSizes()));
    expect(() => big.predictPrefix(test, 0)).toThrow(UsageError);
    expect(() => big.predictPrefix(test, 13)).toThrow('forest: tree count must be an integer between 1 and 12, got 13');
  });

  it('probabilities are the mean over trees of leaf class shares (Breiman 2001), rows sum to 1', () => {
    const m = forest.fit(X, y, { trees: 7, 'min-leaf': 5 }, ctx(8));
    const j = m.toJSON() as { roots: number[]; feature: number[]; threshold: number[]; left: number[]; right: number[]; offset: number[]; values: number[] };
    const probs = m.probabilities?.(test) as Float64Array;
    expect(probs.length).toBe(test.rows * 2);
    for (let i = 0; i < test.rows; i++) {
      const x = test.data.subarray(i * 6, (i + 1) * 6);
      const mean = [0, 0];
      for (const root of j.roots) {
        let node = root;
        while (j.feature[node] >= 0) node = x[j.feature[node]] > j.threshold[node] ? j.right[node] : j.left[node];
        mean[0] += j.values[j.offset[node]] / j.roots.length;
        mean[1] += j.values[j.offset[node] + 1] / j.roots.length;
      }
      expect(Math.abs(probs[2 * i] - mean[0])).toBeLessThan(1e-12);
      expect(Math.abs(probs[2 * i + 1] - mean[1])).toBeLessThan(1e-12);
      expect(Math.abs(probs[2 * i] + probs[2 * i + 1] - 1)).toBeLessThan(1e-12);
    }
    const pred = m.predict(test);
    for (let i = 0; i < test.rows; i++) expect(pred[i]).toBe(probs[2 * i + 1] > probs[2 * i] ? 1 : 0);
  });

  it('toJSON / load through JSON text gives identical predictions (classification and regression)', () => {
    const m = forest.fit(X, y, { trees: 15 }, ctx(1));
    const back = forest.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.predict(test))).toEqual(Array.from(m.predict(test)));
    expect(Array.from(back.probabilities?.(test) ?? [])).toEqual(Array.from(m.probabilities?.(test) ?? [1]));
    const values = Float64Array.from(rows, (x) => Math.sin(3 * x[0]) + x[1] * x[1]);
    const r = forest.fit(X, { task: 'regression', values }, { trees: 15 }, ctx(1));
    const rb = forest.load(JSON.parse(JSON.stringify(r.toJSON())));
    expect(Array.from(rb.predict(test))).toEqual(Array.from(r.predict(test)));
    expect(rb.probabilities).toBeUndefined();
    if (isCartModel(rb) && isCartModel(r)) expect(Array.from(rb.importance())).toEqual(Array.from(r.importance()));
  });

  it('load rejects malformed models with InputError', () => {
    const j = forest.fit(X, y, { trees: 2, depth: 3 }, ctx(1)).toJSON() as Record<string, unknown>;
    expect(() => forest.load(null)).toThrow(InputError);
    expect(() => forest.load({ ...j, format: 'other' })).toThrow('forest: not a forest model: format must be "foldwise-cart"');
    expect(() => forest.load({ ...j, kind: 'tree' })).toThrow(InputError);
    expect(() => forest.load({ ...j, feature: (j.feature as number[]).map(() => 99) })).toThrow(/out of range/);
    expect(() => forest.load({ ...j, threshold: ['x'] })).toThrow(InputError);
  });
});

describe('forest: impurity importance (mean decrease in impurity; Louppe et al. 2013)', () => {
  it('is non-negative, sums to 1 and ranks the only informative feature first', () => {
    const rng = createRng(12);
    const rows: number[][] = [];
    const codes: number[] = [];
    for (let i = 0; i < 500; i++) {
      const x = Array.from({ length: 5 }, () => gauss(rng));
      rows.push(x);
      codes.push(x[2] + 0.3 * gauss(rng) > 0 ? 1 : 0);
    }
    for (const impurity of ['gini', 'entropy']) {
      const m = forest.fit(matrix(rows), classes(codes, 2), { trees: 30, impurity }, ctx(4));
      if (!isCartModel(m)) throw new Error('not a forest model');
      const imp = Array.from(m.importance());
      expect(imp.length).toBe(5);
      expect(Math.abs(imp.reduce((s, v) => s + v, 0) - 1)).toBeLessThan(1e-12);
      for (const v of imp) expect(v).toBeGreaterThanOrEqual(0);
      for (let j = 0; j < 5; j++) if (j !== 2) expect(imp[2]).toBeGreaterThan(imp[j]);
    }
  });
});

describe('forest: missing values', () => {
  const { rows, codes } = synthetic(51, 200);
  it('fit throws InputError on NaN features', () => {
    const bad = rows.map((r) => r.slice());
    bad[3][0] = NaN;
    expect(() => forest.fit(matrix(bad), classes(codes, 2), { trees: 3 }, ctx(1))).toThrow(InputError);
    expect(() => forest.fit(matrix(bad), classes(codes, 2), { trees: 3 }, ctx(1))).toThrow('feature column 1 of row 4 is NaN');
  });
  it('predict sends NaN left at every split, as -Infinity goes', () => {
    const m = forest.fit(matrix(rows), classes(codes, 2), { trees: 10 }, ctx(1));
    const probe = rows.slice(0, 20).map((r) => r.slice());
    const withNaN = probe.map((r) => [NaN, ...r.slice(1)]);
    const withNegInf = probe.map((r) => [-Infinity, ...r.slice(1)]);
    expect(Array.from(m.probabilities?.(matrix(withNaN)) ?? [])).toEqual(Array.from(m.probabilities?.(matrix(withNegInf)) ?? [1]));
  });
  it('predict rejects a matrix with the wrong number of features', () => {
    const m = forest.fit(matrix(rows), classes(codes, 2), { trees: 2 }, ctx(1));
    expect(() => m.predict(matrix([[1, 2, 3]]))).toThrow('forest: model was fitted on 6 features, got 3');
  });
});

describe('forest: options', () => {
  const { rows, codes } = synthetic(61, 60);
  const fit = (params: Record<string, number | string>) => () => forest.fit(matrix(rows), classes(codes, 2), params, ctx(1));

  it('rejects invalid values with messages naming the option and its limit', () => {
    expect(fit({ trees: 0 })).toThrow(UsageError);
    expect(fit({ trees: 0 })).toThrow('forest: option "trees" must be an integer >= 1, got 0');
    expect(fit({ trees: 2.5 })).toThrow('forest: option "trees" must be an integer >= 1, got 2.5');
    expect(fit({ depth: 0 })).toThrow('forest: option "depth" must be an integer >= 1, got 0');
    expect(fit({ 'min-leaf': -1 })).toThrow('forest: option "min-leaf" must be an integer >= 1, got -1');
    expect(fit({ bins: 1 })).toThrow('forest: option "bins" must be an integer between 2 and 255, got 1');
    expect(fit({ impurity: 'mse' })).toThrow('forest: option "impurity" must be one of gini, entropy, got "mse"');
    expect(fit({ features: 'frac:0' })).toThrow('forest: option "features" must be frac:F with 0 < F <= 1, got "frac:0"');
    expect(fit({ features: 'frac:1.5' })).toThrow('frac:F with 0 < F <= 1');
    expect(fit({ features: 'count:0' })).toThrow('forest: option "features" must be count:M with M an integer >= 1, got "count:0"');
    expect(fit({ features: 'count:2.5' })).toThrow('count:M with M an integer >= 1');
    expect(fit({ features: 'half' })).toThrow('forest: option "features" must be breiman, sqrt, log2, all, frac:F');
    expect(fit({ features: 3 })).toThrow('forest: option "features" must be a string, got 3');
    expect(fit({ tree: 3 })).toThrow('forest: unknown option "tree"');
    expect(fit({ tree: 3 })).toThrow('did you mean "trees"');
  });

  it('features: canonical forms and resolved counts', () => {
    expect(parseFeatureCount('SQRT')).toBe('sqrt');
    expect(parseFeatureCount(' frac:0.50 ')).toBe('frac:0.5');
    expect(parseFeatureCount('count:03')).toBe('count:3');
    // breiman: sqrt(p) for classification, p/3 for regression (common practice: Liaw & Wiener 2002)
    expect(resolveFeatureCount('breiman', 20, 'classification')).toBe(4);
    expect(resolveFeatureCount('breiman', 20, 'regression')).toBe(6);
    expect(resolveFeatureCount('breiman', 2, 'regression')).toBe(1);
    expect(resolveFeatureCount('log2', 20, 'classification')).toBe(4);
    expect(resolveFeatureCount('all', 7, 'classification')).toBe(7);
    expect(resolveFeatureCount('frac:0.29', 100, 'classification')).toBe(29);
    expect(resolveFeatureCount('frac:0.01', 10, 'classification')).toBe(1);
    expect(resolveFeatureCount('count:50', 10, 'regression')).toBe(10);
  });

  it('the spec list declares the documented defaults', () => {
    const byName = new Map(forest.params.map((s) => [s.name, s]));
    expect([...byName.keys()]).toEqual(['trees', 'depth', 'min-leaf', 'features', 'impurity', 'bins', 'sample', 'rebalance']);
    expect(byName.get('trees')?.default).toBe(200);
    expect(byName.get('depth')?.default).toBe(32);
    expect(byName.get('min-leaf')?.default).toBe(1);
    expect(byName.get('features')?.default).toBe('breiman');
    expect(byName.get('impurity')?.default).toBe('gini');
    expect(byName.get('sample')?.default).toBe('1');
  });
});

describe('forest: bootstrap sample size (sample, issue 14)', () => {
  const { rows, codes } = synthetic(71, 400);
  const X = matrix(rows);
  const y = classes(codes, 2);
  const Q = matrix(synthetic(72, 100).rows);

  it('reads fractions and counts, and refuses anything else naming the option and its limits', () => {
    expect(parseSampleSize(' 0.10 ')).toBe('0.1');
    expect(parseSampleSize('1.0')).toBe('1');
    expect(parseSampleSize('5000')).toBe('5000');
    for (const bad of ['0', '-0.5', '1.5', '1e400', 'half', '']) expect(() => parseSampleSize(bad)).toThrow(UsageError);
    expect(() => forest.fit(X, y, { sample: '1.5' }, ctx(1))).toThrow(
      'forest: option "sample" must be a fraction F with 0 < F <= 1 of the training rows, or a whole number N >= 2 of rows, got "1.5"',
    );
    expect(resolveSampleSize('0.1', 1000)).toBe(100);
    expect(resolveSampleSize('0.0001', 1000)).toBe(1); // at least one draw
    expect(resolveSampleSize('250', 1000)).toBe(250);
    expect(resolveSampleSize('5000', 1000)).toBe(1000); // capped at the row count
  });

  it('the default (1: n draws) is the forest of Breiman 2001, identical to giving no option', () => {
    const a = forest.fit(X, y, { trees: 15 }, ctx(3));
    const b = forest.fit(X, y, { trees: 15, sample: '1' }, ctx(3));
    const c = forest.fit(X, y, { trees: 15, sample: '400' }, ctx(3));
    expect(Array.from(b.probabilities!(Q))).toEqual(Array.from(a.probabilities!(Q)));
    expect(Array.from(c.probabilities!(Q))).toEqual(Array.from(a.probabilities!(Q)));
  });

  it('N draws give trees on at most N distinct rows: at most 2N - 1 nodes each (a binary tree with at most N leaves)', () => {
    const m = forest.fit(X, y, { trees: 20, sample: '12' }, ctx(5));
    expect(isCartModel(m)).toBe(true);
    if (!isCartModel(m)) throw new Error('not a cart model');
    const sizes = m.treeSizes();
    expect(sizes.length).toBe(20);
    for (const s of sizes) expect(s).toBeLessThanOrEqual(2 * 12 - 1);
    // the full-size forest on the same rows grows trees far larger than that
    const full = forest.fit(X, y, { trees: 20 }, ctx(5));
    if (!isCartModel(full)) throw new Error('not a cart model');
    expect(Math.min(...full.treeSizes())).toBeGreaterThan(2 * 12 - 1);
    // the draw count is kept with the model's settings
    expect(JSON.stringify(m.toJSON())).toContain('["drawsPerTree",12]');
  });

  it('same seed, same smaller forest', () => {
    const a = forest.fit(X, y, { trees: 30, sample: '0.5' }, ctx(9));
    const b = forest.fit(X, y, { trees: 30, sample: '0.5' }, ctx(9));
    expect(Array.from(a.probabilities!(Q))).toEqual(Array.from(b.probabilities!(Q)));
  });
});

describe('forest sizes beyond memory (issue 26)', () => {
  // Mechanics on seeded random rows; the budget is half of os.totalmem() (src/learners/memory-budget.ts).
  const rng = createRng(3);
  const rows = Array.from({ length: 300 }, () => [gauss(rng), gauss(rng), gauss(rng)]);
  const y = classes(rows.map((r) => (r[0] + 0.3 * gauss(rng) > 0 ? 1 : 0)), 2);
  const budget = Math.floor(totalmem() * 0.5);

  it('refuses before any tree when one leaf per tree would already exceed the budget', () => {
    const trees = 1e12; // 24 bytes a node + 2 x 8 bytes a leaf = 40 bytes a tree at least: 40 TB
    expect(() => forest.fit(matrix(rows), y, { trees }, ctx(1))).toThrow(InputError);
    expect(() => forest.fit(matrix(rows), y, { trees }, ctx(1))).toThrow(/^forest: trees=1000000000000 would need at least 40 TB \(one leaf per tree\) for the trees alone, more than the .* one model may use/);
  });

  it('refuses after the first tree when trees of its size would exceed the budget', () => {
    // large enough that trees of the first one's size (tens of nodes, 24 bytes each) exceed the
    // budget, small enough that one leaf per tree does not
    const trees = Math.ceil(budget / 40 / 2);
    expect(trees * 40).toBeLessThan(budget);
    expect(() => forest.fit(matrix(rows), y, { trees }, ctx(1))).toThrow(new RegExp(`^forest: trees=${trees} would need about .* \\(${trees} trees the size of the first, \\d+ nodes\\)`));
  });

  it('still fits a forest whose estimate is inside the budget', () => {
    const m = forest.fit(matrix(rows), y, { trees: 5 }, ctx(1));
    expect(m.predict(matrix(rows.slice(0, 3))).length).toBe(3);
  });
});
