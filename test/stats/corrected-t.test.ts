import jStat from 'jstat';
import { sampleVariance } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { createRng } from '../../src/rng.js';
import { correctedT } from '../../src/stats/corrected-t.js';

const TEN_FOLD = { testRows: 50, trainRows: 450 }; // testRows/trainRows = 1/9

describe('correctedT: paired corrected resampled t test (Nadeau & Bengio 2003)', () => {
  // Hand derivation, 10 folds, d_j = a_j - b_j:
  //   d = 0.02 0.00 0.01 0.03 -0.01 0.01 0.02 0.00 0.01 0.01, mean dbar = 0.01
  //   deviations in hundredths 1 -1 0 2 -2 0 1 -1 0 0, squares sum 12 -> s_d^2 = 0.0012 / 9
  //   corrected variance (1/10 + 1/9) s_d^2 = 19/90 * 0.0012/9 = 0.0228/810
  //   t = 0.01 / sqrt(0.0228/810) = 1.884843..., df = 9
  //   NIST t table (e-Handbook 1.3.6.7.2): t_{9,0.95} = 1.833 < t < t_{9,0.975} = 2.262,
  //   so 0.05 < p < 0.10; interval 0.01 +/- 2.262 * sqrt(0.0228/810) = [-0.00200, 0.02200].
  //   The uncorrected paired t, 0.01 / sqrt(0.0012/9/10) = 2.7386, would pass 2.262.
  const b = [0.8, 0.82, 0.78, 0.85, 0.81, 0.79, 0.83, 0.8, 0.84, 0.78];
  const d = [0.02, 0, 0.01, 0.03, -0.01, 0.01, 0.02, 0, 0.01, 0.01];
  const a = b.map((x, i) => x + d[i]);

  it('matches the hand-derived case', () => {
    const r = correctedT(a, b, TEN_FOLD);
    const tHand = 0.01 / Math.sqrt(0.0228 / 810);
    expect(Math.abs(tHand - 1.884843)).toBeLessThan(1e-6);
    expect(r.df).toBe(9);
    expect(Math.abs(r.meanDiff - 0.01)).toBeLessThan(1e-12);
    expect(Math.abs(r.t! - tHand)).toBeLessThan(1e-9);
    expect(r.p!).toBeGreaterThan(0.05);
    expect(r.p!).toBeLessThan(0.1);
    const half = 2.262 * Math.sqrt(0.0228 / 810);
    expect(Math.abs(r.ci95![0] - (0.01 - half))).toBeLessThan(1e-5);
    expect(Math.abs(r.ci95![1] - (0.01 + half))).toBeLessThan(1e-5);
    expect(0.01 / Math.sqrt(0.0012 / 9 / 10)).toBeGreaterThan(2.262);
  });

  it('p-value equals two tails of jstat\'s t distribution at the hand-derived t', () => {
    const r = correctedT(a, b, TEN_FOLD);
    const tHand = 0.01 / Math.sqrt(0.0228 / 810);
    expect(Math.abs(r.p! - 2 * jStat.studentt.cdf(-tHand, 9))).toBeLessThan(1e-9);
  });

  it('p-value equals jstat\'s two tails on seeded synthetic scores (several J and ratios)', () => {
    const rng = createRng(20240611);
    let checked = 0;
    for (const j of [3, 5, 10, 30, 50]) {
      for (const ratio of [1 / 9, 1 / 4, 1]) {
        const x = Array.from({ length: j }, () => 0.7 + 0.1 * rng.next());
        const y = x.map((v) => v - 0.02 + 0.05 * (rng.next() - 0.5));
        const r = correctedT(x, y, { testRows: ratio, trainRows: 1 });
        const diffs = x.map((v, i) => v - y[i]);
        const mean = diffs.reduce((s, v) => s + v, 0) / j;
        const t = mean / Math.sqrt((1 / j + ratio) * sampleVariance(diffs));
        expect(Math.abs(r.t! - t) / Math.abs(t)).toBeLessThan(1e-12);
        expect(Math.abs(r.p! - 2 * jStat.studentt.cdf(-Math.abs(t), j - 1))).toBeLessThan(1e-12);
        checked++;
      }
    }
    expect(checked).toBe(15);
  });

  it('is antisymmetric in a and b', () => {
    const r1 = correctedT(a, b, TEN_FOLD);
    const r2 = correctedT(b, a, TEN_FOLD);
    expect(r2.t!).toBeCloseTo(-r1.t!, 12);
    expect(r2.p!).toBeCloseTo(r1.p!, 12);
  });

  // Issue 24 part 2 changed this case: zero spread used to give t = +/-Infinity, p = 0 and a
  // zero-width interval; equal differences are not certainty, so without a floor nothing is claimed.
  it('zero spread without a floor: no t, no p, no interval (never Infinity or a zero-width interval)', () => {
    // dyadic scores so that a - b is exactly constant
    const y = [0.5, 0.25, 0.75, 0.625];
    expect(correctedT(y, y, TEN_FOLD)).toEqual({ meanDiff: 0, ci95: null, t: null, df: 3, p: null });
    const up = y.map((v) => v + 0.125);
    expect(correctedT(up, y, TEN_FOLD)).toEqual({ meanDiff: 0.125, ci95: null, t: null, df: 3, p: null });
  });

  it('zero spread with a variance floor: the floor stands in for s_d^2 (t and interval by hand)', () => {
    const y = [0.5, 0.25, 0.75, 0.625];
    const up = y.map((v) => v + 0.125);
    const floor = 0.01;
    const r = correctedT(up, y, TEN_FOLD, 0.95, floor);
    // by hand: SE = sqrt((1/4 + 1/9) * 0.01); t = 0.125 / SE; df 3; two tails from jstat
    const se = Math.sqrt((1 / 4 + 1 / 9) * floor);
    expect(Math.abs(r.t! - 0.125 / se)).toBeLessThan(1e-12);
    expect(Math.abs(r.p! - 2 * jStat.studentt.cdf(-0.125 / se, 3))).toBeLessThan(1e-12);
    const q = jStat.studentt.inv(0.975, 3);
    expect(Math.abs(r.ci95![0] - (0.125 - q * se))).toBeLessThan(1e-9);
    expect(Math.abs(r.ci95![1] - (0.125 + q * se))).toBeLessThan(1e-9);
    // a floor below the sample variance changes nothing
    expect(correctedT(a, b, TEN_FOLD, 0.95, 1e-12)).toEqual(correctedT(a, b, TEN_FOLD));
    expect(() => correctedT(a, b, TEN_FOLD, 0.95, -1)).toThrow('correctedT: varianceFloor must be a finite number >= 0, got -1');
  });

  it('refuses unpaired, too short or NaN input', () => {
    expect(() => correctedT([1, 2, 3], [1, 2], TEN_FOLD)).toThrow('correctedT: a and b must pair up, got 3 and 2 scores');
    expect(() => correctedT([1], [2], TEN_FOLD)).toThrow('correctedT: need at least 2 paired scores, got 1');
    expect(() => correctedT([1, Number.NaN], [2, 3], TEN_FOLD)).toThrow(InputError);
    // the message names the function and which argument holds the NaN (a mutant that blanked 'a' passed the line above)
    expect(() => correctedT([1, Number.NaN], [2, 3], TEN_FOLD)).toThrow('correctedT: a[1] is NaN; filter missing scores before calling');
    expect(() => correctedT([1, 2], [2, Number.NaN], TEN_FOLD)).toThrow('correctedT: b[1] is NaN; filter missing scores before calling');
  });

  it('two folds (the fewest allowed): df 1, the Cauchy closed form and the NIST t_{1,0.975} = 12.706', () => {
    // d = 1, 2: mean 1.5, s_d^2 = 0.5, corrected variance (1/2 + 1/9) 0.5 = 11/36, t = 1.5 / sqrt(11/36).
    // With df = 1 the t distribution is Cauchy: two-sided p = 1 - 2 atan(|t|) / pi (Abramowitz &
    // Stegun sec. 26.7, from memory); the interval half width is 12.706 SE (NIST e-Handbook 1.3.6.7.2).
    const r = correctedT([1, 2], [0, 0], TEN_FOLD);
    const se = Math.sqrt(11 / 36);
    expect(r.df).toBe(1);
    expect(Math.abs(r.t! - 1.5 / se)).toBeLessThan(1e-12);
    expect(Math.abs(r.p! - (1 - (2 * Math.atan(1.5 / se)) / Math.PI))).toBeLessThan(1e-9);
    expect(Math.abs(r.ci95![1] - (1.5 + 12.706 * se))).toBeLessThan(6e-4 * se);
    expect(Math.abs(r.ci95![0] - (1.5 - 12.706 * se))).toBeLessThan(6e-4 * se);
  });

  it('equal differences that are not dyadic: the mean is the difference itself and no spread is claimed', () => {
    // simple-statistics gives mean([0.1, 0.1, 0.1]) = 0.10000000000000002 and a sample variance of
    // about 3e-34 (its compensated sum); the flat case must not turn that noise into a t of 1e16
    expect(correctedT([0.1, 0.1, 0.1], [0, 0, 0], TEN_FOLD)).toEqual({ meanDiff: 0.1, ci95: null, t: null, df: 2, p: null });
  });

  it('refuses a variance floor that is not a finite number >= 0, naming the value; a bad level is refused too', () => {
    expect(() => correctedT(a, b, TEN_FOLD, 0.95, Infinity)).toThrow('correctedT: varianceFloor must be a finite number >= 0, got Infinity');
    expect(() => correctedT(a, b, TEN_FOLD, 0.95, Number.NaN)).toThrow('correctedT: varianceFloor must be a finite number >= 0, got NaN');
    expect(() => correctedT(a, b, TEN_FOLD, 0.95, '0' as never)).toThrow('correctedT: varianceFloor must be a finite number >= 0, got 0');
    expect(() => correctedT(a, b, TEN_FOLD, 1)).toThrow('correctedT: level must be a number strictly between 0 and 1, got 1');
    expect(() => correctedT(a, b, { testRows: 0, trainRows: 1 })).toThrow('correctedT: correction.testRows must be a finite number > 0, got 0');
  });
});
