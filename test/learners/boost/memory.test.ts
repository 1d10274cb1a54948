/**
 * boost sizes beyond memory (issue 26): the learner refuses, naming rounds and the estimate,
 * before the trees' arrays are taken. The machine's budget (half of os.totalmem()) is replaced
 * by a small one here so the mechanics are tested the same on every machine; the estimates are
 * the node arrays' own sizes (24 bytes a node, 8 bytes a leaf value; src/learners/cart/node-store.ts).
 */
import { describe, expect, it, vi } from 'vitest';
import { InputError } from '../../../src/errors.js';
import type { Matrix, Target } from '../../../src/learning.js';
import { createRng } from '../../../src/rng.js';

const BUDGET = 2_000_000; // 2 MB

vi.mock('../../../src/learners/memory-budget.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../../src/learners/memory-budget.js')>();
  return { ...real, memoryBudget: () => BUDGET };
});

const { boost } = await import('../../../src/learners/boost/learner.js');

const rng = createRng(7);
const n = 300;
const data = Float64Array.from({ length: n * 3 }, () => rng.next());
const X: Matrix = { rows: n, cols: 3, data };
const two: Target = { task: 'classification', codes: Int32Array.from({ length: n }, (_, i) => (data[i * 3] + 0.3 * rng.next() > 0.6 ? 1 : 0)), classes: ['a', 'b'] };
const three: Target = { task: 'classification', codes: Int32Array.from({ length: n }, (_, i) => Math.min(2, Math.floor(data[i * 3] * 3))), classes: ['a', 'b', 'c'] };
const fit = (y: Target, params: Record<string, number>) => boost.fit(X, y, params, { rng: createRng(1), seed: 1 });

describe('boost sizes beyond memory (issue 26)', () => {
  it('refuses before any round when one leaf per tree would already exceed the budget', () => {
    // 3 classes: 3 trees a round, each leaf 3 values: 100,000 x 3 x (24 + 24) = 14.4 MB > 2 MB
    expect(() => fit(three, { rounds: 100000 })).toThrow(InputError);
    expect(() => fit(three, { rounds: 100000 })).toThrow(/^boost: rounds=100000 would need at least 14\.4 MB \(one leaf per tree, 3 trees a round\) for the trees alone, more than the 2 MB one model may use/);
  });

  it('refuses after the first round when rounds of its size would exceed the budget', () => {
    // 20,000 one-leaf trees (32 bytes each) fit in 2 MB; 20,000 trees of the first's size do not
    const rounds = 20000;
    expect(rounds * 32).toBeLessThan(BUDGET);
    expect(() => fit(two, { rounds, depth: 6, 'leaf-rows': 2 })).toThrow(/^boost: rounds=20000 would need about .* \(20000 rounds the size of the first, \d+ nodes\)/);
  });

  it('still fits when the estimate is inside the budget', () => {
    const m = fit(two, { rounds: 10, depth: 3 });
    expect(m.predict({ rows: 2, cols: 3, data: data.subarray(0, 6) }).length).toBe(2);
  });
});
