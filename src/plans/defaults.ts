/**
 * The defaults of a run's plan and seed, and the seed check: with the plans they describe, so the
 * runner, the audit and tune read them from one place below all three.
 */
import { UsageError } from '../errors.js';

export const DEFAULT_SEED = 1;
export const DEFAULT_PLAN = 'kfold:10';

/** Checks a seed: an integer from 0 to 2^32-1. */
export function checkSeed(seed: number): number {
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new UsageError(`--seed ${seed}: expected a whole number from 0 to 4294967295`);
  }
  return seed;
}
