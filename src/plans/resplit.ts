/**
 * Random-split plans (`resplit:N@F`): N independent splits, each a fresh random choice of
 * test rows, about a fraction F of them; the other rows train. Source for the method: Hastie,
 * Tibshirani & Friedman, The Elements of Statistical Learning, 2nd ed., section 7.10 (the
 * validation-set approach, repeated).
 *
 * Numbering: all splits are in repeat 0, fold s for split s, and foldsPerRepeat = N. Unlike
 * k-fold, the test parts of different splits overlap, so a row may be tested several times
 * or never.
 *
 * Rows: the test size of each class is its share of F * n_c rounded by apportion.ts (floor or
 * ceil of F * n_c, class sizes summing to round(F * n) up to exact halves; without strata the
 * test set is round(F * n) rows, halves rounded up). The same sizes hold in every split; the
 * rows are drawn by shuffling each class (Fisher-Yates) and taking its first rows.
 *
 * Groups: whole groups are drawn in shuffled order until the test rows reach F * n (see
 * drawGroups in groups.ts: within half a group of F * n, at least one group tested and one
 * trained). Strata are not used when groups are given.
 *
 * Errors: an empty test or training set (too few rows for F), fewer than 2 groups.
 */
import { InputError } from '../errors.js';
import { shuffleInPlace } from '../rng.js';
import { apportion } from './apportion.js';
import { rowsWhere } from './assemble.js';
import { indexCodes } from './codes.js';
import { formatPlan } from './format.js';
import { drawGroups } from './groups.js';
import { countOf } from './input.js';
import { classIndex } from './stratify.js';
import type { BuiltPlan, Fold, PlanInput, PlanSpec } from './types.js';

type ResplitSpec = Extract<PlanSpec, { kind: 'resplit' }>;

const TRAIN = 0;
const TEST = 1;

function split(part: Int32Array, s: number): Fold {
  return { repeat: 0, fold: s, train: rowsWhere(part, (p) => p === TRAIN), test: rowsWhere(part, (p) => p === TEST) };
}

export function buildResplit(spec: ResplitSpec, input: PlanInput): BuiltPlan {
  const { splits, testFraction: f } = spec;
  const { n, rng } = input;
  const label = `--plan ${formatPlan(spec)}`;
  const folds: Fold[] = [];
  const part = new Int32Array(n);
  if (input.groups) {
    const groups = indexCodes(input.groups);
    if (groups.count < 2) throw new InputError(`${label} needs at least 2 groups; the data has ${countOf(groups.count, 'group')}`);
    for (let s = 0; s < splits; s++) {
      const partOf = drawGroups(groups, [{ part: TEST, target: f * n }], TRAIN, rng);
      for (let i = 0; i < n; i++) part[i] = partOf[groups.ids[i]];
      folds.push(split(part, s));
    }
    return { folds, repeats: 1, foldsPerRepeat: splits, warnings: [] };
  }
  const classes = classIndex(input);
  const sizes = apportion(classes.sizes, [1 - f, f]);
  const tested = sizes.reduce((a, c) => a + c[TEST], 0);
  const where = `of ${countOf(n, 'row', 'usable')}; raise or lower F, or use more rows`;
  if (tested === 0) throw new InputError(`${label} puts no rows in the test set ${where}`);
  if (tested === n) throw new InputError(`${label} puts no rows in the training set ${where}`);
  const pools = classes.members.map((m) => Int32Array.from(m));
  for (let s = 0; s < splits; s++) {
    part.fill(TRAIN);
    pools.forEach((pool, c) => {
      shuffleInPlace(pool, rng);
      for (let j = 0; j < sizes[c][TEST]; j++) part[pool[j]] = TEST;
    });
    folds.push(split(part, s));
  }
  return { folds, repeats: 1, foldsPerRepeat: splits, warnings: [] };
}
