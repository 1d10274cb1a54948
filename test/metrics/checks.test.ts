import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { confusionMatrix } from '../../src/metrics/confusion-matrix.js';
import type { CostMatrix } from '../../src/metrics/cost.js';
import { METRICS, metricFor } from '../../src/metrics/index.js';
import type { ClassificationInput, RegressionInput } from '../../src/metrics/types.js';

// `cost` is checked bound to a two-class matrix (the registry's own entry has none; cost.test.ts).
// Written out rather than parsed from a file: code run while this module loads is outside every
// test, so Stryker would run the whole mutate suite for each mutant of cost-matrix.ts (a
// "static" mutant); cost.test.ts tests the reading.
const twoClassCosts: CostMatrix = { classes: ['0', '1'], values: Float64Array.from([0, 1, 5, 0]), sha256: 'not read from a file' };
const classification = [...METRICS.values()].filter((m) => m.task === 'classification').map((m) => (m.name === 'cost' ? metricFor('cost', twoClassCosts) : m));
const regression = [...METRICS.values()].filter((m) => m.task === 'regression');
const withProba = classification.filter((m) => m.needsProba);

function thrown(f: () => unknown): Error {
  try {
    f();
  } catch (e) {
    return e as Error;
  }
  throw new Error('expected a throw');
}

function expectInputError(f: () => unknown, message: string): void {
  const e = thrown(f);
  expect(e).toBeInstanceOf(InputError);
  expect(e.message).toBe(message);
}

const ok: ClassificationInput = {
  actual: Int32Array.from([0, 1, 1]),
  predicted: Int32Array.from([0, 1, 0]),
  classes: 2,
  probs: Float64Array.from([0.9, 0.1, 0.2, 0.8, 0.6, 0.4]),
};

describe('classification input checks, for every classification metric', () => {
  it('has the thirteen classification metrics and five with probabilities', () => {
    expect(classification.length).toBe(13);
    expect(withProba.map((m) => m.name)).toEqual(['log-loss', 'brier', 'roc-auc', 'average-precision', 'ece']);
  });
  for (const m of classification) {
    const fn = m.fn as (input: ClassificationInput) => number;
    it(`${m.name}: accepts good input`, () => expect(typeof fn(ok)).toBe('number'));
    it(`${m.name}: length mismatch`, () =>
      expectInputError(
        () => fn({ ...ok, predicted: Int32Array.from([0, 1, 1, 0]) }),
        `${m.name}: actual and predicted must have the same length (got 3 and 4)`,
      ));
    it(`${m.name}: empty input`, () =>
      expectInputError(
        () => fn({ actual: new Int32Array(0), predicted: new Int32Array(0), classes: 2, probs: new Float64Array(0) }),
        `${m.name}: actual and predicted must not be empty`,
      ));
    it(`${m.name}: bad class count`, () =>
      expectInputError(() => fn({ ...ok, classes: 0 }), `${m.name}: classes must be a positive integer (got 0)`));
    it(`${m.name}: code out of range`, () =>
      expectInputError(
        () => fn({ ...ok, actual: Int32Array.from([0, 2, 1]) }),
        `${m.name}: actual[1] = 2 is not a class code in 0..1`,
      ));
    it(`${m.name}: negative predicted code`, () =>
      expectInputError(
        () => fn({ ...ok, predicted: Int32Array.from([0, 1, -1]) }),
        `${m.name}: predicted[2] = -1 is not a class code in 0..1`,
      ));
  }
  for (const m of withProba) {
    const fn = m.fn as (input: ClassificationInput) => number;
    it(`${m.name}: probs missing`, () =>
      expectInputError(
        () => fn({ actual: ok.actual, predicted: ok.predicted, classes: 2 }),
        `${m.name}: needs class probabilities, but probs is missing`,
      ));
    it(`${m.name}: wrong probs size`, () =>
      expectInputError(
        () => fn({ ...ok, probs: new Float64Array(5).fill(0.5) }),
        `${m.name}: probs must have 3 x 2 = 6 entries (got 5)`,
      ));
    it(`${m.name}: probs not a probability`, () => {
      expectInputError(
        () => fn({ ...ok, probs: Float64Array.from([0.9, 0.1, 1.5, 0.8, 0.6, 0.4]) }),
        `${m.name}: probs at row 1, class 0 is 1.5, not a probability in [0, 1]`,
      );
      expectInputError(
        () => fn({ ...ok, probs: Float64Array.from([0.9, 0.1, 0.2, 0.8, 0.6, NaN]) }),
        `${m.name}: probs at row 2, class 1 is NaN, not a probability in [0, 1]`,
      );
    });
  }
  it('metrics without probabilities ignore a missing probs', () => {
    for (const m of classification.filter((x) => !x.needsProba)) {
      const fn = m.fn as (input: ClassificationInput) => number;
      expect(Number.isFinite(fn({ actual: ok.actual, predicted: ok.predicted, classes: 2 }))).toBe(true);
    }
  });
});

describe('confusionMatrix input checks', () => {
  it('length mismatch', () =>
    expectInputError(
      () => confusionMatrix(Int32Array.from([0]), Int32Array.from([0, 1]), 2),
      'confusionMatrix: actual and predicted must have the same length (got 1 and 2)',
    ));
});

describe('regression input checks, for every regression metric', () => {
  const good: RegressionInput = { actual: Float64Array.from([1, 2, 3]), predicted: Float64Array.from([1, 2, 4]) };
  it('has the four regression metrics', () => expect(regression.length).toBe(4));
  for (const m of regression) {
    const fn = m.fn as (input: RegressionInput) => number;
    it(`${m.name}: accepts good input`, () => expect(Number.isFinite(fn(good))).toBe(true));
    it(`${m.name}: length mismatch`, () =>
      expectInputError(
        () => fn({ actual: good.actual, predicted: Float64Array.from([1, 2, 3, 4]) }),
        `${m.name}: actual and predicted must have the same length (got 3 and 4)`,
      ));
    it(`${m.name}: empty input`, () =>
      expectInputError(
        () => fn({ actual: new Float64Array(0), predicted: new Float64Array(0) }),
        `${m.name}: actual and predicted must not be empty`,
      ));
    it(`${m.name}: non-finite value`, () => {
      expectInputError(
        () => fn({ actual: good.actual, predicted: Float64Array.from([1, 2, NaN]) }),
        `${m.name}: predicted[2] is NaN, not a finite number`,
      );
      expectInputError(
        () => fn({ actual: Float64Array.from([Infinity, 2, 3]), predicted: good.predicted }),
        `${m.name}: actual[0] is Infinity, not a finite number`,
      );
    });
  }
});

describe('the edges of the checks', () => {
  it('one class is a positive integer: accuracy of two rows of class 0 is 1', () => {
    expect(classification.find((m) => m.name === 'accuracy')!.fn({ actual: Int32Array.from([0, 0]), predicted: Int32Array.from([0, 0]), classes: 1 } as never)).toBe(1);
  });

  it('refuses a negative probability', () => {
    for (const m of withProba) {
      expectInputError(
        () => (m.fn as (input: ClassificationInput) => number)({ ...ok, probs: Float64Array.from([0.9, 0.1, -0.5, 0.8, 0.6, 0.4]) }),
        `${m.name}: probs at row 1, class 0 is -0.5, not a probability in [0, 1]`,
      );
    }
  });

  it('accepts probabilities exactly PROBA_SLACK outside [0, 1] (rounding slack, 1e-9)', () => {
    const edge = { ...ok, probs: Float64Array.from([-1e-9, 1 + 1e-9, 0.2, 0.8, 0.6, 0.4]) };
    for (const m of withProba) expect(Number.isFinite((m.fn as (input: ClassificationInput) => number)(edge))).toBe(true);
  });
});
