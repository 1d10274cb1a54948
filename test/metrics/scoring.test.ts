/**
 * src/metrics/scoring.ts: a metric on one test part (`scoreOf`) and the concatenations pooled
 * scores are computed on. Every expected score is computed by hand from the formula written out
 * beside it (accuracy = correct / n; log loss = -(1/n) sum ln p(actual), Good 1952; rmse =
 * sqrt(mean squared error), Willmott & Matsuura 2005).
 */
import { describe, expect, it } from 'vitest';
import type { Target } from '../../src/learning.js';
import { getMetric } from '../../src/metrics/index.js';
import { concatPredictions, concatTargets, scoreOf } from '../../src/metrics/scoring.js';

const cls: Target = { task: 'classification', codes: Int32Array.from([0, 1, 1, 0]), classes: ['a', 'b'] };
const reg: Target = { task: 'regression', values: Float64Array.from([1, 2, 3]) };

describe('scoreOf', () => {
  it('a classification metric on a classification target: accuracy 3 of 4 right = 0.75', () => {
    expect(scoreOf(getMetric('accuracy'), cls, { predicted: Int32Array.from([0, 1, 0, 0]) })).toBe(0.75);
  });

  it('a probability metric reads the probabilities, and is null without them', () => {
    const probs = Float64Array.from([0.8, 0.2, 0.4, 0.6, 0.3, 0.7, 0.9, 0.1]);
    // by hand: p(actual) = .8, .6, .7, .9; log loss = -(ln .8 + ln .6 + ln .7 + ln .9) / 4
    const want = -(Math.log(0.8) + Math.log(0.6) + Math.log(0.7) + Math.log(0.9)) / 4;
    const got = scoreOf(getMetric('log-loss'), cls, { predicted: Int32Array.from([0, 1, 1, 0]), probs });
    expect(got).not.toBeNull();
    expect(Math.abs((got as number) - want)).toBeLessThan(1e-15);
    expect(scoreOf(getMetric('log-loss'), cls, { predicted: Int32Array.from([0, 1, 1, 0]) })).toBeNull();
  });

  it('passes the target class count: three classes, two of them in the rows', () => {
    // classes = 3 makes probs 4 x 3; with classes = 2 the metric would refuse the length.
    const three: Target = { task: 'classification', codes: Int32Array.from([0, 1, 1, 0]), classes: ['a', 'b', 'c'] };
    const probs = Float64Array.from([0.5, 0.25, 0.25, 0.25, 0.5, 0.25, 0.5, 0.25, 0.25, 0.5, 0.25, 0.25]);
    // by hand: p(actual) = .5, .5, .25, .5; log loss = -(3 ln .5 + ln .25) / 4 = (5/4) ln 2
    const got = scoreOf(getMetric('log-loss'), three, { predicted: Int32Array.from([0, 1, 0, 0]), probs });
    expect(Math.abs((got as number) - 1.25 * Math.LN2)).toBeLessThan(1e-15);
  });

  it('a regression metric on a regression target: rmse of errors 0, 0, 2 = sqrt(4/3)', () => {
    const got = scoreOf(getMetric('rmse'), reg, { predicted: Float64Array.from([1, 2, 5]) });
    expect(Math.abs((got as number) - Math.sqrt(4 / 3))).toBeLessThan(1e-15);
  });

  it('is null for a metric of the other task, either way round', () => {
    expect(scoreOf(getMetric('accuracy'), reg, { predicted: Float64Array.from([1, 2, 3]) })).toBeNull();
    expect(scoreOf(getMetric('rmse'), cls, { predicted: Int32Array.from([0, 1, 1, 0]) })).toBeNull();
  });

  it('is null for an undefined score: r2 of a constant actual (SS_tot = 0, NaN)', () => {
    const flat: Target = { task: 'regression', values: Float64Array.from([2, 2, 2]) };
    expect(scoreOf(getMetric('r2'), flat, { predicted: Float64Array.from([1, 2, 3]) })).toBeNull();
  });
});

describe('concatPredictions', () => {
  it('joins class predictions and their probability rows in order', () => {
    const out = concatPredictions(
      [
        { predicted: Int32Array.from([1, 0]), probs: Float64Array.from([0.1, 0.9, 0.7, 0.3]) },
        { predicted: Int32Array.from([1]), probs: Float64Array.from([0.4, 0.6]) },
      ],
      2,
    );
    expect(out.predicted).toBeInstanceOf(Int32Array);
    expect(Array.from(out.predicted)).toEqual([1, 0, 1]);
    expect(Array.from(out.probs!)).toEqual([0.1, 0.9, 0.7, 0.3, 0.4, 0.6]);
  });

  it('has no probabilities unless every part has them; regression values stay Float64', () => {
    const out = concatPredictions([{ predicted: Int32Array.from([1]), probs: Float64Array.from([0.2, 0.8]) }, { predicted: Int32Array.from([0, 0]) }], 2);
    expect(Array.from(out.predicted)).toEqual([1, 0, 0]);
    expect('probs' in out).toBe(false);
    const r = concatPredictions([{ predicted: Float64Array.from([1.5]) }, { predicted: Float64Array.from([2.5, -3]) }], 0);
    expect(r.predicted).toBeInstanceOf(Float64Array);
    expect(Array.from(r.predicted)).toEqual([1.5, 2.5, -3]);
    expect('probs' in r).toBe(false);
  });
});

describe('concatTargets', () => {
  it('joins class codes in order and keeps the first part classes', () => {
    const classes = ['a', 'b', 'c'];
    const out = concatTargets([
      { task: 'classification', codes: Int32Array.from([0, 1]), classes },
      { task: 'classification', codes: Int32Array.from([2, 2, 1]), classes },
    ]);
    expect(out.task).toBe('classification');
    if (out.task !== 'classification') throw new Error('not classification');
    expect(Array.from(out.codes)).toEqual([0, 1, 2, 2, 1]);
    expect(out.classes).toBe(classes);
  });

  it('joins regression values in order', () => {
    const out = concatTargets([
      { task: 'regression', values: Float64Array.from([1.5]) },
      { task: 'regression', values: Float64Array.from([2.5, -3]) },
    ]);
    expect(out.task).toBe('regression');
    if (out.task !== 'regression') throw new Error('not regression');
    expect(Array.from(out.values)).toEqual([1.5, 2.5, -3]);
  });

  it('reads only parts of the first part task (what the code does; callers never mix tasks)', () => {
    const c = concatTargets([
      { task: 'classification', codes: Int32Array.from([1]), classes: ['a', 'b'] },
      { task: 'regression', values: Float64Array.from([7, 8]) },
      { task: 'classification', codes: Int32Array.from([0]), classes: ['a', 'b'] },
    ]);
    if (c.task !== 'classification') throw new Error('not classification');
    expect(Array.from(c.codes)).toEqual([1, 0]);
    const r = concatTargets([
      { task: 'regression', values: Float64Array.from([7]) },
      { task: 'classification', codes: Int32Array.from([1, 1]), classes: ['a', 'b'] },
      { task: 'regression', values: Float64Array.from([8]) },
    ]);
    if (r.task !== 'regression') throw new Error('not regression');
    expect(Array.from(r.values)).toEqual([7, 8]);
  });
});
