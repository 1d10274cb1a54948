/**
 * The slice gate by simulation (issue 17), seeded, on the correlation model the Nadeau-Bengio
 * correction assumes (src/slices/simulate.ts). Limits are binomial: a rate estimated from n runs
 * has standard error sqrt(p (1 - p) / n); 3 standard errors is the margin (common practice).
 * `npm run bench -- honesty-slices` runs the same with more runs and prints the figures.
 */
import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/rng.js';
import { simulateSliceGate } from '../../src/slices/simulate.js';
import { minimalDetectable } from '../../src/stats/power.js';

const RUNS = 2000;
const base = { slices: 8, folds: 10, repeats: 1, sigma: 0.03, alpha: 0.05, runs: RUNS };
const se = (p: number): number => Math.sqrt((p * (1 - p)) / RUNS);

describe('gate --slices by simulation: 8 slices, kfold:10', () => {
  it('no true change in any slice: Holm fails at most alpha of the runs; uncorrected, visibly more', () => {
    const r = simulateSliceGate({ ...base, drops: new Array(8).fill(0) }, createRng(101));
    expect(r.holmFalseAlarm / RUNS).toBeLessThanOrEqual(0.05 + 3 * se(0.05));
    // uncorrected, 8 tests at 0.05 each: 1 - 0.95^8 = 0.337 if they were independent and exact
    expect(r.uncorrectedFalseAlarm / RUNS).toBeGreaterThan(0.25);
  });

  it('a drop planted in one slice at the minimal detectable difference (power.ts, at alpha / 8) is found at the stated 80%', () => {
    // Holm's first step tests the smallest p at alpha / m: the power figure at that level applies
    const mdd = minimalDetectable({ folds: 10, variance: base.sigma ** 2 * (1 - 1 / 10), testRows: 1, trainRows: 9 }, { alpha: 0.05 / 8, power: 0.8 });
    const r = simulateSliceGate({ ...base, drops: [mdd, 0, 0, 0, 0, 0, 0, 0] }, createRng(202));
    expect(Math.abs(r.holmFailed[0] / RUNS - 0.8)).toBeLessThan(3 * se(0.8));
    expect(r.holmFalseAlarm / RUNS).toBeLessThanOrEqual(0.05 + 3 * se(0.05));
  });
});
