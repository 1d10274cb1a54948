/**
 * Unit tests of gateReports (src/compare/gate.ts) on hand-built reports (report-fixture.ts):
 * the choice of metric and learners, the refusals, the paired and unpaired rules as wired, the
 * --worst-allowed limit, the detectable drop and the family switch. The rules themselves are
 * checked in gate-rule.test.ts; here the figures are rederived by hand where the wiring could
 * change them (which folds, which sizes, which direction).
 */
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { gateReports, DEFAULT_ALPHA, DEFAULT_MAX_DROP, GATE_SCHEMA } from '../../src/compare/gate.js';
import { NotComparableError } from '../../src/compare/match-reports.js';
import { InputError, UsageError } from '../../src/errors.js';
import { foldsOf, learnerOf, loaded, reportOf, sliceFoldsOf, sliceLearnerOf, sliceOf, type FoldOptions } from './report-fixture.js';

// Hand derivation (as in gate-rule.test.ts): previous b and current c = b - d on 5 folds of
// 20 test / 80 training rows, d = 0.03 0.01 0.02 0.04 0.00: mean drop 0.02, s_d^2 = 0.00025,
// SE = sqrt((1/5 + 20/80) * 0.00025) = sqrt(0.0001125) = 0.0106066, df 4, t = 1.885618.
// NIST/SEMATECH e-Handbook t table (1.3.6.7.2): t_{4,0.95} = 2.132, t_{4,0.975} = 2.776.
const B = [0.8, 0.82, 0.78, 0.84, 0.81];
const D = [0.03, 0.01, 0.02, 0.04, 0];
const C = B.map((x, i) => x - D[i]);
const SE = Math.sqrt(0.0001125);
const mean = (xs: readonly number[]): number => xs.reduce((a, b) => a + b, 0) / xs.length;

/** The learners of a report: a baseline with the best macro-f1 (never picked by default), knn, and a weaker knn:k=1. */
function learners(knn: readonly number[], o: FoldOptions = {}, extra: Record<string, readonly (number | null)[]> = {}) {
  return [
    learnerOf('baseline', foldsOf({ 'macro-f1': [0.95, 0.95, 0.95, 0.95, 0.95], accuracy: [0.6, 0.6, 0.6, 0.6, 0.6] })),
    learnerOf('knn', foldsOf({ 'macro-f1': knn, accuracy: [0.9, 0.88, 0.9, 0.92, 0.9], ...extra }, o)),
    learnerOf('knn:k=1', foldsOf({ 'macro-f1': [0.7, 0.72, 0.7, 0.71, 0.7], accuracy: [0.8, 0.8, 0.82, 0.8, 0.8] })),
  ];
}
const prev = (o = {}) => loaded('prev.json', reportOf(learners(B), o));
const cur = (scores: readonly number[] = C, o = {}, folds: FoldOptions = {}) => loaded('cur.json', reportOf(learners(scores, folds), o));

/** Power of the one-sided t test at `delta` standard errors (jstat's noncentral t). */
const powerAt = (deltaOverSe: number, df: number, alpha: number): number =>
  1 - jStat.noncentralt.cdf(jStat.studentt.inv(1 - alpha, df), df, deltaOverSe);
/** The verdict's number format, in words: 3 decimals at or above 1, else 3 significant digits. */
const num = (v: number): string => (Math.abs(v) >= 1 ? v.toFixed(3) : v.toPrecision(3));

describe('gateReports: the paired rule on the same folds', () => {
  it('matches the hand derivation, with the defaults written out in the verdict', () => {
    const v = gateReports(prev(), cur());
    expect(DEFAULT_MAX_DROP).toBe(0);
    expect(DEFAULT_ALPHA).toBe(0.05);
    expect(v.schema).toBe('foldwise-gate/2');
    expect(GATE_SCHEMA).toBe('foldwise-gate/2');
    expect(v.verdict).toBe('pass');
    expect(v.reasons).toEqual([]);
    expect(v.metric).toBe('macro-f1');
    expect(v.higherIsBetter).toBe(true);
    expect(v.rule).toBe('paired');
    expect(v.unpairedBecause).toEqual([]);
    expect(v.maxDrop).toBe(0);
    expect(v.alpha).toBe(0.05);
    expect(v.worstAllowed).toBeNull();
    expect(v.improvement).toBe(false);
    // the best learner that is not the baseline, on both sides
    expect(v.previous).toEqual({ path: 'prev.json', learner: 'knn', folds: 5, mean: expect.any(Number) });
    expect(v.current).toEqual({ path: 'cur.json', learner: 'knn', folds: 5, mean: expect.any(Number) });
    expect(Math.abs(v.previous.mean - 0.81)).toBeLessThan(1e-12);
    expect(Math.abs(v.current.mean - 0.79)).toBeLessThan(1e-12);
    expect(Math.abs(v.drop - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(v.change + 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(v.t! - 1.885618)).toBeLessThan(1e-5);
    expect(v.df).toBe(4);
    expect(Math.abs(v.p - (1 - jStat.studentt.cdf(1.885618, 4)))).toBeLessThan(1e-6);
    expect(Math.abs(v.dropBound - (0.02 - 2.132 * SE))).toBeLessThan(2e-4);
    expect(Math.abs(v.ci95![0] - (-0.02 - 2.776 * SE))).toBeLessThan(2e-4);
    expect(Math.abs(v.ci95![1] - (-0.02 + 2.776 * SE))).toBeLessThan(2e-4);
    expect('family' in v).toBe(false);
    expect(v.warnings).toEqual([]);
  });

  it('fails at alpha 0.10 (t = 1.886 > t_{4,0.90} = 1.533, NIST table)', () => {
    const v = gateReports(prev(), cur(), { alpha: 0.1 });
    expect(v.verdict).toBe('fail');
    expect(v.reasons).toEqual(['regression']);
    expect(v.alpha).toBe(0.1);
  });

  it('states the drop it could detect: the noncentrality with the asked power times the SE (jstat)', () => {
    const v = gateReports(prev(), cur());
    expect(v.detectable).not.toBeNull();
    const d = v.detectable!;
    expect(d.power).toBe(0.8);
    expect(d.drop).toBe(0 + d.mdd);
    // SE recovered from the bound is the hand SE; the power at mdd is 0.8 by jstat's noncentral t
    expect(Math.abs(powerAt(d.mdd / SE, 4, 0.05) - 0.8)).toBeLessThan(1e-6);
    const p9 = gateReports(prev(), cur(), { power: 0.9, maxDrop: 0.01 }).detectable!;
    expect(p9.power).toBe(0.9);
    expect(Math.abs(powerAt(p9.mdd / SE, 4, 0.05) - 0.9)).toBeLessThan(1e-6);
    expect(p9.drop).toBe(0.01 + p9.mdd);
    // at alpha 0.10 the critical value is t_{4,0.90}: the SE is still the hand one
    const a10 = gateReports(prev(), cur(), { alpha: 0.1 }).detectable!;
    expect(Math.abs(powerAt(a10.mdd / SE, 4, 0.1) - 0.8)).toBeLessThan(1e-6);
    expect(() => gateReports(prev(), cur(), { power: 0.01 })).toThrow(UsageError);
    expect(() => gateReports(prev(), cur(), { power: 0.01 })).toThrow('--power 0.01');
  });

  it('warns when the drop it can catch is larger than --max-drop, with the figures', () => {
    const v = gateReports(prev(), cur(), { maxDrop: 0.001 });
    const mdd = v.detectable!.mdd;
    expect(mdd).toBeGreaterThan(0.001);
    expect(v.warnings).toEqual([
      `this gate cannot see a drop of the size it guards: with this plan's fold noise a drop is caught with power 0.8 only from ${num(0.001 + mdd)} on (--max-drop 0.001 plus ${num(mdd)}); more repeats help (foldwise power prev.json --drop 0.001)`,
    ]);
    // 3 significant digits below 1 (toFixed(3) would give 0.032)
    expect(num(mdd)).toMatch(/^0\.0\d{3}$/);
    // --max-drop 0 guards no size: no warning; a max-drop above the mdd: none either
    expect(gateReports(prev(), cur()).warnings).toEqual([]);
    expect(gateReports(prev(), cur(), { maxDrop: mdd + 0.01 }).warnings).toEqual([]);
    // the mdd does not depend on --max-drop: at max-drop = mdd exactly the gate sees its size
    const same = gateReports(prev(), cur(), { maxDrop: mdd });
    expect(same.detectable!.mdd).toBe(mdd);
    expect(same.warnings).toEqual([]);
  });

  it('writes a figure of exactly 1 with 3 decimals', () => {
    // scores in units 25 times larger: the mdd is 25 times the one above, between 0.5 and 1
    const big = (xs: readonly number[]) => xs.map((x) => 25 * x);
    const reg = (scores: readonly number[]) => reportOf([learnerOf('linear', foldsOf({ rmse: scores, mae: scores }))], { task: 'regression' });
    const p = loaded('prev.json', reg(big(B)));
    const c = loaded('cur.json', reg(big(B.map((x, i) => x + D[i]))));
    const mdd = gateReports(p, c).detectable!.mdd;
    expect(mdd).toBeGreaterThan(0.5);
    expect(mdd).toBeLessThan(1);
    const maxDrop = 1 - mdd;
    expect(maxDrop + mdd).toBe(1);
    expect(gateReports(p, c, { maxDrop }).warnings[0]).toContain(`only from 1.000 on (--max-drop ${maxDrop} plus ${mdd.toPrecision(3)})`);
  });

  it('formats figures of 1 and more with 3 decimals (rmse in large units, lower is better)', () => {
    // rmse rose by 100 d: worse; SE = 100 * 0.0106066
    const big = (xs: readonly number[]) => xs.map((x) => 100 * x);
    const reg = (scores: readonly number[]) => reportOf([learnerOf('linear', foldsOf({ rmse: scores, mae: scores }))], { task: 'regression' });
    const v = gateReports(loaded('prev.json', reg(big(B))), loaded('cur.json', reg(big(B.map((x, i) => x + D[i])))), { maxDrop: 0.5 });
    expect(v.metric).toBe('rmse');
    expect(v.higherIsBetter).toBe(false);
    expect(Math.abs(v.drop - 2)).toBeLessThan(1e-9);
    expect(Math.abs(v.change - 2)).toBeLessThan(1e-9);
    const mdd = v.detectable!.mdd;
    expect(Math.abs(powerAt(mdd / (100 * SE), 4, 0.05) - 0.8)).toBeLessThan(1e-6);
    expect(mdd).toBeGreaterThan(1);
    expect(v.warnings).toEqual([
      `this gate cannot see a drop of the size it guards: with this plan's fold noise a drop is caught with power 0.8 only from ${(0.5 + mdd).toFixed(3)} on (--max-drop 0.5 plus ${mdd.toFixed(3)}); more repeats help (foldwise power prev.json --drop 0.5)`,
    ]);
  });

  it('no spread: no interval, nothing detectable, no warning', () => {
    const v = gateReports(prev(), cur(B), { maxDrop: 0.01 });
    expect(v).toMatchObject({ verdict: 'pass', t: null, ci95: null, p: 1, drop: 0, dropBound: 0, detectable: null, warnings: [] });
  });

  it('an improvement beyond fold noise is reported', () => {
    const v = gateReports(prev(), cur(B.map((x, i) => x + 3 * D[i] + 0.05)));
    expect(v.improvement).toBe(true);
    expect(v.verdict).toBe('pass');
  });

  it('warns when the reports come from different foldwise versions', () => {
    const v = gateReports(prev(), cur(C, { version: '1.1.0' }));
    expect(v.warnings).toEqual([
      'the reports were made by foldwise 1.0.0 and 1.1.0; pairing by (repeat, fold) assumes the plan code did not change between them',
    ]);
  });
});

describe('gateReports: which metric and which learners', () => {
  it('--metric picks another metric the reports score, and refuses one they do not', () => {
    const v = gateReports(prev(), cur(), { metric: 'accuracy' });
    expect(v.metric).toBe('accuracy');
    // knn's accuracy is the same on both sides
    expect(v.drop).toBe(0);
    expect(() => gateReports(prev(), cur(), { metric: 'rmse' })).toThrow(UsageError);
    expect(() => gateReports(prev(), cur(), { metric: 'rmse' })).toThrow('--metric rmse: the reports do not score it (they score macro-f1, accuracy)');
    // every metric of --metrics is checked, not only the first
    expect(() => gateReports(prev(), cur(), { metrics: ['macro-f1', 'log-loss'] })).toThrow('--metric log-loss: the reports do not score it (they score macro-f1, accuracy)');
  });

  it('an empty --metrics list falls back to --metric; repeated metrics are tested once', () => {
    const v = gateReports(prev(), cur(), { metrics: [], metric: 'accuracy' });
    expect(v.metric).toBe('accuracy');
    expect('family' in v).toBe(false);
    const f = gateReports(prev(), cur(), { metrics: ['accuracy', 'macro-f1', 'accuracy'] });
    expect(f.metric).toBe('accuracy');
    expect(f.family!.tests.map((t) => t.metric)).toEqual(['accuracy', 'macro-f1']);
  });

  it('--learner names the learner in both reports; --current-learner another one in the current report', () => {
    const v = gateReports(prev(), cur(), { learner: 'knn:k=1' });
    expect(v.previous.learner).toBe('knn:k=1');
    expect(v.current.learner).toBe('knn:k=1');
    const w = gateReports(prev(), cur(), { currentLearner: 'knn:k=1' });
    expect(w.previous.learner).toBe('knn');
    expect(w.current.learner).toBe('knn:k=1');
    expect(() => gateReports(prev(), cur(), { learner: 'forest' })).toThrow(UsageError);
    expect(() => gateReports(prev(), cur(), { learner: 'forest' })).toThrow(/^--learner forest: the previous report prev\.json has no such learner/);
    expect(() => gateReports(prev(), cur(), { currentLearner: 'forest' })).toThrow(/^--current-learner forest: the current report cur\.json has no such learner/);
  });

  it('the default learner must be in the current report (named with --learner)', () => {
    const other = loaded('cur.json', reportOf([learnerOf('linear', foldsOf({ 'macro-f1': C, accuracy: C }))]));
    expect(() => gateReports(prev(), other)).toThrow(/^--learner knn: the current report cur\.json has no such learner/);
  });

  it('by default the best mean in the better direction, the baseline only when it is alone', () => {
    const reg = (scores: Record<string, readonly number[]>) =>
      reportOf(Object.entries(scores).map(([spec, s]) => learnerOf(spec, foldsOf({ rmse: s, mae: s }))), { task: 'regression' });
    const r = reg({ baseline: [1, 1.2, 1, 1.1, 1], linear: [3, 3.1, 3, 3.2, 3], knn: [2, 2.1, 2, 2.2, 2] });
    // rmse: lower is better, knn (about 2.06) beats linear (about 3.06); the baseline is left out
    expect(gateReports(loaded('p', r), loaded('c', r)).previous.learner).toBe('knn');
    const only = reg({ baseline: [1, 1.2, 1, 1.1, 1] });
    expect(gateReports(loaded('p', only), loaded('c', only)).previous.learner).toBe('baseline');
  });

  it('refuses when no learner has a score of the metric', () => {
    const none = reportOf([learnerOf('knn', foldsOf({ 'macro-f1': [null, null, null, null, null], accuracy: B }))]);
    expect(() => gateReports(loaded('prev.json', none), loaded('cur.json', none))).toThrow(InputError);
    expect(() => gateReports(loaded('prev.json', none), loaded('cur.json', none))).toThrow('gate: prev.json: no learner has a macro-f1 score');
  });

  it('with only the baseline scored, the baseline is taken', () => {
    const r = reportOf([
      learnerOf('baseline', foldsOf({ 'macro-f1': B, accuracy: B })),
      learnerOf('knn', foldsOf({ 'macro-f1': [null, null, null, null, null], accuracy: B })),
    ]);
    expect(gateReports(loaded('p', r), loaded('c', r)).previous.learner).toBe('baseline');
  });
});

describe('gateReports: refusals of incomparable reports and options', () => {
  it('refuses reports of other data, also when the folds differ too', () => {
    const other = cur(C, { sha256: 'b'.repeat(64) });
    expect(() => gateReports(prev(), other)).toThrow(NotComparableError);
    expect(() => gateReports(prev(), other)).toThrow('gate: the runs differ in data.sha256 (aaaaaaaaaaaa… vs bbbbbbbbbbbb…); they are not comparable');
    const both = cur(C, { sha256: 'b'.repeat(64), seed: 2 });
    expect(() => gateReports(prev(), both)).toThrow(NotComparableError);
  });

  it('refuses a non-finite --worst-allowed and bad --max-drop / --alpha', () => {
    expect(() => gateReports(prev(), cur(), { worstAllowed: NaN })).toThrow(UsageError);
    expect(() => gateReports(prev(), cur(), { worstAllowed: NaN })).toThrow("--worst-allowed NaN: expected a finite number, in the metric's units");
    expect(() => gateReports(prev(), cur(), { worstAllowed: Infinity })).toThrow('--worst-allowed Infinity');
    expect(() => gateReports(prev(), cur(), { maxDrop: -1 })).toThrow('--max-drop -1');
    expect(() => gateReports(prev(), cur(), { alpha: 0.5 })).toThrow('--alpha 0.5');
  });

  it('refuses failed folds, naming the file, the learner and up to 3 folds', () => {
    const failed = (f: number[]) => cur(C, {}, { failed: f });
    const err = (f: () => unknown): NotComparableError => {
      try {
        f();
      } catch (e) {
        return e as NotComparableError;
      }
      throw new Error('no error');
    };
    const four = err(() => gateReports(prev(), failed([0, 1, 2, 4])));
    expect(four).toBeInstanceOf(NotComparableError);
    // the reports themselves match: no differences listed
    expect(four.differences).toEqual([]);
    expect(four.message).toBe(
      'gate: cur.json: knn failed in 4 of 5 folds (repeat 1 fold 1, repeat 1 fold 2, repeat 1 fold 3, …); fix the learner and rerun before gating; they are not comparable',
    );
    expect(err(() => gateReports(prev(), failed([1, 2, 4]))).message).toBe(
      'gate: cur.json: knn failed in 3 of 5 folds (repeat 1 fold 2, repeat 1 fold 3, repeat 1 fold 5); fix the learner and rerun before gating; they are not comparable',
    );
    // on the previous side too
    const p = loaded('prev.json', reportOf(learners(B, { failed: [3] })));
    expect(err(() => gateReports(p, cur())).message).toBe(
      'gate: prev.json: knn failed in 1 of 5 folds (repeat 1 fold 4); fix the learner and rerun before gating; they are not comparable',
    );
  });

  it('refuses folds without a score of the metric, naming up to 3', () => {
    const holes = (xs: (number | null)[]) => loaded('cur.json', reportOf(learners(C, {}, { 'macro-f1': xs })));
    expect(() => gateReports(prev(), holes([0.8, null, 0.8, 0.8, 0.8]))).toThrow(InputError);
    expect(() => gateReports(prev(), holes([0.8, null, 0.8, 0.8, 0.8]))).toThrow(
      'gate: cur.json: knn has no macro-f1 score in 1 of 5 folds (repeat 1 fold 2); a report with failed or undefined folds is not comparable',
    );
    expect(() => gateReports(prev(), holes([null, null, null, 0.8, 0.8]))).toThrow(
      'gate: cur.json: knn has no macro-f1 score in 3 of 5 folds (repeat 1 fold 1, repeat 1 fold 2, repeat 1 fold 3); a report',
    );
    expect(() => gateReports(prev(), holes([null, null, null, null, 0.8]))).toThrow(
      'gate: cur.json: knn has no macro-f1 score in 4 of 5 folds (repeat 1 fold 1, repeat 1 fold 2, repeat 1 fold 3, …); a report',
    );
  });
});

describe('gateReports: the unpaired rule, labelled with why', () => {
  // Welch by hand (gate-rule.test.ts): c = b - 0.02 with s^2 = 0.0005 on both sides; mean rows
  // 20 test / 80 train on both sides: V = (1/5 + 1/4) 0.0005 = 0.000225 each, SE = sqrt(0.00045),
  // Welch df = 8, t = 0.02 / 0.0212132 = 0.942809
  const C2 = [0.78, 0.8, 0.76, 0.82, 0.79];

  it('another seed: the unpaired rule on the mean fold sizes of each side', () => {
    // fold sizes vary on the current side but average 20 test / 80 train rows
    const v = gateReports(prev(), cur(C2, { seed: 2 }, { testRows: [19, 21, 20, 18, 22], trainRows: [81, 79, 80, 82, 78] }));
    expect(v.rule).toBe('unpaired');
    expect(v.unpairedBecause).toEqual(['plan.seed (1 vs 2)']);
    expect(Math.abs(v.df - 8)).toBeLessThan(1e-9);
    expect(Math.abs(v.t! - 0.942809)).toBeLessThan(1e-5);
    expect(Math.abs(v.p - (1 - jStat.studentt.cdf(0.942809, 8)))).toBeLessThan(1e-6);
    // the detectable drop uses the Welch SE and df
    expect(Math.abs(powerAt(v.detectable!.mdd / Math.sqrt(0.00045), 8, 0.05) - 0.8)).toBeLessThan(1e-6);
  });

  it('mean fold sizes, not the first fold: 10 test / 90 train on the previous side', () => {
    // V_b = (1/5 + 10/90) 0.0005, V_c = (1/5 + 20/80) 0.0005 (mean of 15..25 / 85..75 folds)
    const p = loaded('prev.json', reportOf(learners(B, { testRows: [5, 15, 10, 10, 10], trainRows: [95, 85, 90, 90, 90] })));
    const c = cur(C2, { seed: 2 }, { testRows: [15, 25, 20, 20, 20], trainRows: [85, 75, 80, 80, 80] });
    const vb = (1 / 5 + 10 / 90) * 0.0005;
    const vc = (1 / 5 + 20 / 80) * 0.0005;
    const df = (vb + vc) ** 2 / (vb ** 2 / 4 + vc ** 2 / 4);
    const v = gateReports(p, c);
    expect(Math.abs(v.t! - 0.02 / Math.sqrt(vb + vc))).toBeLessThan(1e-9);
    expect(Math.abs(v.df - df)).toBeLessThan(1e-9);
  });

  it('the plans match but the fold sizes differ: unpaired, naming the first such fold', () => {
    const v = gateReports(prev(), cur(C2, {}, { testRows: [20, 21, 20, 20, 20], trainRows: [80, 79, 80, 80, 80] }));
    expect(v.rule).toBe('unpaired');
    expect(v.unpairedBecause).toEqual(['fold sizes (repeat 1 fold 2: train/test 80/20 vs 79/21), although the plans match']);
  });

  it('the plans match but the fold lists differ: unpaired, counting the unmatched folds', () => {
    // the current report has a second repeat (folds 6..10 are repeat 2)
    const ten = [...C2, ...C2];
    const c = loaded('cur.json', reportOf([learnerOf('knn', foldsOf({ 'macro-f1': ten, accuracy: ten }))]));
    const v = gateReports(prev(), c);
    expect(v.rule).toBe('unpaired');
    expect(v.current.folds).toBe(10);
    expect(v.previous.folds).toBe(5);
    expect(v.unpairedBecause).toEqual(['fold lists (5 folds on one side only), although the plans match']);
    // Welch with J_c = 10 (same mean and spread per repeat): V_c = (1/10 + 1/4) s_c^2, s_c^2 = 0.0020/9 * ... by hand
    const sc2 = (2 * (1 + 1 + 9 + 9 + 0) * 1e-4) / 9;
    const vb = (1 / 5 + 1 / 4) * 0.0005;
    const vc = (1 / 10 + 1 / 4) * sc2;
    expect(Math.abs(v.t! - 0.02 / Math.sqrt(vb + vc))).toBeLessThan(1e-9);
    expect(Math.abs(v.df - (vb + vc) ** 2 / (vb ** 2 / 4 + vc ** 2 / 9))).toBeLessThan(1e-9);
  });
});

describe('gateReports: --worst-allowed', () => {
  it('fails when the current mean is below the limit (higher is better), not at it', () => {
    const at = gateReports(prev(), cur()).current.mean;
    const v = gateReports(prev(), cur(), { worstAllowed: 0.8 });
    expect(v.worstAllowed).toBe(0.8);
    expect(v.verdict).toBe('fail');
    expect(v.reasons).toEqual(['worst-allowed']);
    expect(gateReports(prev(), cur(), { worstAllowed: at }).verdict).toBe('pass');
    expect(gateReports(prev(), cur(), { worstAllowed: 0.7 }).reasons).toEqual([]);
    expect(gateReports(prev(), cur(), { worstAllowed: 0.8, alpha: 0.1 }).reasons).toEqual(['regression', 'worst-allowed']);
  });

  it('fails when the current mean is above the limit (lower is better), not at it', () => {
    const reg = (scores: readonly number[]) => reportOf([learnerOf('linear', foldsOf({ rmse: scores, mae: scores }))], { task: 'regression' });
    const up = B.map((x, i) => x + D[i]); // mean 0.83
    const p = loaded('prev.json', reg(B));
    const c = loaded('cur.json', reg(up));
    const at = gateReports(p, c).current.mean;
    expect(gateReports(p, c, { worstAllowed: 0.82 }).reasons).toEqual(['worst-allowed']);
    expect(gateReports(p, c, { worstAllowed: at }).reasons).toEqual([]);
    expect(gateReports(p, c, { worstAllowed: 0.9 }).reasons).toEqual([]);
  });
});

describe('gateReports: several metrics are a Holm family', () => {
  it('the family decides: a second metric can fail a gate the headline passes', () => {
    // accuracy falls from about 0.9 to 0.6 on every fold: far beyond the binomial floor
    const p = loaded('prev.json', reportOf(learners(B)));
    const c = loaded('cur.json', reportOf(learners(C, {}, { accuracy: [0.6, 0.62, 0.6, 0.58, 0.6] })));
    const v = gateReports(p, c, { metrics: ['macro-f1', 'accuracy'] });
    expect(v.metric).toBe('macro-f1');
    expect(v.family!.failing).toEqual(['accuracy']);
    expect(v.family!.tests.map((t) => t.rule)).toEqual(['paired', 'paired']);
    expect(v.verdict).toBe('fail');
    expect(v.reasons).toEqual(['regression']);
  });

  it('and can pass what the headline alone fails: p = 0.066 < 0.10 alone, 2 x 0.066 > 0.10 in a family of two', () => {
    const alone = gateReports(prev(), cur(), { alpha: 0.1 });
    expect(alone.verdict).toBe('fail');
    expect(alone.p).toBeGreaterThan(0.05);
    const v = gateReports(prev(), cur(), { alpha: 0.1, metrics: ['macro-f1', 'accuracy'] });
    expect(v.family!.failing).toEqual([]);
    expect(v.verdict).toBe('pass');
    // unpaired folds: the family is told so
    const u = gateReports(prev(), cur(C, { seed: 2 }), { metrics: ['macro-f1', 'accuracy'] });
    expect(u.family!.tests.map((t) => t.rule)).toEqual(['unpaired', 'unpaired']);
    expect(u.family!.notGated).toEqual([]);
  });

  it('--slices: the slices get the paired rule when the reports pair, the unpaired one when not', () => {
    const withSlices = (path: string, scores: readonly number[], seed: number) =>
      loaded(path, reportOf(learners(scores), { seed, slices: [sliceOf('island', [{ level: 'A', learners: [sliceLearnerOf('knn', sliceFoldsOf({ 'macro-f1': scores, accuracy: scores }))] }])] }));
    const paired = gateReports(withSlices('prev.json', B, 1), withSlices('cur.json', C, 1), { slices: true });
    expect(paired.family!.tests.map((t) => [t.column ?? '', t.rule])).toEqual([
      ['', 'paired'],
      ['island', 'paired'],
    ]);
    const unpaired = gateReports(withSlices('prev.json', B, 1), withSlices('cur.json', C, 2), { slices: true });
    expect(unpaired.family!.tests.map((t) => [t.column ?? '', t.rule])).toEqual([
      ['', 'unpaired'],
      ['island', 'unpaired'],
    ]);
  });

  it('--slices asks the family for the slices (refused here: the reports have none)', () => {
    expect(() => gateReports(prev(), cur(), { slices: true })).toThrow('gate --slices: the previous report has no slices');
  });
});
