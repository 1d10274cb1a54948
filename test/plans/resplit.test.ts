/**
 * Random-split plans (resplit:N@F). Reference: the validation-set approach repeated over
 * random splits (Hastie, Tibshirani & Friedman, The Elements of Statistical Learning, 2nd ed.,
 * section 7.10). Asserted: test size round(F n) without strata (halves up, as Math.round);
 * with strata each class's test count within one row of F n_c (floor or ceil) and the total
 * within half a row of F n; with groups whole groups only, total within half the largest
 * group of F n.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { buildPlan } from '../../src/plans/index.js';
import { arbGroups, arbStrata, countBy, expectGroupsApart, expectWellFormed, FC, foldsKey, input } from './helpers.js';

const resplit = (splits: number, testFraction: number) => ({ kind: 'resplit' as const, splits, testFraction });
const arbF = fc.double({ min: 0.05, max: 0.95, noNaN: true });

describe('resplit', () => {
  it('makes N splits of round(F n) test rows, numbered as folds of repeat 0', () => {
    fc.assert(
      fc.property(fc.integer({ min: 20, max: 150 }), fc.integer({ min: 1, max: 6 }), arbF, fc.nat(), (n, splits, f, seed) => {
        const plan = buildPlan(resplit(splits, f), input(n, seed));
        expect(plan.repeats).toBe(1);
        expect(plan.foldsPerRepeat).toBe(splits);
        expect(plan.folds.map((x) => [x.repeat, x.fold])).toEqual(Array.from({ length: splits }, (_, s) => [0, s]));
        for (const fold of plan.folds) {
          expectWellFormed(fold, n);
          expect(fold.train.length + fold.test.length).toBe(n);
          expect(fold.test.length).toBe(Math.round(f * n));
        }
      }),
      FC,
    );
  });

  it('stratified: every class within one row of F n_c, total within half a row of F n', () => {
    fc.assert(
      fc.property(arbStrata(10, 150), fc.integer({ min: 1, max: 4 }), arbF, ({ n, strata, seed }, splits, f) => {
        let plan;
        try {
          plan = buildPlan(resplit(splits, f), input(n, seed, { strata }));
        } catch (e) {
          // only when F n rounds to no rows on one side
          expect(e).toBeInstanceOf(InputError);
          expect(Math.round(f * n) === 0 || Math.round(f * n) === n).toBe(true);
          return;
        }
        const totals = countBy(Int32Array.from(strata, (_, i) => i), strata);
        expect(plan.folds.length).toBe(splits);
        for (const fold of plan.folds) {
          expectWellFormed(fold, n);
          const m = countBy(fold.test, strata);
          for (const [c, nc] of totals) expect(Math.abs((m.get(c) ?? 0) - f * nc)).toBeLessThan(1);
          expect(Math.abs(fold.test.length - f * n)).toBeLessThanOrEqual(0.5 + 1e-9);
        }
      }),
      FC,
    );
  });

  it('with groups draws whole groups, test rows within half the largest group of F n', () => {
    fc.assert(
      fc.property(arbGroups(6, 150), arbF, ({ n, groups, seed }, f) => {
        const plan = buildPlan(resplit(3, f), input(n, seed, { groups }));
        expectGroupsApart(plan, groups);
        const sizes = countBy(Int32Array.from(groups, (_, i) => i), groups);
        const largest = Math.max(...sizes.values());
        for (const fold of plan.folds) {
          expectWellFormed(fold, n);
          expect(fold.train.length + fold.test.length).toBe(n);
          // exceptions are the forced group on each side: then one side is a single group
          const testGroups = new Set(Array.from(fold.test, (i) => groups[i])).size;
          const trainGroups = new Set(Array.from(fold.train, (i) => groups[i])).size;
          if (testGroups > 1 && trainGroups > 1) expect(Math.abs(fold.test.length - f * n)).toBeLessThanOrEqual(largest / 2);
        }
      }),
      FC,
    );
  });

  it('same seed gives identical splits, different seeds different splits (n >= 20)', () => {
    fc.assert(
      fc.property(arbStrata(20, 100), fc.integer({ min: 3, max: 5 }), fc.double({ min: 0.2, max: 0.8, noNaN: true }), ({ n, strata, seed }, splits, f) => {
        const a = buildPlan(resplit(splits, f), input(n, seed, { strata }));
        expect(foldsKey(a)).toBe(foldsKey(buildPlan(resplit(splits, f), input(n, seed, { strata }))));
        expect(foldsKey(a)).not.toBe(foldsKey(buildPlan(resplit(splits, f), input(n, seed + 1, { strata }))));
        // splits differ from each other
        expect(new Set(a.folds.map((x) => Array.from(x.test).join())).size).toBeGreaterThan(1);
      }),
      FC,
    );
  });

  it('fails when a side would be empty, or with one group', () => {
    expect(() => buildPlan(resplit(5, 0.01), input(20, 1))).toThrow(
      '--plan resplit:5@0.01 puts no rows in the test set of 20 usable rows; raise or lower F, or use more rows',
    );
    expect(() => buildPlan(resplit(5, 0.99), input(20, 1))).toThrow(
      '--plan resplit:5@0.99 puts no rows in the training set of 20 usable rows; raise or lower F, or use more rows',
    );
    expect(() => buildPlan(resplit(5, 0.2), input(20, 1, { groups: new Int32Array(20) }))).toThrow(
      '--plan resplit:5@0.2 needs at least 2 groups; the data has 1 group',
    );
  });
});
