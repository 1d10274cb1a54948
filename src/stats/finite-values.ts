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
  if (values == null || typeof values.length !== 'number') {
    throw new InputError(`${fn}: ${name} must be an array of numbers`);
  }
  const out = new Array<number>(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number') throw new InputError(`${fn}: ${name}[${i}] is not a number`);
    if (Number.isNaN(v)) throw new InputError(`${fn}: ${name}[${i}] is NaN; filter missing scores before calling`);
    if (!Number.isFinite(v)) throw new InputError(`${fn}: ${name}[${i}] is not finite (${v})`);
    out[i] = v;
  }
  return out;
}
