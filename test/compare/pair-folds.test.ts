/**
 * pairFolds and foldScore (src/compare/pair-folds.ts) on hand-built learners: folds pair by
 * (repeat, fold), null scores are skipped and counted, one-sided folds counted as unmatched, the
 * first size mismatch reported, and the Nadeau-Bengio sizes are the mean rows of A's paired folds
 * (written out below as plain arithmetic).
 */
import { describe, expect, it } from 'vitest';
import { foldScore, pairFolds } from '../../src/compare/pair-folds.js';
import type { FoldScores } from '../../src/model/report.js';
import { fold, learner } from './report-samples.js';

describe('foldScore', () => {
  it('is the finite score of the metric, else null (absent, null, not a number, not finite, inherited)', () => {
    expect(foldScore(fold(0, { accuracy: 0.75 }), 'accuracy')).toBe(0.75);
    expect(foldScore(fold(0, { accuracy: 0 }), 'accuracy')).toBe(0);
    expect(foldScore(fold(0, { accuracy: 0.75 }), 'kappa')).toBeNull();
    expect(foldScore(fold(0, { accuracy: null }), 'accuracy')).toBeNull();
    expect(foldScore(fold(0, { accuracy: '0.75' as unknown as number }), 'accuracy')).toBeNull();
    expect(foldScore(fold(0, { accuracy: Infinity }), 'accuracy')).toBeNull();
    expect(foldScore(fold(0, { accuracy: NaN }), 'accuracy')).toBeNull();
    const inherited: FoldScores = { ...fold(0, {}), scores: Object.create({ accuracy: 0.5 }) as Record<string, number> };
    expect(foldScore(inherited, 'accuracy')).toBeNull();
  });
});

describe('pairFolds', () => {
  it('pairs by (repeat, fold) in A\'s order, whatever B\'s order, and averages A\'s paired sizes', () => {
    const a = learner('a', [
      fold(0, { accuracy: 0.8 }, { trainRows: 90, testRows: 10 }),
      fold(1, { accuracy: 0.7 }, { trainRows: 91, testRows: 9 }),
      fold(0, { accuracy: 0.6 }, { repeat: 1, trainRows: 92, testRows: 8 }),
    ]);
    const b = learner('b', [
      fold(0, { accuracy: 0.5 }, { repeat: 1, trainRows: 92, testRows: 8 }),
      fold(1, { accuracy: 0.4 }, { trainRows: 91, testRows: 9 }),
      fold(0, { accuracy: 0.3 }, { trainRows: 90, testRows: 10 }),
    ]);
    const p = pairFolds(a, b, 'accuracy');
    expect(p.a).toEqual([0.8, 0.7, 0.6]);
    expect(p.b).toEqual([0.3, 0.4, 0.5]);
    expect(p.keys).toEqual([
      { repeat: 0, fold: 0 },
      { repeat: 0, fold: 1 },
      { repeat: 1, fold: 0 },
    ]);
    expect(p.skipped).toBe(0);
    expect(p.unmatched).toBe(0);
    expect(p.sizeMismatch).toBeUndefined();
    expect('sizeMismatch' in p).toBe(false);
    expect(p.correction).toEqual({ testRows: (10 + 9 + 8) / 3, trainRows: (90 + 91 + 92) / 3 });
  });

  it('does not confuse repeat 1 fold 11 with repeat 11 fold 1 (the key keeps both numbers apart)', () => {
    const a = learner('a', [fold(11, { accuracy: 0.8 }, { repeat: 1 }), fold(1, { accuracy: 0.7 }, { repeat: 2 })]);
    const b = learner('b', [fold(1, { accuracy: 0.1 }, { repeat: 11 }), fold(1, { accuracy: 0.2 }, { repeat: 2 })]);
    const p = pairFolds(a, b, 'accuracy');
    expect(p.a).toEqual([0.7]);
    expect(p.b).toEqual([0.2]);
    expect(p.unmatched).toBe(2);
  });

  it('skips and counts pairs with a null score on either side; their sizes do not enter the correction', () => {
    const a = learner('a', [
      fold(0, { accuracy: null }, { trainRows: 50, testRows: 50 }),
      fold(1, { accuracy: 0.7 }, { trainRows: 80, testRows: 20 }),
      fold(2, { accuracy: 0.6 }, { trainRows: 60, testRows: 40 }),
      fold(3, { accuracy: 0.9 }, { trainRows: 70, testRows: 30 }),
    ]);
    const b = learner('b', [
      fold(0, { accuracy: 0.5 }, { trainRows: 50, testRows: 50 }),
      fold(1, { accuracy: 0.4 }, { trainRows: 80, testRows: 20 }),
      fold(2, { accuracy: null }, { trainRows: 60, testRows: 40 }),
      fold(3, { accuracy: 0.3 }, { trainRows: 70, testRows: 30 }),
    ]);
    const p = pairFolds(a, b, 'accuracy');
    expect(p.a).toEqual([0.7, 0.9]);
    expect(p.b).toEqual([0.4, 0.3]);
    expect(p.keys).toEqual([
      { repeat: 0, fold: 1 },
      { repeat: 0, fold: 3 },
    ]);
    expect(p.skipped).toBe(2);
    expect(p.unmatched).toBe(0);
    expect(p.correction).toEqual({ testRows: (20 + 30) / 2, trainRows: (80 + 70) / 2 });
  });

  it('counts folds on one side only, on both sides', () => {
    const a = learner('a', [fold(0, { accuracy: 0.8 }), fold(1, { accuracy: 0.7 }), fold(2, { accuracy: 0.7 })]);
    const b = learner('b', [fold(1, { accuracy: 0.6 }), fold(3, { accuracy: 0.5 }), fold(4, { accuracy: 0.5 }), fold(5, { accuracy: 0.5 })]);
    const p = pairFolds(a, b, 'accuracy');
    expect(p.a).toEqual([0.7]);
    // A has folds 0 and 2 alone, B has 3, 4 and 5 alone
    expect(p.unmatched).toBe(2 + 3);
    expect(pairFolds(b, a, 'accuracy').unmatched).toBe(5);
  });

  it('reports the first pair whose training or test sizes differ, with both sizes as train/test', () => {
    const a = learner('a', [
      fold(0, { accuracy: 0.8 }, { trainRows: 80, testRows: 20 }),
      fold(1, { accuracy: 0.7 }, { trainRows: 80, testRows: 20 }),
      fold(2, { accuracy: 0.7 }, { trainRows: 80, testRows: 20 }),
    ]);
    const b = learner('b', [
      fold(0, { accuracy: 0.6 }, { trainRows: 80, testRows: 20 }),
      fold(1, { accuracy: 0.6 }, { trainRows: 80, testRows: 21 }),
      fold(2, { accuracy: 0.6 }, { trainRows: 79, testRows: 20 }),
    ]);
    const p = pairFolds(a, b, 'accuracy');
    expect(p.sizeMismatch).toEqual({ key: { repeat: 0, fold: 1 }, a: '80/20', b: '80/21' });
    // still paired: the caller decides what a mismatch means; the sizes are A's
    expect(p.a.length).toBe(3);
    expect(p.correction).toEqual({ testRows: 20, trainRows: 80 });
    const trainOnly = pairFolds(a, learner('b', [fold(0, { accuracy: 0.6 }, { trainRows: 81, testRows: 20 })]), 'accuracy');
    expect(trainOnly.sizeMismatch).toEqual({ key: { repeat: 0, fold: 0 }, a: '80/20', b: '81/20' });
    // a mismatched pair with a null score is still reported
    const nullMismatch = pairFolds(a, learner('b', [fold(2, { accuracy: null }, { trainRows: 80, testRows: 19 })]), 'accuracy');
    expect(nullMismatch.sizeMismatch).toEqual({ key: { repeat: 0, fold: 2 }, a: '80/20', b: '80/19' });
    expect(nullMismatch.skipped).toBe(1);
  });

  it('has no correction when nothing paired', () => {
    const a = learner('a', [fold(0, { accuracy: null })]);
    const b = learner('b', [fold(0, { accuracy: 0.5 })]);
    const p = pairFolds(a, b, 'accuracy');
    expect(p.a).toEqual([]);
    expect(p.keys).toEqual([]);
    expect(p.skipped).toBe(1);
    expect(p.correction).toBeNull();
    expect(pairFolds(a, learner('b', [fold(1, { accuracy: 0.5 })]), 'accuracy').correction).toBeNull();
  });
});
