/**
 * logistic: a hand-derived optimum, the optimality (gradient = 0) conditions on seeded data for
 * the binary and the multinomial form, agreement of the two forms on two classes, and the
 * standard learner checks.
 */
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { getLearner } from '../../src/learners/index.js';
import { fitLogistic, logistic } from '../../src/learners/logistic.js';
import { parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import type { Matrix, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

const ctx = { rng: createRng(1), seed: 1 };

function seeded(n: number, p: number, K: number, seed: number): { X: Matrix; codes: Int32Array } {
  const rng = createRng(seed);
  const X = Float64Array.from({ length: n * p }, () => rng.next() * 6 - 3 + 10);
  // noisy classes (not separable): score + uniform noise, cut into K bands
  const codes = Int32Array.from({ length: n }, (_, i) => {
    const s = X[i * p] - 10 + 0.5 * (X[i * p + 1] - 10) + (rng.next() * 4 - 2);
    return Math.min(K - 1, Math.max(0, Math.floor(((s + 4.5) / 9) * K)));
  });
  return { X: { rows: n, cols: p, data: X }, codes };
}

/** Gradient of the penalised objective in the standardised coordinates, computed from scratch. */
function gradientAtFit(X: Matrix, codes: Int32Array, K: number, l2: number, form?: 'reference' | 'symmetric'): number {
  const r = fitLogistic(X, codes, K, l2, 200, form);
  expect(r.converged).toBe(true);
  const { mean, sd, used } = r.std;
  const q = used.length;
  const P = q + 1;
  const rowsK = r.theta.length / P;
  const free = form === 'reference' || (!form && K === 2) ? [1] : Array.from({ length: rowsK }, (_, c) => c);
  let worst = 0;
  const g = new Float64Array(rowsK * P);
  for (let i = 0; i < X.rows; i++) {
    const z = Array.from(used, (j) => (X.data[i * X.cols + j] - mean[j]) / sd[j]);
    const eta = Array.from({ length: rowsK }, (_, c) => r.theta[c * P] + z.reduce((s, v, k) => s + v * r.theta[c * P + 1 + k], 0));
    const tot = eta.reduce((s, e) => s + Math.exp(e), 0);
    for (let c = 0; c < rowsK; c++) {
      const res = Math.exp(eta[c]) / tot - (codes[i] === c ? 1 : 0);
      g[c * P] += res;
      for (let k = 0; k < q; k++) g[c * P + 1 + k] += res * z[k];
    }
  }
  for (const c of free) {
    for (let u = 0; u < P; u++) worst = Math.max(worst, Math.abs(g[c * P + u] + (u > 0 ? l2 * r.theta[c * P + u] : 0)));
  }
  return worst;
}

describe('logistic', () => {
  it('finds the hand-derived optimum of a tiny penalised problem', () => {
    // Rows x = -1 (class 0) and x = +1 (class 1): mean 0, population sd 1, so z = x. By symmetry
    // the intercept is 0 and f(w) = 2 log(1 + e^-w) + (l2/2) w^2, whose minimum solves
    // l2 * w = 2 / (1 + e^w). With l2 = 2: w (1 + e^w) = 1, found here by bisection.
    let lo = 0;
    let hi = 1;
    for (let k = 0; k < 200; k++) {
      const mid = (lo + hi) / 2;
      if (mid * (1 + Math.exp(mid)) - 1 > 0) hi = mid;
      else lo = mid;
    }
    const w = (lo + hi) / 2; // about 0.4011
    const X: Matrix = { rows: 2, cols: 1, data: Float64Array.from([-1, 1]) };
    const y: Target = { task: 'classification', codes: Int32Array.from([0, 1]), classes: ['no', 'yes'] };
    const p = logistic.fit(X, y, { l2: 2, iterations: 100 }, ctx).probabilities!({ rows: 2, cols: 1, data: Float64Array.from([1, 0]) });
    expect(Math.abs(p[1] - 1 / (1 + Math.exp(-w)))).toBeLessThan(1e-12);
    expect(Math.abs(p[2] - 0.5)).toBeLessThan(1e-12); // x = 0: intercept 0
    expect(Math.abs(p[0] + p[1] - 1)).toBeLessThan(1e-15);
  });

  it('binary fit has zero gradient of the penalised objective (seeded data)', () => {
    const { X, codes } = seeded(300, 3, 2, 4);
    expect(new Set(codes).size).toBe(2);
    for (const l2 of [0, 0.1, 5]) expect(gradientAtFit(X, codes, 2, l2)).toBeLessThan(1e-7);
  });

  it('multinomial fit has zero gradient of the penalised objective (seeded data, 4 classes)', () => {
    const { X, codes } = seeded(400, 3, 4, 6);
    expect(new Set(codes).size).toBe(4);
    for (const l2 of [0.1, 3]) expect(gradientAtFit(X, codes, 4, l2)).toBeLessThan(1e-7);
  });

  it('the multinomial form agrees with the binary form on two classes (penalty 2 * l2)', () => {
    // symmetric optimum w_1 = -w_0 = w/2 costs (l2'/2)(|w|^2/4 + |w|^2/4) = (l2'/4)|w|^2, equal to
    // the reference form's (l2/2)|w|^2 when l2' = 2 l2; with l2 = 0 both are the plain MLE
    const { X, codes } = seeded(200, 3, 2, 10);
    const Q = seeded(50, 3, 2, 11).X;
    const y: Target = { task: 'classification', codes, classes: ['a', 'b'] };
    for (const l2 of [0, 0.5, 4]) {
      const bin = fitLogistic(X, codes, 2, l2, 200, 'reference');
      const sym = fitLogistic(X, codes, 2, 2 * l2, 200, 'symmetric');
      const P = bin.std.used.length + 1;
      for (let u = 0; u < P; u++) {
        const wBin = bin.theta[P + u];
        const wSym = sym.theta[P + u] - sym.theta[u];
        expect(Math.abs(wBin - wSym)).toBeLessThan(1e-8);
      }
      // and the learner (reference form) gives probabilities from the same model
      const p = logistic.fit(X, y, { l2, iterations: 100 }, ctx).probabilities!(Q);
      expect(p.length).toBe(100);
    }
  });

  it('gives probability 0 to a class absent from the training rows', () => {
    const { X, codes } = seeded(120, 2, 2, 12);
    const three = Int32Array.from(codes, (c) => (c === 1 ? 2 : 0)); // classes 0 and 2 only
    const m = logistic.fit(X, { task: 'classification', codes: three, classes: ['a', 'b', 'c'] }, { l2: 1, iterations: 100 }, ctx);
    const Q = seeded(20, 2, 2, 13).X;
    const p = m.probabilities!(Q);
    expect(p.length).toBe(60);
    for (let i = 0; i < 20; i++) {
      expect(p[i * 3 + 1]).toBe(0);
      expect(Math.abs(p[i * 3] + p[i * 3 + 2] - 1)).toBeLessThan(1e-12);
    }
    expect(Array.from(m.predict(Q)).every((c) => c === 0 || c === 2)).toBe(true);
    // one class only: that class with probability 1
    const one = logistic.fit(X, { task: 'classification', codes: new Int32Array(120).fill(1), classes: ['a', 'b'] }, { l2: 1, iterations: 100 }, ctx);
    expect(Array.from(one.probabilities!(Q).subarray(0, 2))).toEqual([0, 1]);
  });

  it('round-trips through JSON and is deterministic', () => {
    const { X, codes } = seeded(150, 3, 3, 14);
    const y: Target = { task: 'classification', codes, classes: ['a', 'b', 'c'] };
    const Q = seeded(30, 3, 3, 15).X;
    const m = logistic.fit(X, y, { l2: 1, iterations: 100 }, ctx);
    const back = logistic.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.probabilities!(Q))).toEqual(Array.from(m.probabilities!(Q)));
    expect(Array.from(back.predict(Q))).toEqual(Array.from(m.predict(Q)));
    expect(Array.from(logistic.fit(X, y, { l2: 1, iterations: 100 }, { rng: createRng(5), seed: 5 }).probabilities!(Q))).toEqual(Array.from(m.probabilities!(Q)));
    expect(() => logistic.load({})).toThrow(/not a saved logistic model/);
  });

  it('validates its options and its task', () => {
    const l = getLearner('logistic');
    const run = (text: string) => () => resolveParams(l, parseLearnerSpec(text), 'classification');
    expect(run('logistic:l2=-0.5')).toThrow(UsageError);
    expect(run('logistic:l2=-0.5')).toThrow('--learner logistic: l2=-0.5: must be at least 0');
    expect(run('logistic:iterations=0')).toThrow('--learner logistic: iterations=0: must be at least 1');
    expect(run('logistic:iterations=2.5')).toThrow('iterations=2.5: expected a whole number');
    expect(() => resolveParams(l, parseLearnerSpec('logistic'), 'regression')).toThrow(/does not do regression/);
  });
});

describe('logistic on many columns (issue 25, item 1)', () => {
  it('fits 30 rows x 70,000 columns to zero gradient, where a full Hessian could not be stored', () => {
    // 70,001 parameters: a dense Hessian would need 4.9e9 entries, more than a typed array
    // holds; a method on Hessian-vector products needs memory in the data only
    const { X, codes } = seeded(30, 70_000, 2, 21);
    expect(new Set(codes).size).toBe(2);
    expect(gradientAtFit(X, codes, 2, 1)).toBeLessThan(1e-7);
  });

  it('multinomial on one-hot columns (collinear with the intercept) reaches zero gradient', () => {
    // two categorical columns of 6 levels, one-hot: each block sums to 1, so the standardised
    // columns are exactly collinear and only the penalty makes the optimum unique
    const rng = createRng(33);
    const n = 600;
    const p = 12;
    const data = new Float64Array(n * p);
    const codes = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      const a = rng.int(6);
      const b = rng.int(6);
      data[i * p + a] = 1;
      data[i * p + 6 + b] = 1;
      codes[i] = Math.min(2, Math.floor((a + b + rng.next() * 4) / 4.5));
    }
    expect(new Set(codes).size).toBe(3);
    for (const l2 of [0.01, 1]) expect(gradientAtFit({ rows: n, cols: p, data }, codes, 3, l2)).toBeLessThan(1e-7);
  });
});
