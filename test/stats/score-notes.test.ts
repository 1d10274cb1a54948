import { describe, expect, it } from 'vitest';
import { pooledRefused, scoreNote } from '../../src/stats/score-notes.js';

/**
 * The rule under test comes from Airola, Pahikkala, Waegeman, De Baets & Salakoski 2011
 * ("An experimental comparison of cross-validation techniques for estimating the area under the
 * ROC curve", CSDA 55:1828-1844; cited from memory): AUC pooled over leave-one-out folds is
 * biased, because each row is scored by a different model. The check below reproduces the
 * worked case from the source comment by hand: under leave-one-out, a constant learner that
 * predicts its training share of the positive class gives each positive row the share
 * (P - 1) / (n - 1) and each negative row P / (n - 1), so every positive ranks below every
 * negative and the pooled AUC is 0 (Mann-Whitney count of pairs, Hanley & McNeil 1982).
 */
const rank = { name: 'roc-auc', range: [0, 1] as const, proportion: false, rank: true };
const notRank = { name: 'accuracy', range: [0, 1] as const, proportion: true, rank: false };
const folds = (sizes: number[]) => sizes.map((testRows) => ({ testRows }));

describe('pooled rank score under one-row test folds', () => {
  it('the bias it guards against: pooled leave-one-out AUC of a constant learner is 0', () => {
    const y = [1, 1, 1, 0, 0, 0, 0, 0];
    const n = y.length;
    const P = y.reduce((a, b) => a + b, 0);
    const score = y.map((yi) => (P - yi) / (n - 1)); // training share of positives without row i
    let pairs = 0;
    let wins = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++)
        if (y[i] === 1 && y[j] === 0) (pairs++, (wins += score[i] > score[j] ? 1 : score[i] === score[j] ? 0.5 : 0));
    expect(wins / pairs).toBe(0);
    expect(pooledRefused(rank, folds(new Array(n).fill(1)))).toBe(true);
  });

  it('refuses only a rank metric, only when every fold tests exactly one row, and never with no folds', () => {
    expect(pooledRefused(rank, folds([1, 1, 1]))).toBe(true);
    expect(pooledRefused(rank, folds([1]))).toBe(true);
    expect(pooledRefused(notRank, folds([1, 1, 1]))).toBe(false);
    expect(pooledRefused(rank, folds([1, 2, 1]))).toBe(false); // some, not every
    expect(pooledRefused(rank, folds([2, 2]))).toBe(false);
    expect(pooledRefused(rank, folds([0, 0]))).toBe(false); // one row, not at most one
    expect(pooledRefused(rank, [])).toBe(false); // every() of nothing is true: the length check matters
  });

  it('the warning names the metric and a plan that can score it, and is absent otherwise', () => {
    const note = scoreNote(rank, folds([1, 1, 1, 1]));
    expect(note).toBeDefined();
    expect(note).toMatch(/^roc-auc is not scored on the pooled predictions: every test fold holds one row/);
    expect(note).toContain('kfold:10x5');
    expect(scoreNote(rank, folds([5, 5]))).toBeUndefined();
    expect(scoreNote(notRank, folds([1, 1]))).toBeUndefined();
    expect(scoreNote(rank, [])).toBeUndefined();
  });
});
