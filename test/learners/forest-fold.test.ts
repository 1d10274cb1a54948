/**
 * A forest fit that only predicts its fold's test rows (FitContext.predictOnly, fitCartOnFold):
 * the same predictions and probabilities, bit for bit, as the fitted forest, with one tree in
 * memory at a time. Data: the Palmer penguins file shipped by the npm package vega-datasets (CC0;
 * Gorman, Williams & Fraser 2014, PLoS ONE 9(3):e90081): species from the four measurements, and
 * body mass from the other three; even rows train, odd rows test.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { fitCartOnFold } from '../../src/learners/cart/fit-trees.js';
import { forest, isCartModel } from '../../src/learners/forest.js';
import type { FoldView, Matrix, Params, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

const FILE = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'node_modules', 'vega-datasets', 'data', 'penguins.json');
const COLS = ['Beak Length (mm)', 'Beak Depth (mm)', 'Flipper Length (mm)', 'Body Mass (g)'];

function rowsOf(): { x: number[][]; species: string[] } {
  const all = JSON.parse(readFileSync(FILE, 'utf8')) as Record<string, unknown>[];
  const ok = all.filter((r) => COLS.every((c) => typeof r[c] === 'number'));
  return { x: ok.map((r) => COLS.map((c) => r[c] as number)), species: ok.map((r) => String(r.Species)) };
}

const matrix = (rows: number[][]): Matrix => ({ rows: rows.length, cols: rows[0].length, data: Float64Array.from(rows.flat()) });
const foldOf = (test: Matrix): FoldView => ({ label: 'r1.f1', test, columns: [], target: 'y', rawCsv: () => '' });

function problems(): { name: string; train: Matrix; test: Matrix; y: Target }[] {
  const { x, species } = rowsOf();
  const classes = [...new Set(species)].sort();
  const even = x.filter((_, i) => i % 2 === 0);
  const odd = x.filter((_, i) => i % 2 === 1);
  const codes = Int32Array.from(species.filter((_, i) => i % 2 === 0), (s) => classes.indexOf(s));
  const mass = Float64Array.from(even, (r) => r[3]);
  return [
    { name: 'species (classification)', train: matrix(even), test: matrix(odd), y: { task: 'classification', codes, classes } },
    { name: 'body mass (regression)', train: matrix(even.map((r) => r.slice(0, 3))), test: matrix(odd.map((r) => r.slice(0, 3))), y: { task: 'regression', values: mass } },
  ];
}

describe('forest with predictOnly (penguins, vega-datasets)', () => {
  const cases = problems();
  it('has both problems', () => expect(cases).toHaveLength(2));
  for (const { name, train, test, y } of cases) {
    for (const params of [{ trees: 40 }, { trees: 25, sample: '0.5', 'min-leaf': 3 }] as Params[]) {
      it(`${name}, ${JSON.stringify(params)}: the same predictions bit for bit as the fitted forest`, () => {
        const full = forest.fit(train, y, params, { rng: createRng(3), seed: 11 });
        const fold = forest.fit(train, y, params, { rng: createRng(3), seed: 11, fold: foldOf(test), predictOnly: true });
        expect(isCartModel(fold)).toBe(false);
        const a = full.predict(test);
        expect(a.length).toBe(test.rows);
        expect(fold.predict(test)).toEqual(a);
        if (y.task === 'classification') {
          const pa = full.probabilities!(test);
          const pb = fold.probabilities!(test);
          expect(pb.length).toBe(test.rows * y.classes.length);
          // bitwise: every double the same, not just close
          expect(Buffer.from(pb.buffer).equals(Buffer.from(pa.buffer))).toBe(true);
        } else {
          expect(fold.probabilities).toBeUndefined();
          expect(Buffer.from((fold.predict(test) as Float64Array).buffer).equals(Buffer.from((a as Float64Array).buffer))).toBe(true);
        }
      });
    }
  }

  it('predicts test rows coded under the training cuts exactly as the raw thresholds do: NaN, infinities, cut points, values beyond the range', () => {
    const { train, test, y } = cases[0];
    const full = forest.fit(train, y, { trees: 30 }, { rng: createRng(4), seed: 9 });
    if (!isCartModel(full)) throw new Error('a full forest fit is a CartModel');
    // rows at the edges of the codes: every stored threshold itself (x = t goes left, x just above
    // goes right), NaN (left, as x > t is false), both infinities, and values beyond the data
    const t = full.toJSON() as { threshold: number[]; feature: number[] };
    const odd: number[][] = [];
    for (let k = 0; k < t.feature.length && odd.length < 400; k++) {
      const f = t.feature[k];
      if (f < 0) continue;
      const row = Array.from(test.data.subarray(0, 4));
      row[f] = t.threshold[k];
      odd.push(row);
      const up = Array.from(row);
      up[f] = t.threshold[k] + Math.abs(t.threshold[k]) * 1e-15 + 1e-300; // a few ulps above
      odd.push(up);
    }
    expect(odd.length).toBeGreaterThan(100);
    for (const v of [NaN, Infinity, -Infinity, 1e300, -1e300]) for (let j = 0; j < 4; j++) odd.push(COLS.map((_, c) => (c === j ? v : test.data[c])));
    const edge = matrix(odd);
    const fold = forest.fit(train, y, { trees: 30 }, { rng: createRng(4), seed: 9, fold: foldOf(edge), predictOnly: true });
    const pa = full.probabilities!(edge);
    const pb = fold.probabilities!(edge);
    expect(pb.length).toBe(edge.rows * (y.task === 'classification' ? y.classes.length : 0));
    expect(Buffer.from(pb.buffer).equals(Buffer.from(pa.buffer))).toBe(true);
  });

  it('holds one tree at a time: its largest store is the largest tree, not the forest', () => {
    const { train, test, y } = cases[0];
    const s = { trees: 30, depth: 32, minLeaf: 1, features: 'breiman', impurity: 'gini' as const, bins: 255, bootstrap: true, sample: '1' };
    const full = forest.fit(train, y, { trees: 30 }, { rng: createRng(1), seed: 5 });
    if (!isCartModel(full)) throw new Error('a full forest fit is a CartModel');
    const sizes = Array.from(full.treeSizes());
    expect(sizes).toHaveLength(30);
    const out = fitCartOnFold('forest', train, y, s, { rng: createRng(1), seed: 5 }, test);
    expect(out.largestTree).toBe(Math.max(...sizes));
    expect(out.largestTree).toBeLessThan(sizes.reduce((a, b) => a + b, 0) / 10);
  });

  it('makes room for a tree as it grows, not for the 2m - 1 nodes m rows could need', () => {
    // invented for this check: 6,000 rows, the class is x0 > 0 with 3% of labels flipped, so a
    // tree is far smaller than its bound (the bound reserved 27 MB a tree at 10^6 rows)
    const rng = createRng(21);
    const n = 6000;
    const data = new Float64Array(n * 3);
    const codes = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < 3; j++) data[i * 3 + j] = rng.next() * 2 - 1;
      codes[i] = (data[i * 3] > 0 ? 1 : 0) ^ (rng.next() < 0.03 ? 1 : 0);
    }
    const train: Matrix = { rows: n, cols: 3, data };
    const s = { trees: 4, depth: 32, minLeaf: 1, features: 'breiman', impurity: 'gini' as const, bins: 255, bootstrap: true, sample: '1' };
    const out = fitCartOnFold('forest', train, { task: 'classification', codes, classes: ['a', 'b'] }, s, { rng: createRng(1), seed: 5 }, train);
    // about 63% of the rows are drawn at least once, so the bound is about 7,600 nodes
    expect(out.largestTree).toBeGreaterThan(100);
    expect(out.largestTree).toBeLessThan(n / 4);
    expect(out.nodeRoom).toBeLessThanOrEqual(Math.max(1024, 2 * out.largestTree));
  });

  it('refuses other rows and saving', () => {
    const { train, test, y } = cases[0];
    const fold = forest.fit(train, y, { trees: 5 }, { rng: createRng(1), seed: 1, fold: foldOf(test), predictOnly: true });
    const other = matrix([[40, 18, 190, 4000]]);
    expect(() => fold.predict(other)).toThrow('forest: this fit predicted the test rows of fold r1.f1 only (predictOnly) and kept no trees; it cannot predict other rows');
    expect(() => fold.probabilities!(other)).toThrow(/cannot give probabilities for other rows/);
    expect(() => fold.toJSON()).toThrow('forest: a fit made with predictOnly keeps no trees and cannot be saved');
  });
});
