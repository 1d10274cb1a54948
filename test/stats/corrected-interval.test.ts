import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { checkCorrection, checkLevel, correctedInterval, correctedVarianceFactor } from '../../src/stats/corrected-interval.js';

describe('correctedInterval: mean +/- t_{J-1,(1+level)/2} sqrt((1/J + n_test/n_train) s^2) (Nadeau & Bengio 2003)', () => {
  it('10 scores, ratio 1/9, s^2 = 0.0009, level 0.95: by hand with the NIST t table', () => {
    // factor 1/10 + 1/9 = 19/90; half = t_{9,0.975} sqrt(19/90 * 0.0009) with t_{9,0.975} = 2.262
    // (NIST/SEMATECH e-Handbook sec. 1.3.6.7.2, 3 decimals)
    const [lo, hi] = correctedInterval(0.8, 0.0009, 10, { testRows: 100, trainRows: 900 }, 0.95);
    const half = 2.262 * Math.sqrt((19 / 90) * 0.0009);
    expect(Math.abs(lo - (0.8 - half))).toBeLessThan(2e-5);
    expect(Math.abs(hi - (0.8 + half))).toBeLessThan(2e-5);
    expect(hi - 0.8).toBeCloseTo(0.8 - lo, 12);
  });

  it('level 0.90 and 0.99 take the 0.95 and 0.995 columns of the NIST t table (df 4)', () => {
    // t_{4,0.95} = 2.132, t_{4,0.995} = 4.604 (NIST e-Handbook sec. 1.3.6.7.2)
    const c = { testRows: 1, trainRows: 4 };
    const se = Math.sqrt((1 / 5 + 1 / 4) * 2);
    const h90 = correctedInterval(0, 2, 5, c, 0.9)[1];
    const h99 = correctedInterval(0, 2, 5, c, 0.99)[1];
    expect(Math.abs(h90 / se - 2.132)).toBeLessThan(6e-4);
    expect(Math.abs(h99 / se - 4.604)).toBeLessThan(6e-4);
  });

  it('the variance factor is 1/J + n_test/n_train', () => {
    expect(correctedVarianceFactor(4, { testRows: 25, trainRows: 75 })).toBe(1 / 4 + 25 / 75);
    expect(correctedVarianceFactor(10, { testRows: 1, trainRows: 9 })).toBe(0.1 + 1 / 9);
  });
});

describe('checkCorrection and checkLevel', () => {
  it('accept positive finite rows and a level strictly inside (0, 1)', () => {
    expect(() => checkCorrection('f', { testRows: 1e-9, trainRows: 1 })).not.toThrow();
    expect(() => checkLevel('f', 0.5)).not.toThrow();
    expect(() => checkLevel('f', 1e-9)).not.toThrow();
    expect(() => checkLevel('f', 1 - 1e-9)).not.toThrow();
  });

  it('refuse a missing correction or a non-object', () => {
    const msg = 'f: correction must be an object { testRows, trainRows }';
    expect(() => checkCorrection('f', null as never)).toThrow(msg);
    expect(() => checkCorrection('f', undefined as never)).toThrow(msg);
    expect(() => checkCorrection('f', 5 as never)).toThrow(msg);
  });

  it('refuse each field that is not a finite number above 0, naming it', () => {
    expect(() => checkCorrection('f', { testRows: 0, trainRows: 9 })).toThrow('f: correction.testRows must be a finite number > 0, got 0');
    expect(() => checkCorrection('f', { testRows: 1, trainRows: -9 })).toThrow('f: correction.trainRows must be a finite number > 0, got -9');
    expect(() => checkCorrection('f', { testRows: 1, trainRows: Infinity })).toThrow('f: correction.trainRows must be a finite number > 0, got Infinity');
    expect(() => checkCorrection('f', { testRows: '1', trainRows: 9 } as never)).toThrow('f: correction.testRows must be a finite number > 0, got 1');
    expect(() => checkCorrection('f', { testRows: 1 } as never)).toThrow(UsageError);
  });

  it('refuse a level at 0, 1, NaN or not a number', () => {
    expect(() => checkLevel('f', 0)).toThrow('f: level must be a number strictly between 0 and 1, got 0');
    expect(() => checkLevel('f', 1)).toThrow('f: level must be a number strictly between 0 and 1, got 1');
    expect(() => checkLevel('f', Number.NaN)).toThrow(UsageError);
    expect(() => checkLevel('f', '0.9' as never)).toThrow('f: level must be a number strictly between 0 and 1, got 0.9');
  });
});
