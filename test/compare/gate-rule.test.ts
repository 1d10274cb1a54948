import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { pairedGateTest, unpairedGateTest } from '../../src/compare/gate-rule.js';
import { InputError, UsageError } from '../../src/errors.js';

const FIVE_FOLD = { testRows: 20, trainRows: 80 }; // testRows/trainRows = 1/4
const higher = (alpha: number, maxDrop = 0) => ({ higherIsBetter: true, alpha, maxDrop });

describe('pairedGateTest: H0 "drop <= max-drop", one-sided corrected t (Nadeau & Bengio 2003)', () => {
  // Hand derivation: baseline b and current c = b - d on 5 folds, drop d_j = b_j - c_j:
  //   d = 0.03 0.01 0.02 0.04 0.00, mean 0.02, s_d^2 = 0.00025 (deviations 1 -1 0 2 -2 hundredths)
  //   SE = sqrt((1/5 + 1/4) * 0.00025) = sqrt(0.0001125) = 0.0106066, df = 4
  //   max-drop 0:     t = 0.02 / 0.0106066 = 1.885618
  //   max-drop 0.005: t = 0.015 / 0.0106066 = 1.414214
  //   NIST t table (e-Handbook 1.3.6.7.2): t_{4,0.95} = 2.132, t_{4,0.90} = 1.533
  //   -> at alpha 0.05 no rejection (pass); at alpha 0.10 rejection (fail) for max-drop 0 but
  //      not for max-drop 0.005; the one-sided 90% bound of the drop is 0.02 - 1.533 * 0.0106066
  //      = 0.003740. (The uncorrected t, 0.02 / sqrt(0.00025/5) = 2.828, would fail at 0.05.)
  const b = [0.8, 0.82, 0.78, 0.84, 0.81];
  const d = [0.03, 0.01, 0.02, 0.04, 0];
  const c = b.map((x, i) => x - d[i]);
  const se = Math.sqrt(0.0001125);

  it('passes at alpha 0.05 and fails at alpha 0.10, as the hand derivation says', () => {
    const at05 = pairedGateTest(b, c, FIVE_FOLD, higher(0.05));
    expect(at05.rule).toBe('paired');
    expect(Math.abs(at05.drop - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(at05.change + 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(at05.t! - 1.885618)).toBeLessThan(1e-5);
    expect(at05.df).toBe(4);
    expect(at05.regression).toBe(false);
    // one-sided p from jstat's Student t: P(T_4 >= 1.885618)
    expect(Math.abs(at05.p - (1 - jStat.studentt.cdf(1.885618, 4)))).toBeLessThan(1e-6);
    const at10 = pairedGateTest(b, c, FIVE_FOLD, higher(0.1));
    expect(at10.regression).toBe(true);
    expect(Math.abs(at10.dropBound - (0.02 - 1.533 * se))).toBeLessThan(2e-4);
    expect(at10.improvement).toBe(false);
  });

  it('tests the drop against max-drop, not against zero', () => {
    const r = pairedGateTest(b, c, FIVE_FOLD, higher(0.1, 0.005));
    expect(Math.abs(r.t! - 1.414214)).toBeLessThan(1e-5);
    expect(r.regression).toBe(false);
    // p is P(T_4 >= t) at the shifted statistic (jstat)
    expect(Math.abs(r.p - (1 - jStat.studentt.cdf(1.414214, 4)))).toBeLessThan(1e-6);
    // the bound does not depend on max-drop; the decision is "bound > max-drop"
    expect(Math.abs(r.dropBound - pairedGateTest(b, c, FIVE_FOLD, higher(0.1)).dropBound)).toBeLessThan(1e-12);
  });

  it('reads the drop in the better direction for lower-is-better metrics', () => {
    const up = b.map((x, i) => x + d[i]); // an error metric that rose: worse
    const r = pairedGateTest(b, up, FIVE_FOLD, { higherIsBetter: false, alpha: 0.1, maxDrop: 0 });
    expect(Math.abs(r.drop - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(r.change - 0.02)).toBeLessThan(1e-12);
    expect(r.regression).toBe(true);
  });

  it('reports an improvement by the same one-sided test on the gain', () => {
    const r = pairedGateTest(c, b, FIVE_FOLD, higher(0.1));
    expect(Math.abs(r.drop + 0.02)).toBeLessThan(1e-12);
    expect(r.regression).toBe(false);
    expect(r.improvement).toBe(true);
    expect(pairedGateTest(c, b, FIVE_FOLD, higher(0.05)).improvement).toBe(false);
  });

  // Issue 24 part 2 changed this case: zero spread used to fail with p = 0 (false certainty).
  it('with zero spread and no floor: passes within max-drop with no interval, refuses to decide beyond it', () => {
    const base = [0.8, 0.8, 0.8];
    const cur = [0.7, 0.7, 0.7];
    expect(() => pairedGateTest(base, cur, FIVE_FOLD, higher(0.05))).toThrow(InputError);
    expect(() => pairedGateTest(base, cur, FIVE_FOLD, higher(0.05))).toThrow(/no spread/);
    const pass = pairedGateTest(base, cur, FIVE_FOLD, higher(0.05, 0.2));
    expect(pass).toMatchObject({ regression: false, improvement: false, t: null, p: 1, ci95: null });
    const same = pairedGateTest(base, base, FIVE_FOLD, higher(0.05));
    expect(same).toMatchObject({ regression: false, improvement: false, drop: 0, change: 0, ci95: null });
  });

  it('a 2-fold accuracy report with one more error in each fold is not a regression (binomial floor)', () => {
    // 2 folds of 50 test rows (N = 100 rows); each fold has one more error: drop 0.02 on both
    // folds, s_d = 0. Floor by hand (README): q~ = (0.02 * 100 + 2) / 104, SE = sqrt(q~ (1 - q~) / 100),
    // bound = 0.02 - t_{1,0.95} SE with t_{1,0.95} = 6.314 (NIST table)
    const two = { testRows: 50, trainRows: 50 };
    const r = pairedGateTest([0.9, 0.86], [0.88, 0.84], two, { ...higher(0.05), proportion: true, range: [0, 1] });
    const q = 4 / 104;
    const se = Math.sqrt((q * (1 - q)) / 100);
    expect(r.regression).toBe(false);
    expect(Math.abs(r.t! - (r.drop - 0) / se)).toBeLessThan(1e-9);
    expect(Math.abs(r.dropBound - (r.drop - jStat.studentt.inv(0.95, 1) * se))).toBeLessThan(1e-9);
    expect(r.dropBound).toBeLessThan(0);
    expect(Number.isFinite(r.t!)).toBe(true);
    // the interval of change is clipped to [-1, 1] and has width
    expect(r.ci95![0]).toBeGreaterThanOrEqual(-1);
    expect(r.ci95![1] - r.ci95![0]).toBeGreaterThan(0.2);
    // without the floor the same scores would be refused, not failed
    expect(() => pairedGateTest([0.9, 0.86], [0.88, 0.84], two, higher(0.05))).toThrow(InputError);
  });

  it('one-sided p when t < 0 (an improvement) is P(T >= t) > 1/2, from jstat', () => {
    // c and b swapped: drop = -0.02, t = -1.885618 (hand derivation above), df 4
    const r = pairedGateTest(c, b, FIVE_FOLD, higher(0.05));
    expect(Math.abs(r.t! + 1.885618)).toBeLessThan(1e-5);
    expect(Math.abs(r.p - (1 - jStat.studentt.cdf(-1.885618, 4)))).toBeLessThan(1e-6);
    expect(r.p).toBeGreaterThan(0.9);
    // and t > 0 gives the other tail: the two p add to 1
    expect(Math.abs(r.p + pairedGateTest(b, c, FIVE_FOLD, higher(0.05)).p - 1)).toBeLessThan(1e-9);
    // t = 0 exactly: p = 1/2
    const z = pairedGateTest([0.8, 0.82, 0.78], [0.79, 0.83, 0.78], FIVE_FOLD, higher(0.05));
    expect(z.t).toBe(0);
    expect(z.p).toBe(0.5);
  });

  it('refuses bad options and too few folds', () => {
    expect(() => pairedGateTest(b, c, FIVE_FOLD, higher(0.5))).toThrow(UsageError);
    expect(() => pairedGateTest(b, c, FIVE_FOLD, higher(0))).toThrow('--alpha 0');
    expect(() => pairedGateTest(b, c, FIVE_FOLD, higher(0.05, -0.01))).toThrow('--max-drop -0.01');
    expect(() => pairedGateTest([0.8], [0.7], FIVE_FOLD, higher(0.05))).toThrow(InputError);
  });
});

describe('unpairedGateTest: Welch test with a Nadeau-Bengio corrected variance on each side', () => {
  it('matches the hand derivation with equal variances (Welch df = 2(J-1))', () => {
    // b = 0.80 0.82 0.78 0.84 0.81 (mean 0.81), c = b - 0.02 (mean 0.79); deviations in
    // hundredths -1 1 -3 3 0, squares sum 20 -> s^2 = 0.0005 on both sides
    // V = (1/5 + 1/4) * 0.0005 = 0.000225 each; SE = sqrt(0.00045) = 0.0212132
    // Welch-Satterthwaite df (NIST e-Handbook 1.3.5.3) = 0.00045^2 / (2 * 0.000225^2 / 4) = 8
    // t = 0.02 / 0.0212132 = 0.942809 < t_{8,0.95} = 1.860 (NIST t table): pass
    const b = [0.8, 0.82, 0.78, 0.84, 0.81];
    const c = [0.78, 0.8, 0.76, 0.82, 0.79];
    const r = unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05));
    expect(r.rule).toBe('unpaired');
    expect(Math.abs(r.drop - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(r.df - 8)).toBeLessThan(1e-9);
    expect(Math.abs(r.t! - 0.942809)).toBeLessThan(1e-5);
    expect(r.regression).toBe(false);
    // one-sided p and the 95% interval from jstat's Student t with 8 df
    expect(Math.abs(r.p - (1 - jStat.studentt.cdf(0.942809, 8)))).toBeLessThan(1e-6);
    const half = jStat.studentt.inv(0.975, 8) * Math.sqrt(0.00045);
    expect(Math.abs(r.ci95![0] - (-0.02 - half))).toBeLessThan(1e-9);
    expect(Math.abs(r.ci95![1] - (-0.02 + half))).toBeLessThan(1e-9);
  });

  it('matches the hand derivation with unequal variances (df = 100/17)', () => {
    // c = 0.77 0.81 0.73 0.85 0.79 (mean 0.79): deviations -2 2 -6 6 0 hundredths, s^2 = 0.0080/4 = 0.002
    // V_b = 0.000225, V_c = 0.45 * 0.002 = 0.0009, sum 0.001125
    // df = 0.001125^2 / ((0.000225^2 + 0.0009^2) / 4) = 1.265625e-6 / 2.1515625e-7 = 100/17
    // t = 0.02 / sqrt(0.001125) = 0.596285
    const b = [0.8, 0.82, 0.78, 0.84, 0.81];
    const c = [0.77, 0.81, 0.73, 0.85, 0.79];
    const r = unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05));
    expect(Math.abs(r.df - 100 / 17)).toBeLessThan(1e-9);
    expect(Math.abs(r.t! - 0.596285)).toBeLessThan(1e-5);
    expect(Math.abs(r.p - (1 - jStat.studentt.cdf(0.596285, 100 / 17)))).toBeLessThan(1e-6);
  });

  it('fails on a large drop and handles zero spread on both sides', () => {
    const b = [0.9, 0.91, 0.89, 0.9, 0.92];
    const c = [0.6, 0.62, 0.58, 0.61, 0.6];
    expect(unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05)).regression).toBe(true);
    expect(unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05, 0.5)).regression).toBe(false);
    // Issue 24 part 2: zero spread on both sides no longer fails with p = 0; see the boundary test
    expect(() => unpairedGateTest([0.8, 0.8], FIVE_FOLD, [0.7, 0.7], FIVE_FOLD, higher(0.05))).toThrow(InputError);
  });

  it('the boundary of the zero-spread rule: drop = max-drop passes, a hair above is refused, any spread tests', () => {
    // dyadic scores: means and the drop 0.25 are exact
    const b = [0.75, 0.75];
    const c = [0.5, 0.5];
    const at = unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05, 0.25));
    expect(at).toMatchObject({ drop: 0.25, regression: false, improvement: false, t: null, p: 1, ci95: null, dropBound: 0.25 });
    expect(() => unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05, 0.25 - 2 ** -20))).toThrow(/no spread/);
    // an improvement without spread is not claimed either
    expect(unpairedGateTest(c, FIVE_FOLD, b, FIVE_FOLD, higher(0.05))).toMatchObject({ improvement: false, regression: false, p: 1 });
    // spread on one side only: the Welch rule runs, with df = J_c - 1 (all variance on that side)
    const spread = unpairedGateTest(b, FIVE_FOLD, [0.5, 0.5 + 2 ** -10], FIVE_FOLD, higher(0.05, 0.25));
    expect(spread.t).not.toBeNull();
    expect(Math.abs(spread.df - 1)).toBeLessThan(1e-9);
    // a share of test rows is floored on both sides: no refusal, a finite t
    const floored = unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, { ...higher(0.05), proportion: true });
    // N = 20 + 80 = 100 rows on each side: p~ = (p 100 + 2) / 104, Var(mean) >= p~ (1 - p~) / 100
    const pb = (0.75 * 100 + 2) / 104;
    const pc = (0.5 * 100 + 2) / 104;
    const se = Math.sqrt((pb * (1 - pb)) / 100 + (pc * (1 - pc)) / 100);
    expect(Math.abs(floored.t! - 0.25 / se)).toBeLessThan(1e-9);
  });
});

describe('gate rule: the refusals word for word, equal scores and the floor of a gain (mutation survivors, issue 24)', () => {
  it('names the run and the count of its fold scores, and a score that is not finite', () => {
    const b = [0.8, 0.82, 0.78];
    expect(() => pairedGateTest([0.8], [0.7], FIVE_FOLD, higher(0.05))).toThrow('gate: the baseline run has 1 fold score; the gate needs at least 2 folds per run');
    expect(() => pairedGateTest(b, [0.7], FIVE_FOLD, higher(0.05))).toThrow('gate: the current run has 1 fold score; the gate needs at least 2 folds per run');
    expect(() => unpairedGateTest([], FIVE_FOLD, b, FIVE_FOLD, higher(0.05))).toThrow('gate: the baseline run has 0 fold scores; the gate needs at least 2 folds per run');
    expect(() => unpairedGateTest(b, FIVE_FOLD, [0.7], FIVE_FOLD, higher(0.05))).toThrow('gate: the current run has 1 fold score;');
    expect(() => pairedGateTest([0.8, NaN], [0.7, 0.7], FIVE_FOLD, higher(0.05))).toThrow('gate: the baseline run has a score that is not a finite number');
    expect(() => unpairedGateTest(b, FIVE_FOLD, [0.7, Infinity], FIVE_FOLD, higher(0.05))).toThrow('gate: the current run has a score that is not a finite number');
    expect(() => pairedGateTest(b, [0.7, 0.7], FIVE_FOLD, higher(0.05))).toThrow(InputError);
    expect(() => pairedGateTest(b, [0.7, 0.7], FIVE_FOLD, higher(0.05))).toThrow('gate: paired scores must pair up, got 3 and 2');
  });

  it('the option refusals in full; alpha must be a number, not a numeric string', () => {
    const b = [0.8, 0.82, 0.78];
    const c = [0.79, 0.8, 0.77];
    expect(() => pairedGateTest(b, c, FIVE_FOLD, higher(0.05, -0.01))).toThrow("--max-drop -0.01: expected a number >= 0, in the metric's units");
    expect(() => unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05, NaN))).toThrow('--max-drop NaN');
    expect(() => unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, higher(0.05, Infinity))).toThrow('--max-drop Infinity');
    expect(() => pairedGateTest(b, c, FIVE_FOLD, higher(0))).toThrow('--alpha 0: expected a number above 0 and below 0.5 (such as 0.05)');
    // "0.05" > 0 and "0.05" < 0.5 are true in JavaScript: only the typeof check refuses it
    expect(() => pairedGateTest(b, c, FIVE_FOLD, { higherIsBetter: true, maxDrop: 0, alpha: '0.05' as unknown as number })).toThrow(UsageError);
    expect(() => unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, { higherIsBetter: true, maxDrop: 0, alpha: '0.05' as unknown as number })).toThrow('--alpha 0.05');
  });

  it('equal scores are no spread even when their computed mean has a rounding residue', () => {
    // 0.1 + 0.1 + 0.1 = 0.30000000000000004 in doubles: the mean of three 0.1 is not 0.1 and a
    // sample variance would be a tiny positive number, not 0
    const tenth = [0.1, 0.1, 0.1];
    const fifth = [0.2, 0.2, 0.2];
    const u = unpairedGateTest(tenth, FIVE_FOLD, fifth, FIVE_FOLD, higher(0.05));
    expect(u).toMatchObject({ t: null, p: 1, ci95: null, improvement: false, regression: false });
    // the paired drops 0.1 - 0.2 are all the same double: the drop is that double, not a mean with residue
    const p = pairedGateTest(tenth, fifth, FIVE_FOLD, higher(0.05));
    expect(p.drop).toBe(0.1 - 0.2);
    expect(p).toMatchObject({ t: null, p: 1, ci95: null, improvement: false });
    expect(p.dropBound).toBe(0.1 - 0.2);
  });

  it('zero spread on both sides: df is J_b + J_c - 2', () => {
    const r = unpairedGateTest([0.75, 0.75, 0.75], FIVE_FOLD, [0.5, 0.5], FIVE_FOLD, higher(0.05, 0.25));
    expect(r.df).toBe(3);
    expect(r.baselineFolds).toBe(3);
    expect(r.currentFolds).toBe(2);
  });

  it('the binomial floor of a gain uses the size of the change: q~ = (0.02 N + 2) / (N + 4)', () => {
    // the 2-fold case of the test above, the other way round: one error fewer in each fold
    const two = { testRows: 50, trainRows: 50 };
    const r = pairedGateTest([0.88, 0.84], [0.9, 0.86], two, { ...higher(0.05), proportion: true, range: [0, 1] });
    const q = 4 / 104;
    const se = Math.sqrt((q * (1 - q)) / 100);
    expect(Math.abs(r.drop + 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(r.t! - r.drop / se)).toBeLessThan(1e-9);
    // 95% interval of the change: +0.02 -/+ t_{1,0.975} SE, t_{1,0.975} = 12.706 (NIST table), clipped to [-1, 1]
    expect(Math.abs(r.ci95![0] - Math.max(-1, 0.02 - jStat.studentt.inv(0.975, 1) * se))).toBeLessThan(1e-9);
    expect(Math.abs(r.ci95![1] - Math.min(1, 0.02 + 12.706 * se))).toBeLessThan(1e-4);
  });

  it('the unpaired floor uses each run its own mean: p~ = (p N + 2) / (N + 4) per side', () => {
    // baseline 0.75 (N = 100), current 0.5 (N = 50 rows: 10 test + 40 train): different floors
    const r = unpairedGateTest([0.75, 0.75], FIVE_FOLD, [0.5, 0.5], { testRows: 10, trainRows: 40 }, { ...higher(0.05), proportion: true });
    const pb = (0.75 * 100 + 2) / 104;
    const pc = (0.5 * 50 + 2) / 54;
    const vb = (pb * (1 - pb)) / 100;
    const vc = (pc * (1 - pc)) / 50;
    expect(Math.abs(r.t! - 0.25 / Math.sqrt(vb + vc))).toBeLessThan(1e-9);
    expect(Math.abs(r.df - (vb + vc) ** 2 / (vb ** 2 + vc ** 2))).toBeLessThan(1e-9);
  });
});

describe('gate rule: the decision at its edge and the unpaired direction (mutation survivors, issue 24)', () => {
  it('fails only when the bound lies strictly above max-drop: at max-drop = bound it passes', () => {
    // the bound does not depend on max-drop (first describe): take it from a run at max-drop 0
    const b = [0.8, 0.82, 0.78, 0.84, 0.81];
    const c = b.map((x, i) => x - [0.03, 0.01, 0.02, 0.04, 0][i]);
    const bound = pairedGateTest(b, c, FIVE_FOLD, higher(0.1)).dropBound;
    expect(bound).toBeGreaterThan(0);
    const at = pairedGateTest(b, c, FIVE_FOLD, higher(0.1, bound));
    expect(at.dropBound).toBe(bound);
    expect(at.regression).toBe(false);
  });

  it('unpaired, lower is better: a rise of the error is the drop', () => {
    // the equal-variance Welch case of the second describe with the sides read as an error metric
    const b = [0.78, 0.8, 0.76, 0.82, 0.79];
    const c = [0.8, 0.82, 0.78, 0.84, 0.81];
    const r = unpairedGateTest(b, FIVE_FOLD, c, FIVE_FOLD, { higherIsBetter: false, alpha: 0.05, maxDrop: 0 });
    expect(Math.abs(r.drop - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(r.change - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(r.t! - 0.942809)).toBeLessThan(1e-5);
  });
});
