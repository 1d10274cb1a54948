/**
 * Leave-one-out plans (`loo`): n folds, fold i testing on row i alone and training on the
 * other n - 1 rows (Hastie, Tibshirani & Friedman, The Elements of Statistical Learning,
 * 2nd ed., section 7.10.1, K = N). With groups it leaves one group out instead: one fold per
 * group, in ascending group code order, testing on that group's rows. No randomness (one
 * repeat, numbered 0); strata are not used. Needs at least 2 rows (2 groups).
 *
 * Memory: every fold holds its own training rows, so the plan holds about n^2 row numbers.
 */
import { InputError } from '../errors.js';
import { foldsFromParts } from './assemble.js';
import { indexCodes } from './codes.js';
import { countOf } from './input.js';
import type { BuiltPlan, PlanInput } from './types.js';

export function buildLoo(input: PlanInput): BuiltPlan {
  const { n } = input;
  if (input.groups) {
    const groups = indexCodes(input.groups);
    if (groups.count < 2) {
      throw new InputError(`--plan loo needs at least 2 groups; the data has ${countOf(groups.count, 'group')}`);
    }
    const folds = foldsFromParts(groups.ids, groups.count, 0);
    return { folds, repeats: 1, foldsPerRepeat: groups.count, warnings: [] };
  }
  if (n < 2) throw new InputError(`--plan loo needs at least 2 rows; the data has ${countOf(n, 'row', 'usable')}`);
  const folds = [];
  for (let i = 0; i < n; i++) {
    const train = new Int32Array(n - 1);
    for (let j = 0, t = 0; j < n; j++) if (j !== i) train[t++] = j;
    folds.push({ repeat: 0, fold: i, train, test: Int32Array.of(i) });
  }
  return { folds, repeats: 1, foldsPerRepeat: n, warnings: [] };
}
