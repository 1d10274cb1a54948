/**
 * Holdout plans (`holdout:A/B/C`): one split of the rows into a training share A, a
 * validation share B (the fold's test rows) and a holdout share C set aside (BuiltPlan.holdout,
 * scored only on request). Source for the three-way split: Hastie, Tibshirani & Friedman, The
 * Elements of Statistical Learning, 2nd ed., section 7.2 (training, validation and test sets).
 *
 * Rows: the size of each class in each part comes from apportion.ts with fractions A, B, C
 * divided by their sum: floor or ceil of the part's fraction of n_c, the three summing to n_c
 * (without strata: floor or ceil of A n, B n, C n). Each class is shuffled (Fisher-Yates) and
 * cut in that order into training, validation and holdout rows.
 *
 * Groups: whole groups in shuffled order fill the holdout share first, then validation; the
 * rest train (see drawGroups in groups.ts: each part within half a group of its target, each
 * part with a positive share gets a group). Strata are not used when groups are given.
 *
 * `holdout` is present in the result whenever C > 0 (it may then be empty, with a warning).
 * One fold: repeat 0, fold 0. Errors: empty training or validation rows, too few groups.
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
import type { BuiltPlan, PlanInput, PlanSpec } from './types.js';

type HoldoutSpec = Extract<PlanSpec, { kind: 'holdout' }>;

const TRAIN = 0;
const VALIDATION = 1;
const HOLDOUT = 2;

export function buildHoldout(spec: HoldoutSpec, input: PlanInput): BuiltPlan {
  const { n, rng } = input;
  const label = `--plan ${formatPlan(spec)}`;
  const sum = spec.train + spec.validation + spec.holdout;
  const fractions = [spec.train / sum, spec.validation / sum, spec.holdout / sum];
  const part = new Int32Array(n);
  const warnings: string[] = [];
  if (input.groups) {
    const groups = indexCodes(input.groups);
    const needed = spec.holdout > 0 ? 3 : 2;
    if (groups.count < needed) {
      throw new InputError(`${label} needs at least ${countOf(needed, 'group')}; the data has ${countOf(groups.count, 'group')}`);
    }
    const fill = [
      ...(spec.holdout > 0 ? [{ part: HOLDOUT, target: fractions[HOLDOUT] * n }] : []),
      { part: VALIDATION, target: fractions[VALIDATION] * n },
    ];
    const partOf = drawGroups(groups, fill, TRAIN, rng);
    for (let i = 0; i < n; i++) part[i] = partOf[groups.ids[i]];
  } else {
    const classes = classIndex(input);
    const sizes = apportion(classes.sizes, fractions);
    const total = (p: number) => sizes.reduce((a, c) => a + c[p], 0);
    const where = `of ${countOf(n, 'row', 'usable')}; change the shares or use more rows`;
    if (total(TRAIN) === 0) throw new InputError(`${label} puts no rows in the training set ${where}`);
    if (total(VALIDATION) === 0) throw new InputError(`${label} puts no rows in the validation set ${where}`);
    if (spec.holdout > 0 && total(HOLDOUT) === 0) warnings.push(`${label} sets no rows aside for the holdout ${where}`);
    classes.members.forEach((members, c) => {
      const pool = shuffleInPlace(Int32Array.from(members), rng);
      const cut1 = sizes[c][TRAIN];
      const cut2 = cut1 + sizes[c][VALIDATION];
      for (let j = 0; j < pool.length; j++) part[pool[j]] = j < cut1 ? TRAIN : j < cut2 ? VALIDATION : HOLDOUT;
    });
  }
  const fold = { repeat: 0, fold: 0, train: rowsWhere(part, (p) => p === TRAIN), test: rowsWhere(part, (p) => p === VALIDATION) };
  const plan: BuiltPlan = { folds: [fold], repeats: 1, foldsPerRepeat: 1, warnings };
  return spec.holdout > 0 ? { ...plan, holdout: rowsWhere(part, (p) => p === HOLDOUT) } : plan;
}
