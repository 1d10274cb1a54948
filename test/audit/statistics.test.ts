/**
 * The audit's statistics against outside references: quantiles, mean, sd and skewness against
 * simple-statistics; Pearson's r against jstat's corrcoeff; the chi-square test against
 * published worked examples; Cramer's V against its definition on tables with known answers.
 */
import jStat from 'jstat';
import { mean, quantile, sampleSkewness as ssSkewness, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { chiSquareTest } from '../../src/audit/chi-square.js';
import { cramersV } from '../../src/audit/cramers-v.js';
import { numericProfile, quantileSorted } from '../../src/audit/numeric-summary.js';
import { correlationMatrix, pearson } from '../../src/audit/pearson.js';
import { sampleSkewness } from '../../src/audit/skewness.js';
import { InputError } from '../../src/errors.js';
import { createRng } from '../../src/rng.js';
import { gauss } from './synthetic.js';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(1, Math.abs(b));

function sample(n: number, seed: number, f: (z: number) => number = (z) => z): number[] {
  const rng = createRng(seed);
  return Array.from({ length: n }, () => f(gauss(rng)));
}

describe('numeric summaries (reference: simple-statistics quantile, mean, sampleStandardDeviation)', () => {
  for (const [label, xs] of [
    ['normal, n = 101', sample(101, 1)],
    ['skewed, n = 250', sample(250, 2, Math.exp)],
    ['ties, n = 40', sample(40, 3, (z) => Math.round(z * 2))],
    ['n = 2', [3, -1]],
  ] as const) {
    it(`matches on ${label}`, () => {
      const sorted = Float64Array.from(xs).sort();
      const p = numericProfile(sorted);
      const [q1, med, q3] = quantile([...xs], [0.25, 0.5, 0.75]);
      expect(rel(p.q1, q1)).toBeLessThan(1e-12);
      expect(rel(p.median, med)).toBeLessThan(1e-12);
      expect(rel(p.q3, q3)).toBeLessThan(1e-12);
      expect(p.min).toBe(Math.min(...xs));
      expect(p.max).toBe(Math.max(...xs));
      expect(rel(p.mean, mean([...xs]))).toBeLessThan(1e-12);
      expect(rel(p.sd!, sampleStandardDeviation([...xs]))).toBeLessThan(1e-12);
    });
  }

  it('one value has sd null; equal values have sd 0 and their own mean', () => {
    expect(numericProfile(Float64Array.of(7)).sd).toBeNull();
    const p = numericProfile(Float64Array.of(0.1, 0.1, 0.1));
    expect(p.sd).toBe(0);
    expect(p.mean).toBe(0.1);
  });

  it('refuses an empty input and a probability out of range', () => {
    expect(() => numericProfile(new Float64Array(0))).toThrow(InputError);
    expect(() => quantileSorted([1, 2], 1.5)).toThrow(/p 1.5 must be from 0 to 1/);
  });
});

describe('sample skewness (reference: simple-statistics sampleSkewness, adjusted Fisher-Pearson)', () => {
  it("matches simple-statistics' documented example [2, 4, 6, 3, 1] -> 0.590128656384365", () => {
    // value printed in simple-statistics' own doc comment (src/sample_skewness.js)
    expect(Math.abs(sampleSkewness([2, 4, 6, 3, 1])! - 0.590128656384365)).toBeLessThan(1e-14);
  });
  it('matches on seeded samples', () => {
    for (const seed of [4, 5, 6]) {
      const xs = sample(200, seed, Math.exp);
      expect(rel(sampleSkewness(xs)!, ssSkewness(xs))).toBeLessThan(1e-10);
    }
  });
  it('is null below 3 values or without spread', () => {
    expect(sampleSkewness([1, 2])).toBeNull();
    expect(sampleSkewness([2, 2, 2])).toBeNull();
  });
});

describe("Pearson's r (reference: jstat corrcoeff)", () => {
  it('matches jstat on correlated seeded columns, pairwise and through the matrix', () => {
    const rng = createRng(9);
    const n = 300;
    const z = Array.from({ length: n }, () => gauss(rng));
    const cols = [
      z.map((v) => v + 0.3 * gauss(rng)),
      z.map((v) => -2 * v + gauss(rng)),
      z.map(() => gauss(rng)),
    ];
    const m = correlationMatrix(cols.map((c) => Float64Array.from(c)));
    for (let a = 0; a < 3; a++) {
      for (let b = a + 1; b < 3; b++) {
        const ref = jStat.corrcoeff(cols[a], cols[b]);
        expect(Math.abs(pearson(Float64Array.from(cols[a]), Float64Array.from(cols[b]))! - ref)).toBeLessThan(1e-12);
        expect(Math.abs(m[a * 3 + b] - ref)).toBeLessThan(1e-12);
      }
    }
  });

  it('uses the pairwise-complete rows when values are missing (jstat on the same rows)', () => {
    const x = sample(120, 10);
    const y = x.map((v, i) => (i % 7 === 0 ? NaN : v * 0.5 + Math.sin(i)));
    const keep = x.map((_, i) => !Number.isNaN(y[i]));
    const ref = jStat.corrcoeff(x.filter((_, i) => keep[i]), y.filter((_, i) => keep[i]));
    expect(Math.abs(pearson(Float64Array.from(x), Float64Array.from(y))! - ref)).toBeLessThan(1e-12);
    const m = correlationMatrix([Float64Array.from(x), Float64Array.from(y)]);
    expect(Math.abs(m[1] - ref)).toBeLessThan(1e-12);
  });

  it('is undefined without spread or with fewer than 3 complete rows', () => {
    expect(pearson(Float64Array.of(1, 1, 1, 1), Float64Array.of(1, 2, 3, 4))).toBeNull();
    expect(pearson(Float64Array.of(1, 2, NaN), Float64Array.of(1, 2, 3))).toBeNull();
  });
});

describe('chi-square test of independence (published worked examples)', () => {
  it('Wikipedia "Chi-squared test" example (650 residents by neighbourhood and occupation)', () => {
    // table from https://en.wikipedia.org/wiki/Chi-squared_test, section "Example chi-squared
    // test for categorical data"; its text gives the statistic as about 24.6 with 6 degrees
    // of freedom and p about 0.0004 (from memory)
    const t = chiSquareTest([90, 60, 104, 95, 30, 50, 51, 20, 30, 40, 45, 35], 3, 4);
    expect(t.n).toBe(650);
    expect(t.df).toBe(6);
    expect(Math.abs(t.chiSquare - 24.6)).toBeLessThan(0.05);
    expect(Math.abs(t.p - 0.0004)).toBeLessThan(0.00005);
    expect(t.smallExpected).toBe(false);
  });

  it('millionaires in three cities, 2 x 3 (worked example at wizedu.com/questions/53616)', () => {
    // the page computes chi-square = 7.599689826 for yes 40/30/30, no 270/360/370
    const t = chiSquareTest([40, 30, 30, 270, 360, 370], 2, 3);
    expect(Math.abs(t.chiSquare - 7.599689826)).toBeLessThan(1e-8);
    expect(t.df).toBe(2);
    // upper tail of chi-square with 2 df is exp(-x/2) exactly (a textbook identity)
    expect(Math.abs(t.p - Math.exp(-7.599689826 / 2))).toBeLessThan(1e-9);
  });

  it('drops empty rows and columns from the degrees of freedom', () => {
    const t = chiSquareTest([10, 0, 20, 0, 0, 0, 30, 0, 5], 3, 3);
    expect(t.df).toBe(1);
  });

  it('refuses a table of the wrong size or with negative counts', () => {
    expect(() => chiSquareTest([1, 2, 3], 2, 2)).toThrow(/3 counts for a 2 x 2 table/);
    expect(() => chiSquareTest([1, -2, 3, 4], 2, 2)).toThrow(InputError);
  });
});

describe("Cramer's V (definition: sqrt(X^2 / (n (min(r, c) - 1))))", () => {
  it('is 1 when one variable is a relabelling of the other, and 0 for exact independence', () => {
    const a = Int32Array.from({ length: 90 }, (_, i) => i % 3);
    expect(Math.abs(cramersV(a, 3, Int32Array.from(a, (v) => 2 - v), 3)! - 1)).toBeLessThan(1e-12);
    // a balanced 3 x 2 design: every combination equally often
    const b = Int32Array.from({ length: 90 }, (_, i) => Math.floor(i / 3) % 2);
    expect(cramersV(a, 3, b, 2)).toBeLessThan(1e-12);
  });
  it('matches the formula on the Wikipedia table above', () => {
    const rows = [90, 60, 104, 95, 30, 50, 51, 20, 30, 40, 45, 35];
    const a: number[] = [];
    const b: number[] = [];
    rows.forEach((count, k) => {
      for (let j = 0; j < count; j++) (a.push(Math.floor(k / 4)), b.push(k % 4));
    });
    const t = chiSquareTest(rows, 3, 4);
    expect(Math.abs(cramersV(Int32Array.from(a), 3, Int32Array.from(b), 4)! - Math.sqrt(t.chiSquare / (650 * 2)))).toBeLessThan(1e-12);
  });
});
