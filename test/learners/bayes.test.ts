/**
 * bayes: probabilities from hand-computed class statistics with Gaussian densities from jstat
 * (jStat.normal.pdf, an independent general-purpose library), and the standard learner checks.
 */
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { bayes } from '../../src/learners/bayes.js';
import { getLearner } from '../../src/learners/index.js';
import { parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import type { Matrix, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

const ctx = { rng: createRng(1), seed: 1 };
// jstat's normal pdf; src/stats/jstat.d.ts (not ours) types only cdf, so the call is typed here
const normalPdf = (x: number, mean: number, sd: number): number =>
  (jStat.normal as unknown as { pdf(x: number, mean: number, sd: number): number }).pdf(x, mean, sd);
const mat = (rows: number[][]): Matrix => ({ rows: rows.length, cols: rows[0].length, data: Float64Array.from(rows.flat()) });

describe('bayes', () => {
  it('matches hand-computed class statistics and Gaussian likelihoods', () => {
    // class a: (0,1), (2,3), (4,2): x1 mean 2, variance (4+0+4)/3 = 8/3; x2 mean 2, variance 2/3
    // class b: (5,0), (7,4):        x1 mean 6, variance 1;            x2 mean 2, variance 4
    // priors 3/5 and 2/5; var-floor 0 so the variances are exactly these
    const X = mat([[0, 1], [2, 3], [4, 2], [5, 0], [7, 4]]);
    const y: Target = { task: 'classification', codes: Int32Array.from([0, 0, 0, 1, 1]), classes: ['a', 'b'] };
    const m = bayes.fit(X, y, { 'var-floor': 0 }, ctx);
    const queries = [[3, 1], [5.5, 2], [0, 0], [9, 9]];
    const p = m.probabilities!(mat(queries));
    expect(p.length).toBe(8);
    const N = (x: number, mu: number, v: number) => normalPdf(x, mu, Math.sqrt(v));
    queries.forEach(([x1, x2], i) => {
      const a = (3 / 5) * N(x1, 2, 8 / 3) * N(x2, 2, 2 / 3);
      const b = (2 / 5) * N(x1, 6, 1) * N(x2, 2, 4);
      expect(Math.abs(p[i * 2] - a / (a + b))).toBeLessThan(1e-12);
      expect(Math.abs(p[i * 2] + p[i * 2 + 1] - 1)).toBeLessThan(1e-15);
    });
    expect(Array.from(m.predict(mat(queries)))).toEqual(queries.map((_, i) => (p[i * 2] >= p[i * 2 + 1] ? 0 : 1)));
  });

  it('adds the variance floor, gives absent classes probability 0, and explains a zero variance', () => {
    // feature constant within each class: only the floor keeps the density finite
    const X = mat([[1], [1], [3], [3]]);
    const codes = Int32Array.from([0, 0, 2, 2]);
    const y: Target = { task: 'classification', codes, classes: ['a', 'b', 'c'] };
    const m = bayes.fit(X, y, { 'var-floor': 0.01 }, ctx);
    // overall variance of x is 1, so the floor is 0.01 and each class variance is 0 + 0.01
    const p = m.probabilities!(mat([[1.5]]));
    const a = 0.5 * normalPdf(1.5, 1, 0.1);
    const c = 0.5 * normalPdf(1.5, 3, 0.1);
    expect(p[1]).toBe(0);
    expect(Math.abs(p[0] - a / (a + c))).toBeLessThan(1e-12);
    expect(() => bayes.fit(X, y, { 'var-floor': 0 }, ctx)).toThrow(/zero variance within a class; set var-floor above 0/);
  });

  it('round-trips through JSON and is deterministic', () => {
    const rng = createRng(3);
    const X: Matrix = { rows: 90, cols: 3, data: Float64Array.from({ length: 270 }, () => rng.next() * 5) };
    const y: Target = { task: 'classification', codes: Int32Array.from({ length: 90 }, (_, i) => (X.data[i * 3] > 2.5 ? 1 : i % 3 === 0 ? 2 : 0)), classes: ['a', 'b', 'c'] };
    const Q: Matrix = { rows: 20, cols: 3, data: Float64Array.from({ length: 60 }, () => rng.next() * 5) };
    const m = bayes.fit(X, y, { 'var-floor': 1e-9 }, ctx);
    const back = bayes.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.probabilities!(Q))).toEqual(Array.from(m.probabilities!(Q)));
    expect(Array.from(back.predict(Q))).toEqual(Array.from(m.predict(Q)));
    expect(Array.from(bayes.fit(X, y, { 'var-floor': 1e-9 }, { rng: createRng(7), seed: 7 }).probabilities!(Q))).toEqual(Array.from(m.probabilities!(Q)));
    expect(() => bayes.load({ learner: 'bayes' })).toThrow(/not a saved bayes model/);
  });

  it('validates its option and its task', () => {
    const l = getLearner('bayes');
    const run = (text: string) => () => resolveParams(l, parseLearnerSpec(text), 'classification');
    expect(run('bayes:var-floor=-1')).toThrow(UsageError);
    expect(run('bayes:var-floor=-1')).toThrow('--learner bayes: var-floor=-1: must be at least 0');
    expect(run('bayes:var-floor=2')).toThrow('--learner bayes: var-floor=2: must be at most 1');
    expect(() => resolveParams(l, parseLearnerSpec('bayes'), 'regression')).toThrow(/does not do regression/);
  });
});
