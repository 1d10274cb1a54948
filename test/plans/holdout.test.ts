/**
 * Holdout plans (holdout:A/B/C). Reference: the three-way training / validation / test split
 * (Hastie, Tibshirani & Friedman, The Elements of Statistical Learning, 2nd ed., section 7.2).
 * Asserted: the three parts partition the rows; per class (or overall, without strata) each
 * part within one row of its share; with groups, whole groups only.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { buildPlan } from '../../src/plans/index.js';
import { arbGroups, arbStrata, countBy, expectGroupsApart, expectWellFormed, FC, foldsKey, input } from './helpers.js';

const holdout = (train: number, validation: number, held: number) => ({ kind: 'holdout' as const, train, validation, holdout: held });
const arbShares = fc
  .record({ a: fc.double({ min: 0.1, max: 1, noNaN: true }), b: fc.double({ min: 0.1, max: 1, noNaN: true }), c: fc.double({ min: 0, max: 1, noNaN: true }) })
  .map(({ a, b, c }) => {
    const s = a + b + c;
    return [a / s, b / s, c / s] as const;
  });

describe('holdout', () => {
  it('splits each class into parts within one row of their shares', () => {
    fc.assert(
      fc.property(arbStrata(10, 150), arbShares, fc.boolean(), ({ n, strata, seed }, shares, strat) => {
        let plan;
        try {
          plan = buildPlan(holdout(...shares), input(n, seed, strat ? { strata } : {}));
        } catch (e) {
          expect(e).toBeInstanceOf(InputError);
          expect((e as Error).message).toMatch(/puts no rows in the (training|validation) set/);
          return;
        }
        expect(plan.folds.length).toBe(1);
        expect(plan.repeats).toBe(1);
        expect(plan.foldsPerRepeat).toBe(1);
        const [fold] = plan.folds;
        expectWellFormed(fold, n);
        const held = plan.holdout ?? new Int32Array(0);
        expect(plan.holdout === undefined).toBe(shares[2] === 0);
        expect(fold.train.length + fold.test.length + held.length).toBe(n);
        expect(new Set([...fold.train, ...fold.test, ...held]).size).toBe(n);
        const codes = strat ? strata : new Int32Array(n);
        const totals = countBy(Int32Array.from(codes, (_, i) => i), codes);
        [fold.train, fold.test, held].forEach((rows, p) => {
          const m = countBy(rows, codes);
          for (const [c, nc] of totals) expect(Math.abs((m.get(c) ?? 0) - shares[p] * nc)).toBeLessThan(1);
        });
      }),
      FC,
    );
  });

  it('with groups keeps groups whole across all three parts', () => {
    fc.assert(
      fc.property(arbGroups(6, 150), arbShares, ({ n, g, groups, seed }, shares) => {
        if (shares[2] > 0 && g < 3) {
          expect(() => buildPlan(holdout(...shares), input(n, seed, { groups }))).toThrow(`needs at least 3 groups; the data has ${g} groups`);
          return;
        }
        const plan = buildPlan(holdout(...shares), input(n, seed, { groups }));
        const [fold] = plan.folds;
        expectWellFormed(fold, n);
        expectGroupsApart(plan, groups);
        if (shares[2] > 0) expect(plan.holdout!.length).toBeGreaterThan(0);
        expect(fold.train.length + fold.test.length + (plan.holdout?.length ?? 0)).toBe(n);
      }),
      FC,
    );
  });

  it('same seed gives the same split, a different seed another (n >= 20)', () => {
    fc.assert(
      fc.property(arbStrata(20, 100), ({ n, strata, seed }) => {
        const spec = holdout(0.6, 0.2, 0.2);
        const a = buildPlan(spec, input(n, seed, { strata }));
        const key = (p: typeof a) => foldsKey(p) + JSON.stringify(Array.from(p.holdout!));
        expect(key(a)).toBe(key(buildPlan(spec, input(n, seed, { strata }))));
        expect(key(a)).not.toBe(key(buildPlan(spec, input(n, seed + 1, { strata }))));
      }),
      FC,
    );
  });

  it('splits 10 rows 6/2/2 exactly and 11 rows 7/2/2', () => {
    for (const [n, sizes] of [[10, [6, 2, 2]], [11, [7, 2, 2]]] as const) {
      const plan = buildPlan(holdout(0.6, 0.2, 0.2), input(n, 5));
      expect([plan.folds[0].train.length, plan.folds[0].test.length, plan.holdout!.length]).toEqual(sizes);
    }
  });

  it('fails on empty training or validation parts, warns on an empty holdout', () => {
    expect(() => buildPlan(holdout(0.9, 0.05, 0.05), input(5, 1))).toThrow(
      '--plan holdout:0.9/0.05/0.05 puts no rows in the validation set of 5 usable rows; change the shares or use more rows',
    );
    const plan = buildPlan(holdout(0.6, 0.39, 0.01), input(10, 1));
    expect(plan.warnings).toEqual([
      '--plan holdout:0.6/0.39/0.01 sets no rows aside for the holdout of 10 usable rows; change the shares or use more rows',
    ]);
    expect(plan.holdout!.length).toBe(0);
    expect(() => buildPlan(holdout(0.6, 0.2, 0.2), input(4, 1, { groups: Int32Array.of(0, 0, 1, 1) }))).toThrow(
      '--plan holdout:0.6/0.2/0.2 needs at least 3 groups; the data has 2 groups',
    );
  });
});
