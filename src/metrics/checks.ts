/**
 * Input checks shared by the metric functions. Each metric calls one of these in its first
 * lines, so every metric rejects bad data with the same fixed-format message, prefixed by the
 * metric's name:
 *
 *   accuracy: actual and predicted must have the same length (got 3 and 4)
 *   accuracy: actual and predicted must not be empty
 *   accuracy: classes must be a positive integer (got 0)
 *   accuracy: actual[5] = 7 is not a class code in 0..2
 *   log-loss: needs class probabilities, but probs is missing
 *   log-loss: probs must have 3 x 2 = 6 entries (got 5)
 *   log-loss: probs at row 1, class 0 is 1.5, not a probability in [0, 1]
 *   rmse: predicted[2] is NaN, not a finite number
 *
 * Probabilities may overshoot [0, 1] by at most PROBA_SLACK (1e-9), to absorb rounding in a
 * learner's arithmetic; they are used as given, never renormalised.
 */
import { InputError } from '../errors.js';
import type { ClassificationInput, RegressionInput } from './types.js';

/** How far a probability may stray outside [0, 1] before it is rejected (rounding slack). */
export const PROBA_SLACK = 1e-9;

function checkLengths(name: string, a: number, b: number): void {
  if (a !== b) throw new InputError(`${name}: actual and predicted must have the same length (got ${a} and ${b})`);
  if (a === 0) throw new InputError(`${name}: actual and predicted must not be empty`);
}

function checkCodes(name: string, which: 'actual' | 'predicted', codes: Int32Array, classes: number): void {
  for (let i = 0; i < codes.length; i++) {
    const c = codes[i];
    if (c < 0 || c >= classes) {
      throw new InputError(`${name}: ${which}[${i}] = ${c} is not a class code in 0..${classes - 1}`);
    }
  }
}

/** Lengths agree and are non-zero, `classes` is a positive integer, every code is in 0..classes-1. */
export function checkClassification(name: string, input: ClassificationInput): void {
  checkLengths(name, input.actual.length, input.predicted.length);
  const classes = input.classes;
  if (!Number.isInteger(classes) || classes < 1) {
    throw new InputError(`${name}: classes must be a positive integer (got ${classes})`);
  }
  checkCodes(name, 'actual', input.actual, classes);
  checkCodes(name, 'predicted', input.predicted, classes);
}

/**
 * Everything `checkClassification` checks, plus: `probs` is present, has n x classes entries,
 * and every entry is a finite number in [0, 1] (within PROBA_SLACK). Returns `probs`.
 */
export function checkProbabilities(name: string, input: ClassificationInput): Float64Array {
  checkClassification(name, input);
  const probs = input.probs;
  if (probs === undefined) throw new InputError(`${name}: needs class probabilities, but probs is missing`);
  const n = input.actual.length;
  const k = input.classes;
  if (probs.length !== n * k) {
    throw new InputError(`${name}: probs must have ${n} x ${k} = ${n * k} entries (got ${probs.length})`);
  }
  for (let i = 0; i < probs.length; i++) {
    const p = probs[i];
    // written so that NaN fails too
    if (!(p >= -PROBA_SLACK && p <= 1 + PROBA_SLACK)) {
      const row = Math.floor(i / k);
      throw new InputError(`${name}: probs at row ${row}, class ${i - row * k} is ${p}, not a probability in [0, 1]`);
    }
  }
  return probs;
}

function checkFinite(name: string, which: 'actual' | 'predicted', values: Float64Array): void {
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) {
      throw new InputError(`${name}: ${which}[${i}] is ${values[i]}, not a finite number`);
    }
  }
}

/** Lengths agree and are non-zero, and every value is finite. */
export function checkRegression(name: string, input: RegressionInput): void {
  checkLengths(name, input.actual.length, input.predicted.length);
  checkFinite(name, 'actual', input.actual);
  checkFinite(name, 'predicted', input.predicted);
}
