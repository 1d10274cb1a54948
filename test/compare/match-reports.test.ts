/**
 * Whether two reports can be paired fold by fold (src/compare/match-reports.ts), on hand-built
 * reports edited one field at a time; the unit counterpart of the CLI checks in match.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { describeDifferences, NotComparableError, reportDifferences, versionWarning, type ReportDifference } from '../../src/compare/match-reports.js';
import { InputError } from '../../src/errors.js';
import { foldsOf, learner, makeReport, SHA_A, SHA_B, tweak } from './report-samples.js';

const base = () => makeReport([learner('knn', foldsOf('accuracy', [0.8, 0.7]))], ['accuracy', 'kappa']);
const costs = (sha: string, matrix: number[][]) => ({ sha256: sha, classes: ['no', 'yes'], matrix });

describe('reportDifferences, eval reports', () => {
  it('finds nothing between a report and a copy with other features, imputation, learners and version', () => {
    const r = base();
    expect(reportDifferences(r, r)).toEqual([]);
    const other = tweak(r, (x) => {
      x.data.features = ['x2'];
      x.data.dropped = ['x1', 'x3'];
      x.settings.impute = 'mean';
      x.tool.version = '2.0.0';
      x.learners = [];
      x.metrics = ['kappa', 'accuracy'];
    });
    expect(reportDifferences(r, other)).toEqual([]);
    expect(reportDifferences(other, r)).toEqual([]);
  });

  it('names each differing field once, in a fixed order, with its kind and both values', () => {
    const r = base();
    const other = tweak(r, (x) => {
      x.data.sha256 = SHA_B;
      x.data.rowsUsed = 99;
      x.data.target = 'z';
      x.data.task = 'regression';
      x.metrics = ['accuracy'];
      x.plan.group = 'farm';
      x.plan.order = 'day';
      x.plan.text = 'kfold:10';
      x.plan.seed = 2;
      x.plan.stratified = false;
    });
    expect(reportDifferences(r, other)).toEqual<ReportDifference[]>([
      { field: 'data.sha256', a: 'aaaaaaaaaaaa…', b: 'bbbbbbbbbbbb…', kind: 'data' },
      { field: 'data.rowsUsed', a: '100', b: '99', kind: 'data' },
      { field: 'data.target', a: 'y', b: 'z', kind: 'data' },
      { field: 'data.task', a: 'classification', b: 'regression', kind: 'data' },
      { field: 'metrics', a: 'accuracy,kappa', b: 'accuracy', kind: 'data' },
      { field: 'plan.group', a: 'none', b: 'farm', kind: 'data' },
      { field: 'plan.order', a: 'none', b: 'day', kind: 'data' },
      { field: 'plan.text', a: 'kfold:5', b: 'kfold:10', kind: 'folds' },
      { field: 'plan.seed', a: '1', b: '2', kind: 'folds' },
      { field: 'plan.stratified', a: 'true', b: 'false', kind: 'folds' },
    ]);
  });

  it('shortens a data hash to 12 characters only when longer', () => {
    const short = tweak(base(), (x) => (x.data.sha256 = 'abcdef123456'));
    const shorter = tweak(base(), (x) => (x.data.sha256 = 'abcdef12345'));
    expect(reportDifferences(short, shorter)).toEqual([{ field: 'data.sha256', a: 'abcdef123456', b: 'abcdef12345', kind: 'data' }]);
  });

  it('a different --costs matrix is a "data" difference; the same matrix from other file bytes is not', () => {
    const withCosts = (sha: string, m: number[][]) => tweak(base(), (x) => (x.settings.costs = costs(sha, m)));
    const a = withCosts(SHA_A, [[0, 1], [5, 0]]);
    expect(reportDifferences(a, withCosts(SHA_B, [[0, 1], [5, 0]]))).toEqual([]);
    expect(reportDifferences(a, withCosts(SHA_B, [[0, 2], [5, 0]]))).toEqual([
      { field: 'settings.costs', a: 'matrix of file SHA-256 aaaaaaaaaaaa…', b: 'matrix of file SHA-256 bbbbbbbbbbbb…', kind: 'data' },
    ]);
    expect(reportDifferences(a, base())).toEqual([{ field: 'settings.costs', a: 'matrix of file SHA-256 aaaaaaaaaaaa…', b: 'none', kind: 'data' }]);
    expect(reportDifferences(base(), a)).toEqual([{ field: 'settings.costs', a: 'none', b: 'matrix of file SHA-256 aaaaaaaaaaaa…', kind: 'data' }]);
    // the classes count too
    const other = tweak(a, (x) => (x.settings.costs.classes = ['yes', 'no']));
    expect(reportDifferences(a, other).map((d) => d.field)).toEqual(['settings.costs']);
  });
});

describe('reportDifferences, a report scored from a predictions file', () => {
  const source = { kind: 'predictions', file: 'p.csv', foldwise: true, trainRows: 'file' };
  const scored = (assignment?: string) =>
    tweak(base(), (x) => {
      x.source = source;
      x.command = 'score';
      if (assignment) x.plan.assignment = assignment;
    });

  it('matches on the fold assignment, the task and the metric set only', () => {
    const a = scored(SHA_A);
    const b = tweak(scored(SHA_A), (x) => {
      x.data.sha256 = SHA_B;
      x.plan.text = 'given';
      x.plan.seed = 9;
      x.data.rowsUsed = 3;
      x.metrics = ['kappa', 'accuracy'];
    });
    expect(reportDifferences(a, b)).toEqual([]);
    // either side scored is enough to use this rule: an eval report of other data but the same assignment matches
    const evalSameRows = tweak(base(), (x) => {
      x.plan.assignment = SHA_A;
      x.data.sha256 = SHA_B;
      x.plan.seed = 3;
    });
    expect(reportDifferences(a, evalSameRows)).toEqual([]);
    expect(reportDifferences(evalSameRows, a)).toEqual([]);
    // the metric sets compare as sets, on either side
    const unsorted = tweak(a, (x) => (x.metrics = ['kappa', 'accuracy']));
    expect(reportDifferences(unsorted, a)).toEqual([]);
    expect(reportDifferences(a, unsorted)).toEqual([]);
  });

  it('an unknown or different assignment never matches; the task and metrics are compared too', () => {
    expect(reportDifferences(scored(SHA_A), scored(SHA_B))).toEqual([{ field: 'plan.assignment', a: 'aaaaaaaaaaaa…', b: 'bbbbbbbbbbbb…', kind: 'data' }]);
    expect(reportDifferences(scored(), scored(SHA_B))).toEqual([{ field: 'plan.assignment', a: 'unknown', b: 'bbbbbbbbbbbb…', kind: 'data' }]);
    expect(reportDifferences(scored(SHA_A), scored())).toEqual([{ field: 'plan.assignment', a: 'aaaaaaaaaaaa…', b: 'unknown', kind: 'data' }]);
    expect(reportDifferences(scored(), scored())).toEqual([{ field: 'plan.assignment', a: 'unknown', b: 'unknown', kind: 'data' }]);
    const other = tweak(scored(SHA_A), (x) => {
      x.data.task = 'regression';
      x.metrics = ['rmse'];
    });
    expect(reportDifferences(scored(SHA_A), other)).toEqual([
      { field: 'data.task', a: 'classification', b: 'regression', kind: 'data' },
      { field: 'metrics', a: 'accuracy,kappa', b: 'rmse', kind: 'data' },
    ]);
  });
});

describe('describeDifferences and NotComparableError', () => {
  const d = (field: string): ReportDifference => ({ field, a: '1', b: '2', kind: 'folds' });

  it('lists none, one, two and three differences in words', () => {
    expect(describeDifferences([])).toBe('');
    expect(describeDifferences([d('plan.seed')])).toBe('plan.seed (1 vs 2)');
    expect(describeDifferences([d('plan.seed'), d('plan.text')])).toBe('plan.seed (1 vs 2) and plan.text (1 vs 2)');
    expect(describeDifferences([d('a'), d('b'), d('c')])).toBe('a (1 vs 2), b (1 vs 2) and c (1 vs 2)');
  });

  it('is an InputError naming the command and the differences, or the reason given', () => {
    const e = new NotComparableError('gate', [d('plan.seed')]);
    expect(e).toBeInstanceOf(InputError);
    expect(e.message).toBe('gate: the runs differ in plan.seed (1 vs 2); they are not comparable');
    expect(e.reason).toBe('the runs differ in plan.seed (1 vs 2)');
    expect(e.differences).toEqual([d('plan.seed')]);
    const r = new NotComparableError('compare', [], 'the folds differ');
    expect(r.message).toBe('compare: the folds differ; they are not comparable');
    expect(r.reason).toBe('the folds differ');
  });
});

describe('versionWarning', () => {
  it('is undefined for the same version and names both versions otherwise', () => {
    const r = base();
    expect(versionWarning(r, r)).toBeUndefined();
    const other = tweak(r, (x) => (x.tool.version = '1.1.0'));
    expect(versionWarning(r, other)).toBe(
      'the reports were made by foldwise 1.0.0 and 1.1.0; pairing by (repeat, fold) assumes the plan code did not change between them',
    );
  });
});
