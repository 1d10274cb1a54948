/**
 * How much memory one model may ask for, so that a size the user typed (forest:trees=1e9) is
 * refused with an estimate instead of failing deep inside an allocation or swapping the machine.
 *
 * The budget is half of this machine's physical memory (os.totalmem()): our own choice, leaving
 * the other half for the data's columns, the fold's prepared matrices, other worker threads and
 * the rest of the system. A learner compares its estimate with it before the memory is taken and
 * throws InputError (exit 2) naming the option, the estimate and the budget.
 */
import { totalmem } from 'node:os';
import { InputError } from '../errors.js';

export const BUDGET_SHARE = 0.5;

/** Bytes one model may use: BUDGET_SHARE of the physical memory. */
export function memoryBudget(): number {
  return Math.floor(totalmem() * BUDGET_SHARE);
}

/** 1.2 GB, 340 MB, 12 kB: decimal units, three significant digits. */
export function formatBytes(bytes: number): string {
  const units = ['B', 'kB', 'MB', 'GB', 'TB', 'PB', 'EB'];
  let v = bytes;
  let u = 0;
  while (v >= 1000 && u < units.length - 1) {
    v /= 1000;
    u++;
  }
  return `${Number(v.toPrecision(3))} ${units[u]}`;
}

/**
 * The refusal when a model's own arrays would exceed the budget: `what` names the learner and
 * the option (`forest: trees=1e9`), `need` the estimate and how it was made, `advice` what to
 * ask for instead.
 */
export function modelTooLarge(what: string, need: string, budget: number, advice: string): InputError {
  return new InputError(`${what} would need ${need}, more than the ${formatBytes(budget)} one model may use (half of this machine's memory); ${advice}`);
}
