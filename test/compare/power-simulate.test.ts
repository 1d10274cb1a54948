/**
 * The gate's power figures by simulation (issue 17), mechanics on a small seeded run
 * (src/compare/power-simulate.ts); `npm run bench -- honesty-power` runs it large and prints the
 * table. Limits are binomial: a rate from n runs has standard error sqrt(p (1 - p) / n); 3
 * standard errors is the margin (common practice). The stated power is src/stats/power.ts,
 * itself checked against jstat's noncentral t in test/stats/power.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/rng.js';
import { processVariance, simulateGatePower, simulateRepeatsAdvice } from '../../src/compare/power-simulate.js';
import { minimalDetectable } from '../../src/stats/power.js';

const RUNS = 1500;
const se = (p: number): number => Math.sqrt((p * (1 - p)) / RUNS);
const base = { folds: 10, repeats: 1, sigma: 0.03, alpha: 0.05, power: 0.8, runs: RUNS };

describe('gate power by simulation (kfold:10, Nadeau-Bengio correlation model)', () => {
  it('the MDD of the simulation is the one power.ts gives at the process variance sigma^2 (1 - 1/k)', () => {
    const r = simulateGatePower({ ...base, drops: [], runs: 1 }, createRng(1));
    expect(processVariance(10, 0.03)).toBeCloseTo(0.0009 * 0.9, 12);
    expect(r.mdd).toBeCloseTo(minimalDetectable({ folds: 10, variance: 0.0009 * 0.9, testRows: 1, trainRows: 9 }, { alpha: 0.05, power: 0.8 }), 12);
  });

  it('no drop: the gate fails about alpha of the runs; a drop at the MDD: about the stated 80%; twice the MDD: about the stated power', () => {
    const mdd = simulateGatePower({ ...base, drops: [], runs: 1 }, createRng(1)).mdd;
    const r = simulateGatePower({ ...base, drops: [0, mdd, 2 * mdd] }, createRng(17));
    expect(r.rows.map((x) => x.drop)).toEqual([0, mdd, 2 * mdd]);
    expect(r.rows[0].statedPower).toBeCloseTo(0.05, 6);
    expect(r.rows[1].statedPower).toBeCloseTo(0.8, 6);
    for (const row of r.rows) expect(Math.abs(row.failed / RUNS - row.statedPower)).toBeLessThan(3 * se(row.statedPower) + 1e-9);
    // the MDD the gate states from each run's observed variance is about the true one (sd of s is ~24% at 9 df)
    expect(Math.abs(r.meanStatedMdd / r.mdd - 1)).toBeLessThan(0.1);
  });

  it('the repeats advised from the true variance reach the stated power; pilot advice is counted run by run', () => {
    const a = simulateRepeatsAdvice({ folds: 10, pilotRepeats: 1, sigma: 0.03, alpha: 0.05, power: 0.8, drop: 0.03, runs: 400, maxRepeats: 200 }, createRng(23));
    expect(a.oracleRepeats).not.toBeNull();
    // more repeats than kfold:10 needs: its MDD at this variance is above 0.03
    expect(a.oracleRepeats!).toBeGreaterThan(1);
    const p = a.oracleFailed / 400;
    expect(Math.abs(p - 0.8)).toBeLessThan(3 * Math.sqrt((0.8 * 0.2) / 400));
    expect(a.advised + a.noAdvice).toBe(400);
    expect(a.repeatsGiven.length).toBe(a.advised);
    expect(a.advisedFailed).toBeLessThanOrEqual(a.advised);
  });
});
