import { describe, expect, it } from 'vitest';
import { commonGrid, prOnGrid, quartileBand, rocOnGrid } from '../../src/curves/band.js';
import { operatingPoints } from '../../src/curves/points.js';
import { wilsonInterval } from '../../src/curves/wilson.js';

describe('Wilson interval', () => {
  it('matches Newcombe (1998) Table I, method 3 (values from memory, four decimals)', () => {
    // Newcombe, "Two-sided confidence intervals for the single proportion", Stat Med 17:857-872
    const cases: [number, number, number, number][] = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    expect(cases.length).toBe(4);
    for (const [h, n, lo, hi] of cases) {
      const [a, b] = wilsonInterval(h, n);
      expect(Math.abs(a - lo)).toBeLessThan(1e-4);
      expect(Math.abs(b - hi)).toBeLessThan(1e-4);
    }
  });

  it('does not collapse when every row is a hit', () => {
    const [lo, hi] = wilsonInterval(10, 10);
    expect(hi).toBe(1);
    expect(lo).toBeLessThan(0.75);
  });
});

describe('per-fold curves on the common grid', () => {
  it('reads the ROC step and the interpolated precision by hand', () => {
    // scores .9 (pos), .8 (neg), .7 (pos), .2 (neg): points (FP, TP) = (0,0) (0,1) (1,1) (1,2) (2,2)
    const p = operatingPoints(Float64Array.from([0.9, 0.8, 0.7, 0.2]), Uint8Array.from([1, 0, 1, 0]));
    const grid = [0, 0.25, 0.5, 1];
    // highest TPR with FPR <= g: g = 0 -> .5, .25 -> .5, .5 -> 1, 1 -> 1
    expect(rocOnGrid(p, grid)).toEqual([0.5, 0.5, 1, 1]);
    // highest precision at recall >= r: r = 0 -> 1, .25 -> 1, .5 -> 1 (first point), 1 -> 2/3
    expect(prOnGrid(p, grid).map((v) => Math.round(v * 1e9) / 1e9)).toEqual([1, 1, 1, Math.round((2 / 3) * 1e9) / 1e9]);
    expect(commonGrid().length).toBe(41);
  });

  it('gives pointwise quartiles (Hyndman & Fan definition 7, by hand)', () => {
    const band = quartileBand([[0, 1], [1, 2], [2, 3], [3, 5]]);
    // column 0: 0 1 2 3 -> q1 .75, median 1.5, q3 2.25; column 1: 1 2 3 5 -> 1.75, 2.5, 3.5
    expect(band.q1).toEqual([0.75, 1.75]);
    expect(band.median).toEqual([1.5, 2.5]);
    expect(band.q3).toEqual([2.25, 3.5]);
  });
});
