import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { getLearner } from '../../src/learners/index.js';
import { formatSpec, parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';

describe('learner specs', () => {
  it('parses NAME and NAME:key=value,... and fills defaults', () => {
    const knn = getLearner('knn');
    const p = resolveParams(knn, parseLearnerSpec('knn:k=3,vote=inverse'), 'classification');
    expect(p).toEqual(Object.assign(Object.create(null), { k: 3, vote: 'inverse' }));
    expect(formatSpec(knn, p)).toBe('knn:k=3,vote=inverse');
    expect(formatSpec(knn, resolveParams(knn, parseLearnerSpec('knn'), 'classification'))).toBe('knn');
    expect(formatSpec(knn, resolveParams(knn, parseLearnerSpec('knn:k=5'), 'regression'))).toBe('knn');
  });

  it.each([
    ['knn:', /nothing after ":"/],
    ['knn:k', /"k" is not key=value/],
    ['knn:k=3,k=4', /option "k" is given twice/],
    ['KNN', /lower-case NAME/],
    ['knn:kk=3', /unknown option "kk" for knn; did you mean "k"\?/],
    ['knn:k=0', /--learner knn: k=0: must be at least 1/],
    ['knn:k=2.5', /k=2.5: expected a whole number/],
    ['knn:k=abc', /k=abc: expected a number/],
    ['knn:vote=near', /vote=near: expected one of equal, inverse/],
  ])('rejects %s', (text, message) => {
    const run = () => {
      const spec = parseLearnerSpec(text);
      resolveParams(getLearner(spec.name), spec, 'classification');
    };
    expect(run).toThrow(UsageError);
    expect(run).toThrow(message);
  });

  it('names close learners for an unknown one', () => {
    expect(() => getLearner('kn')).toThrow(/unknown learner; did you mean "knn"/);
  });

  it('refuses a task the learner does not do', () => {
    expect(() => resolveParams(getLearner('knn-ref'), parseLearnerSpec('knn-ref'), 'regression')).toThrow(/does not do regression/);
  });
});
