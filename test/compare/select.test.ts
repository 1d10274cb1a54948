/**
 * Picking learners out of a report (src/compare/select.ts) on hand-built reports: the summary
 * mean, the best learner in the metric's direction (first wins a tie), the baseline, and a
 * learner named by spec, directly or through the learner registry's canonical spelling.
 */
import { describe, expect, it } from 'vitest';
import { baselineOf, bestBy, findLearner, summaryMean } from '../../src/compare/select.js';
import { UsageError } from '../../src/errors.js';
import type { LearnerReport } from '../../src/model/report.js';
import { foldsOf, learner, makeReport } from './report-samples.js';

const withMean = (spec: string, mean: number | null, name?: string): LearnerReport => {
  const l = learner(spec, foldsOf('accuracy', [mean]));
  return name ? { ...l, name } : l;
};

describe('summaryMean', () => {
  it('is the summary mean of the metric, or undefined when absent, null, not finite or only inherited', () => {
    const l = learner('knn', foldsOf('accuracy', [0.6, 0.8]));
    expect(summaryMean(l, 'accuracy')).toBeCloseTo(0.7, 12);
    expect(summaryMean(l, 'kappa')).toBeUndefined();
    expect(summaryMean({ ...l, summary: { accuracy: null } }, 'accuracy')).toBeUndefined();
    const nanMean = { ...l.summary.accuracy!, mean: NaN };
    expect(summaryMean({ ...l, summary: { accuracy: nanMean } }, 'accuracy')).toBeUndefined();
    // a summary whose prototype carries the metric: not the learner's own score
    const inherited = Object.create({ accuracy: l.summary.accuracy }) as LearnerReport['summary'];
    expect(summaryMean({ ...l, summary: inherited }, 'accuracy')).toBeUndefined();
  });
});

describe('bestBy', () => {
  const r = makeReport([withMean('a', 0.7), withMean('b', 0.9), withMean('c', null), withMean('d', 0.6), withMean('e', 0.9)]);

  it('takes the highest mean when higher is better and the lowest when lower is better; the first wins a tie', () => {
    expect(bestBy(r, 'accuracy', true)?.spec).toBe('b');
    expect(bestBy(r, 'accuracy', false)?.spec).toBe('d');
    const tie = makeReport([withMean('p', 0.5), withMean('q', 0.5)]);
    expect(bestBy(tie, 'accuracy', true)?.spec).toBe('p');
    expect(bestBy(tie, 'accuracy', false)?.spec).toBe('p');
  });

  it('never picks a learner without a score, nor one `keep` refuses; undefined when none is left', () => {
    const nullFirst = makeReport([withMean('c', null), withMean('a', 0.7)]);
    expect(bestBy(nullFirst, 'accuracy', true)?.spec).toBe('a');
    expect(bestBy(nullFirst, 'accuracy', false)?.spec).toBe('a');
    expect(bestBy(r, 'accuracy', true, (l) => l.spec !== 'b' && l.spec !== 'e')?.spec).toBe('a');
    expect(bestBy(r, 'accuracy', false, (l) => l.spec !== 'd')?.spec).toBe('a');
    expect(bestBy(r, 'accuracy', true, () => false)).toBeUndefined();
    expect(bestBy(r, 'kappa', true)).toBeUndefined();
    expect(bestBy(makeReport([withMean('c', null)]), 'accuracy', true)).toBeUndefined();
  });

  it('an unscored learner between two scored ones does not reset the running best', () => {
    const mid = makeReport([withMean('a', 0.7), withMean('c', null), withMean('b', 0.6)]);
    expect(bestBy(mid, 'accuracy', true)?.spec).toBe('a');
    const refused = makeReport([withMean('a', 0.7), withMean('z', 0.95), withMean('b', 0.6)]);
    expect(bestBy(refused, 'accuracy', true, (l) => l.spec !== 'z')?.spec).toBe('a');
  });
});

describe('baselineOf', () => {
  it('is the first learner named "baseline", or undefined', () => {
    const first = withMean('baseline:strategy=prior', 0.5, 'baseline');
    const second = withMean('baseline', 0.6, 'baseline');
    expect(baselineOf(makeReport([withMean('knn', 0.8), first, second]))).toBe(first);
    expect(baselineOf(makeReport([withMean('knn', 0.8)]))).toBeUndefined();
  });
});

describe('findLearner', () => {
  const r = makeReport([withMean('baseline', 0.5, 'baseline'), withMean('knn:k=7', 0.8, 'knn'), withMean('knn', 0.7, 'knn')]);

  it('finds the exact spec, trimmed', () => {
    expect(findLearner(r, 'knn:k=7', '--learner', 'the report').spec).toBe('knn:k=7');
    expect(findLearner(r, '  knn  ', '--learner', 'the report').spec).toBe('knn');
  });

  it('finds a spec as the report spells it even when the registry would spell it otherwise', () => {
    // "knn:k=5" names the default k: the registry's spelling is "knn", which this report does not have
    const odd = makeReport([withMean('knn:k=5', 0.8, 'knn'), withMean('my-own', 0.7, 'my-own')]);
    expect(findLearner(odd, 'knn:k=5', '--learner', 'the report').spec).toBe('knn:k=5');
    expect(findLearner(odd, 'my-own', '--learner', 'the report').spec).toBe('my-own');
  });

  it('names the trimmed spec in its refusal', () => {
    expect(() => findLearner(r, '  tree:depth=3 ', '--learner', 'the report')).toThrow(
      '--learner tree:depth=3: the report has no such learner (it has "baseline", "knn:k=7", "knn")',
    );
  });

  it('finds another spelling of the same options through the registry (defaults dropped, order canonical)', () => {
    expect(findLearner(r, 'knn:vote=equal,k=7', '--learner', 'the report').spec).toBe('knn:k=7');
    expect(findLearner(r, 'knn:k=5', '--learner', 'the report').spec).toBe('knn');
  });

  it('refuses an unknown learner naming the option, the place, close names and the specs it has', () => {
    expect(() => findLearner(r, 'knn:k=9', '--learner', 'the first report a.json')).toThrow(UsageError);
    expect(() => findLearner(r, 'knn:k=9', '--learner', 'the first report a.json')).toThrow(
      '--learner knn:k=9: the first report a.json has no such learner; did you mean "knn:k=7"? (it has "baseline", "knn:k=7", "knn")',
    );
  });

  it('falls back to the specs of the same learner name when none is close, at most three', () => {
    const many = makeReport([
      withMean('knn:k=11,vote=inverse', 0.8, 'knn'),
      withMean('knn:k=13,vote=inverse', 0.8, 'knn'),
      withMean('knn:k=15,vote=inverse', 0.8, 'knn'),
      withMean('knn:k=17,vote=inverse', 0.8, 'knn'),
      withMean('baseline', 0.5, 'baseline'),
    ]);
    expect(() => findLearner(many, 'knn:k=2', '--previous-learner', 'the report')).toThrow(
      '--previous-learner knn:k=2: the report has no such learner; did you mean "knn:k=11,vote=inverse", "knn:k=13,vote=inverse", "knn:k=15,vote=inverse"? (it has ',
    );
  });

  it('gives no hint when nothing is close and no learner has the name; a spec the registry refuses is just not found', () => {
    expect(() => findLearner(r, 'forest:trees=300', '--learner', 'the report')).toThrow(
      '--learner forest:trees=300: the report has no such learner (it has "baseline", "knn:k=7", "knn")',
    );
    expect(() => findLearner(r, 'Not A Spec!', '--learner', 'the report')).toThrow(
      '--learner Not A Spec!: the report has no such learner (it has "baseline", "knn:k=7", "knn")',
    );
  });

  it('canonicalises for the report\'s task: a learner that does not do it is not found', () => {
    const reg = makeReport([withMean('logistic', 0.5, 'logistic')], ['accuracy'], {});
    const regression = { ...reg, data: { ...reg.data, task: 'regression' as const } };
    expect(findLearner(reg, 'logistic:l2=0.1', '--learner', 'the report').spec).toBe('logistic');
    expect(() => findLearner(regression, 'logistic:l2=0.1', '--learner', 'the report')).toThrow(
      '--learner logistic:l2=0.1: the report has no such learner; did you mean "logistic"?',
    );
  });
});
