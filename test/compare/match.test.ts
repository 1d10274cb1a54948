import { describe, expect, it } from 'vitest';
import { compareReports } from '../../src/compare/compare-reports.js';
import { gateReports } from '../../src/compare/gate.js';
import { describeDifferences, NotComparableError, reportDifferences } from '../../src/compare/match-reports.js';
import type { LoadedReport } from '../../src/compare/read-report.js';
import type { Report } from '../../src/model/report.js';
import { VERSION } from '../../src/version.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from './synthetic.js';

const tmp = tempFolder();
const csv = tmp.file('syn.csv', syntheticCsv('classification', 150, 3));

let made: Promise<Report> | undefined;
const base = (): Promise<Report> =>
  (made ??= cli(['eval', csv, '--target', 'y', '--learner', 'knn', '--plan', 'kfold:5', '--json', '-', '--no-timing']).then((r) => {
    expect(r.code).toBe(0);
    return JSON.parse(r.stdout) as Report;
  }));

const loaded = (report: Report, path: string): LoadedReport => ({ path, text: JSON.stringify(report), report });
// free-form edits of a parsed report
type Loose = Record<string, any>;
const tweak = (r: Report, f: (x: Loose) => void): Report => {
  const copy = structuredClone(r) as Loose;
  f(copy);
  return copy as Report;
};

describe('reportDifferences: what makes two runs incomparable (src/compare/match-reports.ts)', () => {
  it('finds nothing between a report and itself', async () => {
    const r = await base();
    expect(reportDifferences(r, r)).toEqual([]);
  });

  it('sorts differences into "data" (never comparable) and "folds" (gate: unpaired)', async () => {
    const r = await base();
    const other = tweak(r, (x) => {
      x.plan.group = 'farm';
      x.plan.stratified = false;
      x.plan.seed = 7;
    });
    const diffs = reportDifferences(r, other);
    expect(diffs.map((d) => [d.field, d.kind])).toEqual([
      ['plan.group', 'data'],
      ['plan.seed', 'folds'],
      ['plan.stratified', 'folds'],
    ]);
    expect(describeDifferences(diffs)).toBe('plan.group (none vs farm), plan.seed (1 vs 7) and plan.stratified (true vs false)');
  });

  it('lets features, imputation and learner options differ: they are what a change changes', async () => {
    const r = await base();
    const other = tweak(r, (x) => {
      x.data.features = ['x2', 'x3'];
      x.data.dropped = ['x1'];
      x.settings.impute = 'mean';
      x.tool.version = '9.9.9';
    });
    expect(reportDifferences(r, other)).toEqual([]);
  });
});

describe('gateReports and compareReports on edited reports', () => {
  it('gate: a group change is not comparable; a stratification change uses the unpaired rule', async () => {
    const r = await base();
    const grouped = tweak(r, (x) => (x.plan.group = 'farm'));
    expect(() => gateReports(loaded(r, 'a.json'), loaded(grouped, 'b.json'))).toThrow(NotComparableError);
    expect(() => gateReports(loaded(r, 'a.json'), loaded(grouped, 'b.json'))).toThrow(
      'gate: the runs differ in plan.group (none vs farm); they are not comparable',
    );
    const unstratified = tweak(r, (x) => (x.plan.stratified = false));
    const v = gateReports(loaded(r, 'a.json'), loaded(unstratified, 'b.json'));
    expect(v.rule).toBe('unpaired');
    expect(v.unpairedBecause).toEqual(['plan.stratified (true vs false)']);
    expect(v.verdict).toBe('pass');
  });

  it('gate: folds of other sizes under a matching plan fall back to the unpaired rule, with a version warning', async () => {
    const r = await base();
    const resized = tweak(r, (x) => {
      x.tool.version = '9.9.9';
      for (const l of x.learners) l.folds[0].trainRows -= 1;
    });
    const v = gateReports(loaded(r, 'a.json'), loaded(resized, 'b.json'));
    expect(v.rule).toBe('unpaired');
    expect(v.unpairedBecause[0]).toMatch(/^fold sizes \(repeat 1 fold 1: train\/test \d+\/\d+ vs \d+\/\d+\), although the plans match$/);
    expect(v.warnings).toEqual([
      `the reports were made by foldwise ${VERSION} and 9.9.9; pairing by (repeat, fold) assumes the plan code did not change between them`,
    ]);
  });

  it('compare: folds of other sizes under a matching plan are not comparable', async () => {
    const r = await base();
    const resized = tweak(r, (x) => {
      for (const l of x.learners) l.folds[2].testRows += 1;
    });
    expect(() => compareReports(loaded(r, 'a.json'), loaded(resized, 'b.json'))).toThrow(
      /^compare: the folds differ in size \(repeat 1 fold 3: train\/test \d+\/\d+ vs \d+\/\d+\) although the plans match; they are not comparable$/,
    );
  });

  it('compare: a null fold score is left out of that pair and counted', async () => {
    const r = await base();
    const holed = tweak(r, (x) => (x.learners[1].folds[0].scores.accuracy = null));
    const c = compareReports(loaded(r, 'a.json'), loaded(holed, 'b.json'), { learners: ['knn'] });
    expect(c.rows[0].stats!.folds).toBe(4);
    expect(c.rows[0].stats!.skippedFolds).toBe(1);
    expect(c.warnings).toEqual(['knn: 1 fold has no accuracy score on one side; it is left out']);
  });
});
