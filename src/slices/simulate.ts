/**
 * A seeded simulation of the slice gate (bench/cases/slices.ts and test/slices/simulate.test.ts):
 * how often `gate --slices` fails a change, per slice and over the family.
 *
 * The process: m slices, each with J paired fold differences (previous minus current, in the
 * worse direction) d_j = delta + sigma (sqrt(rho) Z_0 + sqrt(1 - rho) Z_j), Z standard normal,
 * Z_0 shared by the folds of a slice. This is the correlation model the Nadeau-Bengio
 * correction assumes: with rho = testRows / (testRows + trainRows) the corrected variance
 * (1/J + testRows/trainRows) E[s^2] equals the true variance of the mean of the d_j
 * (Nadeau & Bengio 2003, sec. 4). Slices test disjoint rows, so they are drawn independently.
 * Each slice is gated with the paired rule (gate-rule.ts, max-drop 0), and the family by Holm.
 */
import type { Rng } from '../rng.js';
import { pairedGateTest } from '../compare/gate-rule.js';
import { holm } from '../stats/holm.js';

export interface SliceSimulation {
  readonly slices: number;
  /** folds per repeat (k of k-fold) and repeats: J = k * repeats */
  readonly folds: number;
  readonly repeats: number;
  /** standard deviation of one fold difference */
  readonly sigma: number;
  /** the true drop of each slice (length = slices) */
  readonly drops: readonly number[];
  readonly alpha: number;
  readonly runs: number;
}

export interface SliceSimulationResult {
  /** runs where Holm failed at least one slice whose true drop is 0 */
  readonly holmFalseAlarm: number;
  /** runs where some slice with true drop 0 had p <= alpha (no correction) */
  readonly uncorrectedFalseAlarm: number;
  /** per slice: runs where Holm failed it */
  readonly holmFailed: readonly number[];
}

function normal(rng: Rng): number {
  // Box-Muller
  let u = rng.next();
  while (u <= 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

/** Runs the simulation; counts are out of `runs`. */
export function simulateSliceGate(x: SliceSimulation, rng: Rng): SliceSimulationResult {
  const j = x.folds * x.repeats;
  const rho = 1 / x.folds;
  const correction = { testRows: 1, trainRows: x.folds - 1 };
  const o = { higherIsBetter: true, maxDrop: 0, alpha: x.alpha };
  let holmFalseAlarm = 0;
  let uncorrectedFalseAlarm = 0;
  const holmFailed = new Array<number>(x.slices).fill(0);
  for (let r = 0; r < x.runs; r++) {
    const p: number[] = [];
    for (let s = 0; s < x.slices; s++) {
      const z0 = normal(rng);
      const previous: number[] = [];
      const current: number[] = [];
      for (let f = 0; f < j; f++) {
        const d = x.drops[s] + x.sigma * (Math.sqrt(rho) * z0 + Math.sqrt(1 - rho) * normal(rng));
        const b = 0.8 + 0.05 * normal(rng);
        previous.push(b);
        current.push(b - d);
      }
      p.push(pairedGateTest(previous, current, correction, o).p);
    }
    const h = holm(p, x.alpha);
    h.rejected.forEach((rej, s) => rej && holmFailed[s]++);
    if (h.rejected.some((rej, s) => rej && x.drops[s] === 0)) holmFalseAlarm++;
    if (p.some((v, s) => v <= x.alpha && x.drops[s] === 0)) uncorrectedFalseAlarm++;
  }
  return { holmFalseAlarm, uncorrectedFalseAlarm, holmFailed };
}
