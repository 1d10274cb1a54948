/**
 * compareReports (src/compare/compare-reports.ts) on hand-built reports, without the CLI: which
 * learners pair up, the refusals, the warnings, and the sign (second minus first). The figures
 * use the hand-derived 5-fold example of test/compare/paired-stats.test.ts: differences
 * 0.03 0.01 0.02 0.04 0.00, mean 0.02, corrected t = 1.885618 with 4 df (Nadeau & Bengio 2003),
 * Wilcoxon T+ = 10 of n = 4, exact two-sided p = 0.125.
 */
import { describe, expect, it } from 'vitest';
import { compareReports } from '../../src/compare/compare-reports.js';
import { NotComparableError } from '../../src/compare/match-reports.js';
import { pairedStats } from '../../src/compare/paired-stats.js';
import type { LoadedReport } from '../../src/compare/read-report.js';
import { UsageError } from '../../src/errors.js';
import { getMetric } from '../../src/metrics/index.js';
import type { LearnerReport, Report } from '../../src/model/report.js';
import { fold, foldsOf, learner, makeReport, SHA_B, tweak } from './report-samples.js';

const REF = [0.8, 0.82, 0.78, 0.84, 0.81];
const D = [0.03, 0.01, 0.02, 0.04, 0];
const UP = REF.map((r, i) => r + D[i]);
const SIZES = { testRows: 20, trainRows: 80 };

const loaded = (report: Report, path: string): LoadedReport => ({ path, text: JSON.stringify(report), report });
const two = (first: readonly LearnerReport[], second: readonly LearnerReport[], metrics = ['kappa', 'accuracy'], over: Partial<Report> = {}) => [
  loaded(makeReport(first, metrics, over), 'first.json'),
  loaded(makeReport(second, metrics, over), 'second.json'),
] as const;
const scores = (spec: string, values: readonly (number | null)[], metric = 'kappa') => learner(spec, foldsOf(metric, values));

describe('compareReports: the same learners across two reports, fold by fold', () => {
  it('gives second minus first with the corrected t of the hand-derived example, on the first metric by default', () => {
    const [a, b] = two([scores('knn', REF)], [scores('knn', UP)]);
    const c = compareReports(a, b);
    expect(c.metric).toBe('kappa');
    expect(c.higherIsBetter).toBe(true);
    expect(c.rows.length).toBe(1);
    const s = c.rows[0].stats!;
    expect(Math.abs(s.diff - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(s.t! - 1.885618)).toBeLessThan(1e-5);
    expect(s.df).toBe(4);
    expect(s.wilcoxon).toMatchObject({ n: 4, tPlus: 10, tMinus: 0 });
    expect(Math.abs(s.wilcoxon.p - 0.125)).toBeLessThan(1e-12);
    expect(Math.abs(s.referenceMean - 0.81)).toBeLessThan(1e-12);
    expect(Math.abs(s.learnerMean - 0.83)).toBeLessThan(1e-12);
    expect([s.wins, s.ties, s.losses]).toEqual([4, 1, 0]);
    // the rest is pairedStats on the paired series, with the metric's rules
    expect(s).toEqual(pairedStats(UP, REF, SIZES, true, 0, getMetric('kappa')));
    expect(c.rows[0]).toMatchObject({ first: 'knn', second: 'knn' });
    expect(c).toMatchObject({ firstPath: 'first.json', secondPath: 'second.json', sha256: 'a'.repeat(64), plan: 'kfold:5', seed: 1, warnings: [] });
  });

  it('reads a lower-is-better metric the other way, and refuses a metric the reports do not score', () => {
    const err = (v: readonly number[]) => learner('knn', foldsOf('rmse', v));
    const [a, b] = two([err(REF)], [err(UP)], ['rmse', 'mae']);
    const c = compareReports(a, b, { metric: 'rmse' });
    expect(c.higherIsBetter).toBe(false);
    expect(c.rows[0].stats!.direction).toBe('worse');
    expect([c.rows[0].stats!.wins, c.rows[0].stats!.losses]).toEqual([0, 4]);
    expect(() => compareReports(a, b, { metric: 'medae' })).toThrow(UsageError);
    expect(() => compareReports(a, b, { metric: 'medae' })).toThrow('--metric medae: the reports do not score it (they score rmse, mae)');
  });

  it('by default pairs every spec present in both, in the first report\'s order', () => {
    const [a, b] = two(
      [scores('baseline', REF), scores('knn', REF), scores('tree', REF), scores('knn:k=7', REF)],
      [scores('knn:k=7', UP), scores('forest', UP), scores('knn', UP), scores('baseline', REF)],
    );
    const c = compareReports(a, b);
    expect(c.rows.map((r) => [r.first, r.second])).toEqual([
      ['baseline', 'baseline'],
      ['knn', 'knn'],
      ['knn:k=7', 'knn:k=7'],
    ]);
    expect(c.rows[0].stats!.diff).toBe(0);
    expect(Math.abs(c.rows[1].stats!.diff - 0.02)).toBeLessThan(1e-12);
  });

  it('takes the learners named, found in each report through the registry\'s spelling', () => {
    const [a, b] = two([scores('knn', REF), scores('knn:k=7', REF)], [scores('knn:k=7', UP), scores('knn', REF)]);
    const c = compareReports(a, b, { learners: ['knn:vote=equal,k=7'] });
    expect(c.rows.map((r) => [r.first, r.second])).toEqual([['knn:k=7', 'knn:k=7']]);
    expect(() => compareReports(a, b, { learners: ['tree'] })).toThrow('--learner tree: the first report first.json has no such learner');
    const [a2, b2] = two([scores('knn', REF), scores('tree', REF)], [scores('knn', UP)]);
    expect(() => compareReports(a2, b2, { learners: ['tree'] })).toThrow('--learner tree: the second report second.json has no such learner');
    // an empty list means the default
    expect(compareReports(a, b, { learners: [] }).rows.length).toBe(2);
  });

  it('refuses reports with no learner in common, naming both lists', () => {
    const [a, b] = two([scores('knn', REF), scores('tree', REF)], [scores('forest', UP), scores('bayes', UP)]);
    expect(() => compareReports(a, b)).toThrow(UsageError);
    expect(() => compareReports(a, b)).toThrow('compare: the reports have no learner in common (first: knn, tree; second: forest, bayes); name one with --learner');
  });

  it('refuses runs that differ in data or plan, naming every field', () => {
    const a = loaded(makeReport([scores('knn', REF)], ['kappa']), 'first.json');
    const b = loaded(tweak(a.report, (x) => {
      x.data.sha256 = SHA_B;
      x.plan.seed = 4;
    }), 'second.json');
    expect(() => compareReports(a, b)).toThrow(NotComparableError);
    expect(() => compareReports(a, b)).toThrow('compare: the runs differ in data.sha256 (aaaaaaaaaaaa… vs bbbbbbbbbbbb…) and plan.seed (1 vs 4); they are not comparable');
  });

  it('refuses fold lists that differ, or folds of other sizes, although the plans match', () => {
    const [a, b] = two([scores('knn', REF)], [scores('knn', UP.slice(0, 3))]);
    expect(() => compareReports(a, b)).toThrow(NotComparableError);
    // not a field difference: the error lists none
    let caught: unknown;
    try {
      compareReports(a, b);
    } catch (e) {
      caught = e;
    }
    expect((caught as NotComparableError).differences).toEqual([]);
    expect(() => compareReports(a, b)).toThrow('compare: the fold lists differ (2 folds on one side only) although the plans match; they are not comparable');
    const [c, d] = two([scores('knn', REF.slice(0, 3))], [scores('knn', UP)]);
    expect(() => compareReports(c, d)).toThrow('(2 folds on one side only)');
    const bigger = learner('knn', [fold(0, { kappa: 0.5 }), fold(1, { kappa: 0.5 }, { trainRows: 81, testRows: 19 })]);
    const [e, f] = two([learner('knn', [fold(0, { kappa: 0.5 }), fold(1, { kappa: 0.5 })])], [bigger]);
    expect(() => compareReports(e, f)).toThrow(
      'compare: the folds differ in size (repeat 1 fold 2: train/test 80/20 vs 81/19) although the plans match; they are not comparable',
    );
  });

  it('warns of another foldwise version and of folds left out, one or more, or all', () => {
    const first = [scores('knn', REF), scores('tree', REF), scores('forest', REF)];
    const second = [scores('knn', [null, ...UP.slice(1)]), scores('tree', [null, null, ...UP.slice(2)]), scores('forest', [null, null, null, null, null])];
    const a = loaded(makeReport(first, ['kappa']), 'first.json');
    const b = loaded(tweak(makeReport(second, ['kappa']), (x) => (x.tool.version = '1.2.0')), 'second.json');
    const c = compareReports(a, b);
    expect(c.warnings).toEqual([
      'the reports were made by foldwise 1.0.0 and 1.2.0; pairing by (repeat, fold) assumes the plan code did not change between them',
      'knn: 1 fold has no kappa score on one side; it is left out',
      'tree: 2 folds have no kappa score on one side; they are left out',
      'forest: no fold has a kappa score in both reports',
    ]);
    expect(c.rows[0].stats!.skippedFolds).toBe(1);
    expect(c.rows[0].stats!.folds).toBe(4);
    expect(c.rows[2].stats).toBeNull();
  });
});
