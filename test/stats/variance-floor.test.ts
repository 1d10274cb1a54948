import { describe, expect, it } from 'vitest';
import { binomialVarianceFloor, clipInterval, differenceRange } from '../../src/stats/variance-floor.js';

describe('binomialVarianceFloor (Agresti & Coull 1998 add-two estimate)', () => {
  it('matches the hand computation', () => {
    // 0.75 over 5 folds of 20 rows: 75 of 100 correct; p~ = 77/104; floor = p~ (1 - p~) / 20
    const p = 77 / 104;
    expect(Math.abs(binomialVarianceFloor(0.75, 20, 5) - (p * (1 - p)) / 20)).toBeLessThan(1e-15);
    // all wrong and all right give the same, non-zero floor
    expect(binomialVarianceFloor(0, 20, 5)).toBeGreaterThan(0);
    expect(Math.abs(binomialVarianceFloor(0, 20, 5) - binomialVarianceFloor(1, 20, 5))).toBeLessThan(1e-15);
    // shares outside [0, 1] (never from a metric) are held at the ends
    expect(binomialVarianceFloor(1.5, 20, 5)).toBe(binomialVarianceFloor(1, 20, 5));
    expect(binomialVarianceFloor(-0.5, 20, 5)).toBe(binomialVarianceFloor(0, 20, 5));
  });

  it('clips intervals and gives the range of a difference', () => {
    expect(clipInterval([-0.3, 1.35], [0, 1])).toEqual([0, 1]);
    expect(clipInterval([0.2, 0.4], [0, 1])).toEqual([0.2, 0.4]);
    expect(clipInterval([1.2, 1.4], [0, 1])).toEqual([1, 1]);
    expect(clipInterval([-2, -1], [0, 1])).toEqual([0, 0]);
    expect(differenceRange([0, 1])).toEqual([-1, 1]);
    expect(differenceRange([-1, 1])).toEqual([-2, 2]);
    expect(differenceRange([0, 2])).toEqual([-2, 2]);
  });
});
