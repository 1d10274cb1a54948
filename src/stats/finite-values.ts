/**
 * Input check shared by the fold-score statistics: every value must be a finite number.
 * Missing scores (NaN) are the caller's to filter, so that a summary never silently covers
 * fewer folds than the report claims.
 */
import { InputError } from '../errors.js';

/**
 * A plain array copy of `values`, after checking that it is array-like and every entry is a
 * finite number. Throws InputError "<fn>: <name>[i] is NaN; ..." or "... is not finite ...".
 */
export function finiteValues(fn: string, name: string, values: ArrayLike<number>): number[] {
  // an array-like's length is a whole number >= 0 (Number.isInteger does not coerce a string)
  if (values == null || !Number.isInteger(values.length) || values.length < 0) {
    throw new InputError(`${fn}: ${name} must be an array of numbers`);
  }
  // grown by push: new Array(length) would throw a RangeError for a length of 2^32 or more
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number') throw new InputError(`${fn}: ${name}[${i}] is not a number`);
    if (Number.isNaN(v)) throw new InputError(`${fn}: ${name}[${i}] is NaN; filter missing scores before calling`);
    if (!Number.isFinite(v)) throw new InputError(`${fn}: ${name}[${i}] is not finite (${v})`);
    out.push(v);
  }
  return out;
}
