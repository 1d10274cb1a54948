/**
 * Unit tests of the gate's family of tests (src/compare/gate-family.ts): ruleOn's choice of the
 * paired or unpaired rule and of the folds it uses, the slices it can and cannot gate (with the
 * reasons written out), and Holm's adjustment over the family (S. Holm, Scand. J. Statist.
 * 6:65-70, 1979: q_(i) = min(1, max_{k <= i} (m - k + 1) p_(k)), worked by hand below).
 */
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { familyName, gateFamily, ruleOn, type FamilyInput } from '../../src/compare/gate-family.js';
import type { GateTest } from '../../src/compare/gate-rule.js';
import { foldsOf, learnerOf, reportOf, sliceFoldsOf, sliceLearnerOf, sliceOf } from './report-fixture.js';
import type { SliceReport } from '../../src/model/report.js';

// Hand derivation (gate-rule.test.ts): b and c = b - d on 5 folds of 20 test / 80 train rows,
// d = 0.03 0.01 0.02 0.04 0.00: mean 0.02, s_d^2 = 0.00025, SE = sqrt(0.0001125), t = 1.885618, df 4
const B = [0.8, 0.82, 0.78, 0.84, 0.81];
const D = [0.03, 0.01, 0.02, 0.04, 0];
const C = B.map((x, i) => x - D[i]);
const P_PAIRED = 1 - jStat.studentt.cdf(1.885618, 4); // one-sided p, jstat
// Welch (gate-rule.test.ts): c2 = b - 0.02, s^2 = 0.0005 on each side, df 8, t = 0.942809
const C2 = [0.78, 0.8, 0.76, 0.82, 0.79];
const P_UNPAIRED = 1 - jStat.studentt.cdf(0.942809, 8);
const O = { higherIsBetter: true, maxDrop: 0, alpha: 0.05 };

describe('familyName', () => {
  it('names a whole-report test by its metric, a slice test with its column and level', () => {
    expect(familyName({ metric: 'accuracy' })).toBe('accuracy');
    expect(familyName({ metric: 'accuracy', column: 'island', level: 'Dream' })).toBe('accuracy in island = Dream');
  });
});

describe('ruleOn: the rule on two learners folds, whole-report or one slice', () => {
  it('paired on the same folds: the hand derivation', () => {
    const t = ruleOn({ folds: foldsOf({ m: B }) }, { folds: foldsOf({ m: C }) }, 'm', true, O)!;
    expect(t.rule).toBe('paired');
    expect(Math.abs(t.t! - 1.885618)).toBeLessThan(1e-5);
    expect(t.df).toBe(4);
    expect(Math.abs(t.p - P_PAIRED)).toBeLessThan(1e-6);
  });

  it('paired with exactly 2 folds; with 1 fold no test at all (null, not a refusal)', () => {
    // d = 0.02 0.01: mean 0.015, s_d^2 = 0.00005, SE = sqrt((1/2 + 1/4) 0.00005), df 1
    const two = ruleOn({ folds: foldsOf({ m: [0.8, 0.82] }) }, { folds: foldsOf({ m: [0.78, 0.81] }) }, 'm', true, O)!;
    expect(two.rule).toBe('paired');
    expect(two.df).toBe(1);
    expect(Math.abs(two.t! - 0.015 / Math.sqrt(0.75 * 0.00005))).toBeLessThan(1e-9);
    expect(ruleOn({ folds: foldsOf({ m: [0.8] }) }, { folds: foldsOf({ m: [0.78] }) }, 'm', true, O)).toBeNull();
    // unpaired, 2 scored folds on each side are enough: Welch on s_b^2 = 0.0002, s_c^2 = 0.00045
    const unpaired = ruleOn({ folds: foldsOf({ m: [0.8, 0.82] }) }, { folds: foldsOf({ m: [0.78, 0.81] }) }, 'm', false, O)!;
    expect(unpaired.rule).toBe('unpaired');
    expect(Math.abs(unpaired.t! - 0.015 / Math.sqrt(0.75 * (0.0002 + 0.00045)))).toBeLessThan(1e-9);
  });

  it('unpaired when asked, when the folds do not match, or when their sizes differ', () => {
    const b = { folds: foldsOf({ m: B }) };
    const c = { folds: foldsOf({ m: C2 }) };
    const asked = ruleOn(b, c, 'm', false, O)!;
    expect(asked.rule).toBe('unpaired');
    expect(Math.abs(asked.df - 8)).toBeLessThan(1e-9);
    expect(Math.abs(asked.t! - 0.942809)).toBeLessThan(1e-5);
    expect(Math.abs(asked.p - P_UNPAIRED)).toBeLessThan(1e-6);
    // a sixth fold on one side only
    const six = { folds: foldsOf({ m: [...C2, 0.79] }) };
    expect(ruleOn(b, six, 'm', true, O)!.rule).toBe('unpaired');
    // the same fold numbers, one fold of another size (mean sizes stay 20 / 80)
    const sized = { folds: foldsOf({ m: C2 }, { testRows: [21, 19, 20, 20, 20], trainRows: [79, 81, 80, 80, 80] }) };
    const u = ruleOn(b, sized, 'm', true, O)!;
    expect(u.rule).toBe('unpaired');
    expect(Math.abs(u.t! - 0.942809)).toBeLessThan(1e-5);
  });

  it('the unpaired rule uses only the scored folds, and their mean sizes', () => {
    // previous: the null fold has 60 test rows; without it the mean is 10 test / 90 train
    const b = { folds: foldsOf({ m: [...B, null] }, { testRows: [5, 15, 10, 10, 10, 60], trainRows: [95, 85, 90, 90, 90, 40] }) };
    const c = { folds: foldsOf({ m: [null, ...C2] }, { k: 6, testRows: [70, 15, 25, 20, 20, 20], trainRows: [30, 85, 75, 80, 80, 80] }) };
    const vb = (1 / 5 + 10 / 90) * 0.0005;
    const vc = (1 / 5 + 20 / 80) * 0.0005;
    const t = ruleOn(b, c, 'm', false, O)!;
    expect(t.baselineFolds).toBe(5);
    expect(t.currentFolds).toBe(5);
    expect(Math.abs(t.t! - 0.02 / Math.sqrt(vb + vc))).toBeLessThan(1e-9);
    expect(Math.abs(t.df - (vb + vc) ** 2 / (vb ** 2 / 4 + vc ** 2 / 4))).toBeLessThan(1e-9);
  });

  it('null when either side has fewer than 2 scored folds', () => {
    const five = { folds: foldsOf({ m: B }) };
    const one = { folds: foldsOf({ m: [0.8, null, null, null, null] }) };
    expect(ruleOn(one, five, 'm', false, O)).toBeNull();
    expect(ruleOn(five, one, 'm', false, O)).toBeNull();
    // paired with one side scored on one fold: falls to the unpaired rule, which has too few too
    expect(ruleOn(five, one, 'm', true, O)).toBeNull();
  });

  it('reads the direction of the metric', () => {
    // an error metric that rose by d: a drop of 0.02
    const t = ruleOn({ folds: foldsOf({ m: B }) }, { folds: foldsOf({ m: B.map((x, i) => x + D[i]) }) }, 'm', true, { ...O, higherIsBetter: false })!;
    expect(Math.abs(t.drop - 0.02)).toBeLessThan(1e-12);
  });
});

/** A made-up whole-report test with a chosen p (gateFamily copies these fields). */
const overallTest = (p: number, i: number): GateTest => ({
  rule: 'paired',
  baselineMean: 0.8,
  currentMean: 0.79,
  baselineFolds: 5,
  currentFolds: 10 + i,
  change: -0.01 * (i + 1),
  ci95: [-0.05, 0.03],
  drop: 0.01 * (i + 1),
  dropBound: -0.01 * (i + 1),
  t: 1,
  df: 4,
  p,
  regression: false,
  improvement: false,
});

const plain = (metrics: string[], ps: number[], extra: Partial<FamilyInput> = {}): FamilyInput => ({
  previous: reportOf([]),
  current: reportOf([]),
  previousLearner: 'knn',
  currentLearner: 'knn',
  metrics,
  overall: ps.map(overallTest),
  slices: false,
  paired: true,
  maxDrop: 0,
  alpha: 0.05,
  ...extra,
});

describe('gateFamily: Holm over the whole-report tests', () => {
  it('copies each metric test and adjusts by hand: p 0.01, 0.04, 0.03 at alpha 0.05', () => {
    // sorted 0.01, 0.03, 0.04 (m = 3): 3 x 0.01 = 0.03; max(0.03, 2 x 0.03) = 0.06; max(0.06, 1 x 0.04) = 0.06
    const f = gateFamily(plain(['accuracy', 'macro-f1', 'kappa'], [0.01, 0.04, 0.03]));
    expect(f.method).toBe('holm');
    expect(f.tests).toHaveLength(3);
    expect(f.tests[0]).toEqual({ metric: 'accuracy', rule: 'paired', folds: 10, drop: 0.01, dropBound: -0.01, p: 0.01, adjustedP: expect.any(Number), regression: true });
    expect(f.tests.map((t) => t.adjustedP).map((q) => Math.round(q * 1e12) / 1e12)).toEqual([0.03, 0.06, 0.06]);
    expect(f.tests.map((t) => t.regression)).toEqual([true, false, false]);
    expect(f.tests.map((t) => t.folds)).toEqual([10, 11, 12]);
    expect(f.failing).toEqual(['accuracy']);
    expect(f.notGated).toEqual([]);
    expect('column' in f.tests[0]).toBe(false);
    // alpha is the family's: at 0.10 the two others fail too (0.06 <= 0.10)
    expect(gateFamily(plain(['accuracy', 'macro-f1', 'kappa'], [0.01, 0.04, 0.03], { alpha: 0.1 })).failing).toEqual(['accuracy', 'macro-f1', 'kappa']);
  });

  it('without --slices the reports slices are not read', () => {
    // reports without slices: no refusal when slices is false
    expect(gateFamily(plain(['accuracy'], [0.5])).tests).toHaveLength(1);
  });
});

// Slices: a column "island" with levels A, B, C and a binned column "size".
const sl = (spec: string, m: readonly (number | null)[], brier: readonly (number | null)[], o = {}) =>
  sliceLearnerOf(spec, sliceFoldsOf({ 'macro-f1': m, brier }, o));
const BRIER_B = [0.2, 0.22, 0.18, 0.24, 0.21];
const BRIER_C = BRIER_B.map((x, i) => x + D[i]); // brier rose by d: worse, a drop of 0.02
const NONE = [null, null, null, null, null];
const SHORT = [0.8, null, null, null, null];

function previousSlices(): SliceReport[] {
  return [
    sliceOf('island', [
      { level: 'A', learners: [sl('knn', B, BRIER_B), sl('linear', B, BRIER_B)] },
      { level: 'B', learners: [sl('knn', B, BRIER_B)] },
      { level: 'C', learners: [sl('knn', B, BRIER_B)] },
      { level: 'D', learners: [sl('linear', B, BRIER_B)] },
    ], { minRows: 7 }),
    sliceOf('size', [{ level: '[0, 1)', learners: [sl('knn', B, BRIER_B)] }], { edges: [0, 1, 2] }),
    sliceOf('colour', [{ level: 'red', learners: [sl('knn', B, BRIER_B)] }]),
    sliceOf('plain', [{ level: 'x', learners: [sl('knn', B, BRIER_B)] }]),
  ];
}
function currentSlices(): SliceReport[] {
  return [
    sliceOf('island', [
      // A: both metrics tested
      { level: 'A', learners: [sl('knn', C, BRIER_C)] },
      // B: macro-f1 scored on one fold only (short folds), brier tested
      { level: 'B', learners: [sl('knn', SHORT, BRIER_C)] },
      // C: absent; D: no knn in the previous slice
      { level: 'D', learners: [sl('knn', C, BRIER_C)] },
    ], { minRows: 7 }),
    // other bin edges
    sliceOf('size', [{ level: '[0, 1)', learners: [sl('knn', C, BRIER_C)] }], { edges: [0, 1.5, 2] }),
    // colour: not in the current report; plain: levels without bins on both sides, tested
    sliceOf('plain', [{ level: 'x', learners: [sl('knn', C, BRIER_C)] }]),
  ];
}

const sliced = (extra: Partial<FamilyInput> = {}): FamilyInput => ({
  previous: reportOf([learnerOf('knn', foldsOf({ 'macro-f1': B }))], { slices: previousSlices() }),
  current: reportOf([learnerOf('knn', foldsOf({ 'macro-f1': C }))], { slices: currentSlices() }),
  previousLearner: 'knn',
  currentLearner: 'knn',
  metrics: ['macro-f1', 'brier'],
  overall: [overallTest(0.5, 0), overallTest(0.6, 1)],
  slices: true,
  paired: true,
  maxDrop: 0,
  alpha: 0.05,
  ...extra,
});

describe('gateFamily --slices: every level both reports carry, with the reasons for the others', () => {
  it('tests the shared levels and lists the rest under notGated, in order', () => {
    const f = gateFamily(sliced());
    expect(f.tests.map((t) => [t.metric, t.column, t.level, t.rule, t.folds])).toEqual([
      ['macro-f1', undefined, undefined, 'paired', 10],
      ['brier', undefined, undefined, 'paired', 11],
      ['macro-f1', 'island', 'A', 'paired', 5],
      ['brier', 'island', 'A', 'paired', 5],
      ['brier', 'island', 'B', 'paired', 5],
      ['macro-f1', 'plain', 'x', 'paired', 5],
      ['brier', 'plain', 'x', 'paired', 5],
    ]);
    expect(f.notGated).toEqual([
      'macro-f1 in island = B: fewer than 2 folds scored on a side (a fold needs 7 test rows in the slice)',
      'island = C: not in the current report',
      'island = D: not in the current report',
      'size: the bins differ between the reports (other --slice-bins or data)',
      'colour: the current report has no slices of this column',
    ]);
    // every slice test is the hand derivation, in its metric's direction (brier rose: a drop)
    const slices = f.tests.slice(2);
    expect(slices).toHaveLength(5);
    for (const t of slices) {
      expect(Math.abs(t.drop - 0.02)).toBeLessThan(1e-12);
      expect(Math.abs(t.p - P_PAIRED)).toBeLessThan(1e-6);
      expect(Math.abs(t.dropBound - (0.02 - 2.132 * Math.sqrt(0.0001125)))).toBeLessThan(2e-4); // t_{4,0.95} = 2.132, NIST table
    }
  });

  it('Holm over all seven tests: the slices share one p, adjusted by hand', () => {
    // p sorted: P (x5), 0.5, 0.6 (m = 7); P = 0.0661: 7P, then 6P..3P are smaller, running max 7P
    // 0.5 x 2 = 1 -> 1; 0.6 x 1 -> max 1
    const f = gateFamily(sliced());
    const seven = Math.min(1, 7 * P_PAIRED);
    expect(f.tests.map((t) => t.adjustedP).map((q) => Math.round(q * 1e6) / 1e6)).toEqual(
      [1, 1, seven, seven, seven, seven, seven].map((q) => Math.round(q * 1e6) / 1e6),
    );
    expect(f.failing).toEqual([]);
    // 7P = 0.463: at alpha 0.49 the five slices fail, at 0.45 none
    expect(gateFamily(sliced({ alpha: 0.49 })).failing).toEqual([
      'macro-f1 in island = A',
      'brier in island = A',
      'brier in island = B',
      'macro-f1 in plain = x',
      'brier in plain = x',
    ]);
    expect(gateFamily(sliced({ alpha: 0.45 })).failing).toEqual([]);
  });

  it('uses the unpaired rule on the slices when the whole-report rule was unpaired', () => {
    const f = gateFamily(sliced({ paired: false }));
    expect(f.tests.slice(2).map((t) => t.rule)).toEqual(['unpaired', 'unpaired', 'unpaired', 'unpaired', 'unpaired']);
  });

  it('matches the current learner by its own spec', () => {
    // the current slices have no "linear" (and B, C have none in the previous): no level of island is tested
    const f = gateFamily(sliced({ previousLearner: 'linear', currentLearner: 'linear' }));
    expect(f.notGated.filter((n) => n.startsWith('island'))).toEqual(['A', 'B', 'C', 'D'].map((l) => `island = ${l}: not in the current report`));
    expect(f.tests.filter((t) => t.column !== undefined)).toEqual([]);
    // previous linear against current knn: island A and D are tested
    const g = gateFamily(sliced({ previousLearner: 'linear', currentLearner: 'knn' }));
    expect(g.tests.filter((t) => t.column === 'island').map((t) => `${t.metric} ${t.level}`)).toEqual(['macro-f1 A', 'brier A', 'macro-f1 D', 'brier D']);
  });

  it('refuses --slices when either report has none', () => {
    const noSlices = reportOf([]);
    expect(() => gateFamily(sliced({ previous: noSlices }))).toThrow(
      'gate --slices: the previous report has no slices; run eval with --slice COL for both reports',
    );
    expect(() => gateFamily(sliced({ current: noSlices }))).toThrow('gate --slices: the current report has no slices; run eval with --slice COL for both reports');
    expect(() => gateFamily(sliced({ current: reportOf([], { slices: [] }) }))).toThrow('the current report has no slices');
  });
});
