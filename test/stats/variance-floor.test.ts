import { describe, expect, it } from 'vitest';
import { binomialVarianceFloor, clipInterval, differenceRange } from '../../src/stats/variance-floor.js';

describe('binomialVarianceFloor (Agresti & Coull 1998 add-two estimate)', () => {
  it('matches the hand computation', () => {
    // a share of 0.75 over 100 rows: 75 correct; p~ = 77/104; floor = p~ (1 - p~) / 100
    const p = 77 / 104;
    expect(Math.abs(binomialVarianceFloor(0.75, 100) - (p * (1 - p)) / 100)).toBeLessThan(1e-15);
    // all wrong and all right give the same, non-zero floor: 2/104 * 102/104 / 100
    expect(Math.abs(binomialVarianceFloor(0, 100) - (2 / 104) * (102 / 104) / 100)).toBeLessThan(1e-15);
    expect(Math.abs(binomialVarianceFloor(0, 100) - binomialVarianceFloor(1, 100))).toBeLessThan(1e-15);
    // shares outside [0, 1] (never from a metric) are held at the ends
    expect(binomialVarianceFloor(1.5, 100)).toBe(binomialVarianceFloor(1, 100));
    expect(binomialVarianceFloor(-0.5, 100)).toBe(binomialVarianceFloor(0, 100));
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
