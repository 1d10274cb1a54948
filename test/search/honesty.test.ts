/**
 * Is the nested estimate honest? Seeded synthetic data with a known generating process.
 *
 * Pure noise: labels drawn independently of the features, so every model's true accuracy is
 * exactly 0.5. Varma & Simon (2006, "Bias in error estimation when using cross-validation for
 * model selection", BMC Bioinformatics 7:91) showed that the cross-validated score of the
 * candidate chosen by that same cross-validation is optimistic, while nested cross-validation
 * is nearly unbiased. The test reproduces both halves of that finding with tune.
 *
 * Signal: the "known best k range" comes from the generating process, not from cross-validation:
 * each k's true accuracy when fitted on all rows is measured on a large fresh sample of the same
 * process, and the range is the set of k within a margin of the best one.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import type { Table } from '../../src/data/types.js';
import { nearest, predictFromNeighbours } from '../../src/learners/knn.js';
import type { Matrix } from '../../src/learning.js';
import { type Rng, createRng, shuffleInPlace } from '../../src/rng.js';
import { tune } from '../../src/search/tune.js';

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

async function csvTable(X: number[][], y: number[], name: string): Promise<Table> {
  const p = X[0].length;
  const lines = [[...Array.from({ length: p }, (_, j) => `x${j}`), 'label'].join(',')];
  X.forEach((row, i) => lines.push(`${row.map((v) => v.toFixed(6)).join(',')},${y[i] ? 'b' : 'a'}`));
  return loadCsv({ text: `${lines.join('\n')}\n`, name });
}

/** n rows of p N(0,1) features; exactly n/2 labels of each class, shuffled independently of X. */
async function noise(n: number, p: number, seed: number): Promise<Table> {
  const rng = createRng(seed);
  const X = Array.from({ length: n }, () => Array.from({ length: p }, () => gauss(rng)));
  const y = Array.from(shuffleInPlace(Int32Array.from({ length: n }, (_, i) => (i < n / 2 ? 1 : 0)), rng));
  return csvTable(X, y, `noise-${seed}.csv`);
}

describe('nested selection on pure noise (Varma & Simon 2006)', () => {
  it('the nested outer mean accuracy stays near 0.5, while the best inner mean of the non-nested search is above it', async () => {
    const seeds = [1, 2, 3, 4, 5, 6];
    const nested: number[] = [];
    const nonNested: number[] = [];
    for (const seed of seeds) {
      const table = await noise(300, 5, 1000 + seed);
      const r = tune(table, {
        target: 'label',
        // 20 values of k x 2 weightings = 40 candidates
        learners: ['knn:k=1..39+2,vote=equal|inverse'],
        metrics: ['accuracy'],
        seed,
        timing: false,
      });
      expect(r.candidates.length).toBe(40);
      nested.push(r.outer.summary.accuracy!.mean);
      // the non-nested figure: the best inner mean of the search over all rows, i.e. what one
      // would report after picking the candidate by the same cross-validation
      nonNested.push(r.recommendation.bestInnerMean);
    }
    const avg = (xs: number[]) => xs.reduce((s, v) => s + v, 0) / xs.length;
    const nestedMean = avg(nested);
    const nonNestedMean = avg(nonNested);
    // measured with these seeds: nested outer mean accuracy 0.5011 (per dataset 0.493, 0.537,
    // 0.483, 0.510, 0.463, 0.520); non-nested best inner mean 0.5333 (0.523, 0.513, 0.537,
    // 0.543, 0.523, 0.560): optimistic by 0.032 although no candidate can beat 0.5
    expect(Math.abs(nestedMean - 0.5)).toBeLessThan(0.03);
    expect(nonNestedMean).toBeGreaterThan(nestedMean);
    // the optimism is not a rounding effect: every single non-nested figure is above 0.5
    expect(nonNested.every((v) => v > 0.5)).toBe(true);
    expect(nonNestedMean - nestedMean).toBeGreaterThan(0.02);
  });
});

/**
 * Signal: two features uniform on [0, 1]^2, class 1 when exactly one of x0, x1 exceeds 0.5 (an
 * exclusive-or checkerboard), each label flipped with probability 0.2 (Bayes accuracy 0.8), and
 * one feature of pure noise. Small k follows the flipped labels; large k averages across the
 * squares and falls towards 0.5 (every square has opposite neighbours).
 */
function signalRows(n: number, rng: Rng): { X: number[][]; y: number[] } {
  const X: number[][] = [];
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    const row = Array.from({ length: 3 }, () => rng.next());
    const c = row[0] > 0.5 !== row[1] > 0.5 ? 1 : 0;
    X.push(row);
    y.push(rng.next() < 0.2 ? 1 - c : c);
  }
  return { X, y };
}

describe('nested selection on a signal with a known best range of k', () => {
  it('recommends a k whose true accuracy (from the generating process) is within 0.02 of the best k', async () => {
    const train = signalRows(400, createRng(77));
    const fresh = signalRows(10_000, createRng(78));
    const ks = Array.from({ length: 50 }, (_, i) => 1 + 4 * i); // 1, 5, ..., 197
    // True accuracy of each k fitted on all 400 rows, measured on 10,000 fresh rows of the same
    // process, on features standardised with the training rows' mean and sd as tune does. One
    // neighbour list for k = 197 scores every k (predictFromNeighbours equals knn exactly; see
    // knn-shared.test.ts).
    const cols = 3;
    const mean = Array.from({ length: cols }, (_, j) => train.X.reduce((s, r) => s + r[j], 0) / train.X.length);
    const sd = Array.from({ length: cols }, (_, j) => Math.sqrt(train.X.reduce((s, r) => s + (r[j] - mean[j]) ** 2, 0) / train.X.length));
    const mat = (rows: number[][]): Matrix => ({ rows: rows.length, cols, data: Float64Array.from(rows.flatMap((r) => r.map((v, j) => (v - mean[j]) / sd[j]))) });
    const K = ks[ks.length - 1];
    const list = { ...nearest(mat(train.X), mat(fresh.X), K), stride: K, rows: fresh.y.length };
    const truth = new Map<number, number>();
    for (const k of ks) {
      const pred = predictFromNeighbours(list, Float64Array.from(train.y), train.y.length, 2, k, 'equal').predicted;
      let hit = 0;
      for (let i = 0; i < fresh.y.length; i++) if (pred[i] === fresh.y[i]) hit++;
      truth.set(k, hit / fresh.y.length);
    }
    const bestTrue = Math.max(...truth.values());
    const goodRange = ks.filter((k) => truth.get(k)! >= bestTrue - 0.02);
    // measured: best true accuracy 0.7626; the range within 0.02 is k = 9 to 93; k = 1 and the
    // largest k fall outside. tune recommended k = 45 (best, true accuracy 0.7574) and k = 61
    // (one-se, 0.7578); the outer folds picked k = 13, 25, 29, 21, 29 (best) and 53, 41, 41, 33,
    // 29 (one-se)
    expect(Math.min(...goodRange)).toBeGreaterThan(1);
    expect(Math.max(...goodRange)).toBeLessThan(150);
    const table = await csvTable(train.X, train.y, 'signal.csv');
    for (const pick of ['best', 'one-se'] as const) {
      const r = tune(table, { target: 'label', learners: [`knn:k=${ks.join('|')}`], metrics: ['accuracy'], pick, seed: 5, timing: false });
      const k = Number(r.recommendation.params.k);
      expect(goodRange).toContain(k);
      // and every outer fold's pick lands there too
      const outerKs = r.outer.folds.map((f) => Number(r.candidates[f.pick].params.k));
      expect(outerKs.length).toBe(5);
      for (const ok of outerKs) expect(goodRange).toContain(ok);
    }
  });
});
