import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { tCdf, tQuantile } from '../../src/stats/t-quantile.js';

// Source: NIST/SEMATECH e-Handbook of Statistical Methods, sec. 1.3.6.7.2 "Critical Values of
// the Student's t Distribution" (https://www.itl.nist.gov/div898/handbook/eda/section3/eda3672.htm),
// columns 0.95, 0.975 and 0.995 (upper-tail probability 0.05, 0.025, 0.005). The values were read
// from a reproduction of that table credited to the e-Handbook. The table has 3 decimals, so
// we compare with |a - b| < 0.0006.
const NIST_T_TABLE: ReadonlyArray<{ df: number; q95: number; q975: number; q995: number }> = [
  { df: 1, q95: 6.314, q975: 12.706, q995: 63.657 },
  { df: 2, q95: 2.92, q975: 4.303, q995: 9.925 },
  { df: 5, q95: 2.015, q975: 2.571, q995: 4.032 },
  { df: 9, q95: 1.833, q975: 2.262, q995: 3.25 },
  { df: 10, q95: 1.812, q975: 2.228, q995: 3.169 },
  { df: 29, q95: 1.699, q975: 2.045, q995: 2.756 },
  { df: 30, q95: 1.697, q975: 2.042, q995: 2.75 },
  { df: 100, q95: 1.66, q975: 1.984, q995: 2.626 },
];

describe('tQuantile', () => {
  it('matches the NIST e-Handbook t table to its 3 decimals', () => {
    expect(NIST_T_TABLE.length).toBe(8);
    for (const row of NIST_T_TABLE) {
      expect(Math.abs(tQuantile(0.95, row.df) - row.q95)).toBeLessThan(0.0006);
      expect(Math.abs(tQuantile(0.975, row.df) - row.q975)).toBeLessThan(0.0006);
      expect(Math.abs(tQuantile(0.995, row.df) - row.q995)).toBeLessThan(0.0006);
    }
  });

  it('is symmetric about 0 and 0 at the median', () => {
    expect(tQuantile(0.5, 7)).toBe(0);
    expect(Math.abs(tQuantile(0.025, 9) + tQuantile(0.975, 9))).toBeLessThan(1e-9);
  });

  it('approaches the normal quantile for large df', () => {
    // z_{0.975} = 1.960 (NIST table, row "infinity")
    expect(Math.abs(tQuantile(0.975, 1e7) - 1.96)).toBeLessThan(0.0006);
  });

  it('refuses p outside (0, 1) and df <= 0', () => {
    expect(() => tQuantile(0, 5)).toThrow(UsageError);
    expect(() => tQuantile(1, 5)).toThrow('tQuantile: p must be a number strictly between 0 and 1, got 1');
    expect(() => tQuantile(Number.NaN, 5)).toThrow(UsageError);
    expect(() => tQuantile(0.9, 0)).toThrow('tQuantile: df must be a finite number > 0, got 0');
    expect(() => tQuantile(0.9, Infinity)).toThrow(UsageError);
  });
});

describe('tCdf', () => {
  it('agrees with the closed forms for 1 and 2 degrees of freedom', () => {
    // Closed forms (from memory; standard results, see Abramowitz & Stegun, Handbook of
    // Mathematical Functions, sec. 26.7):
    // df = 1 is the Cauchy distribution, F(x) = 1/2 + atan(x)/pi; df = 2 has
    // F(x) = 1/2 + x / (2 sqrt(2 + x^2)). Compared on the smaller tail, relatively.
    const xs = [-30, -10, -3.3, -1, -0.2, 0.4, 1.7, 5, 12.706];
    expect(xs.length).toBe(9);
    for (const x of xs) {
      const c1 = 0.5 + Math.atan(x) / Math.PI;
      const c2 = 0.5 + x / (2 * Math.sqrt(2 + x * x));
      expect(Math.abs(tCdf(x, 1) - c1) / Math.min(c1, 1 - c1)).toBeLessThan(1e-6);
      expect(Math.abs(tCdf(x, 2) - c2) / Math.min(c2, 1 - c2)).toBeLessThan(1e-6);
    }
  });

  it('gives the NIST table probabilities back at the tabulated critical values', () => {
    // Same NIST table as above: P(T_10 <= 2.228) = 0.975, P(T_29 <= 1.699) = 0.95. The 3-decimal
    // rounding of the table moves the probability by less than 2e-4.
    expect(Math.abs(tCdf(2.228, 10) - 0.975)).toBeLessThan(2e-4);
    expect(Math.abs(tCdf(1.699, 29) - 0.95)).toBeLessThan(2e-4);
    expect(Math.abs(tCdf(-2.262, 9) - 0.025)).toBeLessThan(2e-4);
  });

  it('inverts tQuantile', () => {
    for (const df of [1, 3, 9, 29, 250]) {
      for (const p of [0.001, 0.05, 0.3, 0.8, 0.975]) {
        expect(Math.abs(tCdf(tQuantile(p, df), df) - p)).toBeLessThan(1e-7);
      }
    }
  });

  it('handles the infinite ends and 0 exactly', () => {
    expect(tCdf(Infinity, 4)).toBe(1);
    expect(tCdf(-Infinity, 4)).toBe(0);
    expect(tCdf(0, 4)).toBe(0.5);
  });

  it('refuses NaN and bad df', () => {
    expect(() => tCdf(Number.NaN, 4)).toThrow('tCdf: x must be a number, got NaN');
    expect(() => tCdf(1, -1)).toThrow('tCdf: df must be a finite number > 0, got -1');
  });

  it('refuses a number written as text (from a JSON or CLI caller), which comparisons would coerce', () => {
    // mechanics check (no outside value): '0.5' > 0 and '1' is not NaN, so only the typeof test refuses them
    expect(() => tQuantile('0.5' as unknown as number, 5)).toThrow(UsageError);
    expect(() => tCdf('1' as unknown as number, 4)).toThrow(UsageError);
  });
});
