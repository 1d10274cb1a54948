/**
 * Forward (time-ordered) plans. Reference: time series cross-validation with an expanding
 * window (Hyndman & Athanasopoulos, Forecasting: Principles and Practice, 3rd ed., section
 * 5.10): each fold trains on everything up to a point and tests on what follows. Asserted:
 * every test row's order value is greater than every training row's; equal order values are
 * never split across blocks; training sets grow; blocks are nearly equal when there are no
 * ties. Dataset check: flipper lengths of the Palmer penguins (vega-datasets, CC0), which
 * have missing values and many ties.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { buildPlan } from '../../src/plans/index.js';
import type { BuiltPlan } from '../../src/plans/types.js';
import { expectGroupsApart, expectWellFormed, FC, input } from './helpers.js';

const forward = (k: number) => ({ kind: 'forward' as const, k });

function expectForward(plan: BuiltPlan, order: Float64Array): void {
  const n = order.length;
  const k = plan.foldsPerRepeat;
  expect(plan.folds.length).toBe(k);
  plan.folds.forEach((f, i) => {
    expectWellFormed(f, n);
    expect([f.repeat, f.fold]).toEqual([0, i]);
    const latestTrain = Math.max(...Array.from(f.train, (r) => order[r]));
    const earliestTest = Math.min(...Array.from(f.test, (r) => order[r]));
    expect(earliestTest).toBeGreaterThan(latestTrain);
    if (i > 0) {
      // expanding window: this fold trains on the previous fold's training and test rows
      const prev = plan.folds[i - 1];
      expect(Array.from(f.train)).toEqual([...prev.train, ...prev.test].sort((a, b) => a - b));
    }
  });
  // blocks: the first fold's train and every fold's test cover all rows exactly once
  const blocks = [plan.folds[0].train, ...plan.folds.map((f) => f.test)];
  expect(blocks.reduce((a, b) => a + b.length, 0)).toBe(n);
  const blockOf = new Int32Array(n).fill(-1);
  blocks.forEach((rows, b) => rows.forEach((r) => (blockOf[r] = b)));
  expect(blockOf.every((b) => b >= 0)).toBe(true);
  // equal order values share a block
  const blockOfValue = new Map<number, number>();
  const split: number[] = [];
  for (let r = 0; r < n; r++) {
    const seen = blockOfValue.get(order[r]);
    if (seen !== undefined && seen !== blockOf[r]) split.push(order[r]);
    blockOfValue.set(order[r], blockOf[r]);
  }
  expect(split).toEqual([]);
}

describe('forward', () => {
  it('tests only on rows later than all training rows, never splitting ties (random orders)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 120 }),
        fc.integer({ min: 1, max: 8 }),
        fc.integer({ min: 1, max: 200 }),
        fc.nat(),
        (n, k0, levels, seed) => {
          const rng = input(0, seed).rng;
          const order = Float64Array.from({ length: n }, () => rng.int(levels) * 0.5 - 3);
          const distinct = new Set(order).size;
          const k = Math.min(k0, n - 1);
          if (distinct < k + 1) {
            expect(() => buildPlan(forward(k), input(n, seed, { order }))).toThrow(
              `--plan forward:${k} needs ${k + 1} blocks of rows; ties in the order column allow only ${distinct}`,
            );
            return;
          }
          expectForward(buildPlan(forward(k), input(n, seed, { order })), order);
        },
      ),
      FC,
    );
  });

  it('makes blocks of floor or ceil n / (K + 1) rows when all values differ', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 200 }), fc.integer({ min: 1, max: 10 }), fc.nat(), (n, k0, seed) => {
        const k = Math.min(k0, n - 1);
        const order = Float64Array.from({ length: n }, (_, i) => i);
        const plan = buildPlan(forward(k), input(n, seed, { order: order.reverse() }));
        expectForward(plan, order);
        const sizes = [plan.folds[0].train.length, ...plan.folds.map((f) => f.test.length)];
        for (const s of sizes) {
          expect(s).toBeGreaterThanOrEqual(Math.floor(n / (k + 1)));
          expect(s).toBeLessThanOrEqual(Math.ceil(n / (k + 1)));
        }
      }),
      FC,
    );
  });

  it('with groups never cuts through a group', () => {
    fc.assert(
      fc.property(fc.integer({ min: 4, max: 100 }), fc.integer({ min: 1, max: 3 }), fc.nat(), (n, k, seed) => {
        const rng = input(0, seed).rng;
        const order = Float64Array.from({ length: n }, (_, i) => i + rng.int(3));
        // groups of consecutive rows with a little overlap in time
        const groups = Int32Array.from({ length: n }, (_, i) => Math.floor((i + rng.int(2)) / 4));
        let plan: BuiltPlan;
        try {
          plan = buildPlan(forward(k), input(n, seed, { order, groups }));
        } catch (e) {
          expect((e as Error).message).toMatch(/ties in the order column and whole groups allow only \d+$/);
          return;
        }
        expectForward(plan, order);
        expectGroupsApart(plan, groups);
      }),
      FC,
    );
  });

  it('moves a cut back when ties at the end leave no later change of value', () => {
    // ideal cuts at 3 and 7; 4 repeats to the end, so the second cut must go before position 3
    const order = Float64Array.of(1, 2, 3, 4, 4, 4, 4, 4, 4, 4);
    const plan = buildPlan(forward(2), input(10, 1, { order }));
    expectForward(plan, order);
  });

  it('needs an order column, values on every row, and enough rows and distinct values', () => {
    expect(() => buildPlan(forward(3), input(10, 1))).toThrow(UsageError);
    expect(() => buildPlan(forward(3), input(10, 1))).toThrow('forward plans need --order COL');
    const order = Float64Array.from({ length: 10 }, (_, i) => (i % 4 === 0 ? NaN : i));
    expect(() => buildPlan(forward(3), input(10, 1, { order }))).toThrow(InputError);
    expect(() => buildPlan(forward(3), input(10, 1, { order }))).toThrow('--plan forward:3: 3 rows have no order value; drop or fill them');
    expect(() => buildPlan(forward(20), input(12, 1, { order: new Float64Array(12) }))).toThrow(
      '--plan forward:20 needs at least 21 rows; the data has 12 usable rows',
    );
    expect(() => buildPlan(forward(2), input(12, 1, { order: Float64Array.from({ length: 12 }, (_, i) => i % 2) }))).toThrow(
      '--plan forward:2 needs 3 blocks of rows; ties in the order column allow only 2',
    );
  });

  it('on the penguins flipper lengths: names the missing rows, then splits at value changes', () => {
    const rows = JSON.parse(readFileSync('node_modules/vega-datasets/data/penguins.json', 'utf8')) as Record<string, unknown>[];
    const raw = Float64Array.from(rows, (r) => (typeof r['Flipper Length (mm)'] === 'number' ? (r['Flipper Length (mm)'] as number) : NaN));
    const missing = raw.filter(Number.isNaN).length;
    expect(missing).toBeGreaterThan(0); // the file has rows without a flipper length
    expect(() => buildPlan(forward(4), input(raw.length, 1, { order: raw }))).toThrow(
      `--plan forward:4: ${missing} rows have no order value; drop or fill them`,
    );
    const order = raw.filter((v) => !Number.isNaN(v));
    const plan = buildPlan(forward(4), input(order.length, 1, { order }));
    expectForward(plan, order);
  });
});
