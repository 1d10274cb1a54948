/**
 * Shared checks and generators for the plan tests. Synthetic inputs are seeded: fast-check
 * runs with a fixed seed so every run explores the same cases.
 */
import fc from 'fast-check';
import { expect } from 'vitest';
import { createRng } from '../../src/rng.js';
import type { BuiltPlan, Fold, PlanInput } from '../../src/plans/types.js';

export const FC = { seed: 0x5eed_f01d, numRuns: 60 } as const;

export function isAscending(a: Int32Array): boolean {
  for (let i = 1; i < a.length; i++) if (a[i] <= a[i - 1]) return false;
  return true;
}

/** Train and test ascending, within 0..n-1, disjoint, both non-empty. */
export function expectWellFormed(fold: Fold, n: number): void {
  expect(fold.train).toBeInstanceOf(Int32Array);
  expect(fold.test).toBeInstanceOf(Int32Array);
  expect(fold.train.length).toBeGreaterThan(0);
  expect(fold.test.length).toBeGreaterThan(0);
  expect(isAscending(fold.train)).toBe(true);
  expect(isAscending(fold.test)).toBe(true);
  for (const a of [fold.train, fold.test]) {
    expect(a[0]).toBeGreaterThanOrEqual(0);
    expect(a[a.length - 1]).toBeLessThan(n);
  }
  const inTrain = new Set(fold.train);
  expect(Array.from(fold.test).filter((i) => inTrain.has(i))).toEqual([]);
}

/** The test parts of each repeat cover every row exactly once. */
export function expectPartition(plan: BuiltPlan, n: number): void {
  expect(plan.folds.length).toBe(plan.repeats * plan.foldsPerRepeat);
  for (let r = 0; r < plan.repeats; r++) {
    const folds = plan.folds.filter((f) => f.repeat === r);
    expect(folds.map((f) => f.fold)).toEqual(Array.from({ length: plan.foldsPerRepeat }, (_, i) => i));
    const seen = new Int32Array(n);
    for (const f of folds) {
      for (const i of f.test) seen[i]++;
      // train is exactly the complement of test for k-fold and leave-one-out
      expect(f.train.length + f.test.length).toBe(n);
    }
    expect(Array.from(seen).every((c) => c === 1)).toBe(true);
  }
}

/** No group on both sides of any fold (nor between test/train and the holdout). */
export function expectGroupsApart(plan: BuiltPlan, groups: Int32Array): void {
  for (const f of plan.folds) {
    const trainGroups = new Set(Array.from(f.train, (i) => groups[i]));
    expect(Array.from(f.test).filter((i) => trainGroups.has(groups[i]))).toEqual([]);
    if (plan.holdout) {
      const held = new Set(Array.from(plan.holdout, (i) => groups[i]));
      expect([...f.train, ...f.test].filter((i) => held.has(groups[i]))).toEqual([]);
    }
  }
}

export function countBy(rows: Int32Array, codes: Int32Array): Map<number, number> {
  const m = new Map<number, number>();
  for (const i of rows) m.set(codes[i], (m.get(codes[i]) ?? 0) + 1);
  return m;
}

export function foldsKey(plan: BuiltPlan): string {
  return JSON.stringify(plan.folds.map((f) => [f.repeat, f.fold, Array.from(f.test), Array.from(f.train)]));
}

/** A random class mix: n rows, codes 0..classes-1 with skewed frequencies, seeded. */
export const arbStrata = (minN: number, maxN: number) =>
  fc
    .record({
      n: fc.integer({ min: minN, max: maxN }),
      classes: fc.integer({ min: 1, max: 5 }),
      skew: fc.double({ min: 0, max: 3, noNaN: true }),
      seed: fc.integer({ min: 0, max: 2 ** 31 - 1 }),
    })
    .map(({ n, classes, skew, seed }) => {
      const rng = createRng(seed ^ 0x9e3779b9);
      const strata = new Int32Array(n);
      for (let i = 0; i < n; i++) strata[i] = Math.min(classes - 1, Math.floor(classes * rng.next() ** (1 + skew)));
      return { n, strata, seed };
    });

/** Random groups: n rows in g groups of uneven sizes (every group non-empty), seeded. */
export const arbGroups = (minN: number, maxN: number) =>
  fc
    .record({
      n: fc.integer({ min: minN, max: maxN }),
      share: fc.double({ min: 0.05, max: 0.7, noNaN: true }),
      classes: fc.integer({ min: 1, max: 4 }),
      pure: fc.boolean(),
      seed: fc.integer({ min: 0, max: 2 ** 31 - 1 }),
    })
    .map(({ n, share, classes, pure, seed }) => {
      const rng = createRng(seed ^ 0x85ebca6b);
      const g = Math.max(2, Math.round(n * share));
      const groups = new Int32Array(n);
      for (let i = 0; i < n; i++) groups[i] = i < g ? i : rng.int(g);
      // sparse, unordered group codes, as a loader might give
      for (let i = 0; i < n; i++) groups[i] = groups[i] * 7 + 3;
      const groupClass = Array.from({ length: g }, () => rng.int(classes));
      const strata = Int32Array.from(groups, (c) => (pure ? groupClass[(c - 3) / 7] : rng.int(classes)));
      return { n, g, groups, strata, seed };
    });

export function input(n: number, seed: number, extra: Partial<Omit<PlanInput, 'n' | 'rng'>> = {}): PlanInput {
  return { n, rng: createRng(seed), ...extra };
}
