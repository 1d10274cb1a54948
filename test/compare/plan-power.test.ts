/**
 * Unit tests of `foldwise power` (src/compare/plan-power.ts) on hand-built reports: which
 * learner, metric and variance it takes, its refusals, and the advice checked against jstat's
 * noncentral t: the power of the one-sided corrected paired t test on J folds at a true drop
 * delta is 1 - F_nct(t_{J-1,1-alpha}; J - 1, delta / SE) with SE = sqrt((1/J + test/train) s^2)
 * (Nadeau & Bengio 2003; NIST/SEMATECH e-Handbook 7.2.2.2), so the stated MDD must have power
 * 0.8, and the advised repeats R the fewest with power >= 0.8 at the drop asked for.
 * renderPowerMarkdown is checked on advice written out by hand.
 */
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { planPower, renderPowerMarkdown, type PowerAdvice } from '../../src/compare/plan-power.js';
import { InputError, UsageError } from '../../src/errors.js';
import { foldsOf, learnerOf, reportOf, type FoldOptions } from './report-fixture.js';

// kfold:5x2: 10 folds; scores of the learner and their sample variance written out
const S = [0.8, 0.82, 0.78, 0.84, 0.81, 0.79, 0.83, 0.8, 0.82, 0.81];
const sampleVar = (xs: readonly number[]): number => {
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return xs.reduce((a, x) => a + (x - m) ** 2, 0) / (xs.length - 1);
};
const SETTING = { alpha: 0.05, power: 0.8 };

/** Power of the one-sided corrected test on J folds at a true drop delta (jstat's noncentral t). */
function powerOf(delta: number, j: number, variance: number, ratio: number, alpha = 0.05): number {
  const se = Math.sqrt((1 / j + ratio) * variance);
  return 1 - jStat.noncentralt.cdf(jStat.studentt.inv(1 - alpha, j - 1), j - 1, delta / se);
}

function learners(o: FoldOptions = {}, knn: readonly (number | null)[] = S) {
  return [
    learnerOf('baseline', foldsOf({ 'macro-f1': S.map(() => 0.95), accuracy: S }, { k: 5 })),
    learnerOf('knn', foldsOf({ 'macro-f1': knn, accuracy: S }, { k: 5, ...o })),
    learnerOf('knn:k=1', foldsOf({ 'macro-f1': S.map((x) => x - 0.1), accuracy: S }, { k: 5 })),
  ];
}
const plan = { planText: 'kfold:5x2', folds: 5, repeats: 2 };
const report = (o: FoldOptions = {}, extra = {}) => reportOf(learners(o), { ...plan, ...extra });

describe('planPower: one report, the variance bounded by twice the fold variance', () => {
  it('takes the best non-baseline learner and the headline metric, with the plan and mean sizes', () => {
    const sizes = { testRows: [19, 21, 20, 20, 20, 18, 22, 20, 20, 20], trainRows: [81, 79, 80, 80, 80, 82, 78, 80, 80, 80] };
    const a = planPower(report(sizes), 'prev.json', { drop: 0.04, ...SETTING });
    expect(a.metric).toBe('macro-f1');
    expect(a.learner).toBe('knn');
    expect(a.plan).toBe('kfold:5x2');
    expect(a.foldsPerRepeat).toBe(5);
    expect(a.repeatsNow).toBe(2);
    expect(a.testRows).toBe(20);
    expect(a.trainRows).toBe(80);
    expect(a.varianceFrom).toBe('twice-fold-variance');
    expect(Math.abs(a.variance - 2 * sampleVar(S))).toBeLessThan(1e-15);
    expect(a.alpha).toBe(0.05);
    expect(a.power).toBe(0.8);
    expect(a.drop).toBe(0.04);
    // the MDD of the plan as it is (J = 10) has power 0.8
    expect(Math.abs(powerOf(a.mddNow, 10, a.variance, 0.25) - 0.8)).toBeLessThan(1e-6);
    // the advice: power >= 0.8 at the drop with R repeats, < 0.8 with R - 1
    expect(a.repeats).not.toBeNull();
    const r = a.repeats!;
    expect(r).toBeGreaterThanOrEqual(2);
    expect(powerOf(0.04, 5 * r, a.variance, 0.25)).toBeGreaterThanOrEqual(0.8 - 1e-9);
    expect(powerOf(0.04, 5 * (r - 1), a.variance, 0.25)).toBeLessThan(0.8);
    expect(Math.abs(powerOf(a.mddAtRepeats, 5 * r, a.variance, 0.25) - 0.8)).toBeLessThan(1e-6);
    // the limit (z_{0.95} + z_{0.80}) sqrt(test/train s^2), normal quantiles from jstat
    const z = jStat.normal.inv(0.95, 0, 1) + jStat.normal.inv(0.8, 0, 1);
    expect(Math.abs(a.limit - z * Math.sqrt(0.25 * a.variance))).toBeLessThan(1e-12);
    expect(a.timeMs).toBeNull();
  });

  it('a learner, a metric and the power asked for', () => {
    const a = planPower(report(), 'prev.json', { drop: 0.05, learner: 'knn:k=1', metric: 'accuracy', alpha: 0.1, power: 0.9 });
    expect(a.learner).toBe('knn:k=1');
    expect(a.metric).toBe('accuracy');
    expect(Math.abs(powerOf(a.mddNow, 10, a.variance, 0.25, 0.1) - 0.9)).toBeLessThan(1e-6);
  });

  it('no number of repeats reaches a drop below the limit: repeats null, the MDD at 1000 repeats', () => {
    const t = { totalMs: 1000, learners: [{ spec: 'knn', fitMs: 10, predictMs: 5 }] };
    const a = planPower(report({}, { timing: t }), 'prev.json', { drop: 0.001, ...SETTING });
    expect(a.limit).toBeGreaterThan(0.001);
    expect(a.repeats).toBeNull();
    expect(Math.abs(powerOf(a.mddAtRepeats, 5000, a.variance, 0.25) - 0.8)).toBeLessThan(1e-6);
    expect(a.timeMs).toBeNull();
  });

  it('scales the report timing by R / R_now: fits and predictions of every learner, and the whole run', () => {
    const t = { totalMs: 10_000, learners: [{ spec: 'knn', fitMs: 100, predictMs: 50 }, { spec: 'baseline', fitMs: 300, predictMs: 50 }] };
    const a = planPower(report({}, { timing: t }), 'prev.json', { drop: 0.04, ...SETTING });
    const r = a.repeats!;
    expect(r).toBe(3); // the fewest with power >= 0.8 at 0.04, as the first test checks with jstat
    expect(a.timeMs).toEqual([(500 * r) / 2, (10_000 * r) / 2]);
  });

  it('lower is better: the learner with the lowest rmse', () => {
    const reg = reportOf(
      [
        learnerOf('baseline', foldsOf({ rmse: [1, 1, 1, 1.1, 1], mae: [1, 1, 1, 1, 1] })),
        learnerOf('linear', foldsOf({ rmse: [3, 3.1, 3, 3.2, 3], mae: [1, 1, 1, 1, 1] })),
        learnerOf('knn', foldsOf({ rmse: [2, 2.1, 2, 2.2, 2], mae: [1, 1, 1, 1, 1] })),
      ],
      { task: 'regression' },
    );
    expect(planPower(reg, 'prev.json', { drop: 0.5, ...SETTING }).learner).toBe('knn');
    const only = reportOf([learnerOf('baseline', foldsOf({ rmse: [1, 1, 1, 1.1, 1], mae: [1, 1, 1, 1, 1] }))], { task: 'regression' });
    expect(planPower(only, 'prev.json', { drop: 0.5, ...SETTING }).learner).toBe('baseline');
  });

  it('two folds are enough', () => {
    const two = reportOf([learnerOf('knn', foldsOf({ 'macro-f1': [0.8, 0.82], accuracy: [0.8, 0.8] }, { k: 2 }))], { planText: 'kfold:2', folds: 2 });
    const a = planPower(two, 'prev.json', { drop: 0.5, ...SETTING });
    expect(Math.abs(a.variance - 2 * sampleVar([0.8, 0.82]))).toBeLessThan(1e-15);
  });
});

describe('planPower --current: the variance measured from two reports fold by fold', () => {
  it('the sample variance of the paired differences', () => {
    const D = [0.03, 0.01, 0.02, 0.04, 0, 0.01, 0.02, 0.03, 0, 0.02];
    const cur = reportOf(learners({}, S.map((x, i) => x - D[i])), plan);
    const a = planPower(report(), 'prev.json', { drop: 0.03, current: { report: cur, path: 'cur.json' }, ...SETTING });
    expect(a.varianceFrom).toBe('paired');
    expect(Math.abs(a.variance - sampleVar(D))).toBeLessThan(1e-12);
    expect(Math.abs(powerOf(a.mddNow, 10, sampleVar(D), 0.25) - 0.8)).toBeLessThan(1e-6);
  });

  it('pairs the folds scored on both sides: 2 are enough, 1 is refused', () => {
    const cur = (knn: (number | null)[]) => ({ report: reportOf(learners({}, knn), plan), path: 'cur.json' });
    const eight = [null, null, null, null, null, null, null, null];
    const a = planPower(report(), 'prev.json', { drop: 0.03, current: cur([0.79, 0.8, ...eight]), ...SETTING });
    expect(Math.abs(a.variance - sampleVar([0.01, 0.02]))).toBeLessThan(1e-12);
    expect(() => planPower(report(), 'prev.json', { drop: 0.03, current: cur([0.79, ...eight, null]), ...SETTING })).toThrow(
      'power: prev.json and cur.json do not share their folds; give reports of the same plan and seed',
    );
  });

  it('refuses reports whose folds do not match, and a current report without the learner', () => {
    const five = reportOf([learnerOf('knn', foldsOf({ 'macro-f1': S.slice(0, 5), accuracy: S.slice(0, 5) }))], plan);
    expect(() => planPower(report(), 'prev.json', { drop: 0.03, current: { report: five, path: 'cur.json' }, ...SETTING })).toThrow(InputError);
    expect(() => planPower(report(), 'prev.json', { drop: 0.03, current: { report: five, path: 'cur.json' }, ...SETTING })).toThrow('do not share their folds');
    const other = reportOf([learnerOf('linear', foldsOf({ 'macro-f1': S, accuracy: S }))], plan);
    expect(() => planPower(report(), 'prev.json', { drop: 0.03, current: { report: other, path: 'cur.json' }, ...SETTING })).toThrow(
      /^--learner knn: cur\.json has no such learner/,
    );
  });
});

describe('planPower: refusals', () => {
  it('a drop that is not > 0', () => {
    expect(() => planPower(report(), 'p', { drop: 0, ...SETTING })).toThrow(UsageError);
    expect(() => planPower(report(), 'p', { drop: 0, ...SETTING })).toThrow("--drop 0: give the drop to catch, a number > 0 in the metric's units");
    expect(() => planPower(report(), 'p', { drop: NaN, ...SETTING })).toThrow('--drop NaN');
    expect(() => planPower(report(), 'p', { drop: -0.1, ...SETTING })).toThrow('--drop -0.1');
  });

  it('a metric the report does not score', () => {
    expect(() => planPower(report(), 'p', { drop: 0.1, metric: 'rmse', ...SETTING })).toThrow(UsageError);
    expect(() => planPower(report(), 'p', { drop: 0.1, metric: 'rmse', ...SETTING })).toThrow('--metric rmse: the report does not score it (it scores macro-f1, accuracy)');
  });

  it('plans without repeats: leave-one-out, holdout, given folds; resplit plans are advised', () => {
    for (const kind of ['loo', 'holdout', 'given']) {
      const r = report({}, { kind, planText: `${kind}:x` });
      expect(() => planPower(r, 'p', { drop: 0.1, ...SETTING })).toThrow(UsageError);
      expect(() => planPower(r, 'p', { drop: 0.1, ...SETTING })).toThrow(
        `power: the plan ${kind}:x has no repeats to add; the advice is for kfold:K (kfold:KxR) and resplit/shuffle plans`,
      );
    }
    expect(planPower(report({}, { kind: 'resplit', planText: 'resplit:0.2x10' }), 'p', { drop: 0.1, ...SETTING }).plan).toBe('resplit:0.2x10');
  });

  it('a learner not in the report, or none with a score', () => {
    expect(() => planPower(report(), 'prev.json', { drop: 0.1, learner: 'forest', ...SETTING })).toThrow(/^--learner forest: prev\.json has no such learner/);
    const none = reportOf([learnerOf('knn', foldsOf({ 'macro-f1': [null, null], accuracy: [0.8, 0.8] }))]);
    expect(() => planPower(none, 'prev.json', { drop: 0.1, ...SETTING })).toThrow(InputError);
    expect(() => planPower(none, 'prev.json', { drop: 0.1, ...SETTING })).toThrow('power: prev.json: no learner has a macro-f1 score');
  });

  it('folds without a score, and a single fold', () => {
    const holes = reportOf(learners({}, [0.8, null, ...S.slice(2)]), plan);
    expect(() => planPower(holes, 'prev.json', { drop: 0.1, learner: 'knn', ...SETTING })).toThrow(InputError);
    expect(() => planPower(holes, 'prev.json', { drop: 0.1, learner: 'knn', ...SETTING })).toThrow('power: prev.json: knn has folds without a macro-f1 score');
    // a score that is not a finite number (a hand-edited report) and a fold without the metric's key
    const inf = reportOf(learners({}, [0.8, Infinity, ...S.slice(2)]), plan);
    expect(() => planPower(inf, 'prev.json', { drop: 0.1, learner: 'knn', ...SETTING })).toThrow('power: prev.json: knn has folds without a macro-f1 score');
    const keyless = reportOf([learnerOf('knn', [...foldsOf({ 'macro-f1': [0.8, 0.82], accuracy: [0.8, 0.8] }), { repeat: 0, fold: 2, trainRows: 80, testRows: 20, scores: { accuracy: 0.8 } }])]);
    expect(() => planPower(keyless, 'prev.json', { drop: 0.1, learner: 'knn', ...SETTING })).toThrow('power: prev.json: knn has folds without a macro-f1 score');
    const one = reportOf([learnerOf('knn', foldsOf({ 'macro-f1': [0.8], accuracy: [0.8] }))]);
    expect(() => planPower(one, 'prev.json', { drop: 0.1, ...SETTING })).toThrow('power: prev.json: knn has 1 fold; the advice needs at least 2');
  });
});

const advice = (o: Partial<PowerAdvice> = {}): PowerAdvice => ({
  metric: 'accuracy',
  learner: 'knn',
  plan: 'kfold:5',
  foldsPerRepeat: 5,
  repeatsNow: 1,
  testRows: 20,
  trainRows: 80,
  variance: 0.0012345,
  varianceFrom: 'twice-fold-variance',
  alpha: 0.05,
  power: 0.8,
  drop: 0.02,
  mddNow: 0.0456789,
  repeats: 4,
  mddAtRepeats: 0.0187654,
  limit: 0.0123456,
  timeMs: [1500, 59_999],
  ...o,
});

describe('renderPowerMarkdown', () => {
  it('the advice with repeats and timing, figures below 1 to 3 significant digits', () => {
    expect(renderPowerMarkdown(advice())).toBe(
      [
        '# How many repeats to catch a drop of 0.0200 accuracy',
        '',
        'Learner knn, plan kfold:5 (5 folds x 1 repeat), one-sided alpha 0.05, power 0.8.',
        '',
        '- Noise of the paired differences: variance 0.00123, bounded by twice the variance of the fold scores (one report; give --current for a measured figure).',
        '- With the plan as it is, the smallest drop a gate (--max-drop 0) catches with power 0.8: **0.0457**.',
        '- Repeats needed: **4** (kfold:5x4 for a k-fold plan), which catches a drop of 0.0188 with power 0.8.',
        '- Time for that plan: about 1.5 s (fits and predictions) to 60.0 s (the whole run), scaled from this report\'s timing.',
        '- A gate run with --max-drop 0.0200 on that plan catches drops of about 0.0388 with that power; with --max-drop 0 it catches 0.0188.',
        '- No number of repeats gets the smallest detectable drop below 0.0123.',
        '',
      ].join('\n'),
    );
  });

  it('minutes from 60 s on, figures from 1 on to 3 decimals, repeats in the plural, the measured variance', () => {
    const text = renderPowerMarkdown(
      advice({ repeatsNow: 2, varianceFrom: 'paired', drop: 1, mddAtRepeats: 0.5, mddNow: 2.25, limit: 1.5, timeMs: [60_000, 150_000], metric: 'rmse' }),
    );
    expect(text).toContain('# How many repeats to catch a drop of 1.000 rmse\n');
    expect(text).toContain('(5 folds x 2 repeats)');
    expect(text).toContain('- Noise of the paired differences: variance 0.00123, measured from the two reports fold by fold.\n');
    expect(text).toContain('catches with power 0.8: **2.250**.');
    expect(text).toContain('- Time for that plan: about 1.0 min (fits and predictions) to 2.5 min (the whole run)');
    expect(text).toContain('catches drops of about 1.500 with that power; with --max-drop 0 it catches 0.500.');
    expect(text).toContain('below 1.500.\n');
  });

  it('without timing, and when no number of repeats gets there', () => {
    expect(renderPowerMarkdown(advice({ timeMs: null }))).toContain(
      '\n- Time: the report has no timing (made with --no-timing); rerun without it for an estimate.\n',
    );
    expect(renderPowerMarkdown(advice({ repeats: null, timeMs: null }))).toBe(
      [
        '# How many repeats to catch a drop of 0.0200 accuracy',
        '',
        'Learner knn, plan kfold:5 (5 folds x 1 repeat), one-sided alpha 0.05, power 0.8.',
        '',
        '- Noise of the paired differences: variance 0.00123, bounded by twice the variance of the fold scores (one report; give --current for a measured figure).',
        '- With the plan as it is, the smallest drop a gate (--max-drop 0) catches with power 0.8: **0.0457**.',
        '- No number of repeats gets there: repeats only shrink part of the noise, and the smallest detectable drop stays above 0.0123 however many there are (the folds share their rows). Use more data, or accept a larger drop.',
        '',
      ].join('\n'),
    );
  });
});
