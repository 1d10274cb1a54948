/**
 * Leave-one-out plans. Reference: the definition (Hastie, Tibshirani & Friedman, The Elements
 * of Statistical Learning, 2nd ed., section 7.10.1, K = N): n folds, each testing one row;
 * with groups, one fold per group (leave one group out).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { buildPlan } from '../../src/plans/index.js';
import { arbGroups, expectGroupsApart, expectPartition, expectWellFormed, FC, foldsKey, input } from './helpers.js';

describe('loo', () => {
  it('makes n folds of one test row each, in row order, without randomness', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 60 }), fc.nat(), (n, seed) => {
        const plan = buildPlan({ kind: 'loo' }, input(n, seed));
        expect(plan.repeats).toBe(1);
        expect(plan.foldsPerRepeat).toBe(n);
        plan.folds.forEach((f, i) => {
          expectWellFormed(f, n);
          expect(f.repeat).toBe(0);
          expect(Array.from(f.test)).toEqual([i]);
        });
        expectPartition(plan, n);
        expect(foldsKey(plan)).toBe(foldsKey(buildPlan({ kind: 'loo' }, input(n, seed + 1))));
      }),
      FC,
    );
  });

  it('leaves one group out when groups are given', () => {
    fc.assert(
      fc.property(arbGroups(2, 80), ({ n, g, groups, seed }) => {
        const plan = buildPlan({ kind: 'loo' }, input(n, seed, { groups }));
        expect(plan.foldsPerRepeat).toBe(g);
        for (const f of plan.folds) {
          expectWellFormed(f, n);
          expect(new Set(Array.from(f.test, (i) => groups[i])).size).toBe(1);
        }
        expectPartition(plan, n);
        expectGroupsApart(plan, groups);
        // folds in ascending group code order
        const firstCodes = plan.folds.map((f) => groups[f.test[0]]);
        expect(firstCodes).toEqual([...firstCodes].sort((a, b) => a - b));
      }),
      FC,
    );
  });

  it('needs two rows or two groups', () => {
    expect(() => buildPlan({ kind: 'loo' }, input(1, 1))).toThrow(InputError);
    expect(() => buildPlan({ kind: 'loo' }, input(1, 1))).toThrow('--plan loo needs at least 2 rows; the data has 1 usable row');
    expect(() => buildPlan({ kind: 'loo' }, input(4, 1, { groups: new Int32Array(4) }))).toThrow(
      '--plan loo needs at least 2 groups; the data has 1 group',
    );
  });
});
