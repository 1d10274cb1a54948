import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { roundingTolerance, wilcoxon } from '../../src/stats/wilcoxon.js';

/** Differences +r for r in a subset summing to t, -r otherwise: ranks 1..n, no ties, T+ = t. */
function withTPlus(n: number, t: number): number[] {
  const d = Array.from({ length: n }, (_, i) => -(i + 1));
  let rest = t;
  for (let r = n; r >= 1; r--) {
    if (r <= rest) {
      d[r - 1] = r;
      rest -= r;
    }
  }
  return d;
}
const zeros = (n: number): number[] => new Array<number>(n).fill(0);

describe('wilcoxon: published examples', () => {
  // Hollander & Wolfe, Nonparametric Statistical Methods, Example 3.1 (Hamilton depression scale
  // factor IV, 9 patients; x first visit, y second visit; Table 3.1 there). Data and the exact
  // two-sided p = 0.0391 as quoted, with the page "Hollander & Wolfe, p. 39", in the tests of
  // the R package exactRankTests; the same data are the example of R's wilcox.test help page
  // (from memory). With d = x - y: T+ = 40, T- = 5; exact two-sided p = 2 * 10/512 = 0.0390625.
  const x = [1.83, 0.5, 1.62, 2.48, 1.68, 1.88, 1.55, 3.06, 1.3];
  const y = [0.878, 0.647, 0.598, 2.05, 1.06, 1.29, 1.06, 3.14, 1.29];

  it('Hollander & Wolfe Example 3.1, exact', () => {
    const r = wilcoxon(x, y);
    expect(r).toEqual({ n: 9, tPlus: 40, tMinus: 5, p: 0.0390625, method: 'exact' });
    expect(Math.abs(r.p - 0.0391)).toBeLessThan(0.00005);
  });

  it('Hollander & Wolfe Example 3.1, large-sample approximation', () => {
    // H&W give .0192 as the one-sided level of the normal approximation without continuity
    // correction (read from a reproduction of the example's text); z = (5 - 22.5)/sqrt(71.25).
    const r = wilcoxon(x, y, { method: 'normal', continuity: false });
    expect(r.method).toBe('normal');
    expect(Math.abs(r.p / 2 - 0.0192)).toBeLessThan(0.0005); // measured 0.01908
  });

  it('reproduces the two-sided 0.05 critical values of the signed-rank table, n = 5..25', () => {
    // Critical values of T (reject when min(T+, T-) <= value, two-sided P = 0.05), University of
    // York, Department of Mathematics, "Critical Values for T in the Wilcoxon Signed-Rank Test"
    // (https://www.york.ac.uk/depts/maths/tables/wilcoxon.htm); n = 5 has none (-1 here).
    const table = [-1, 0, 2, 3, 5, 8, 10, 13, 17, 21, 25, 29, 34, 40, 46, 52, 58, 65, 73, 81, 89];
    const found: number[] = [];
    for (let n = 5; n <= 25; n++) {
      let critical = -1;
      for (let t = 0; t <= (n * (n + 1)) / 4; t++) {
        const r = wilcoxon(withTPlus(n, t), zeros(n));
        expect(r.method).toBe('exact');
        expect(r.tPlus).toBe(t);
        if (r.p <= 0.05) critical = t;
      }
      found.push(critical);
    }
    expect(found).toEqual(table);
  });
});

describe('wilcoxon: zeros and ties (hand-derived)', () => {
  // d = 0, 1, -1, 2, 2, 3, 0, -4. Zeros dropped (Wilcoxon's convention): n = 6.
  // |d| sorted 1 1 2 2 3 4 -> midranks 1.5 1.5 3.5 3.5 5 6.
  // T+ = 1.5 + 3.5 + 3.5 + 5 = 13.5, T- = 1.5 + 6 = 7.5 (sum 21 = 6*7/2).
  // Exact null: signs flipped independently on the doubled ranks {3,3,7,7,10,12} (total 42);
  // P(T+ >= 13.5) = P(doubled T- <= 15): subsets of {3,3,7,7,10,12} with sum <= 15 are
  //   {} ; {3}x2 ; {3,3} ; {7}x2 ; {3,7}x4, {10} ; {12} ; {3,3,7}x2, {3,10}x2 ; {7,7} ; {3,12}x2
  //   = 1 + 2 + 1 + 2 + 5 + 1 + 4 + 1 + 2 = 19 of 64, so two-sided p = 38/64 = 0.59375.
  const d = [0, 1, -1, 2, 2, 3, 0, -4];

  it('exact, with midranks', () => {
    expect(wilcoxon(d, zeros(8))).toEqual({ n: 6, tPlus: 13.5, tMinus: 7.5, p: 38 / 64, method: 'exact' });
  });

  it('normal approximation with tie and continuity corrections', () => {
    // E = 6*7/4 = 10.5; Var = 6*7*13/24 - [(2^3-2) + (2^3-2)]/48 = 22.75 - 0.25 = 22.5;
    // z = (|13.5 - 10.5| - 0.5) / sqrt(22.5) = 2.5 / sqrt(22.5); p = 2 P(Z >= z)
    const z = 2.5 / Math.sqrt(22.5);
    const r = wilcoxon(d, zeros(8), { method: 'normal' });
    expect(Math.abs(r.p - 2 * (1 - jStat.normal.cdf(z, 0, 1)))).toBeLessThan(1e-12);
  });

  it('exact distribution with ties equals brute-force enumeration of all 2^n sign flips', () => {
    // n = 10 with tie groups of 3 and 2 at several observed sign patterns
    const mags = [0.5, 0.5, 0.5, 1, 2, 2, 3, 4, 5, 6];
    const mid = [2, 2, 2, 4, 5.5, 5.5, 7, 8, 9, 10];
    let checked = 0;
    for (const mask of [0b0000000000, 0b1010101010, 0b0000011111, 0b1111100001, 0b0110000000]) {
      const dd = mags.map((m, i) => ((mask >> i) & 1 ? m : -m));
      const t = mid.reduce((s, r, i) => s + ((mask >> i) & 1 ? r : 0), 0);
      let le = 0;
      let ge = 0;
      for (let f = 0; f < 1 << 10; f++) {
        const s = mid.reduce((acc, r, i) => acc + ((f >> i) & 1 ? r : 0), 0);
        if (s <= t) le++;
        if (s >= t) ge++;
      }
      const r = wilcoxon(dd, zeros(10));
      expect(r.tPlus).toBe(t);
      expect(r.p).toBe(Math.min(1, (2 * Math.min(le, ge)) / 1024));
      checked++;
    }
    expect(checked).toBe(5);
  });

  it('all differences zero: n = 0, p = 1', () => {
    expect(wilcoxon([0.7, 0.8], [0.7, 0.8])).toEqual({ n: 0, tPlus: 0, tMinus: 0, p: 1, method: 'exact' });
  });
});

describe('wilcoxon: normal approximation beyond n = 25', () => {
  it('switches at n = 26 and agrees with the exact distribution to 0.01 for n = 26..30', () => {
    expect(wilcoxon(withTPlus(25, 100), zeros(25)).method).toBe('exact');
    expect(wilcoxon(withTPlus(26, 100), zeros(26)).method).toBe('normal');
    let compared = 0;
    let worst = 0;
    for (let n = 26; n <= 30; n++) {
      for (let t = 0; t <= (n * (n + 1)) / 2; t++) {
        const dd = withTPlus(n, t);
        const approx = wilcoxon(dd, zeros(n));
        const exact = wilcoxon(dd, zeros(n), { method: 'exact' });
        expect(approx.method).toBe('normal');
        expect(exact.tPlus).toBe(t);
        worst = Math.max(worst, Math.abs(approx.p - exact.p));
        compared++;
      }
    }
    expect(compared).toBe(352 + 379 + 407 + 436 + 466);
    expect(worst).toBeLessThan(0.01); // measured 0.0064 (n = 26, T+ = 145)
  });
});

describe('wilcoxon: symmetry and input checks', () => {
  it('swapping a and b swaps T+ and T- and keeps p', () => {
    const a = [0.81, 0.79, 0.84, 0.8, 0.83, 0.77];
    const b = [0.8, 0.8, 0.8, 0.8, 0.8, 0.8];
    const r1 = wilcoxon(a, b);
    const r2 = wilcoxon(b, a);
    expect([r2.tPlus, r2.tMinus]).toEqual([r1.tMinus, r1.tPlus]);
    expect(r2.p).toBe(r1.p);
  });

  it('refuses unpaired, empty or NaN input and bad options', () => {
    expect(() => wilcoxon([1, 2], [1])).toThrow('wilcoxon: a and b must pair up, got 2 and 1 scores');
    expect(() => wilcoxon([], [])).toThrow('wilcoxon: need at least 1 paired score, got 0');
    expect(() => wilcoxon([Number.NaN], [1])).toThrow(InputError);
    // the message names the function and the argument holding the NaN, for either argument
    // (mutants that blanked 'wilcoxon', 'a' or 'b' passed the type check above)
    expect(() => wilcoxon([1, Number.NaN], [2, 3])).toThrow('wilcoxon: a[1] is NaN; filter missing scores before calling');
    expect(() => wilcoxon([1, 2], [Number.NaN, 3])).toThrow('wilcoxon: b[0] is NaN; filter missing scores before calling');
    expect(() => wilcoxon([1], [2], { method: 'fast' as never })).toThrow(
      'wilcoxon: method must be one of "auto", "exact", "normal", got "fast"',
    );
    expect(() => wilcoxon([1], [2], { continuity: 1 as never })).toThrow(UsageError);
    expect(() => wilcoxon(withTPlus(501, 0), zeros(501), { method: 'exact' })).toThrow(
      'wilcoxon: method "exact" takes at most 500 non-zero differences, got 501',
    );
  });
});

describe('wilcoxon: ties within a tolerance tied to the test fold size (issue 24 part 4)', () => {
  // Accuracies over a 10-row test fold, learner and reference correct counts per fold:
  //   learner 4 4 4 1 2, reference 6 6 6 7 0  ->  d = -2 -2 -2 -6 +2 tenths.
  // By hand (Hollander & Wolfe sec. 3.1, midranks for ties): |d| = 2 2 2 6 2, four tied at 2
  // take ranks 1..4, mean 2.5; |d| = 6 takes rank 5. T+ = 2.5 (the one positive), T- = 12.5.
  // Exact conditional null over 2^5 sign flips: T+ <= 2.5 for T+ = 0 (1 way) or 2.5 (4 ways),
  // so P = 5/32 and the two-sided p = 10/32 = 0.3125.
  const learner = [4, 4, 4, 1, 2].map((k) => k / 10);
  const reference = [6, 6, 6, 7, 0].map((k) => k / 10);

  it('computed fractions carry rounding noise that exact comparison ranks apart (p 0.5)', () => {
    const d = learner.map((x, i) => x - reference[i]);
    expect(d[0]).toBe(-0.19999999999999996);
    expect(d[4]).toBe(0.2);
    expect(wilcoxon(learner, reference).p).toBe(0.5);
  });

  it('with roundingTolerance(10 rows) the ties hold: T+ = 2.5 and p = 0.3125 as by hand', () => {
    const r = wilcoxon(learner, reference, { tolerance: roundingTolerance(10, 1) });
    expect(r.tPlus).toBe(2.5);
    expect(r.tMinus).toBe(12.5);
    expect(Math.abs(r.p - 0.3125)).toBeLessThan(1e-12);
    // the same as on the exact integer counts
    expect(r).toEqual(wilcoxon([4, 4, 4, 1, 2], [6, 6, 6, 7, 0]));
  });

  it('a difference within the tolerance is a zero, and is dropped (Wilcoxon 1945)', () => {
    const r = wilcoxon([0.1 + 0.2, 0.5, 0.9], [0.3, 0.25, 0.5], { tolerance: roundingTolerance(10, 1) });
    expect(r.n).toBe(2);
    expect(wilcoxon([0.1 + 0.2, 0.5, 0.9], [0.3, 0.25, 0.5]).n).toBe(3);
  });

  it('the tolerance stays far below the step 1/n^2 between distinct fractions of n rows', () => {
    for (const n of [10, 100, 1000, 10_000]) {
      expect(roundingTolerance(n, 1)).toBeLessThan(1 / (n * n) / 10);
      expect(roundingTolerance(n, 1)).toBeGreaterThan(n * Number.EPSILON);
    }
    // a real gap of one row in 1,000 is never merged
    const r = wilcoxon([0.501, 0.502, 0.4], [0.5, 0.5, 0.5], { tolerance: roundingTolerance(1000, 1) });
    expect([r.n, r.tPlus, r.tMinus]).toEqual([3, 3, 3]);
    expect(() => wilcoxon([1, 2], [2, 1], { tolerance: -1 })).toThrow('wilcoxon: tolerance must be a finite number >= 0, got -1');
  });

  it('is 4 testRows EPSILON |scale|, at least one row: written out by hand (issue 24, mutation testing)', () => {
    // the header's formula with powers of two, so every product is exact
    expect(roundingTolerance(10, 0.5)).toBe(20 * Number.EPSILON);
    expect(roundingTolerance(10, -2)).toBe(80 * Number.EPSILON);
    expect(roundingTolerance(0, 1)).toBe(4 * Number.EPSILON);
    expect(roundingTolerance(0.25, 4)).toBe(16 * Number.EPSILON);
  });
});

describe('wilcoxon: small cases by hand and the edges of the options (issue 24, mutation testing)', () => {
  // Exact null by enumeration of the 2^n sign patterns (Hollander & Wolfe sec. 3.1; Wilcoxon 1945).
  it('one pair: n = 1, T+ = 0, T- = 1; P(T+ <= 0) = 1/2, so p = min(1, 2 * 1/2) = 1', () => {
    expect(wilcoxon([1], [2])).toEqual({ n: 1, tPlus: 0, tMinus: 1, p: 1, method: 'exact' });
  });

  it('T+ at the centre: d = 1, 2, -3 gives T+ = T- = 3; P(T+ <= 3) = P(T+ >= 3) = 5/8, and p is capped at 1', () => {
    // sign patterns with T+ <= 3: {}, {1}, {2}, {3}, {1,2} = 5 of 8, so 2 * 5/8 = 1.25 -> 1
    expect(wilcoxon([1, 2, -3], zeros(3))).toEqual({ n: 3, tPlus: 3, tMinus: 3, p: 1, method: 'exact' });
  });

  it('four differences 1, 2, 3, 4 all positive: T+ = 10, exact two-sided p = 2/16', () => {
    expect(wilcoxon([1, 2, 3, 4], zeros(4))).toEqual({ n: 4, tPlus: 10, tMinus: 0, p: 0.125, method: 'exact' });
  });

  it('a difference exactly at the tolerance counts as zero (|d| <= tolerance)', () => {
    expect(wilcoxon([1.5, 3], [1, 1], { tolerance: 0.5 })).toEqual({ n: 1, tPlus: 1, tMinus: 0, p: 1, method: 'exact' });
  });

  it('magnitudes within the tolerance of the smallest of their group tie; one just past it does not', () => {
    // d = -1, 1.25, -2 with tolerance 0.25: |d| 1 and 1.25 share ranks 1, 2 (midrank 1.5), 2 takes
    // rank 3, so T+ = 1.5; with tolerance 0.2 they are apart: ranks 1, 2, 3 and T+ = 2
    expect(wilcoxon([-1, 1.25, -2], zeros(3), { tolerance: 0.25 })).toMatchObject({ tPlus: 1.5, tMinus: 4.5 });
    expect(wilcoxon([-1, 1.25, -2], zeros(3), { tolerance: 0.2 })).toMatchObject({ tPlus: 2, tMinus: 4 });
  });

  it('n = 0 keeps the asked method; 500 differences are allowed with method exact, and normal has no such cap', () => {
    expect(wilcoxon([0.5], [0.5], { method: 'normal' })).toEqual({ n: 0, tPlus: 0, tMinus: 0, p: 1, method: 'normal' });
    const r = wilcoxon(withTPlus(500, 0), zeros(500), { method: 'exact' });
    expect([r.n, r.tPlus, r.method]).toEqual([500, 0, 'exact']);
    expect(r.p).toBeLessThan(1e-100);
    expect(wilcoxon(withTPlus(501, 0), zeros(501), { method: 'normal' }).n).toBe(501);
  });

  it('refuses a tolerance that is not a finite number >= 0, and a continuity that is not boolean, naming the value', () => {
    expect(() => wilcoxon([1], [2], { tolerance: Infinity })).toThrow('wilcoxon: tolerance must be a finite number >= 0, got null');
    expect(() => wilcoxon([1], [2], { tolerance: Number.NaN })).toThrow(UsageError);
    expect(() => wilcoxon([1], [2], { tolerance: '0' as never })).toThrow('wilcoxon: tolerance must be a finite number >= 0, got "0"');
    expect(() => wilcoxon([1], [2], { continuity: 'yes' as never })).toThrow('wilcoxon: continuity must be true or false, got "yes"');
    expect(wilcoxon([1], [2], { continuity: false }).n).toBe(1);
  });
});
