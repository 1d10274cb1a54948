/**
 * checkScoreRanges (src/compare/score-ranges.ts) on hand-built reports: each fold, holdout and
 * pooled score of a known metric must lie in the metric's range, with a slack of
 * 1e-9 * max(1, |bound|). The ranges are the ones the metrics can take by definition (accuracy a
 * share, [0, 1]; mcc and kappa correlations, [-1, 1]; Brier score of two or more classes, [0, 2];
 * log loss clipped at probability 2^-53, so at most 53 ln 2; r2 at most 1, unbounded below).
 */
import { describe, expect, it } from 'vitest';
import { checkScoreRanges } from '../../src/compare/score-ranges.js';
import { InputError } from '../../src/errors.js';
import { fold, learner, makeReport } from './report-samples.js';

const one = (metric: string, value: number | null) => makeReport([learner('knn', [fold(0, { [metric]: value })])], [metric]);
const ok = (metric: string, value: number | null) => () => checkScoreRanges('r.json', one(metric, value));

describe('checkScoreRanges: scores outside what a metric can take are refused', () => {
  it('accepts the bounds and anything within the slack 1e-9 of a bound of size at most 1', () => {
    expect(ok('accuracy', 0)).not.toThrow();
    expect(ok('accuracy', 1)).not.toThrow();
    // exactly at the bound plus the slack: still inside (the test is strictly beyond it)
    expect(ok('accuracy', 1 + 1e-9)).not.toThrow();
    expect(ok('accuracy', 0 - 1e-9)).not.toThrow();
    expect(ok('mcc', -1 - 1e-9)).not.toThrow();
    expect(ok('mcc', -1 - 3e-9)).toThrow(InputError);
  });

  it('refuses just beyond the slack on either side, naming the report, learner, fold, value and range', () => {
    expect(ok('accuracy', 1 + 3e-9)).toThrow(InputError);
    expect(ok('accuracy', -3e-9)).toThrow(InputError);
    expect(ok('accuracy', 1.5)).toThrow(
      'r.json: knn fold r1.f1 has accuracy = 1.5, outside the range [0, 1] that accuracy can take; the report was edited or damaged, so write it again with foldwise eval',
    );
  });

  it('scales the slack with a bound larger than 1 (1e-9 times the bound)', () => {
    // brier's upper bound 2: slack 2e-9, so 2 + 1.5e-9 is inside, 2 + 3e-9 outside
    expect(ok('brier', 2 + 1.5e-9)).not.toThrow();
    expect(ok('brier', 2 + 3e-9)).toThrow(InputError);
    // log loss at most 53 ln 2 = 36.74 (clip at 2^-53): slack about 3.7e-8
    const top = 53 * Math.LN2;
    expect(ok('log-loss', top + 2e-8)).not.toThrow();
    expect(ok('log-loss', top + 6e-8)).toThrow(InputError);
  });

  it('leaves an infinite bound open, nulls alone, and metrics the registry does not know alone', () => {
    expect(ok('r2', -1e6)).not.toThrow();
    expect(ok('r2', 1 + 3e-9)).toThrow(InputError);
    expect(ok('rmse', 1e9)).not.toThrow();
    expect(ok('rmse', -3e-9)).toThrow(InputError);
    expect(ok('accuracy', null)).not.toThrow();
    expect(ok('my-own-score', 99)).not.toThrow();
  });

  it('checks every fold, the holdout and the pooled scores, of every learner', () => {
    const good = { accuracy: 0.8 };
    const bad = { accuracy: 1.2 };
    const second = (l: ReturnType<typeof learner>) => makeReport([learner('baseline', [fold(0, good)]), l]);
    expect(() => checkScoreRanges('r.json', second(learner('knn', [fold(0, good), fold(1, bad, { repeat: 1 })])))).toThrow(
      'r.json: knn fold r2.f2 has accuracy = 1.2',
    );
    const holdout = learner('knn', [fold(0, good)], { final: { trainRows: 80, testRows: 20, scores: bad } });
    expect(() => checkScoreRanges('r.json', second(holdout))).toThrow('r.json: knn holdout has accuracy = 1.2');
    const pooled = { ...learner('knn', [fold(0, good)]), pooled: bad };
    expect(() => checkScoreRanges('r.json', second(pooled))).toThrow('r.json: knn pooled has accuracy = 1.2');
    // the same learners with good scores everywhere pass
    expect(() => checkScoreRanges('r.json', second(learner('knn', [fold(0, good)], { final: { trainRows: 80, testRows: 20, scores: good } })))).not.toThrow();
  });

  it('checks every metric of a fold, not only the first', () => {
    const r = makeReport([learner('knn', [fold(0, { accuracy: 0.5, kappa: -1.5 })])], ['accuracy', 'kappa']);
    expect(() => checkScoreRanges('r.json', r)).toThrow('knn fold r1.f1 has kappa = -1.5, outside the range [-1, 1]');
  });
});
