import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { pairedStats, directionOf } from '../../src/compare/paired-stats.js';
import { InputError } from '../../src/errors.js';
import { minimalDetectable } from '../../src/stats/power.js';

// 5-fold plan: each model trains on 4/5 of the rows and is tested on 1/5, testRows/trainRows = 1/4
const FIVE_FOLD = { testRows: 20, trainRows: 80 };

describe('pairedStats: one learner against a reference on the same folds', () => {
  // Hand derivation (5 folds), d_j = learner_j - reference_j:
  //   d = 0.03 0.01 0.02 0.04 0.00, mean 0.02; deviations in hundredths 1 -1 0 2 -2, squares
  //   sum 10 -> s_d^2 = 0.0010 / 4 = 0.00025
  //   Nadeau-Bengio variance (1/5 + 1/4) s_d^2 = 0.45 * 0.00025 = 0.0001125, SE = 0.0106066
  //   t = 0.02 / 0.0106066 = 1.885618, df = 4
  //   NIST t table (e-Handbook 1.3.6.7.2): t_{4,0.95} = 2.132, t_{4,0.975} = 2.776, so the
  //   two-sided p lies between 0.10 and 0.20; interval 0.02 +/- 2.776 * 0.0106066 = [-0.00944, 0.04944]
  //   (the uncorrected paired t, 0.02 / sqrt(0.00025/5) = 2.828, would pass 2.776)
  //   Wilcoxon: the zero is dropped, n = 4, all positive: T+ = 1+2+3+4 = 10, exact two-sided
  //   p = 2 * (1/2)^4 = 0.125 (Wilcoxon 1945; only one sign pattern of 4 ranks gives T+ = 10)
  const reference = [0.8, 0.82, 0.78, 0.84, 0.81];
  const d = [0.03, 0.01, 0.02, 0.04, 0];
  const learner = reference.map((r, i) => r + d[i]);

  it('matches the hand-derived corrected t, interval, Wilcoxon figures and fold counts', () => {
    const s = pairedStats(learner, reference, FIVE_FOLD, true);
    expect(s.folds).toBe(5);
    expect(Math.abs(s.diff - 0.02)).toBeLessThan(1e-12);
    expect(s.direction).toBe('better');
    expect(s.df).toBe(4);
    expect(Math.abs(s.t! - 1.885618)).toBeLessThan(1e-5);
    expect(s.p!).toBeGreaterThan(0.1);
    expect(s.p!).toBeLessThan(0.2);
    const half = 2.776 * Math.sqrt(0.0001125);
    expect(Math.abs(s.ci95![0] - (0.02 - half))).toBeLessThan(1e-4);
    expect(Math.abs(s.ci95![1] - (0.02 + half))).toBeLessThan(1e-4);
    expect(s.wilcoxon).toMatchObject({ n: 4, tPlus: 10, tMinus: 0, method: 'exact' });
    expect(Math.abs(s.wilcoxon.p - 0.125)).toBeLessThan(1e-12);
    expect([s.wins, s.ties, s.losses]).toEqual([4, 1, 0]);
    expect(Math.abs(s.learnerMean - 0.83)).toBeLessThan(1e-12);
    expect(Math.abs(s.referenceMean - 0.81)).toBeLessThan(1e-12);
    expect([s.testRows, s.trainRows]).toEqual([20, 80]);
  });

  it("gives the two-sided p of jstat's Student t at the hand-derived t", () => {
    const s = pairedStats(learner, reference, FIVE_FOLD, true);
    // jstat (npm), the reference t distribution: p = 2 P(T_4 <= -1.885618)
    expect(Math.abs(s.p! - 2 * jStat.studentt.cdf(-1.885618, 4))).toBeLessThan(1e-6);
  });

  it('keeps diff in the metric units and flips only direction and wins for a lower-is-better metric', () => {
    const s = pairedStats(learner, reference, FIVE_FOLD, false);
    expect(Math.abs(s.diff - 0.02)).toBeLessThan(1e-12);
    expect(s.direction).toBe('worse');
    expect([s.wins, s.ties, s.losses]).toEqual([0, 1, 4]);
    expect(Math.abs(s.t! - 1.885618)).toBeLessThan(1e-5);
  });

  it('reproduces Hollander & Wolfe Example 3.1 with learner = x, reference = y: T+ = 40, exact p = 0.0391', () => {
    // Hollander & Wolfe, Nonparametric Statistical Methods, Example 3.1 (Hamilton depression
    // scale, first and second visit): T+ = 40, exact two-sided p = 0.0391 (book value)
    const x = [1.83, 0.5, 1.62, 2.48, 1.68, 1.88, 1.55, 3.06, 1.3];
    const y = [0.878, 0.647, 0.598, 2.05, 1.06, 1.29, 1.06, 3.14, 1.29];
    const s = pairedStats(x, y, { testRows: 1, trainRows: 8 }, true);
    expect(s.wilcoxon.tPlus).toBe(40);
    expect(s.wilcoxon.tMinus).toBe(5);
    expect(Math.abs(s.wilcoxon.p - 0.0391)).toBeLessThan(5e-5);
    // signs of x - y (computed by hand): 7 positive, 2 negative (0.5 - 0.647, 3.06 - 3.14)
    expect([s.wins, s.ties, s.losses]).toEqual([7, 0, 2]);
  });

  // Issue 24 part 2: equal differences used to give p = 0 and a zero-width interval; without a
  // variance floor (a metric that is not a share of test rows) nothing is claimed now.
  it('reports no t, df, p or interval for a single fold, and no t, p or interval when every difference is the same', () => {
    const one = pairedStats([0.9], [0.8], FIVE_FOLD, true);
    expect(one.ci95).toBeNull();
    expect(one.t).toBeNull();
    expect(one.df).toBeNull();
    expect(one.p).toBeNull();
    expect(Math.abs(one.diff - 0.1)).toBeLessThan(1e-12);
    const same = pairedStats([0.75, 0.5, 0.25], [0.5, 0.25, 0], FIVE_FOLD, true);
    expect(same.t).toBeNull();
    expect(same.p).toBeNull();
    expect(same.ci95).toBeNull();
    const equal = pairedStats([0.5, 0.25], [0.5, 0.25], FIVE_FOLD, true);
    expect(equal).toMatchObject({ diff: 0, direction: 'equal', t: null, p: null, ci95: null, ties: 2 });
  });

  it('refuses series that do not pair up or are empty', () => {
    expect(() => pairedStats([1, 2], [1], FIVE_FOLD, true)).toThrow(InputError);
    expect(() => pairedStats([], [], FIVE_FOLD, true)).toThrow('need at least 1 paired score');
    expect(directionOf(-0.1, false)).toBe('better');
    expect(directionOf(0, true)).toBe('equal');
  });
});

describe('pairedStats: rounding noise is not a win (issue 24 part 4)', () => {
  it('0.1 + 0.2 against 0.3 is a tie in wins/ties/losses and a zero in the Wilcoxon test', () => {
    // 0.1 + 0.2 = 0.30000000000000004 in binary floating point (IEEE 754 double), 0.3 as a fraction
    const s = pairedStats([0.1 + 0.2, 0.5, 0.9], [0.3, 0.25, 0.5], FIVE_FOLD, true);
    expect([s.wins, s.ties, s.losses]).toEqual([2, 1, 0]);
    expect(s.wilcoxon.n).toBe(2);
  });

  it('accuracy differences from counts keep their ties: the signed-rank p of the integer counts', () => {
    // counts over 10-row folds (worked by hand in test/stats/wilcoxon.test.ts): p = 0.3125
    const s = pairedStats([4, 4, 4, 1, 2].map((k) => k / 10), [6, 6, 6, 7, 0].map((k) => k / 10), { testRows: 10, trainRows: 40 }, true, 0, { proportion: true, range: [0, 1] });
    expect(Math.abs(s.wilcoxon.p - 0.3125)).toBeLessThan(1e-12);
    expect([s.wins, s.ties, s.losses]).toEqual([1, 0, 4]);
  });
});

describe('pairedStats: two folds, the proportion floor, clipping and the minimal detectable difference (issue 24, mutation survivors)', () => {
  it('names both lengths and the empty case in full', () => {
    expect(() => pairedStats([1, 2], [1], FIVE_FOLD, true)).toThrow('pairedStats: the series must pair up, got 2 and 1 scores');
    // wilcoxon has a message of the same words: the prefix tells that pairedStats refused first
    expect(() => pairedStats([], [], FIVE_FOLD, true)).toThrow('pairedStats: need at least 1 paired score, got 0');
  });

  it('two folds already give t and df = 1: t = sqrt(6) by hand', () => {
    // d = 0.1, 0.2, mean 0.15, s_d^2 = 0.005; with 5-fold rows (testRows/trainRows = 1/4) the
    // Nadeau-Bengio variance is (1/2 + 1/4) 0.005 = 0.00375, t = 0.15 / sqrt(0.00375) = sqrt(6)
    const s = pairedStats([0.9, 0.8], [0.8, 0.6], FIVE_FOLD, true);
    expect(s.df).toBe(1);
    expect(s.t!).toBeCloseTo(Math.sqrt(6), 9);
    // jstat (npm): two-sided p of Student t with 1 df
    expect(s.p!).toBeCloseTo(2 * jStat.studentt.cdf(-Math.sqrt(6), 1), 9);
  });

  it('equal accuracy differences on every fold take the binomial floor of |mean d| over all rows', () => {
    // d = 0.2 on each of 3 folds, 10 test + 40 train rows. Agresti-Coull add-two share written out:
    // p~ = (0.2 * 50 + 2) / (50 + 4) = 12/54, floor of the variance of the mean = p~ (1 - p~) / 50;
    // t = 0.2 / sqrt(floor), df = 2 (the floor is the variance of the mean, the correction already in it).
    // (d = 0.1 would not do: a share of 0.9 read by mistake gives the same p~ (1 - p~).)
    const rows = { testRows: 10, trainRows: 40 };
    const s = pairedStats([0.7, 0.7, 0.7], [0.5, 0.5, 0.5], rows, true, 0, { proportion: true, range: [0, 1] });
    const pt = 12 / 54;
    const floorOfMean = (pt * (1 - pt)) / 50;
    expect(s.df).toBe(2);
    expect(s.t!).toBeCloseTo(0.2 / Math.sqrt(floorOfMean), 6);
    expect(s.p!).toBeCloseTo(2 * jStat.studentt.cdf(-0.2 / Math.sqrt(floorOfMean), 2), 6);
    // the minimal detectable difference is there, since the floor gave a spread
    expect(s.mdd).not.toBeNull();
    expect(s.mdd!).toBeGreaterThan(0);
  });

  it('clips the interval to the range a difference of shares can take, [-1, 1]', () => {
    // d = 1, 0: mean 0.5, s_d^2 = 0.5, variance (1/2 + 1/4) 0.5 = 0.375; t_{1,0.975} = 12.706
    // (NIST e-Handbook table 1.3.6.7.2) so the raw interval is about 0.5 +/- 7.78, far outside [-1, 1]
    const clipped = pairedStats([1, 0], [0, 0], FIVE_FOLD, true, 0, { proportion: true, range: [0, 1] });
    expect(clipped.ci95).toEqual([-1, 1]);
    const raw = pairedStats([1, 0], [0, 0], FIVE_FOLD, true);
    expect(raw.ci95![1]).toBeCloseTo(0.5 + 12.706 * Math.sqrt(0.375), 2);
  });

  it('the minimal detectable difference uses the hand-derived s_d^2 = 0.00025 and is null with no spread', () => {
    const reference = [0.8, 0.82, 0.78, 0.84, 0.81];
    const learner = reference.map((r, i) => r + [0.03, 0.01, 0.02, 0.04, 0][i]);
    const s = pairedStats(learner, reference, FIVE_FOLD, true);
    // the MDD is minimalDetectable (src/stats/power.ts, its own tests) at the variance derived
    // by hand in the first describe above: this checks the variance pairedStats hands it
    const expected = minimalDetectable({ folds: 5, variance: 0.00025, testRows: 20, trainRows: 80 }, { alpha: 0.025, power: 0.8 });
    expect(s.mdd!).toBeCloseTo(expected, 9);
    expect(pairedStats([0.75, 0.5, 0.25], [0.5, 0.25, 0], FIVE_FOLD, true).mdd).toBeNull();
  });
});
