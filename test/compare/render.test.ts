/**
 * The Markdown of compare and gate (src/compare/render.ts) on hand-built comparisons and
 * verdicts: whole documents written out line by line, numbers with four decimals, signs on
 * differences, p-values below 0.0001 as "< 0.0001", and each branch of the verdict's wording.
 */
import { describe, expect, it } from 'vitest';
import { pValue, renderCompareMarkdown, renderGateMarkdown, renderNotComparableMarkdown, signed } from '../../src/compare/render.js';
import type { CrossComparison, FamilyTest, GateVerdict, PairedStats } from '../../src/model/compare.js';

describe('signed and pValue', () => {
  it('signs a difference with four decimals; a negative zero after rounding is 0.0000; no number is "–"', () => {
    expect(signed(0.012)).toBe('+0.0120');
    expect(signed(-0.0031)).toBe('-0.0031');
    expect(signed(0)).toBe('0.0000');
    expect(signed(-0.00001)).toBe('0.0000');
    expect(signed(0.00001)).toBe('+0.0000');
    expect(signed(-0)).toBe('0.0000');
    expect(signed(null)).toBe('–');
    expect(signed(undefined)).toBe('–');
    expect(signed(NaN)).toBe('–');
    expect(signed(Infinity)).toBe('–');
  });

  it('writes p with four decimals, or "< 0.0001" below it', () => {
    expect(pValue(0.04567)).toBe('0.0457');
    expect(pValue(0.0001)).toBe('0.0001');
    expect(pValue(0.00009)).toBe('< 0.0001');
    expect(pValue(0)).toBe('< 0.0001');
    expect(pValue(1)).toBe('1.0000');
    expect(pValue(null)).toBe('–');
    expect(pValue(undefined)).toBe('–');
    expect(pValue(NaN)).toBe('–');
    expect(pValue(-Infinity)).toBe('–');
  });
});

const stats = (over: Partial<PairedStats> = {}): PairedStats => ({
  folds: 5,
  skippedFolds: 0,
  testRows: 20,
  trainRows: 80,
  learnerMean: 0.83,
  referenceMean: 0.81,
  diff: 0.02,
  direction: 'better',
  ci95: [-0.00944, 0.04944],
  t: 1.885618,
  df: 4,
  p: 0.1325,
  wilcoxon: { n: 4, tPlus: 10, tMinus: 0, p: 0.125, method: 'exact' },
  mdd: 0.04,
  wins: 4,
  ties: 1,
  losses: 0,
  ...over,
});

describe('renderCompareMarkdown', () => {
  const c: CrossComparison = {
    metric: 'kappa',
    higherIsBetter: true,
    firstPath: 'runs/a|1.json',
    secondPath: 'runs/b.json',
    sha256: '0123456789abcdef'.repeat(4),
    plan: 'kfold:5',
    seed: 7,
    rows: [
      { first: 'knn', second: 'knn', stats: stats() },
      { first: 'knn:k=7', second: 'knn:vote=inverse', stats: stats({ diff: -0.003, ci95: null, t: null, df: null, p: null, wilcoxon: { n: 0, tPlus: 0, tMinus: 0, p: 0.00001, method: 'exact' } }) },
      { first: 'tree', second: 'tree', stats: null },
    ],
    warnings: ['tree: no fold has a kappa score in both reports', 'a <b>'],
  };

  it('writes the header lines, one table row per learner and the warnings', () => {
    expect(renderCompareMarkdown(c).split('\n')).toEqual([
      '# foldwise compare: kappa',
      '',
      '- First: runs/a\\|1.json; second: runs/b.json',
      '- Same data (SHA-256 0123456789ab), plan kfold:5, seed 7: folds paired by repeat and fold',
      '- difference = second minus first (kappa: higher is better); interval and t with the Nadeau-Bengio correction; the Wilcoxon test treats folds as independent, so read its p as a description',
      '',
      '| learner | first | second | difference | 95% interval (corrected) | t | df | p | Wilcoxon p | second wins/ties/losses |',
      '| :-- | --: | --: | --: | --: | --: | --: | --: | --: | --: |',
      '| knn | 0.8100 | 0.8300 | +0.0200 | -0.0094 to +0.0494 | 1.89 | 4 | 0.1325 | 0.1250 | 4/1/0 |',
      '| knn:k=7 -> knn:vote=inverse | 0.8100 | 0.8300 | -0.0030 | – | – | – | – | < 0.0001 | 4/1/0 |',
      '| tree | – | – | – | – | – | – | – | – | – |',
      '',
      '- Warning: tree: no fold has a kappa score in both reports',
      '- Warning: a &lt;b&gt;',
      '',
    ]);
  });

  it('says lower is better for such a metric and ends after the table without warnings', () => {
    const lines = renderCompareMarkdown({ ...c, metric: 'rmse', higherIsBetter: false, rows: [c.rows[0]], warnings: [] }).split('\n');
    expect(lines[4]).toContain('(rmse: lower is better)');
    expect(lines.slice(-2)).toEqual(['| knn | 0.8100 | 0.8300 | +0.0200 | -0.0094 to +0.0494 | 1.89 | 4 | 0.1325 | 0.1250 | 4/1/0 |', '']);
  });
});

const verdict = (over: Partial<GateVerdict> = {}): GateVerdict => ({
  schema: 'foldwise-gate/2',
  verdict: 'pass',
  reasons: [],
  improvement: false,
  metric: 'accuracy',
  higherIsBetter: true,
  previous: { path: 'prev.json', learner: 'knn', folds: 10, mean: 0.85 },
  current: { path: 'cur.json', learner: 'knn', folds: 10, mean: 0.845 },
  rule: 'paired',
  unpairedBecause: [],
  change: -0.005,
  ci95: [-0.02, 0.01],
  drop: 0.005,
  dropBound: -0.008,
  maxDrop: 0.01,
  alpha: 0.05,
  t: -1.234,
  df: 9,
  p: 0.876,
  worstAllowed: null,
  detectable: null,
  warnings: [],
  ...over,
});

const lines = (v: GateVerdict) => renderGateMarkdown(v).split('\n');

describe('renderGateMarkdown', () => {
  it('writes a paired pass in full', () => {
    expect(lines(verdict())).toEqual([
      '### foldwise gate: PASS',
      '',
      '- **Compared:** knn on accuracy (higher is better), previous prev.json -> current cur.json; 10 folds paired by repeat and fold',
      '- **Score:** 0.8500 -> 0.8450, change -0.0050 (95% interval -0.0200 to +0.0100, corrected)',
      '- **Rule:** fail only when the drop exceeds 0.01 beyond fold noise; one-sided corrected t test of "drop <= 0.01" at alpha 0.05: t = -1.23, df 9, p = 0.8760',
      '- **Verdict:** pass: no drop beyond the allowed 0.01',
      '',
    ]);
  });

  it('writes an unpaired regression with the worst allowed not met, detectability, --accept, warnings', () => {
    const v = verdict({
      verdict: 'fail',
      reasons: ['regression', 'worst-allowed'],
      higherIsBetter: false,
      metric: 'rmse',
      previous: { path: 'prev.json', learner: 'knn', folds: 10, mean: 0.5 },
      current: { path: 'cur.json', learner: 'knn:k=9', folds: 5, mean: 0.6 },
      rule: 'unpaired',
      unpairedBecause: ['plan.seed (1 vs 2)', 'plan.text (a|b vs c)'],
      change: 0.1,
      ci95: null,
      drop: 0.1,
      dropBound: 0.06,
      maxDrop: 0,
      alpha: 0.1,
      t: null,
      df: 11.46,
      p: 0.00002,
      worstAllowed: 0.55,
      detectable: { power: 0.8, mdd: 0.031, drop: 0.031 },
      accepted: false,
      warnings: ['first | second'],
    });
    expect(lines(v)).toEqual([
      '### foldwise gate: FAIL',
      '',
      '- **Compared:** knn -> knn:k=9 on rmse (lower is better), previous prev.json -> current cur.json; 10 previous and 5 current folds, NOT paired',
      '- **Score:** 0.5000 -> 0.6000, change +0.1000 (no interval: no fold shows any spread)',
      '- **Rule (unpaired):** the runs used different folds (they differ in plan.seed (1 vs 2), plan.text (a\\|b vs c)), so the two sets of fold scores are compared by a Welch test, each variance with the Nadeau-Bengio correction; conservative: pair the runs (same plan and seed) for a sharper gate. Fail only when the drop exceeds 0 beyond fold noise; one-sided Welch t test of "drop <= 0" at alpha 0.1: no spread, df 11.5, p = < 0.0001',
      '- **Worst allowed:** rmse must be at most 0.55 (--worst-allowed): 0.6000, NOT met',
      '- **Verdict:** fail: rmse dropped by 0.1000 (at least 0.0600 with 90% confidence), more than the allowed 0; and the score is worse than the worst allowed 0.55 (--worst-allowed)',
      '- **Could see:** a drop of at least 0.0310 would have been caught with power 0.8 (the allowed 0 plus the minimal detectable difference 0.0310 of these folds)',
      '- **Previous report:** kept; --accept replaces it only when the gate passes',
      '- Warning: first \\| second',
      '',
    ]);
  });

  it('says the worst allowed is met, "at least" for higher-is-better, and --accept replaced the report', () => {
    const out = lines(verdict({ worstAllowed: 0.8, accepted: true }));
    expect(out).toContain('- **Worst allowed:** accuracy must be at least 0.8 (--worst-allowed): 0.8450, met');
    expect(out).toContain('- **Previous report:** replaced by the current report (--accept)');
    expect(out).toContain('- **Verdict:** pass: no drop beyond the allowed 0.01');
  });

  it('a pass that fails only the worst allowed says "but"', () => {
    const out = lines(verdict({ verdict: 'fail', reasons: ['worst-allowed'], worstAllowed: 0.9 }));
    expect(out).toContain('- **Verdict:** fail: no drop beyond the allowed 0.01; but the score is worse than the worst allowed 0.9 (--worst-allowed)');
    expect(out).toContain('- **Worst allowed:** accuracy must be at least 0.9 (--worst-allowed): 0.8450, NOT met');
  });

  it('names an improvement, and a drop beyond the limit that is within fold noise', () => {
    expect(lines(verdict({ improvement: true, drop: 0.02 }))).toContain('- **Verdict:** pass: accuracy improved beyond fold noise (one-sided, alpha 0.05)');
    expect(lines(verdict({ drop: 0.02, dropBound: 0.004, alpha: 0.025 }))).toContain(
      '- **Verdict:** pass: the drop of 0.0200 is within fold noise (its 97.5% lower bound 0.0040 does not exceed 0.01)',
    );
    // a drop exactly at the limit is not beyond it
    expect(lines(verdict({ drop: 0.01 }))).toContain('- **Verdict:** pass: no drop beyond the allowed 0.01');
  });

  it('rounds the confidence to one decimal of a percent', () => {
    const out = lines(verdict({ verdict: 'fail', reasons: ['regression'], alpha: 0.0123, drop: 0.05, dropBound: 0.02 }));
    expect(out).toContain('- **Verdict:** fail: accuracy dropped by 0.0500 (at least 0.0200 with 98.8% confidence), more than the allowed 0.01');
  });

  it('writes a family of tests: metrics, slices, the failing ones and the untested', () => {
    const test = (over: Partial<FamilyTest>): FamilyTest => ({ metric: 'accuracy', rule: 'paired', folds: 10, drop: 0.001, dropBound: -0.01, p: 0.6, adjustedP: 1, regression: false, ...over });
    const family = {
      method: 'holm' as const,
      tests: [
        test({}),
        test({ metric: 'kappa' }),
        test({ column: 'island', level: 'Dream', drop: 0.08, dropBound: 0.05, p: 0.00001, adjustedP: 0.00003, regression: true }),
        test({ metric: 'kappa', column: 'island', level: 'Biscoe', drop: 0.06, dropBound: 0.02, p: 0.004, adjustedP: 0.012, regression: true }),
      ],
      failing: ['accuracy in island = Dream', 'kappa in island = Biscoe'],
      notGated: ['island = Torgersen: 1 fold', 'sex = <none>'],
    };
    const out = lines(verdict({ verdict: 'fail', reasons: ['regression'], family }));
    expect(out.slice(5)).toEqual([
      '- **Family:** 4 tests (accuracy, kappa, on all rows and per slice), each the rule above; Holm\'s step-down method keeps the chance of any false failure at most alpha 0.05',
      '- **Failing:** accuracy in island = Dream: drop 0.0800 (one-sided bound 0.0500), p = < 0.0001, Holm-adjusted < 0.0001',
      '- **Failing:** kappa in island = Biscoe: drop 0.0600 (one-sided bound 0.0200), p = 0.0040, Holm-adjusted 0.0120',
      '- **Not gated:** island = Torgersen: 1 fold; sex = &lt;none&gt;',
      '- **Verdict:** fail: a drop beyond 0.01 and beyond fold noise, after Holm\'s adjustment, in accuracy in island = Dream; kappa in island = Biscoe',
      '',
    ]);
    // metrics only, nothing failing, nothing untested
    const plain = lines(verdict({ family: { method: 'holm', tests: [test({}), test({ metric: 'kappa' })], failing: [], notGated: [] } }));
    expect(plain.slice(5)).toEqual([
      '- **Family:** 2 tests (accuracy, kappa), each the rule above; Holm\'s step-down method keeps the chance of any false failure at most alpha 0.05',
      '- **Verdict:** pass: no drop beyond the allowed 0.01',
      '',
    ]);
  });

  it('writes an integer df without decimals and a t with two', () => {
    expect(lines(verdict({ df: 18, t: 2.5 }))[4]).toContain(': t = 2.50, df 18, p = 0.8760');
  });
});

describe('renderNotComparableMarkdown', () => {
  it('names the reason and what to do', () => {
    expect(renderNotComparableMarkdown('the runs differ in data.target (y vs z|w)').split('\n')).toEqual([
      '### foldwise gate: NOT COMPARABLE',
      '',
      '- the runs differ in data.target (y vs z\\|w); no verdict (exit code 2)',
      "- Re-run eval with the previous report's data, target, task, metrics, group and order; or, when the change is intended, replace the previous report by copying the current report over it",
      '',
    ]);
  });
});
