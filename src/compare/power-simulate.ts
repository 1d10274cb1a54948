/**
 * A seeded simulation of the gate's power figures (issue 17; bench/cases/honesty-power.ts and
 * test/compare/power-simulate.test.ts): does the gate catch a true drop at the rate the power
 * figure states, and do the repeats `foldwise power` recommends reach the stated power?
 *
 * The process is the one src/slices/simulate.ts uses: J = k R paired fold differences (previous
 * minus current, positive = worse) d_j = delta + sigma (sqrt(rho) Z_0 + sqrt(1 - rho) Z_j), Z
 * standard normal, Z_0 shared by the folds of one run, rho = 1/k. With testRows/trainRows =
 * 1/(k - 1) this is the correlation the Nadeau-Bengio correction assumes (Nadeau & Bengio 2003,
 * sec. 4): the corrected variance (1/J + 1/(k - 1)) E[s^2] equals the true variance of the mean
 * difference. Each run is decided by the real paired rule (gate-rule.ts, --max-drop 0).
 *
 * `simulateGatePower`: for each true drop, the share of runs the gate fails, beside the power
 * src/stats/power.ts states for that drop (noncentral t at the true variance), and the mean of
 * the minimal detectable difference the gate states from each run's observed variance.
 *
 * `simulateRepeatsAdvice`: each run first makes a pilot pair of runs of the plan kfold:k x R0
 * with no true change, takes the observed variance of its differences (what `foldwise power
 * BASE --current CUR` measures) and asks repeatsFor (the function `foldwise power` calls) for
 * the fewest repeats whose MDD is at most `drop`; then a fresh run with that many repeats and a
 * true drop of `drop` is gated. The same with the repeats from the true variance ("oracle")
 * separates the power arithmetic from the noise of the pilot's variance.
 */
import type { Rng } from '../rng.js';
import { correctedSe, mddInSe, minimalDetectable, powerAt, repeatsFor } from '../stats/power.js';
import { pairedGateTest } from './gate-rule.js';

export interface GatePowerSimulation {
  /** folds per repeat (k of k-fold) and repeats: J = k * repeats */
  readonly folds: number;
  readonly repeats: number;
  /** standard deviation of one fold difference */
  readonly sigma: number;
  readonly alpha: number;
  readonly power: number;
  /** the true drops to simulate */
  readonly drops: readonly number[];
  readonly runs: number;
}

export interface GatePowerRow {
  readonly drop: number;
  /** the power src/stats/power.ts states for this drop at the true variance */
  readonly statedPower: number;
  /** runs where the gate failed */
  readonly failed: number;
}

export interface GatePowerResult {
  /** the minimal detectable difference at the true variance (power at the asked power) */
  readonly mdd: number;
  /** mean over all runs of the MDD the gate states from the run's observed variance */
  readonly meanStatedMdd: number;
  readonly rows: readonly GatePowerRow[];
}

function normal(rng: Rng): number {
  // Box-Muller
  let u = rng.next();
  while (u <= 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

/** One run's paired scores: previous and current fold scores with the drops of the process. */
function drawRun(k: number, folds: number, sigma: number, delta: number, rng: Rng): { previous: number[]; current: number[] } {
  const rho = 1 / k;
  const z0 = normal(rng);
  const previous: number[] = [];
  const current: number[] = [];
  for (let f = 0; f < folds; f++) {
    const d = delta + sigma * (Math.sqrt(rho) * z0 + Math.sqrt(1 - rho) * normal(rng));
    const b = 0.8 + 0.05 * normal(rng);
    previous.push(b);
    current.push(b - d);
  }
  return { previous, current };
}

function variance(xs: readonly number[]): number {
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return xs.reduce((s, v) => s + (v - m) ** 2, 0) / (xs.length - 1);
}

/** The expected sample variance of the fold differences of the process: sigma^2 (1 - 1/k). */
export function processVariance(k: number, sigma: number): number {
  return sigma ** 2 * (1 - 1 / k);
}

export function simulateGatePower(x: GatePowerSimulation, rng: Rng): GatePowerResult {
  const j = x.folds * x.repeats;
  const sizes = { testRows: 1, trainRows: x.folds - 1 };
  const setting = { alpha: x.alpha, power: x.power };
  const truth = { folds: j, variance: processVariance(x.folds, x.sigma), ...sizes };
  const se = correctedSe(truth);
  const o = { higherIsBetter: true, maxDrop: 0, alpha: x.alpha };
  const mddSe = mddInSe(j - 1, setting);
  let statedSum = 0;
  let statedN = 0;
  const rows = x.drops.map((drop) => {
    let failed = 0;
    for (let r = 0; r < x.runs; r++) {
      const run = drawRun(x.folds, j, x.sigma, drop, rng);
      if (pairedGateTest(run.previous, run.current, sizes, o).regression) failed++;
      const v = variance(run.previous.map((b, i) => b - run.current[i]));
      statedSum += mddSe * correctedSe({ ...truth, variance: v });
      statedN++;
    }
    return { drop, statedPower: powerAt(drop / se, j - 1, x.alpha), failed };
  });
  return { mdd: minimalDetectable(truth, setting), meanStatedMdd: statedSum / statedN, rows };
}

export interface RepeatsAdviceSimulation {
  readonly folds: number;
  /** repeats of the pilot runs the advice is computed from */
  readonly pilotRepeats: number;
  readonly sigma: number;
  readonly alpha: number;
  readonly power: number;
  /** the drop to catch (the --drop of `foldwise power`) */
  readonly drop: number;
  readonly runs: number;
  /** the most repeats the advice may give (repeatsFor's search bound) */
  readonly maxRepeats: number;
}

export interface RepeatsAdviceResult {
  /** repeats from the true variance, and the gate's detection count with them */
  readonly oracleRepeats: number | null;
  readonly oracleFailed: number;
  /** pilot advice: runs with a recommendation, the gate's detections among them, and the repeats given (sorted) */
  readonly advised: number;
  readonly advisedFailed: number;
  /** runs where the pilot said no number of repeats (up to maxRepeats) reaches the drop */
  readonly noAdvice: number;
  readonly repeatsGiven: readonly number[];
}

export function simulateRepeatsAdvice(x: RepeatsAdviceSimulation, rng: Rng): RepeatsAdviceResult {
  const sizes = { testRows: 1, trainRows: x.folds - 1 };
  const setting = { alpha: x.alpha, power: x.power };
  const o = { higherIsBetter: true, maxDrop: 0, alpha: x.alpha };
  const oracle = repeatsFor(x.drop, { variance: processVariance(x.folds, x.sigma), ...sizes, foldsPerRepeat: x.folds }, setting, x.maxRepeats).repeats;
  let oracleFailed = 0;
  let advised = 0;
  let advisedFailed = 0;
  let noAdvice = 0;
  const repeatsGiven: number[] = [];
  const gateFails = (repeats: number): boolean => {
    const run = drawRun(x.folds, x.folds * repeats, x.sigma, x.drop, rng);
    return pairedGateTest(run.previous, run.current, sizes, o).regression;
  };
  for (let r = 0; r < x.runs; r++) {
    if (oracle !== null && gateFails(oracle)) oracleFailed++;
    const pilot = drawRun(x.folds, x.folds * x.pilotRepeats, x.sigma, 0, rng);
    const v = variance(pilot.previous.map((b, i) => b - pilot.current[i]));
    const advice = repeatsFor(x.drop, { variance: v, ...sizes, foldsPerRepeat: x.folds }, setting, x.maxRepeats).repeats;
    if (advice === null) {
      noAdvice++;
      continue;
    }
    advised++;
    repeatsGiven.push(advice);
    if (gateFails(advice)) advisedFailed++;
  }
  repeatsGiven.sort((a, b) => a - b);
  return { oracleRepeats: oracle, oracleFailed, advised, advisedFailed, noAdvice, repeatsGiven };
}
