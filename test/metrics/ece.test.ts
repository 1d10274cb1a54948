import { describe, expect, it } from 'vitest';
import { calibrationPairs, equalCountBins } from '../../src/metrics/calibration-bins.js';
import { ECE_BINS, ece } from '../../src/metrics/ece.js';
import { binaryScores } from './helpers.js';

// ECE as in Naeini, Cooper & Hauskrecht (2015), AAAI: sum over equal-count bins of
// (bin share of rows) x |observed frequency - mean predicted probability|.

describe('ece, two classes', () => {
  it('matches a hand computation with ten bins of two rows', () => {
    expect(ECE_BINS).toBe(10);
    // scores .05, .15, ..., .95, each twice (so the ten equal-count bins are the ten pairs);
    // positives per pair: 0, 0, 1, 1, 1, 1, 1, 2, 2, 2
    // |o - e| per bin: .05 .15 .25 .15 .05 .05 .15 .25 .15 .05, sum 1.3; each bin is 2/20 of
    // the rows, so ECE = 1.3 / 10 = 0.13
    const hits = [0, 0, 1, 1, 1, 1, 1, 2, 2, 2];
    const labels: number[] = [];
    const scores: number[] = [];
    for (let b = 0; b < 10; b++) {
      for (let j = 0; j < 2; j++) {
        scores.push(0.05 + 0.1 * b);
        labels.push(j < hits[b] ? 1 : 0);
      }
    }
    expect(labels.length).toBe(20);
    expect(Math.abs(ece(binaryScores(labels, scores)) - 0.13)).toBeLessThan(1e-12);
  });

  it('is 0 for a perfectly calibrated forecaster (by hand)', () => {
    // 20 rows at score .5, half of them positive: one bin (ties kept together), |.5 - .5| = 0
    const labels = Array.from({ length: 20 }, (_, i) => i % 2);
    expect(ece(binaryScores(labels, new Array(20).fill(0.5)))).toBe(0);
  });
});

describe('ece, more classes: top-label form', () => {
  it('uses the largest probability against "predicted class is right" (by hand)', () => {
    // 3 classes, 3 rows, so each row is its own bin (fewer rows than bins):
    // row 0: (.6 .3 .1), actual 0: confidence .6, right -> |1 - .6| = .4
    // row 1: (.2 .7 .1), actual 2: confidence .7, wrong -> |0 - .7| = .7
    // row 2: (.1 .1 .8), actual 2: confidence .8, right -> |1 - .8| = .2
    // ECE = (.4 + .7 + .2) / 3 = 1.3 / 3
    const input = {
      actual: Int32Array.from([0, 2, 2]),
      predicted: Int32Array.from([0, 1, 2]),
      classes: 3,
      probs: Float64Array.from([0.6, 0.3, 0.1, 0.2, 0.7, 0.1, 0.1, 0.1, 0.8]),
    };
    expect(Math.abs(ece(input) - 1.3 / 3)).toBeLessThan(1e-12);
  });
});

describe('equal-count bins', () => {
  it('keeps tied scores in one bin and drops the bin emptied by that (by hand)', () => {
    // 6 rows into 3 bins: nominal cuts after sorted positions 2 and 4. Position 2 holds .2, tied
    // with position 1, so the first bin runs to the end of the tie (.1 .2 .2 .2); the second bin
    // is then empty and dropped; the last holds .6 and .9.
    const score = Float64Array.from([0.2, 0.9, 0.1, 0.2, 0.6, 0.2]);
    const outcome = Uint8Array.from([1, 1, 0, 0, 1, 0]);
    const bins = equalCountBins(score, outcome, 3);
    expect(bins.length).toBe(2);
    expect(bins[0].count).toBe(4);
    expect(Math.abs(bins[0].meanScore - 0.175)).toBeLessThan(1e-12);
    expect(bins[0].observed).toBe(0.25);
    expect(bins[1].count).toBe(2);
    expect(Math.abs(bins[1].meanScore - 0.75)).toBeLessThan(1e-12);
    expect(bins[1].observed).toBe(1);
  });

  it('splits distinct scores into sizes that differ by at most one', () => {
    const score = Float64Array.from({ length: 25 }, (_, i) => (i * 7919) % 25);
    const bins = equalCountBins(score, new Uint8Array(25), 10);
    expect(bins.map((b) => b.count)).toEqual([2, 3, 2, 3, 2, 3, 2, 3, 2, 3]);
  });
});

describe('equal-count bins: what each bin reports, and the refusals', () => {
  it('gives each bin its lowest and highest score and its hit count (the tie example, by hand)', () => {
    // sorted: .1 (0), .2 (1), .2 (0), .2 (0) | .6 (1), .9 (1)
    const score = Float64Array.from([0.2, 0.9, 0.1, 0.2, 0.6, 0.2]);
    const outcome = Uint8Array.from([1, 1, 0, 0, 1, 0]);
    const bins = equalCountBins(score, outcome, 3);
    expect(bins.length).toBe(2);
    expect([bins[0].lowScore, bins[0].highScore, bins[0].hits]).toEqual([0.1, 0.2, 1]);
    expect([bins[1].lowScore, bins[1].highScore, bins[1].hits]).toEqual([0.6, 0.9, 2]);
  });

  it('one bin holds every row', () => {
    const bins = equalCountBins(Float64Array.from([0.3, 0.1, 0.2]), Uint8Array.from([1, 0, 1]), 1);
    expect(bins.length).toBe(1);
    expect(bins[0].count).toBe(3);
    expect(bins[0].hits).toBe(2);
  });

  it('refuses lengths that differ and a bin count that is not a positive integer', () => {
    expect(() => equalCountBins(new Float64Array(3), new Uint8Array(2), 2)).toThrow(new RangeError('equalCountBins: score and outcome lengths differ (3 and 2)'));
    expect(() => equalCountBins(new Float64Array(3), new Uint8Array(3), 0)).toThrow(new RangeError('equalCountBins: bins must be a positive integer (got 0)'));
    expect(() => equalCountBins(new Float64Array(3), new Uint8Array(3), 1.5)).toThrow(new RangeError('equalCountBins: bins must be a positive integer (got 1.5)'));
  });
});

describe('calibrationPairs', () => {
  it('two classes: the class-1 column against "actual = 1", whichever column is larger (Naeini et al. 2015)', () => {
    const { score, outcome } = calibrationPairs(Int32Array.from([0, 1, 1]), Float64Array.from([0.7, 0.3, 0.2, 0.8, 0.6, 0.4]), 2);
    expect(Array.from(score)).toEqual([0.3, 0.8, 0.4]);
    expect(Array.from(outcome)).toEqual([0, 1, 1]);
  });

  it('three classes: the row largest probability, the first column on a tie, against "that class is right" (Guo et al. 2017)', () => {
    // by hand: row 0 (.4 .4 .2) tie -> column 0, actual 1: wrong; row 1 (.1 .5 .4) -> column 1, right;
    // row 2 (.1 .3 .6) -> column 2, right; row 3 (.9 .05 .05) -> column 0, right
    const proba = Float64Array.from([0.4, 0.4, 0.2, 0.1, 0.5, 0.4, 0.1, 0.3, 0.6, 0.9, 0.05, 0.05]);
    const { score, outcome } = calibrationPairs(Int32Array.from([1, 1, 2, 0]), proba, 3);
    expect(Array.from(score)).toEqual([0.4, 0.5, 0.6, 0.9]);
    expect(Array.from(outcome)).toEqual([0, 1, 1, 1]);
  });
});
