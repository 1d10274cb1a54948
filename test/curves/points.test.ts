import { describe, expect, it } from 'vitest';
import { operatingPoints, rocArea, stepwiseArea } from '../../src/curves/points.js';
import { rocAuc } from '../../src/metrics/roc-auc.js';
import { averagePrecision } from '../../src/metrics/average-precision.js';
import { binaryScores } from '../metrics/helpers.js';

function outcomes(labels: readonly number[]): Uint8Array {
  return Uint8Array.from(labels);
}

describe('ROC operating points', () => {
  it('Fawcett (2006) Fig. 3: the 21 points of the 20-instance curve and area 0.68', () => {
    // Fawcett, "An introduction to ROC analysis", Fig. 3 (same data as test/metrics/roc-auc.test.ts)
    const classes = 'ppnpppnnpnpnpnnnpnpn';
    const scores = [0.9, 0.8, 0.7, 0.6, 0.55, 0.54, 0.53, 0.52, 0.51, 0.505, 0.4, 0.39, 0.38, 0.37, 0.36, 0.35, 0.34, 0.33, 0.3, 0.1];
    const labels = [...classes].map((c) => (c === 'p' ? 1 : 0));
    const p = operatingPoints(Float64Array.from(scores), outcomes(labels));
    // the staircase of Fig. 3, in tenths: (FP, TP) after each instance
    const want = [
      [0, 0], [0, 1], [0, 2], [1, 2], [1, 3], [1, 4], [1, 5], [2, 5], [3, 5], [3, 6], [4, 6],
      [4, 7], [5, 7], [5, 8], [6, 8], [7, 8], [8, 8], [8, 9], [9, 9], [9, 10], [10, 10],
    ];
    expect(p.tp.length).toBe(21);
    expect(Array.from(p.fp, (v, i) => [v, p.tp[i]])).toEqual(want);
    expect(p.threshold[0]).toBe(Infinity);
    expect(p.threshold[3]).toBe(0.7);
    expect(Math.abs(rocArea(p) - 0.68)).toBeLessThan(1e-12);
  });

  it('tied scores make one diagonal step; the trapezoid area equals the Mann-Whitney area (Hanley & McNeil 1982 Table I)', () => {
    // Hanley & McNeil (1982), Radiology 143:29-36, Table I (as in roc-auc.test.ts): ratings 1..5,
    // normal counts 33 6 6 11 2, abnormal 3 2 2 11 33. Operating points by hand, rating >= r:
    // r = 5: TP 33, FP 2; r >= 4: 44, 13; >= 3: 46, 19; >= 2: 48, 25; >= 1: 51, 58.
    const normal = [33, 6, 6, 11, 2];
    const abnormal = [3, 2, 2, 11, 33];
    const labels: number[] = [];
    const scores: number[] = [];
    for (let r = 0; r < 5; r++) {
      for (let i = 0; i < normal[r]; i++) (labels.push(0), scores.push(r / 4));
      for (let i = 0; i < abnormal[r]; i++) (labels.push(1), scores.push(r / 4));
    }
    const p = operatingPoints(Float64Array.from(scores), outcomes(labels));
    expect(Array.from(p.tp)).toEqual([0, 33, 44, 46, 48, 51]);
    expect(Array.from(p.fp)).toEqual([0, 2, 13, 19, 25, 58]);
    expect(Math.abs(rocArea(p) - 2642 / 2958)).toBeLessThan(1e-12);
    expect(Math.abs(rocArea(p) - rocAuc(binaryScores(labels, scores)))).toBeLessThan(1e-12);
    expect(Math.abs(stepwiseArea(p) - averagePrecision(binaryScores(labels, scores)))).toBeLessThan(1e-12);
  });
});
