import { describe, expect, it } from 'vitest';
import { averagePrecision } from '../../src/metrics/average-precision.js';
import { prInterpolate } from '../../src/curves/points.js';
import { binaryScores } from './helpers.js';

// Fawcett (2006), "An introduction to ROC analysis", Fig. 3: the same 20 instances as in
// test/metrics/roc-auc.test.ts (classes p/n, scores descending).
const FAWCETT_CLASSES = 'ppnpppnnpnpnpnnnpnpn';
const FAWCETT_SCORES = [
  0.9, 0.8, 0.7, 0.6, 0.55, 0.54, 0.53, 0.52, 0.51, 0.505, 0.4, 0.39, 0.38, 0.37, 0.36, 0.35, 0.34, 0.33, 0.3, 0.1,
];

describe('average_precision, the step-wise sum', () => {
  it('Fawcett (2006) Fig. 3 data: mean precision at the ranks of the positives (by hand)', () => {
    expect(FAWCETT_CLASSES.length).toBe(20);
    const labels = [...FAWCETT_CLASSES].map((c) => (c === 'p' ? 1 : 0));
    // positives at ranks 1, 2, 4, 5, 6, 9, 11, 13, 17, 19 (no ties), so
    // AP = (1/1 + 2/2 + 3/4 + 4/5 + 5/6 + 6/9 + 7/11 + 8/13 + 9/17 + 10/19) / 10
    const byHand = (1 + 1 + 3 / 4 + 4 / 5 + 5 / 6 + 6 / 9 + 7 / 11 + 8 / 13 + 9 / 17 + 10 / 19) / 10;
    expect(Math.abs(byHand - 0.735747)).toBeLessThan(1e-6);
    expect(Math.abs(averagePrecision(binaryScores(labels, FAWCETT_SCORES)) - byHand)).toBeLessThan(1e-12);
  });

  it('tied scores enter together: the precision of the whole tied run counts (by hand)', () => {
    // scores .9 (pos), .5 (pos), .5 (neg), .5 (neg), .1 (pos); P = 3
    // step 1: recall 1/3 at precision 1; step 2 (three rows tied at .5): recall 2/3 at 2/4;
    // step 3: recall 1 at 3/5. AP = (1 + 1/2 + 3/5) / 3 = 0.7
    const ap = averagePrecision(binaryScores([1, 1, 0, 0, 1], [0.9, 0.5, 0.5, 0.5, 0.1]));
    expect(Math.abs(ap - 0.7)).toBeLessThan(1e-12);
    // the row order inside the tie does not matter
    const ap2 = averagePrecision(binaryScores([1, 0, 0, 1, 1], [0.9, 0.5, 0.5, 0.5, 0.1]));
    expect(Math.abs(ap2 - 0.7)).toBeLessThan(1e-12);
  });

  it('is NaN without a positive row (documented)', () => {
    expect(averagePrecision(binaryScores([0, 0, 0], [0.2, 0.5, 0.9]))).toBeNaN();
  });

  it('more classes: macro one-vs-rest over the classes present (by hand)', () => {
    // 3 classes, 4 rows: actual 0, 0, 1, 2
    // column 0 scores .7 .2 .6 .1 -> ranking rows 0 (pos), 2, 1 (pos), 3: AP_0 = (1 + 2/3) / 2 = 5/6
    // column 1 scores .2 .3 .3 .1 -> rows 1 and 2 tied at .3 (one pos): AP_1 = 1/2
    // column 2 scores .1 .5 .1 .8 -> row 3 (pos) first: AP_2 = 1
    const proba = Float64Array.from([0.7, 0.2, 0.1, 0.2, 0.3, 0.5, 0.6, 0.3, 0.1, 0.1, 0.1, 0.8]);
    const input = { actual: Int32Array.from([0, 0, 1, 2]), predicted: Int32Array.from([0, 2, 0, 2]), classes: 3, probs: proba };
    expect(Math.abs(averagePrecision(input) - (5 / 6 + 1 / 2 + 1) / 3)).toBeLessThan(1e-12);
  });
});

describe('precision-recall interpolation (Davis & Goadrich 2006)', () => {
  it('reproduces their interpolation table between A (TP 5, FP 5) and B (TP 10, FP 30), 20 positives', () => {
    // Davis & Goadrich (2006), "The relationship between precision-recall and ROC curves",
    // ICML, section 4 and its table of interpolated points (values recalled from memory and
    // recomputed by hand here): each extra true positive brings (30 - 5) / (10 - 5) = 5 false
    // positives, so the points are TP 5..10 with FP 5, 10, 15, 20, 25, 30.
    const { recall, precision } = prInterpolate({ tp: 5, fp: 5 }, { tp: 10, fp: 30 }, 20);
    expect(recall.length).toBe(6);
    const wantRecall = [0.25, 0.3, 0.35, 0.4, 0.45, 0.5];
    const wantPrecision = [0.5, 0.375, 0.318, 0.286, 0.265, 0.25];
    for (let i = 0; i < 6; i++) {
      expect(Math.abs(recall[i] - wantRecall[i])).toBeLessThan(1e-12);
      expect(Math.abs(precision[i] - wantPrecision[i])).toBeLessThan(5e-4);
    }
    // the straight line from (.25, .5) to (.5, .25) would claim precision .45 at recall .30,
    // far above the .375 that is reachable: linear interpolation overstates the PR curve
    const linearAt30 = 0.5 + ((0.3 - 0.25) / (0.5 - 0.25)) * (0.25 - 0.5);
    expect(Math.abs(linearAt30 - 0.45)).toBeLessThan(1e-12);
    expect(precision[1]).toBeLessThan(linearAt30 - 0.07);
  });
});

describe('average_precision, more classes with one absent from actual', () => {
  it('leaves the absent class out of the mean (by hand, (1 + 5/6) / 2 = 11/12)', () => {
    // rows (p0 p1 p2): (.4 .5 .1) a0, (.2 .7 .1) a1, (.5 .2 .3) a0, (.3 .4 .3) a1; class 2 never occurs.
    // class 0, column 0 descending: .5 (pos) .4 (pos) .3 .2 -> AP 1
    // class 1, column 1 descending: .7 (pos, P 1, R 1/2) .5 (neg) .4 (pos, P 2/3, R 1) .2 -> 1/2 + 1/2 * 2/3 = 5/6
    const input = {
      actual: Int32Array.from([0, 1, 0, 1]),
      predicted: Int32Array.from([1, 1, 0, 1]),
      classes: 3,
      probs: Float64Array.from([0.4, 0.5, 0.1, 0.2, 0.7, 0.1, 0.5, 0.2, 0.3, 0.3, 0.4, 0.3]),
    };
    expect(Math.abs(averagePrecision(input) - 11 / 12)).toBeLessThan(1e-15);
  });
});
