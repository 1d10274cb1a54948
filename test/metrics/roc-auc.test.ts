import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/rng.js';
import { rocAuc } from '../../src/metrics/roc-auc.js';
import { binaryScores } from './helpers.js';

describe('roc-auc, two classes', () => {
  it('Fawcett (2006) Fig. 3: 20 instances, AUC 0.68', () => {
    // Fawcett, "An introduction to ROC analysis", Pattern Recognition Letters 27:861-874,
    // Fig. 3: instance classes (p/n) and scores. Recalled from memory and matched against a
    // public transcription of "Fawcett Figure 3 data" in a research repository's ROC tests.
    // Hand count: sum over positives of negatives scored lower = 10+10+9+9+9+7+6+5+2+1 = 68,
    // over 10 x 10 pairs, so AUC = 0.68.
    const classes = 'ppnpppnnpnpnpnnnpnpn';
    const scores = [
      0.9, 0.8, 0.7, 0.6, 0.55, 0.54, 0.53, 0.52, 0.51, 0.505, 0.4, 0.39, 0.38, 0.37, 0.36, 0.35, 0.34, 0.33,
      0.3, 0.1,
    ];
    expect(classes.length).toBe(20);
    expect(scores.length).toBe(20);
    const labels = [...classes].map((c) => (c === 'p' ? 1 : 0));
    expect(Math.abs(rocAuc(binaryScores(labels, scores)) - 0.68)).toBeLessThan(1e-12);
  });

  it('Hanley & McNeil (1982) Table I: five-point ratings with ties, AUC 0.893', () => {
    // Hanley & McNeil, Radiology 143:29-36, Table I: ratings 1 (definitely normal) .. 5
    // (definitely abnormal) of CT images; 58 truly normal, 51 truly abnormal. Counts recalled
    // from memory and matched against two public transcriptions in other projects' tests.
    // Published area 0.893. Ratings r are given as scores (r - 1) / 4, a monotone map that
    // leaves the area unchanged; most rows are tied, and ties count one half.
    const normal = [33, 6, 6, 11, 2];
    const abnormal = [3, 2, 2, 11, 33];
    const labels: number[] = [];
    const scores: number[] = [];
    for (let r = 0; r < 5; r++) {
      for (let i = 0; i < normal[r]; i++) (labels.push(0), scores.push(r / 4));
      for (let i = 0; i < abnormal[r]; i++) (labels.push(1), scores.push(r / 4));
    }
    expect(labels.length).toBe(109);
    const auc = rocAuc(binaryScores(labels, scores));
    expect(Math.abs(auc - 0.893)).toBeLessThan(5e-4);
    // exact value by hand: (abnormal, normal) pairs with the abnormal rated higher = 2487,
    // tied pairs = 3*33 + 2*6 + 2*6 + 11*11 + 33*2 = 310; (2487 + 310 / 2) / (58 * 51)
    // = 2642 / 2958 = 0.893171
    expect(Math.abs(auc - 2642 / 2958)).toBeLessThan(1e-12);
  });

  it('matches the pairwise definition on seeded data with many ties (property check)', () => {
    const rng = createRng(20240611);
    for (let trial = 0; trial < 20; trial++) {
      const n = 5 + rng.int(60);
      const labels: number[] = [];
      const scores: number[] = [];
      for (let i = 0; i < n; i++) {
        labels.push(rng.next() < 0.4 ? 1 : 0);
        scores.push(rng.int(6) / 5); // coarse scores: many ties
      }
      let pos = 0;
      let neg = 0;
      let wins = 0;
      for (let i = 0; i < n; i++) {
        if (labels[i] === 1) pos++;
        else neg++;
        for (let j = 0; j < n; j++) {
          if (labels[i] !== 1 || labels[j] !== 0) continue;
          wins += scores[i] > scores[j] ? 1 : scores[i] === scores[j] ? 0.5 : 0;
        }
      }
      const got = rocAuc(binaryScores(labels, scores));
      if (pos === 0 || neg === 0) expect(got).toBeNaN();
      else expect(Math.abs(got - wins / (pos * neg))).toBeLessThan(1e-12);
    }
  });

  it('is NaN when only one class occurs in actual (documented)', () => {
    expect(rocAuc(binaryScores([1, 1, 1], [0.2, 0.5, 0.9]))).toBeNaN();
  });
});

describe('roc-auc, more classes: macro one-vs-rest', () => {
  it('averages the one-vs-rest areas of the classes with positives and negatives (by hand)', () => {
    // 4 classes, class 3 never occurs in actual (no positives), so it is left out.
    // rows: actual, probs (p0, p1, p2, p3)
    //  0: .6 .2 .1 .1
    //  0: .3 .4 .2 .1
    //  1: .2 .5 .2 .1
    //  1: .5 .3 .1 .1
    //  2: .1 .2 .6 .1
    //  2: .3 .3 .3 .1
    // class 0, scores: positives {.6, .3}, negatives {.2, .5, .1, .3}
    //   .6 beats all 4 -> 4; .3 beats .2, .1, ties .3 -> 2.5; AUC_0 = 6.5 / 8 = 0.8125
    // class 1, positives {.5, .3}, negatives {.2, .4, .2, .3}
    //   .5 beats 4 -> 4; .3 beats .2, .2, ties .3 -> 2.5; AUC_1 = 6.5 / 8 = 0.8125
    // class 2, positives {.6, .3}, negatives {.1, .2, .2, .1}
    //   both beat all 4 -> 8; AUC_2 = 1
    // macro = (0.8125 + 0.8125 + 1) / 3 = 0.875
    const probs = Float64Array.from([
      0.6, 0.2, 0.1, 0.1, 0.3, 0.4, 0.2, 0.1, 0.2, 0.5, 0.2, 0.1, 0.5, 0.3, 0.1, 0.1, 0.1, 0.2, 0.6, 0.1, 0.3,
      0.3, 0.3, 0.1,
    ]);
    const actual = Int32Array.from([0, 0, 1, 1, 2, 2]);
    const predicted = Int32Array.from([0, 1, 1, 0, 2, 0]);
    expect(Math.abs(rocAuc({ actual, predicted, classes: 4, probs }) - 0.875)).toBeLessThan(1e-12);
  });
});

describe('roc-auc, two classes: the score is column 1 only', () => {
  it('reads class 1 probabilities even when a row does not sum to 1 (by hand, AUC 3/4)', () => {
    // column 1: negatives .1, .4; positives .35, .8. Pairs: .35 > .1 (win), .35 < .4 (loss),
    // .8 beats both: 3 wins of 4 = 0.75. Column 0 is .9 in every row (rows used as given, not
    // renormalised); averaging a class-0 area from it (all tied, 0.5) would give 0.625.
    const input = {
      actual: Int32Array.from([0, 0, 1, 1]),
      predicted: Int32Array.from([0, 1, 0, 1]),
      classes: 2,
      probs: Float64Array.from([0.9, 0.1, 0.9, 0.4, 0.9, 0.35, 0.9, 0.8]),
    };
    expect(rocAuc(input)).toBe(0.75);
  });
});
