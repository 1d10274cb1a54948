/**
 * Plans too large to hold are refused before any fold is built (src/plans/build.ts), so an
 * out-of-range count is exit 2 with a message instead of an out-of-memory crash. Limits:
 * MAX_FOLDS folds, and MAX_PLAN_ROWS row numbers in all folds together (folds times rows).
 */
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { buildPlan } from '../../src/plans/index.js';
import { MAX_FOLDS, MAX_PLAN_ROWS } from '../../src/plans/build.js';
import { createRng } from '../../src/rng.js';

const rng = () => createRng(1);

describe('plan size limits', () => {
  it('refuses more than MAX_FOLDS folds from repeats or splits, naming the plan', () => {
    expect(MAX_FOLDS).toBe(100_000);
    expect(() => buildPlan({ kind: 'resplit', splits: MAX_FOLDS + 1, testFraction: 0.5 }, { n: 10, rng: rng() })).toThrow(UsageError);
    expect(() => buildPlan({ kind: 'resplit', splits: 1e9, testFraction: 0.5 }, { n: 10, rng: rng() })).toThrow(
      '--plan resplit:1000000000@0.5 would make 1000000000 folds; at most 100000 are allowed; use fewer splits',
    );
    expect(() => buildPlan({ kind: 'kfold', k: 5, repeats: 20_001 }, { n: 10, rng: rng() })).toThrow(
      '--plan kfold:5x20001 would make 100005 folds; at most 100000 are allowed; use fewer folds or repeats',
    );
  });

  it('keeps the "needs at least K rows" message when K exceeds the rows', () => {
    expect(() => buildPlan({ kind: 'kfold', k: 1e12, repeats: 1 }, { n: 10, rng: rng() })).toThrow('needs at least 1000000000000 rows');
  });

  it('refuses leave-one-out when n^2 row numbers exceed MAX_PLAN_ROWS, and allows it below', () => {
    // 11586^2 = 134 235 396 > 2^27 = 134 217 728 > 11585^2 = 134 212 225
    expect(MAX_PLAN_ROWS).toBe(2 ** 27);
    expect(() => buildPlan({ kind: 'loo' }, { n: 11_586, rng: rng() })).toThrow(
      '--plan loo would make 11586 folds of 11586 rows each, more than 134217728 row numbers in all; use kfold:K instead',
    );
    // one group out with few groups is small whatever n is
    const n = 20_000;
    const groups = Int32Array.from({ length: n }, (_, i) => i % 4);
    const plan = buildPlan({ kind: 'loo' }, { n, groups, rng: rng() });
    expect(plan.folds.length).toBe(4);
  });

  it('builds large plans below the limits', () => {
    const plan = buildPlan({ kind: 'resplit', splits: 1000, testFraction: 0.5 }, { n: 4, rng: rng() });
    expect(plan.folds.length).toBe(1000);
  });
});
