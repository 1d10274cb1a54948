/**
 * K-fold plans. References: the definition of k-fold cross-validation (Hastie, Tibshirani &
 * Friedman, The Elements of Statistical Learning, 2nd ed., section 7.10.1: the rows are split
 * into K roughly equal parts, each part tested once), and of stratified k-fold (Kohavi 1995,
 * IJCAI, "A study of cross-validation and bootstrap...": folds keep about the class
 * proportions of the data). What is asserted for "stratified" (common practice, made exact
 * here): every fold's count of class c is floor(n_c / K) or ceil(n_c / K), i.e. strictly
 * within one of its proportional share n_c / K, and fold sizes are floor(n / K) or ceil(n / K).
 * Dataset check: the Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams &
 * Fraser 2014), whose species and island counts are read from the file itself.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { buildPlan } from '../../src/plans/index.js';
import type { BuiltPlan } from '../../src/plans/types.js';
import {
  arbGroups, arbStrata, countBy, expectGroupsApart, expectPartition, expectWellFormed, FC, foldsKey, input,
} from './helpers.js';

const kfold = (k: number, repeats = 1) => ({ kind: 'kfold' as const, k, repeats });

function expectStratified(plan: BuiltPlan, strata: Int32Array): void {
  const k = plan.foldsPerRepeat;
  const total = countBy(Int32Array.from(strata, (_, i) => i), strata);
  expect(total.size).toBeGreaterThan(0);
  for (const f of plan.folds) {
    const inFold = countBy(f.test, strata);
    for (const [c, nc] of total) {
      const got = inFold.get(c) ?? 0;
      expect(got).toBeGreaterThanOrEqual(Math.floor(nc / k));
      expect(got).toBeLessThanOrEqual(Math.ceil(nc / k));
    }
  }
}

function expectBalancedSizes(plan: BuiltPlan, n: number): void {
  const k = plan.foldsPerRepeat;
  for (const f of plan.folds) {
    expect(f.test.length).toBeGreaterThanOrEqual(Math.floor(n / k));
    expect(f.test.length).toBeLessThanOrEqual(Math.ceil(n / k));
  }
}

describe('kfold', () => {
  it('partitions the rows into K nearly equal folds per repeat (random sizes and seeds)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 120 }), fc.integer({ min: 2, max: 12 }), fc.integer({ min: 1, max: 3 }), fc.nat(), (n, k0, r, seed) => {
        const k = Math.min(k0, n);
        const plan = buildPlan(kfold(k, r), input(n, seed));
        expect(plan.repeats).toBe(r);
        expect(plan.foldsPerRepeat).toBe(k);
        expect(plan.warnings).toEqual([]);
        for (const f of plan.folds) expectWellFormed(f, n);
        expectPartition(plan, n);
        expectBalancedSizes(plan, n);
      }),
      FC,
    );
  });

  it('stratifies: every class within one of n_c / K in every fold, sizes within one of n / K', () => {
    fc.assert(
      fc.property(arbStrata(2, 150), fc.integer({ min: 2, max: 10 }), fc.integer({ min: 1, max: 3 }), ({ n, strata, seed }, k0, r) => {
        const k = Math.min(k0, n);
        const plan = buildPlan(kfold(k, r), input(n, seed, { strata }));
        for (const f of plan.folds) expectWellFormed(f, n);
        expectPartition(plan, n);
        expectStratified(plan, strata);
        expectBalancedSizes(plan, n);
      }),
      FC,
    );
  });

  it('keeps groups whole; fold sizes differ by at most the largest group (LPT bound, Graham 1969)', () => {
    fc.assert(
      fc.property(arbGroups(4, 150), fc.integer({ min: 2, max: 8 }), fc.boolean(), ({ n, g, groups, strata, seed }, k0, withStrata) => {
        const k = Math.min(k0, g);
        const plan = buildPlan(kfold(k, 2), input(n, seed, { groups, ...(withStrata ? { strata } : {}) }));
        for (const f of plan.folds) expectWellFormed(f, n);
        expectPartition(plan, n);
        expectGroupsApart(plan, groups);
        if (!withStrata) {
          const largest = Math.max(...countBy(Int32Array.from(groups, (_, i) => i), groups).values());
          for (let rep = 0; rep < 2; rep++) {
            const sizes = plan.folds.filter((f) => f.repeat === rep).map((f) => f.test.length);
            expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(largest);
          }
        }
      }),
      FC,
    );
  });

  it('same seed gives identical folds, different seeds different folds (n >= 10)', () => {
    fc.assert(
      fc.property(arbStrata(10, 80), fc.integer({ min: 2, max: 5 }), fc.boolean(), ({ n, strata, seed }, k, strat) => {
        const extra = strat ? { strata } : {};
        const a = buildPlan(kfold(k, 2), input(n, seed, extra));
        const b = buildPlan(kfold(k, 2), input(n, seed, extra));
        const c = buildPlan(kfold(k, 2), input(n, seed + 1, extra));
        expect(foldsKey(a)).toBe(foldsKey(b));
        expect(foldsKey(a)).not.toBe(foldsKey(c));
        // each repeat starts from a fresh shuffle
        const rep0 = JSON.stringify(a.folds.filter((f) => f.repeat === 0).map((f) => Array.from(f.test)));
        const rep1 = JSON.stringify(a.folds.filter((f) => f.repeat === 1).map((f) => Array.from(f.test)));
        expect(rep0).not.toBe(rep1);
      }),
      FC,
    );
  });

  it('group folds also vary with the seed when every group has a different size', () => {
    // 12 groups of sizes 1..12: a strict largest-first order would fix the folds
    const groups = Int32Array.from({ length: 78 }, (_, i) => Math.floor((Math.sqrt(8 * i + 1) - 1) / 2));
    const keys = new Set(Array.from({ length: 5 }, (_, s) => foldsKey(buildPlan(kfold(3), input(78, s, { groups })))));
    expect(keys.size).toBeGreaterThan(1);
  });

  it('balances classes across grouped folds better than ignoring them (class-pure groups)', () => {
    // synthetic: 60 groups of 1-6 rows, each group all one of 3 classes; sum over seeds of the
    // squared deviation of fold class counts from n_c / K, with and without strata
    let withStrata = 0;
    let without = 0;
    for (let seed = 0; seed < 20; seed++) {
      const gen = input(0, 1000 + seed).rng;
      const groups: number[] = [];
      const strata: number[] = [];
      for (let g = 0; g < 60; g++) {
        const size = 1 + gen.int(6);
        const cls = gen.int(3);
        for (let j = 0; j < size; j++) {
          groups.push(g);
          strata.push(cls);
        }
      }
      const n = groups.length;
      const s = Int32Array.from(strata);
      const totals = countBy(Int32Array.from(s, (_, i) => i), s);
      const deviation = (plan: BuiltPlan) =>
        plan.folds.reduce((acc, f) => {
          const m = countBy(f.test, s);
          let d = 0;
          for (const [c, nc] of totals) d += ((m.get(c) ?? 0) - nc / 5) ** 2;
          return acc + d;
        }, 0);
      withStrata += deviation(buildPlan(kfold(5), input(n, seed, { groups: Int32Array.from(groups), strata: s })));
      without += deviation(buildPlan(kfold(5), input(n, seed, { groups: Int32Array.from(groups) })));
    }
    expect(withStrata).toBeLessThan(without / 10); // measured: about 1/50
  });

  it('warns about classes smaller than K and keeps going', () => {
    const strata = Int32Array.from({ length: 40 }, (_, i) => (i < 3 ? 1 : 0));
    const plan = buildPlan(kfold(5), input(40, 7, { strata, strataNames: ['accept', 'reject'] }));
    expect(plan.warnings).toEqual(['class "reject" has 3 rows, fewer than the 5 folds: some folds have none of it']);
    expectStratified(plan, strata);
    const unnamed = buildPlan(kfold(5), input(40, 7, { strata }));
    expect(unnamed.warnings).toEqual(['class "1" has 3 rows, fewer than the 5 folds: some folds have none of it']);
  });

  it('joins the warnings of more than five small classes into one line that names five and counts the rest', () => {
    // 60 rows of class 0, then classes 1..7 with 1, 2, 1, 2, 1, 2, 1 rows: seven classes below 3 folds
    const small = [1, 2, 1, 2, 1, 2, 1];
    const codes: number[] = Array.from({ length: 60 }, () => 0);
    small.forEach((rows, k) => codes.push(...Array.from({ length: rows }, () => k + 1)));
    const strata = Int32Array.from(codes);
    const names = ['bulk', 'c1', 'c2', 'c3', 'c4', 'c5', 'c6', 'c7'];
    const plan = buildPlan(kfold(3), input(codes.length, 7, { strata, strataNames: names }));
    expect(plan.warnings).toEqual([
      '7 classes have fewer rows than the 3 folds, so some folds have none of them: "c1" (1 row), "c2" (2 rows), "c3" (1 row), "c4" (2 rows), "c5" (1 row) and 2 more',
    ]);
    // five small classes still get a line each
    const five = buildPlan(kfold(3), input(codes.length, 7, { strata: Int32Array.from(codes.map((c) => (c > 5 ? 0 : c))), strataNames: names }));
    expect(five.warnings).toHaveLength(5);
    expect(five.warnings[4]).toBe('class "c5" has 1 row, fewer than the 3 folds: some folds have none of it');
  });

  it('warns about classes found in fewer groups than K', () => {
    // class 1 is 10 rows in 2 groups
    const groups = Int32Array.from({ length: 50 }, (_, i) => Math.floor(i / 5));
    const strata = Int32Array.from({ length: 50 }, (_, i) => (i < 10 ? 1 : 0));
    const plan = buildPlan(kfold(4), input(50, 3, { groups, strata, strataNames: ['a', 'b'] }));
    expect(plan.warnings).toEqual(['class "b" occurs in 2 groups, fewer than the 4 folds: some folds have none of it']);
  });

  it('fails when K exceeds the rows or the groups', () => {
    expect(() => buildPlan(kfold(20), input(12, 1))).toThrow(InputError);
    expect(() => buildPlan(kfold(20), input(12, 1))).toThrow('--plan kfold:20 needs at least 20 rows; the data has 12 usable rows');
    expect(() => buildPlan(kfold(3, 2), input(1, 1))).toThrow('--plan kfold:3x2 needs at least 3 rows; the data has 1 usable row');
    const groups = Int32Array.from({ length: 12 }, (_, i) => i % 3);
    expect(() => buildPlan(kfold(5), input(12, 1, { groups }))).toThrow('--plan kfold:5 needs at least 5 groups; the data has 3 groups');
  });

  describe('on the Palmer penguins (vega-datasets, CC0)', () => {
    const rows = JSON.parse(readFileSync('node_modules/vega-datasets/data/penguins.json', 'utf8')) as Record<string, unknown>[];
    const codesOf = (key: string) => {
      const levels: string[] = [];
      const codes = Int32Array.from(rows, (r) => {
        const v = String(r[key]);
        if (!levels.includes(v)) levels.push(v);
        return levels.indexOf(v);
      });
      return { codes, levels };
    };
    const species = codesOf('Species');
    const island = codesOf('Island');

    it('stratified 10-fold keeps each species within one of its tenth', () => {
      expect(rows.length).toBe(344); // 344 rows in the file (Gorman et al. 2014 sample)
      const plan = buildPlan(kfold(10), input(rows.length, 2014, { strata: species.codes, strataNames: species.levels }));
      expectPartition(plan, rows.length);
      expectStratified(plan, species.codes);
      expect(plan.warnings).toEqual([]);
    });

    it('grouping by island gives one island per fold at K = 3, and K = 4 fails', () => {
      const plan = buildPlan(kfold(3), input(rows.length, 1, { groups: island.codes, strata: species.codes }));
      expectGroupsApart(plan, island.codes);
      for (const f of plan.folds) expect(new Set(Array.from(f.test, (i) => island.codes[i])).size).toBe(1);
      expect(() => buildPlan(kfold(4), input(rows.length, 1, { groups: island.codes }))).toThrow(
        '--plan kfold:4 needs at least 4 groups; the data has 3 groups',
      );
    });
  });
});
