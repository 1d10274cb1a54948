/**
 * The gate's power figures by simulation (issue 17), mechanics on a small seeded run
 * (src/compare/power-simulate.ts); `npm run bench -- honesty-power` runs it large and prints the
 * table. Limits are binomial: a rate from n runs has standard error sqrt(p (1 - p) / n); 3
 * standard errors is the margin (common practice). The stated power is src/stats/power.ts,
 * itself checked against jstat's noncentral t in test/stats/power.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { createRng, type Rng } from '../../src/rng.js';
import { processVariance, simulateGatePower, simulateRepeatsAdvice } from '../../src/compare/power-simulate.js';
import { minimalDetectable, repeatsFor } from '../../src/stats/power.js';

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
    // at power about 0.8 over hundreds of advised runs, some are caught and some are not
    expect(a.advisedFailed).toBeGreaterThan(0);
    expect(a.advisedFailed).toBeLessThan(a.advised);
    // the repeats given are sorted ascending, and a one-repeat pilot gives more than one answer
    expect(a.repeatsGiven).toEqual([...a.repeatsGiven].sort((x, y) => x - y));
    expect(new Set(a.repeatsGiven).size).toBeGreaterThan(1);
  });
});

/** A generator that counts its uniforms, or plays a script of them (and refuses to run past its end). */
function counting(seed: number): Rng & { calls: number } {
  const inner = createRng(seed);
  const r = { calls: 0, next: () => (r.calls++, inner.next()), int: (n: number) => inner.int(n) };
  return r;
}
function scripted(values: readonly number[]): Rng {
  let i = 0;
  return {
    next: () => {
      if (i >= values.length) throw new Error(`the script of ${values.length} uniforms ran out`);
      return values[i++];
    },
    int: () => {
      throw new Error('int is not used');
    },
  };
}
// Box-Muller written out: sqrt(-2 ln u) cos(2 pi a), a standard normal from two uniforms (Box & Muller 1958)
const boxMuller = (u: number, a: number): number => Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * a);
const sampleVar = (xs: readonly number[]): number => {
  const m = xs.reduce((s, x) => s + x, 0) / xs.length;
  return xs.reduce((s, x) => s + (x - m) ** 2, 0) / (xs.length - 1);
};

describe('the process of one run, uniform by uniform (src/compare/power-simulate.ts)', () => {
  // kfold:3, one repeat, one run, sigma 1: the uniforms are z0's pair, then per fold the pair of
  // the difference's own normal Z_f and the pair of the base score's normal
  const k = 3;
  const shared = [0.5, 0.25]; // z0 = sqrt(2 ln 2) cos(pi / 2), about 0
  const own = [
    [0.1, 0],
    [0.2, 0.05],
    [0.3, 0.9],
  ];
  // the base scores' normals near 0 (angle 1/4): b cancels from previous - current; a base score that did not would show
  const baseDraw = [0.5, 0.25];
  const script = [0, ...shared, ...own.flatMap((z) => [...z, ...baseDraw])];
  const z0 = boxMuller(shared[0], shared[1]);
  const d = own.map(([u, a]) => Math.sqrt(1 / k) * z0 + Math.sqrt(1 - 1 / k) * boxMuller(u, a));

  it('redraws a uniform of exactly 0, and states the MDD of the observed variance of d_f = delta + sigma (sqrt(rho) Z_0 + sqrt(1 - rho) Z_f)', () => {
    const r = simulateGatePower({ folds: k, repeats: 1, sigma: 1, alpha: 0.05, power: 0.8, drops: [0], runs: 1 }, scripted(script));
    const expected = minimalDetectable({ folds: k, variance: sampleVar(d), testRows: 1, trainRows: k - 1 }, { alpha: 0.05, power: 0.8 });
    expect(Number.isFinite(r.meanStatedMdd)).toBe(true);
    expect(r.meanStatedMdd).toBeCloseTo(expected, 10);
  });

  it('a run whose differences are all positive (previous minus current: current worse) fails the gate', () => {
    expect(d.every((x) => x > 0)).toBe(true);
    const r = simulateGatePower({ folds: k, repeats: 1, sigma: 0.03, alpha: 0.05, power: 0.8, drops: [0], runs: 1 }, scripted(script));
    expect(r.rows.map((x) => x.failed)).toEqual([1]);
  });

  it('draws 2 + 4 J uniforms per run (z0, then two normals per fold) over J = k R folds, for each drop', () => {
    const rng = counting(5);
    const r = simulateGatePower({ folds: 4, repeats: 2, sigma: 0.03, alpha: 0.05, power: 0.8, drops: [0, 10], runs: 3 }, rng);
    expect(rng.calls).toBe(2 * 3 * (2 + 4 * 8));
    expect(r.mdd).toBeCloseTo(minimalDetectable({ folds: 8, variance: processVariance(4, 0.03), testRows: 1, trainRows: 3 }, { alpha: 0.05, power: 0.8 }), 12);
    // a drop of 10 (over 300 sigma) fails every run
    expect(r.rows.map((x) => x.failed)).toEqual([r.rows[0].failed, 3]);
  });

  it('repeats advice: the oracle from the true variance, the pilot of kfold:k x R0 and the advised run, 2 + 4 k R uniforms each', () => {
    const x = { folds: 5, pilotRepeats: 2, sigma: 0.03, alpha: 0.05, power: 0.8, drop: 0.05, runs: 4, maxRepeats: 200 };
    const rng = counting(9);
    const a = simulateRepeatsAdvice(x, rng);
    const oracle = repeatsFor(0.05, { variance: processVariance(5, 0.03), testRows: 1, trainRows: 4, foldsPerRepeat: 5 }, { alpha: 0.05, power: 0.8 }, 200).repeats;
    expect(oracle).not.toBeNull();
    expect(a.oracleRepeats).toBe(oracle);
    expect(a.advised + a.noAdvice).toBe(4);
    const draws = (repeats: number) => 2 + 4 * 5 * repeats;
    const expected = 4 * (draws(oracle!) + draws(2)) + a.repeatsGiven.reduce((s, r) => s + draws(r), 0);
    expect(rng.calls).toBe(expected);
  });

  it('no oracle when no number of repeats reaches the drop: nothing counted for it, no oracle run drawn', () => {
    const x = { folds: 5, pilotRepeats: 1, sigma: 0.03, alpha: 0.05, power: 0.8, drop: 0.001, runs: 3, maxRepeats: 2 };
    const rng = counting(4);
    const a = simulateRepeatsAdvice(x, rng);
    expect(a.oracleRepeats).toBeNull();
    expect(a.oracleFailed).toBe(0);
    const draws = (repeats: number) => 2 + 4 * 5 * repeats;
    expect(rng.calls).toBe(3 * draws(1) + a.repeatsGiven.reduce((s, r) => s + draws(r), 0));
  });

  it('a long pilot advises about the oracle\'s repeats (its variance is that of the differences, near the true one)', () => {
    const x = { folds: 10, pilotRepeats: 20, sigma: 0.03, alpha: 0.05, power: 0.8, drop: 0.03, runs: 20, maxRepeats: 200 };
    const a = simulateRepeatsAdvice(x, createRng(31));
    expect(a.oracleRepeats).not.toBeNull();
    expect(a.advised).toBe(20);
    expect(a.repeatsGiven.length).toBe(20);
    // 200 pilot folds: the variance is within about 20% (sd sqrt(2/199) = 10%), so the repeats within a factor 2
    for (const r of a.repeatsGiven) {
      expect(r).toBeLessThanOrEqual(2 * a.oracleRepeats!);
      expect(r).toBeGreaterThanOrEqual(Math.floor(a.oracleRepeats! / 2));
    }
  });
});
