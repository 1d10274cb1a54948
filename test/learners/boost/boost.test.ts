/**
 * The `boost` learner against published worked rules:
 * - Friedman (2001), "Greedy function approximation: a gradient boosting machine", Ann. Statist.
 *   29(5):1189-1232: the boosting loop (Algorithm 1), F_0 = the loss minimiser (mean for squared
 *   loss, median for absolute loss, log-odds for two classes), LAD_TreeBoost leaf = median of
 *   the leaf's residuals (Algorithm 3).
 * - Chen & Guestrin (2016), "XGBoost: a scalable tree boosting system", KDD: leaf value
 *   -G / (H + lambda) (eq. 5) and split gain 1/2 [G_L^2/(H_L+l) + G_R^2/(H_R+l) - G^2/(H+l)]
 *   (eq. 7). The one-round examples below were computed by hand from these formulas; every
 *   number is written out in the comments.
 */
import { describe, expect, it } from 'vitest';
import { boost } from '../../../src/learners/boost/learner.js';
import { type BoostModel, isBoostModel } from '../../../src/learners/boost/model.js';
import { innerSplit } from '../../../src/learners/boost/stop.js';
import { getLearner } from '../../../src/learners/index.js';
import { parseLearnerSpec, resolveParams } from '../../../src/learners/spec.js';
import type { Matrix, Params, Target } from '../../../src/learning.js';
import { createRng } from '../../../src/rng.js';

const col = (xs: number[]): Matrix => ({ rows: xs.length, cols: 1, data: Float64Array.from(xs) });
const reg = (ys: number[]): Target => ({ task: 'regression', values: Float64Array.from(ys) });
const cls = (codes: number[], classes = ['a', 'b']): Target => ({ task: 'classification', codes: Int32Array.from(codes), classes });

function fit(X: Matrix, y: Target, params: Params, seed = 1): BoostModel {
  const m = boost.fit(X, y, params, { rng: createRng(seed), seed });
  if (!isBoostModel(m)) throw new Error('not a boost model');
  return m;
}

/** One tree, one split, step 1: the hand-computed settings. */
const ONE_SPLIT: Params = { rounds: 1, step: 1, depth: 1, 'leaf-rows': 1, ridge: 1 };

function rootOf(m: BoostModel): { feature: number; threshold: number } {
  const t = m.parts.trees!;
  return { feature: t.feature[0], threshold: t.threshold[0] };
}

const close = (a: number, b: number, tol = 1e-9) => expect(Math.abs(a - b)).toBeLessThan(tol);

describe('boost: one round, one split, computed by hand (Chen & Guestrin 2016 eq. 5 and 7)', () => {
  it('squared loss: x = 1..4, y = 1, 2, 10, 11, lambda = 1', () => {
    // F0 = mean = 6; g = F0 - y = 5, 4, -4, -5; h = 1 each; G = 0, H = 4.
    // x <= 1.5: G_L = 5, H_L = 1, G_R = -5, H_R = 3: gain = (25/2 + 25/4)/2 = 9.375
    // x <= 2.5: G_L = 9, H_L = 2, G_R = -9, H_R = 2: gain = (81/3 + 81/3)/2 = 27 (the best)
    // x <= 3.5: 9.375 by symmetry. Leaves: -9/(2+1) = -3 and 9/3 = 3, so predictions 3, 3, 9, 9.
    const m = fit(col([1, 2, 3, 4]), reg([1, 2, 10, 11]), ONE_SPLIT);
    expect(rootOf(m)).toEqual({ feature: 0, threshold: 2.5 });
    const pred = m.predict(col([1, 2, 3, 4]));
    expect(pred.length).toBe(4);
    [3, 3, 9, 9].forEach((v, i) => close(pred[i], v));
    close(m.gainTotals()[0], 27);
    expect(Array.from(m.importance())).toEqual([1]);
  });

  it('logistic loss: x = 1..5, classes 0, 0, 1, 1, 1, lambda = 1', () => {
    // F0 = log(0.6/0.4) = 0.4054651; p = 0.6, g = p - y = 0.6, 0.6, -0.4, -0.4, -0.4; h = 0.24 each.
    // x <= 1.5: (0.36/1.24 + 0.36/1.96)/2 = 0.2369980
    // x <= 2.5: G_L = 1.2, H_L = 0.48, G_R = -1.2, H_R = 0.72: (1.44/1.48 + 1.44/1.72)/2 = 0.9050911 (best)
    // x <= 3.5: (0.64/1.72 + 0.64/1.48)/2 = 0.4022627;  x <= 4.5: (0.16/1.96 + 0.16/1.24)/2 = 0.1053325
    // leaves: -1.2/1.48 = -0.8108108 and 1.2/1.72 = 0.6976744
    const m = fit(col([1, 2, 3, 4, 5]), cls([0, 0, 1, 1, 1]), ONE_SPLIT);
    expect(rootOf(m)).toEqual({ feature: 0, threshold: 2.5 });
    close(m.gainTotals()[0], 0.9050911, 1e-7);
    const sig = (f: number) => 1 / (1 + Math.exp(-f));
    const proba = m.probabilities!(col([1, 5]));
    expect(proba.length).toBe(4);
    close(proba[1], sig(0.4054651 - 0.8108108), 1e-7);
    close(proba[3], sig(0.4054651 + 0.6976744), 1e-7);
    close(proba[0] + proba[1], 1, 1e-12);
    expect(Array.from(m.predict(col([1, 5])))).toEqual([0, 1]);
  });

  it('absolute loss: the leaf is the median of its residuals (Friedman 2001, Algorithm 3)', () => {
    // F0 = median(1, 2, 9, 10, 11, 30) = 9.5; residuals -8.5, -7.5, -0.5, 0.5, 1.5, 20.5; the tree
    // fits their signs, so it splits at x <= 3.5; leaf medians -7.5 and 1.5 give 2 and 11.
    const m = fit(col([1, 2, 3, 4, 5, 6]), reg([1, 2, 9, 10, 11, 30]), { ...ONE_SPLIT, loss: 'absolute' });
    expect(rootOf(m)).toEqual({ feature: 0, threshold: 3.5 });
    const pred = m.predict(col([1, 6]));
    close(pred[0], 2);
    close(pred[1], 11);
  });
});

describe('boost: Huber loss (Friedman 2001, Algorithm 4, M_TreeBoost)', () => {
  it('with the threshold at the largest residual nothing is clipped and a leaf takes its mean residual', () => {
    // F0 = median = 9.5; residuals -8.5, -7.5, -0.5, 0.5, 1.5, 20.5; huber-quantile 1 puts delta at
    // 20.5, so g = -residual. Gains (lambda 1) of x <= 1.5 .. 5.5: 33.0, 88.5, 94.7, 103.7, 120.0;
    // the best isolates the last row. Left leaf: median -0.5 + mean(-8, -7, 0, 1, 2) = -2.9 (the
    // mean residual), so 6.6; right leaf: 20.5, so 30.
    const m = fit(col([1, 2, 3, 4, 5, 6]), reg([1, 2, 9, 10, 11, 30]), { ...ONE_SPLIT, loss: 'huber', 'huber-quantile': 1 });
    expect(rootOf(m)).toEqual({ feature: 0, threshold: 5.5 });
    const pred = m.predict(col([1, 6]));
    close(pred[0], 6.6, 1e-12);
    close(pred[1], 30, 1e-12);
  });

  it('a lower quantile clips the outlier: its leaf moves by at most delta from the median', () => {
    // huber-quantile 0.5: delta = median of |residuals| 0.5, 0.5, 1.5, 7.5, 8.5, 20.5 = 4.5 (type 7);
    // g = -clip(r, 4.5) = 4.5, 4.5, 0.5, -0.5, -1.5, -4.5. With leaf-rows 2 the gains of
    // x <= 2.5, 3.5, 4.5 are 16.457, 15.920, 13.457: split at 2.5. Left leaf: residuals -8.5, -7.5,
    // median -8, clipped deviations -0.5, 0.5: value -8, so 1.5. Right leaf: residuals -0.5, 0.5,
    // 1.5, 20.5, median 1, deviations -1.5, -0.5, 0.5, 19.5 clipped to 4.5: mean 0.75, value 1.75,
    // so 11.25 (unclipped it would be 14.5).
    const m = fit(col([1, 2, 3, 4, 5, 6]), reg([1, 2, 9, 10, 11, 30]), { ...ONE_SPLIT, loss: 'huber', 'huber-quantile': 0.5, 'leaf-rows': 2 });
    expect(rootOf(m)).toEqual({ feature: 0, threshold: 2.5 });
    const pred = m.predict(col([1, 6]));
    close(pred[0], 1.5, 1e-12);
    close(pred[1], 11.25, 1e-12);
  });
});

describe('boost: base score and exact fits (Friedman 2001, F_0 and Algorithm 1)', () => {
  it('zero rounds gives the training mean (squared), the median (absolute, huber)', () => {
    const X = col([1, 2, 3, 4, 5]);
    const y = reg([1, 2, 3, 4, 20]);
    expect(Array.from(fit(X, y, { rounds: 0 }).predict(col([0, 9])))).toEqual([6, 6]);
    expect(Array.from(fit(X, y, { rounds: 0, loss: 'absolute' }).predict(col([0])))).toEqual([3]);
    expect(Array.from(fit(X, y, { rounds: 0, loss: 'huber' }).predict(col([0])))).toEqual([3]);
  });

  it('zero rounds gives the training shares: log-odds for two classes, log shares for more', () => {
    const two = fit(col([1, 2, 3, 4]), cls([0, 1, 1, 1]), { rounds: 0 });
    close(two.parts.base[0], Math.log(0.75 / 0.25), 1e-12);
    const p2 = two.probabilities!(col([7]));
    close(p2[0], 0.25, 1e-12);
    close(p2[1], 0.75, 1e-12);
    const three = fit(col([1, 2, 3, 4, 5]), cls([0, 1, 1, 2, 2], ['a', 'b', 'c']), { rounds: 0 });
    const p3 = three.probabilities!(col([7]));
    expect(p3.length).toBe(3);
    [0.2, 0.4, 0.4].forEach((v, k) => close(p3[k], v, 1e-12));
  });

  it('a class the training rows lack gets share 1/(2n), not zero (the floor)', () => {
    const m = fit(col([1, 2, 3, 4]), cls([0, 0, 2, 2], ['a', 'b', 'c']), { rounds: 0 });
    const p = m.probabilities!(col([0]));
    // shares 0.5, 1/8 (floored), 0.5 before softmax renormalises them to 0.5/1.125 etc.
    close(p[1], 0.125 / 1.125, 1e-12);
    expect(p[1]).toBeGreaterThan(0);
  });

  it('step 1, one round, no penalty on a one-feature step function fits exactly', () => {
    const xs = Array.from({ length: 20 }, (_, i) => i);
    const ys = xs.map((x) => (x < 8 ? -3.25 : 4.5));
    const m = fit(col(xs), reg(ys), { ...ONE_SPLIT, ridge: 0 });
    const pred = m.predict(col(xs));
    expect(pred.length).toBe(20);
    for (let i = 0; i < 20; i++) close(pred[i], ys[i], 1e-12);
    expect(rootOf(m).threshold).toBe(7.5);
  });

  it('depth 2, four leaves, step 1, no penalty fits a function with a different split in each half exactly', () => {
    // y = x1 > 0.3 ? 1 : 0 where x0 <= 0.5, and x1 > 0.7 ? 5 : 3 where x0 > 0.5: the children need
    // their own histograms (one built from rows, the other by subtraction) to find 0.3 and 0.7
    const xs: number[] = [];
    const ys: number[] = [];
    for (let a = 0; a < 10; a++) {
      for (let b = 0; b < 20; b++) {
        const x0 = (a + 0.5) / 10;
        const x1 = (b + 0.5) / 20;
        xs.push(x0, x1);
        ys.push(x0 <= 0.5 ? (x1 > 0.3 ? 1 : 0) : x1 > 0.7 ? 5 : 3);
      }
    }
    const X = { rows: 200, cols: 2, data: Float64Array.from(xs) };
    const m = fit(X, reg(ys), { rounds: 1, step: 1, depth: 2, leaves: 4, 'leaf-rows': 1, ridge: 0 });
    const pred = m.predict(X);
    expect(pred.length).toBe(200);
    for (let i = 0; i < 200; i++) close(pred[i], ys[i], 1e-12);
  });

  it('depth 1 on data with one informative split among noise features finds it', () => {
    const rng = createRng(5);
    const n = 400;
    const p = 6;
    const data = new Float64Array(n * p);
    for (let i = 0; i < n * p; i++) data[i] = rng.next();
    const X = { rows: n, cols: p, data };
    const noisy = (i: number) => (data[i * p + 3] > 0.62 ? 1 : 0) ^ (rng.next() < 0.1 ? 1 : 0);
    const codes = Array.from({ length: n }, (_, i) => noisy(i));
    for (const y of [cls(codes), reg(codes.map((c) => 2 * c + 0.3 * rng.next()))]) {
      const m = fit(X, y, { rounds: 1, depth: 1, step: 1 });
      const root = rootOf(m);
      expect(root.feature).toBe(3);
      expect(Math.abs(root.threshold - 0.62)).toBeLessThan(0.02);
      expect(m.parts.trees!.feature.length).toBe(3); // one split, two leaves
    }
  });
});

function synthetic(task: 'classification' | 'regression' | 'three', n: number, seed: number): { X: Matrix; y: Target } {
  const rng = createRng(seed);
  const p = 5;
  const data = Float64Array.from({ length: n * p }, () => rng.next() * 4 - 2);
  const f = (i: number) => data[i * p] + data[i * p + 1] * data[i * p + 2] + 0.4 * rng.next();
  const X = { rows: n, cols: p, data };
  if (task === 'regression') return { X, y: reg(Array.from({ length: n }, (_, i) => f(i))) };
  if (task === 'classification') return { X, y: cls(Array.from({ length: n }, (_, i) => (f(i) > 0 ? 1 : 0))) };
  return { X, y: cls(Array.from({ length: n }, (_, i) => (f(i) > 0.7 ? 2 : f(i) > -0.7 ? 1 : 0)), ['a', 'b', 'c']) };
}

describe('boost: determinism, prefixes, round trip', () => {
  const random: Params = { rounds: 30, 'row-share': 0.6, 'feature-share': 0.5 };

  it('the same seed gives identical predictions; another seed changes the draws', () => {
    for (const task of ['classification', 'regression', 'three'] as const) {
      const { X, y } = synthetic(task, 300, 3);
      const a = fit(X, y, random, 11);
      const b = fit(X, y, random, 11);
      const c = fit(X, y, random, 12);
      const out = (m: BoostModel) => Array.from(task === 'regression' ? m.predict(X) : m.probabilities!(X));
      expect(out(b)).toEqual(out(a));
      expect(out(c)).not.toEqual(out(a));
    }
  });

  it('the first r rounds of a fit are exactly the fit of r rounds (with row and feature draws)', () => {
    for (const task of ['classification', 'regression', 'three'] as const) {
      const { X, y } = synthetic(task, 250, 4);
      const long = fit(X, y, random, 9);
      for (const r of [0, 1, 7, 30]) {
        const short = fit(X, y, { ...random, rounds: r }, 9);
        expect(Array.from(long.predictRounds(X, r))).toEqual(Array.from(short.predict(X)));
        if (task !== 'regression') expect(Array.from(long.probaRounds!(X, r))).toEqual(Array.from(short.probabilities!(X)));
      }
      const [s0, s7] = long.scoresAt(X, [0, 7]);
      expect(s0.length).toBe(X.rows * long.parts.width);
      expect(Array.from(s7)).not.toEqual(Array.from(s0));
    }
  });

  it('toJSON / load through JSON text gives an equal model, also for zero rounds and softmax', () => {
    for (const [task, params] of [
      ['three', random],
      ['regression', { ...random, loss: 'huber' }],
      ['classification', { rounds: 0 }],
    ] as const) {
      const { X, y } = synthetic(task, 200, 6);
      const m = fit(X, y, params as Params);
      const back = boost.load(JSON.parse(JSON.stringify(m.toJSON())));
      expect(Array.from(back.predict(X))).toEqual(Array.from(m.predict(X)));
      if (m.probabilities) expect(Array.from(back.probabilities!(X))).toEqual(Array.from(m.probabilities(X)));
    }
  });

  it('load refuses a damaged model with a message naming what is wrong', () => {
    const { X, y } = synthetic('three', 100, 6);
    const json = fit(X, y, { rounds: 3 }).toJSON();
    expect(() => boost.load({ ...json, rounds: 4 })).toThrow(/rounds x width = 12 trees/);
    expect(() => boost.load({ ...json, width: 1 })).toThrow(/width must be 3/);
    expect(() => boost.load({ ...json, loss: 'squared' })).toThrow(/does not fit task/);
    expect(() => boost.load({ ...json, format: 'other' })).toThrow(/format must be "foldwise-boost"/);
  });

  it('softmax probabilities are rows summing to 1, and beat the base score on its own data', () => {
    const { X, y } = synthetic('three', 300, 8);
    const m = fit(X, y, {});
    const p = m.probabilities!(X);
    expect(p.length).toBe(900);
    for (let i = 0; i < 300; i++) close(p[3 * i] + p[3 * i + 1] + p[3 * i + 2], 1, 1e-12);
    const pred = m.predict(X);
    let right = 0;
    for (let i = 0; i < 300; i++) if (pred[i] === (y as { codes: Int32Array }).codes[i]) right++;
    expect(right / 300).toBeGreaterThan(0.9);
  });
});

describe('boost: options are checked before any fit', () => {
  const resolve = (text: string, task: 'classification' | 'regression' = 'regression') => () => resolveParams(getLearner('boost'), parseLearnerSpec(text), task);

  it('refuses values outside the limits, naming the option and its limit', () => {
    expect(resolve('boost:rounds=-1')).toThrow(/rounds=-1: must be at least 0/);
    expect(resolve('boost:step=0')).toThrow(/step=0: must be greater than 0/);
    expect(resolve('boost:step=1.5')).toThrow(/step=1.5: must be at most 1/);
    expect(resolve('boost:leaves=1')).toThrow(/leaves=1: must be at least 2/);
    expect(resolve('boost:leaves=1025')).toThrow(/leaves=1025: must be at most 1024/);
    expect(resolve('boost:row-share=0')).toThrow(/row-share=0: must be greater than 0/);
    expect(resolve('boost:stop-share=0.6')).toThrow(/stop-share=0.6: must be at most 0.5/);
    expect(resolve('boost:loss=quantile')).toThrow(/loss=quantile: expected one of auto, squared, absolute, huber/);
    expect(resolve('boost:ridg=1')).toThrow(/unknown option "ridg" for boost; did you mean "ridge"/);
  });

  it('refuses a regression loss for classes at resolve time, and fit checks again', () => {
    expect(resolve('boost:loss=huber', 'classification')).toThrow(/option "loss" must be auto for classification/);
    expect(resolve('boost:loss=huber', 'regression')).not.toThrow();
    const { X, y } = synthetic('classification', 50, 1);
    expect(() => fit(X, y, { loss: 'absolute' })).toThrow(/option "loss" must be auto/);
    expect(() => fit(X, y, { leaves: 0 })).toThrow(/option "leaves" must be an integer between 2 and 1024, got 0/);
  });
});

describe('boost: early stopping on an inner split of the training rows only', () => {
  it('the inner split is stratified by class and seeded', () => {
    const codes = Array.from({ length: 200 }, (_, i) => (i < 150 ? 0 : 1));
    for (const seed of [1, 2, 3, 4, 5, 6]) {
      // exactly 20% of each class, whatever the seed
      const v = innerSplit(cls(codes), 0.2, seed).valid;
      expect(v.length).toBe(40);
      expect(Array.from(v).filter((i) => i >= 150).length).toBe(10);
    }
    const s = innerSplit(cls(codes), 0.2, 77);
    expect(s.valid.length).toBe(40);
    expect(s.train.length).toBe(160);
    expect(Array.from(s.valid).filter((i) => i >= 150).length).toBe(10); // 20% of 50
    expect(new Set([...s.train, ...s.valid]).size).toBe(200);
    expect(Array.from(innerSplit(cls(codes), 0.2, 77).valid)).toEqual(Array.from(s.valid));
    expect(Array.from(innerSplit(cls(codes), 0.2, 78).valid)).not.toEqual(Array.from(s.valid));
  });

  it('stops early on pure noise and later on signal; reports the round in notes()', () => {
    const signal = synthetic('regression', 400, 2);
    const rng = createRng(3);
    const noise = reg(Array.from({ length: 400 }, () => rng.next()));
    const a = fit(signal.X, signal.y, { rounds: 500, stop: 10 });
    const b = fit(signal.X, noise, { rounds: 500, stop: 10 });
    const na = a.notes();
    const nb = b.notes();
    expect(na['stopped-at']).toBe(a.rounds);
    expect(na['rounds-run']).toBe(Math.min(500, na['stopped-at'] + 10));
    expect(na['validation-rows']).toBe(80);
    expect(na['stopped-at']).toBeGreaterThan(50);
    expect(nb['stopped-at']).toBeLessThan(20);
    expect(nb['rounds-run']).toBe(nb['stopped-at'] + 10);
  });

  it('stop-then=keep keeps the inner model cut at the chosen round; refit uses all rows', () => {
    const { X, y } = synthetic('classification', 300, 5);
    const keep = fit(X, y, { rounds: 400, stop: 5, 'stop-then': 'keep' });
    const refit = fit(X, y, { rounds: 400, stop: 5 });
    expect(keep.rounds).toBe(keep.notes()['stopped-at']);
    expect(refit.rounds).toBe(refit.notes()['stopped-at']);
    expect(keep.notes()['stopped-at']).toBe(refit.notes()['stopped-at']);
    // the refit is the plain fit of that many rounds on all rows, with the same seed
    const plain = fit(X, y, { rounds: refit.rounds });
    expect(Array.from(refit.probabilities!(X))).toEqual(Array.from(plain.probabilities!(X)));
    expect(Array.from(keep.probabilities!(X))).not.toEqual(Array.from(plain.probabilities!(X)));
  });

  it('without stop there are no notes', () => {
    const { X, y } = synthetic('regression', 60, 5);
    expect(fit(X, y, { rounds: 3 }).notes()).toEqual({});
  });
});
