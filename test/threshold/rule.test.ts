import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { chooseThreshold, parseThresholdRule } from '../../src/threshold/rule.js';

// scores .9 .8 .7 .6 .5 .4 .3 .2 with classes p p n p n n p n (4 positives, 4 negatives).
// Operating points by hand (threshold: TP, FP): .9: 1,0  .8: 2,0  .7: 2,1  .6: 3,1  .5: 3,2
// .4: 3,3  .3: 4,3  .2: 4,4.
const score = Float64Array.from([0.9, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2]);
const outcome = Uint8Array.from([1, 1, 0, 1, 0, 0, 1, 0]);
const pick = (rule: string): number => chooseThreshold(score, outcome, parseThresholdRule(rule)).threshold;

describe('threshold rules (hand-computed on eight rows)', () => {
  it('max-f1: F1 = 2TP / (2TP + FP + FN) is highest at .6 (6/8 = .75)', () => expect(pick('max-f1')).toBe(0.6));
  it('youden: TPR - FPR = .5 at .8 and .6; the tie goes to the higher threshold (Youden 1950)', () => expect(pick('youden')).toBe(0.8));
  it('precision>=P: the lowest threshold that keeps the precision', () => {
    expect(pick('precision>=0.75')).toBe(0.6);
    expect(pick('precision>=1')).toBe(0.8);
  });
  it('recall>=R: the highest threshold that reaches the recall', () => {
    expect(pick('recall>=0.75')).toBe(0.6);
    expect(pick('recall>=1')).toBe(0.3);
  });
  it('cost: the lowest a * FP + b * FN', () => {
    // FP=1, FN=5: costs 15 10 11 6 7 8 3 4 -> .3; FP=5, FN=1: 3 2 7 6 ... -> .8
    expect(pick('cost:FP=1,FN=5')).toBe(0.3);
    expect(pick('cost:FP=5,FN=1')).toBe(0.8);
  });
  it('says when a precision rule cannot be met and returns the most precise threshold', () => {
    const c = chooseThreshold(Float64Array.from([0.9, 0.8, 0.1]), Uint8Array.from([0, 1, 0]), parseThresholdRule('precision>=1'));
    expect(c).toEqual({ threshold: 0.8, met: false });
  });
  it('refuses a malformed rule with the option named', () => {
    for (const bad of ['max_f1', 'precision>=0', 'precision>=1.5', 'recall>=', 'cost:FP=-1,FN=2', 'cost:FP=0,FN=0']) {
      expect(() => parseThresholdRule(bad)).toThrow(UsageError);
      expect(() => parseThresholdRule(bad)).toThrow(/^--threshold /);
    }
  });
});
