/**
 * linear: coefficients against the NIST StRD certified values (Norris, Longley), ridge against
 * its one-feature closed form, and the standard learner checks.
 */
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { getLearner } from '../../src/learners/index.js';
import { fitLinear, linear } from '../../src/learners/linear.js';
import { parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import type { Matrix, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';
import { LONGLEY_CERTIFIED, LONGLEY_X, LONGLEY_Y, NORRIS_CERTIFIED, NORRIS_X, NORRIS_Y } from './external/nist-strd.js';

const ctx = { rng: createRng(1), seed: 1 };
const mat = (rows: number[][]): Matrix => ({ rows: rows.length, cols: rows[0].length, data: Float64Array.from(rows.flat()) });
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

function seeded(n: number, p: number, seed: number): { X: Matrix; y: Float64Array } {
  const rng = createRng(seed);
  const X = Float64Array.from({ length: n * p }, () => rng.next() * 10 - 5);
  const y = Float64Array.from({ length: n }, (_, i) => 3 + X[i * p] - 2 * X[i * p + 1] + rng.next());
  return { X: { rows: n, cols: p, data: X }, y };
}

describe('linear', () => {
  it('reproduces the NIST StRD Norris certified coefficients', () => {
    // Source: NIST/ITL StRD, Norris.dat (certified to 15 significant digits). Tolerances: the
    // certified values are rounded to 15 digits (relative 5e-16) and double-precision QR after
    // centring loses a few more; we ask for 12 correct digits (relative 1e-12 on the slope, absolute
    // 1e-12 on the intercept, which is near 0). Measured: 4.7e-15 and 1.3e-13.
    const { intercept, coef } = fitLinear({ rows: 36, cols: 1, data: Float64Array.from(NORRIS_X) }, Float64Array.from(NORRIS_Y), 0);
    expect(rel(coef[0], NORRIS_CERTIFIED.b1)).toBeLessThan(1e-12);
    expect(Math.abs(intercept - NORRIS_CERTIFIED.b0)).toBeLessThan(1e-12);
    // residual sum of squares, certified 26.6173985294224
    let rss = 0;
    NORRIS_X.forEach((x, i) => (rss += (NORRIS_Y[i] - intercept - coef[0] * x) ** 2));
    expect(rel(rss, NORRIS_CERTIFIED.rss)).toBeLessThan(1e-10);
  });

  it('reproduces the NIST StRD Longley certified coefficients (ill-conditioned design)', () => {
    // Source: NIST/ITL StRD, Longley.dat, "higher difficulty" (condition number about 1e7 on the
    // raw scale, from memory). We ask for 11 correct digits of every coefficient (relative 1e-11);
    // measured at most 5.6e-14 (QR on standardised columns, never the normal equations).
    const { intercept, coef } = fitLinear(mat(LONGLEY_X), Float64Array.from(LONGLEY_Y), 0);
    const all = [intercept, ...coef];
    expect(all.length).toBe(LONGLEY_CERTIFIED.length);
    all.forEach((v, i) => expect(rel(v, LONGLEY_CERTIFIED[i])).toBeLessThan(1e-11));
  });

  it('ridge matches the one-feature closed form', () => {
    // Hand derivation: x = 1,2,3,4 has mean 2.5 and population variance 5/4, so z = (x - 2.5)/sd
    // has sum z^2 = n = 4; y = 2,3,5,8 gives sum (x - 2.5) y = 10. The ridge coefficient on z is
    // (10/sd)/(4 + ridge), i.e. slope 10/((5/4)(4 + ridge)) = 8/(4 + ridge) on x, and the
    // intercept is mean(y) - slope * 2.5 = 4.5 - 2.5 * slope.
    const X = mat([[1], [2], [3], [4]]);
    const y = Float64Array.from([2, 3, 5, 8]);
    for (const ridge of [0, 0.5, 4, 100]) {
      const { intercept, coef } = fitLinear(X, y, ridge);
      const slope = 8 / (4 + ridge);
      expect(Math.abs(coef[0] - slope)).toBeLessThan(1e-13);
      expect(Math.abs(intercept - (4.5 - 2.5 * slope))).toBeLessThan(1e-13);
    }
    // ridge = 4: y = 2 + x exactly
    const m = linear.fit(X, { task: 'regression', values: y }, { ridge: 4 }, ctx);
    expect(Array.from(m.predict(mat([[0], [10]]))).map((v) => Math.round(v * 1e12) / 1e12)).toEqual([2, 12]);
  });

  it('ridge satisfies its normal equations on seeded multi-feature data', () => {
    // optimality: Z'(y - ybar - Z b) = ridge * b on the standardised features
    const { X, y } = seeded(60, 4, 3);
    const ridge = 7;
    const { coef } = fitLinear(X, y, ridge);
    const n = X.rows;
    const p = X.cols;
    const mean = new Array(p).fill(0);
    const sd = new Array(p).fill(0);
    for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) mean[j] += X.data[i * p + j] / n;
    for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) sd[j] += (X.data[i * p + j] - mean[j]) ** 2 / n;
    for (let j = 0; j < p; j++) sd[j] = Math.sqrt(sd[j]);
    const b = coef.map((c, j) => c * sd[j]);
    const ybar = y.reduce((s, v) => s + v, 0) / n;
    for (let j = 0; j < p; j++) {
      let g = 0;
      for (let i = 0; i < n; i++) {
        let fit = ybar;
        for (let k = 0; k < p; k++) fit += b[k] * ((X.data[i * p + k] - mean[k]) / sd[k]);
        g += ((X.data[i * p + j] - mean[j]) / sd[j]) * (y[i] - fit);
      }
      expect(Math.abs(g - ridge * b[j])).toBeLessThan(1e-9);
    }
  });

  it('leaves out a collinear or constant column (coefficient 0) and fits the rest', () => {
    const { X, y } = seeded(40, 2, 5);
    // columns: x1, x2, x1 again, a constant
    const wide: Matrix = { rows: 40, cols: 4, data: Float64Array.from({ length: 160 }, (_, t) => {
      const i = Math.floor(t / 4);
      const j = t % 4;
      return j === 3 ? 7 : X.data[i * 2 + (j === 2 ? 0 : j)];
    }) };
    const narrow = fitLinear(X, y, 0);
    const w = fitLinear(wide, y, 0);
    expect(w.coef[2]).toBe(0);
    expect(w.coef[3]).toBe(0);
    expect(Math.abs(w.coef[0] - narrow.coef[0])).toBeLessThan(1e-10);
    expect(Math.abs(w.coef[1] - narrow.coef[1])).toBeLessThan(1e-10);
    expect(Math.abs(w.intercept - narrow.intercept)).toBeLessThan(1e-10);
  });

  it('round-trips through JSON and is deterministic', () => {
    const { X, y } = seeded(50, 3, 8);
    const t: Target = { task: 'regression', values: y };
    const Q = seeded(10, 3, 9).X;
    const m = linear.fit(X, t, { ridge: 0.3 }, ctx);
    const back = linear.load(JSON.parse(JSON.stringify(m.toJSON())));
    expect(Array.from(back.predict(Q))).toEqual(Array.from(m.predict(Q)));
    expect(Array.from(linear.fit(X, t, { ridge: 0.3 }, { rng: createRng(99), seed: 99 }).predict(Q))).toEqual(Array.from(m.predict(Q)));
    expect(() => linear.load({ learner: 'knn' })).toThrow(/not a saved linear model/);
  });

  it('validates its option and its task', () => {
    const l = getLearner('linear');
    const run = (text: string) => () => resolveParams(l, parseLearnerSpec(text), 'regression');
    expect(run('linear:ridge=-1')).toThrow(UsageError);
    expect(run('linear:ridge=-1')).toThrow('--learner linear: ridge=-1: must be at least 0');
    expect(run('linear:ridge=1e13')).toThrow('ridge=1e13: must be at most 1000000000000');
    expect(run('linear:ridg=1')).toThrow(/unknown option "ridg" for linear; did you mean "ridge"/);
    expect(() => resolveParams(l, parseLearnerSpec('linear'), 'classification')).toThrow(/does not do classification/);
    expect(() => linear.fit(mat([[1], [NaN]]), { task: 'regression', values: Float64Array.from([1, 2]) }, { ridge: 0 }, ctx)).toThrow(/row 2, column 1/);
  });
});
