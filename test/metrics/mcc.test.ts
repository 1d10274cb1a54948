import { describe, expect, it } from 'vitest';
import { sampleCorrelation } from 'simple-statistics';
import { accuracy } from '../../src/metrics/accuracy.js';
import { mcc } from '../../src/metrics/mcc.js';
import { perClassScores } from '../../src/metrics/per-class.js';
import { fromBinary, fromTable } from './helpers.js';

describe('mcc, accuracy and F1 against Chicco & Jurman (2020), BMC Genomics 21:6', () => {
  // The six synthetic use cases of the paper's "Use cases" section: counts and the published
  // two-decimal values of accuracy, F1 (of the positive class) and MCC. The counts and values
  // are from memory of the paper (the full text was not retrievable here); every published
  // value is reproduced to two decimals from the counts, which the test checks.
  const cases = [
    { name: 'A1 positively imbalanced', tp: 90, fn: 1, tn: 0, fp: 9, acc: 0.9, f1: 0.95, mcc: -0.03 },
    { name: 'A2 positively imbalanced', tp: 5, fn: 70, tn: 19, fp: 6, acc: 0.24, f1: 0.12, mcc: -0.24 },
    { name: 'B1 balanced', tp: 47, fn: 3, tn: 5, fp: 45, acc: 0.52, f1: 0.66, mcc: 0.07 },
    { name: 'B2 balanced', tp: 10, fn: 40, tn: 46, fp: 4, acc: 0.56, f1: 0.31, mcc: 0.17 },
    { name: 'C1 negatively imbalanced', tp: 9, fn: 1, tn: 1, fp: 89, acc: 0.1, f1: 0.17, mcc: -0.19 },
    { name: 'C2 negatively imbalanced', tp: 2, fn: 9, tn: 88, fp: 1, acc: 0.9, f1: 0.29, mcc: 0.31 },
  ];
  it('has all six cases', () => expect(cases.length).toBe(6));
  for (const c of cases) {
    it(`use case ${c.name}`, () => {
      const input = fromBinary(c.tp, c.fn, c.tn, c.fp);
      expect(input.actual.length).toBe(100);
      expect(Math.abs(accuracy(input) - c.acc)).toBeLessThan(0.005 + 1e-12);
      expect(Math.abs(perClassScores(input).f1[1] - c.f1)).toBeLessThan(0.005 + 1e-12);
      expect(Math.abs(mcc(input) - c.mcc)).toBeLessThan(0.005 + 1e-12);
    });
  }
});

describe('mcc cross-checks', () => {
  it('binary mcc equals the phi coefficient computed by hand', () => {
    // table rows = actual, columns = predicted: TN = 20, FP = 5, FN = 10, TP = 15
    // phi = (TP*TN - FP*FN) / sqrt((TP+FP)(TP+FN)(TN+FP)(TN+FN))
    //     = (15*20 - 5*10) / sqrt(20 * 25 * 25 * 30) = 250 / sqrt(375000) = 250 / 612.3724 = 0.408248
    const input = fromTable([
      [20, 5],
      [10, 15],
    ]);
    expect(Math.abs(mcc(input) - 250 / Math.sqrt(375000))).toBeLessThan(1e-12);
    expect(Math.abs(mcc(input) - 0.408248)).toBeLessThan(1e-6);
  });

  it('binary mcc equals the Pearson correlation of the 0/1 vectors (simple-statistics)', () => {
    const input = fromTable([
      [31, 7],
      [12, 50],
    ]);
    const r = sampleCorrelation(Array.from(input.actual), Array.from(input.predicted));
    expect(Math.abs(mcc(input) - r)).toBeLessThan(1e-12);
  });

  it('three-class mcc on a small case computed by hand (Gorodkin 2004 R_K)', () => {
    // rows = actual, columns = predicted
    //   [5 1 0]   t (actual counts)    = 6, 6, 6
    //   [2 3 1]   p (predicted counts) = 7, 6, 5
    //   [0 2 4]   c (correct) = 5 + 3 + 4 = 12, n = 18
    // numerator   = c*n - sum p_k t_k = 12*18 - (42 + 36 + 30) = 216 - 108 = 108
    // denominator = sqrt((n^2 - sum p_k^2)(n^2 - sum t_k^2)) = sqrt((324 - 110)(324 - 108))
    //             = sqrt(214 * 216) = sqrt(46224) = 214.99767...
    // MCC = 108 / 214.99767 = 0.502331
    const input = fromTable([
      [5, 1, 0],
      [2, 3, 1],
      [0, 2, 4],
    ]);
    expect(Math.abs(mcc(input) - 108 / Math.sqrt(46224))).toBeLessThan(1e-12);
    expect(Math.abs(mcc(input) - 0.502331)).toBeLessThan(1e-6);
  });

  it('is 1 for a perfect prediction, -1 for a swapped binary one, 0 when undefined (documented)', () => {
    expect(mcc(fromTable([[4, 0, 0], [0, 3, 0], [0, 0, 2]]))).toBe(1);
    expect(mcc(fromTable([[0, 5], [5, 0]]))).toBe(-1);
    // constant prediction: denominator 0, foldwise returns 0
    expect(mcc(fromTable([[6, 0], [4, 0]]))).toBe(0);
  });
});
