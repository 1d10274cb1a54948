/**
 * The comparisons inside one report (src/compare/within-report.ts) on hand-built reports, without
 * the CLI (test/compare/within-report.test.ts runs eval end to end): which pairs appear, against
 * which reference, and that each entry is pairedStats of learner minus reference. The figures use
 * the hand-derived example of test/compare/paired-stats.test.ts (differences 0.03 0.01 0.02 0.04
 * 0.00: mean 0.02, corrected t 1.885618 on 4 df).
 */
import { describe, expect, it } from 'vitest';
import { pairedStats } from '../../src/compare/paired-stats.js';
import { COMPARISON_LEVEL, reportComparisons, withComparisons } from '../../src/compare/within-report.js';
import { getMetric } from '../../src/metrics/index.js';
import type { LearnerReport } from '../../src/model/report.js';
import { foldsOf, learner, makeReport } from './report-samples.js';

const REF = [0.8, 0.82, 0.78, 0.84, 0.81];
const D = [0.03, 0.01, 0.02, 0.04, 0];
const UP = REF.map((r, i) => r + D[i]);
const LOW = REF.map((r, i) => r - 2 * D[i]);
const SIZES = { testRows: 20, trainRows: 80 };

const k = (spec: string, values: readonly (number | null)[], metric = 'kappa'): LearnerReport => learner(spec, foldsOf(metric, values));
const base = (values: readonly (number | null)[]) => k('baseline', values);
const pairsOf = (learners: LearnerReport[], metrics = ['kappa']) => reportComparisons(makeReport(learners, metrics))?.pairs.map((p) => [p.learner, p.reference, p.against.join('+')]);

describe('reportComparisons', () => {
  it('compares every learner with the baseline and with the best; the stats are learner minus reference', () => {
    const r = makeReport([base(REF), k('knn', UP), k('tree', LOW)], ['kappa', 'accuracy']);
    const c = reportComparisons(r)!;
    expect(c.metric).toBe('kappa');
    expect(c.higherIsBetter).toBe(true);
    expect(c.level).toBe(0.95);
    expect(COMPARISON_LEVEL).toBe(0.95);
    expect(c.pairs.map((p) => [p.learner, p.reference, p.against])).toEqual([
      ['knn', 'baseline', ['baseline']],
      ['tree', 'baseline', ['baseline']],
      ['tree', 'knn', ['best']],
    ]);
    const knn = c.pairs[0];
    expect(Math.abs(knn.diff - 0.02)).toBeLessThan(1e-12);
    expect(Math.abs(knn.t! - 1.885618)).toBeLessThan(1e-5);
    expect(knn).toEqual({ learner: 'knn', reference: 'baseline', against: ['baseline'], ...pairedStats(UP, REF, SIZES, true, 0, getMetric('kappa')) });
    expect(c.pairs[2]).toEqual({ learner: 'tree', reference: 'knn', against: ['best'], ...pairedStats(LOW, UP, SIZES, true, 0, getMetric('kappa')) });
  });

  it('lists a baseline that is also the best once, against both; the baseline is never compared with the best', () => {
    expect(pairsOf([k('knn', LOW), base(UP), k('tree', REF)])).toEqual([
      ['knn', 'baseline', 'baseline+best'],
      ['tree', 'baseline', 'baseline+best'],
    ]);
  });

  it('picks the best in the metric\'s direction: lowest rmse', () => {
    expect(pairsOf([base(REF), k('knn', UP, 'rmse'), k('tree', LOW, 'rmse')].map((l, i) => (i === 0 ? k('baseline', REF, 'rmse') : l)), ['rmse'])).toEqual([
      ['knn', 'baseline', 'baseline'],
      ['knn', 'tree', 'best'],
      ['tree', 'baseline', 'baseline'],
    ]);
    const c = reportComparisons(makeReport([k('baseline', REF, 'rmse'), k('knn', UP, 'rmse')], ['rmse']))!;
    expect(c.higherIsBetter).toBe(false);
    expect(c.pairs[0].direction).toBe('worse');
  });

  it('without a baseline, compares every learner but the best with the best', () => {
    expect(pairsOf([k('knn', REF), k('tree', UP), k('forest', LOW)])).toEqual([
      ['knn', 'tree', 'best'],
      ['forest', 'tree', 'best'],
    ]);
  });

  it('has no comparisons with one learner, or when no pair has a fold scored on both sides', () => {
    expect(reportComparisons(makeReport([k('knn', UP)], ['kappa']))).toBeUndefined();
    expect(reportComparisons(makeReport([base([null, null]), k('knn', [0.5, null])], ['kappa']))).toBeUndefined();
  });

  it('leaves out a pair with nothing in common and counts skipped folds in the others', () => {
    const c = reportComparisons(makeReport([base([0.5, 0.6, null]), k('knn', [null, null, 0.9]), k('tree', [0.7, null, 0.8])], ['kappa']))!;
    // best is knn (mean 0.9): knn-baseline has no common fold; tree-baseline has 1, tree-knn has 1
    expect(c.pairs.map((p) => [p.learner, p.reference, p.folds, p.skippedFolds])).toEqual([
      ['tree', 'baseline', 1, 2],
      ['tree', 'knn', 1, 2],
    ]);
  });
});

describe('withComparisons', () => {
  it('adds the comparisons before the timings, or returns the report itself when there are none', () => {
    const timing = { totalMs: 5, learners: [] };
    const r = { ...makeReport([base(REF), k('knn', UP)], ['kappa']), timing };
    const w = withComparisons(r);
    expect(Object.keys(w).slice(-2)).toEqual(['comparisons', 'timing']);
    expect(w.timing).toEqual(timing);
    expect(w.comparisons).toEqual(reportComparisons(r));
    const untimed = withComparisons(makeReport([base(REF), k('knn', UP)], ['kappa']));
    expect('timing' in untimed).toBe(false);
    expect(Object.keys(untimed).at(-1)).toBe('comparisons');
    const single = makeReport([k('knn', UP)], ['kappa']);
    expect(withComparisons(single)).toBe(single);
  });
});
