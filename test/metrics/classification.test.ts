import { describe, expect, it } from 'vitest';
import { accuracy } from '../../src/metrics/accuracy.js';
import { balancedAccuracy } from '../../src/metrics/balanced-accuracy.js';
import { confusionMatrix } from '../../src/metrics/confusion-matrix.js';
import { macroF1 } from '../../src/metrics/macro-f1.js';
import { macroPrecision } from '../../src/metrics/macro-precision.js';
import { macroRecall } from '../../src/metrics/macro-recall.js';
import { perClassScores } from '../../src/metrics/per-class.js';
import { fromBinary, fromTable } from './helpers.js';

describe('confusionMatrix', () => {
  it('puts actual classes in rows and predicted classes in columns', () => {
    const actual = Int32Array.from([0, 0, 1, 2, 2, 2]);
    const predicted = Int32Array.from([0, 1, 1, 2, 0, 2]);
    expect(confusionMatrix(actual, predicted, 4)).toEqual([
      [1, 1, 0, 0],
      [0, 1, 0, 0],
      [1, 0, 2, 0],
      [0, 0, 0, 0],
    ]);
  });
});

describe('accuracy and the recall/precision family on a hand-worked 3-class table', () => {
  // rows = actual, columns = predicted; n = 20
  //   [6 2 0]  actual 0: 8 rows    predicted 0: 6 + 1 + 1 = 8
  //   [1 4 3]  actual 1: 8 rows    predicted 1: 2 + 4 + 0 = 6
  //   [1 0 3]  actual 2: 4 rows    predicted 2: 0 + 3 + 3 = 6
  // correct = 6 + 4 + 3 = 13
  // recall    = 6/8, 4/8, 3/4 = .75, .5, .75
  // precision = 6/8, 4/6, 3/6 = .75, .666667, .5
  // F1 = 2 c_k / (a_k + p_k) = 12/16, 8/14, 6/10 = .75, .571429, .6
  const input = fromTable([
    [6, 2, 0],
    [1, 4, 3],
    [1, 0, 3],
  ]);
  it('accuracy = 13 / 20', () => expect(Math.abs(accuracy(input) - 0.65)).toBeLessThan(1e-12));
  it('balanced-accuracy = mean recall = 2 / 3', () =>
    expect(Math.abs(balancedAccuracy(input) - (0.75 + 0.5 + 0.75) / 3)).toBeLessThan(1e-12));
  it('macro-recall = balanced-accuracy when every class occurs in actual', () =>
    expect(Math.abs(macroRecall(input) - balancedAccuracy(input))).toBeLessThan(1e-12));
  it('macro-precision = (.75 + 2/3 + .5) / 3', () =>
    expect(Math.abs(macroPrecision(input) - (0.75 + 2 / 3 + 0.5) / 3)).toBeLessThan(1e-12));
  it('macro-f1 = mean per-class F1 = (12/16 + 8/14 + 6/10) / 3', () =>
    expect(Math.abs(macroF1(input) - (12 / 16 + 8 / 14 + 6 / 10) / 3)).toBeLessThan(1e-12));
});

describe('zero-denominator conventions (documented in src/metrics/per-class.ts)', () => {
  // 5 classes declared; class 2 is never predicted, class 3 is predicted but never actual,
  // class 4 occurs in neither.
  //   actual    0 0 1 1 2 2
  //   predicted 0 1 1 1 3 0
  const input = {
    actual: Int32Array.from([0, 0, 1, 1, 2, 2]),
    predicted: Int32Array.from([0, 1, 1, 1, 3, 0]),
    classes: 5,
  };
  it('a never-predicted class has precision 0; a never-actual predicted class has recall 0', () => {
    const s = perClassScores(input);
    expect(Array.from(s.present)).toEqual([1, 1, 1, 1, 0]);
    expect(s.precision[2]).toBe(0);
    expect(s.recall[3]).toBe(0);
    expect(s.f1[2]).toBe(0);
    expect(s.f1[3]).toBe(0);
    expect(s.precision[4]).toBeNaN(); // absent from both: left out
  });
  it('macro averages run over the four present classes', () => {
    // precision: class 0 = 1/2, class 1 = 2/3, class 2 = 0, class 3 = 0
    expect(Math.abs(macroPrecision(input) - (1 / 2 + 2 / 3) / 4)).toBeLessThan(1e-12);
    // recall: 1/2, 1, 0, 0 (class 3 has no actual rows)
    expect(Math.abs(macroRecall(input) - 1.5 / 4)).toBeLessThan(1e-12);
    // F1: 2/4, 4/5, 0, 0
    expect(Math.abs(macroF1(input) - (0.5 + 0.8) / 4)).toBeLessThan(1e-12);
  });
  it('balanced-accuracy runs over the classes present in actual only', () => {
    // recall 1/2, 1, 0 over classes 0, 1, 2
    expect(Math.abs(balancedAccuracy(input) - 0.5)).toBeLessThan(1e-12);
  });
});

describe('balanced accuracy, two classes', () => {
  it('is the mean of sensitivity and specificity (Chicco, Toetsch & Jurman 2021 definition)', () => {
    // Chicco & Jurman (2020) use case A1 counts: TP 90, FN 1, TN 0, FP 9
    // sensitivity = 90 / 91, specificity = 0 / 9 -> (0.989011 + 0) / 2 = 0.494505
    const input = fromBinary(90, 1, 0, 9);
    expect(Math.abs(balancedAccuracy(input) - (90 / 91 + 0) / 2)).toBeLessThan(1e-12);
  });
});

describe('perClassScores without a caller name', () => {
  it('names itself perClassScores in a refusal', () => {
    expect(() => perClassScores({ actual: new Int32Array(0), predicted: new Int32Array(0), classes: 2 })).toThrow(
      'perClassScores: actual and predicted must not be empty',
    );
  });
});
