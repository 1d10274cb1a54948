/**
 * Checks a PlanInput before any plan is built, and the wording shared by the builders'
 * messages. Bad input is an InputError: n must be a whole number >= 0, and every per-row
 * array (strata, groups, order) must have n entries; strata and group codes must be >= 0.
 */
import { InputError } from '../errors.js';
import type { PlanInput } from './types.js';

/** "1 row", "12 rows" (with an optional adjective: "12 usable rows"). */
export function countOf(n: number, noun: string, adjective = ''): string {
  return `${n} ${adjective ? adjective + ' ' : ''}${noun}${n === 1 ? '' : 's'}`;
}

function checkCodes(name: string, codes: Int32Array | undefined, n: number): void {
  if (codes === undefined) return;
  if (!(codes instanceof Int32Array)) throw new InputError(`plan input: ${name} must be an Int32Array`);
  if (codes.length !== n) throw new InputError(`plan input: ${name} has ${codes.length} codes for ${countOf(n, 'row')}`);
  for (let i = 0; i < n; i++) {
    if (codes[i] < 0) throw new InputError(`plan input: ${name} code ${codes[i]} at row ${i}; codes must be >= 0`);
  }
}

export function checkPlanInput(input: PlanInput): void {
  const { n } = input;
  if (!Number.isInteger(n) || n < 0) throw new InputError(`plan input: n must be a whole number >= 0, got ${n}`);
  if (!input.rng || typeof input.rng.int !== 'function') throw new InputError('plan input: rng is required');
  checkCodes('strata', input.strata, n);
  checkCodes('groups', input.groups, n);
  if (input.order !== undefined) {
    if (!(input.order instanceof Float64Array)) throw new InputError('plan input: order must be a Float64Array');
    if (input.order.length !== n) {
      throw new InputError(`plan input: order has ${input.order.length} values for ${countOf(n, 'row')}`);
    }
  }
}
