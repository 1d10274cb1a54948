/**
 * K-fold plans (`kfold:K`, `kfold:KxR`): the rows are cut into K folds; fold f tests on its
 * own rows and trains on all others. Each of the R repeats starts from a fresh shuffle.
 * Source for the method: Hastie, Tibshirani & Friedman, The Elements of Statistical Learning,
 * 2nd ed. (2009, free PDF from the authors), section 7.10.1.
 *
 * Rows (no groups): shuffle the rows of each class (Fisher-Yates), lay the classes end to
 * end in code order and deal the sequence round robin: position i goes to fold i mod K.
 * Without strata all rows are one class. A class of n_c rows occupies a run of n_c
 * consecutive positions, and any run of n_c positions holds floor(n_c/K) or ceil(n_c/K)
 * positions of each residue mod K; so every fold holds floor(n_c/K) or ceil(n_c/K) rows of
 * every class (within one of n_c/K), and, the whole sequence being one run of n, every fold
 * holds floor(n/K) or ceil(n/K) rows. (Each class starts where the previous one stopped, which
 * is the usual per-class rotation of the starting fold.) Stratified k-fold as defined by
 * Kohavi (1995), "A study of cross-validation and bootstrap for accuracy estimation and model
 * selection", IJCAI: folds with about the class proportions of the whole data.
 *
 * Groups: whole groups are dealt to folds (see groups.ts), balancing classes when strata are
 * given (best effort). No group is in both the training and the test rows of any fold; every
 * fold has at least one group.
 *
 * Errors: K > n rows, or K > number of groups. Warnings: a class with fewer rows (or, with
 * groups, fewer groups) than K.
 */
import { InputError } from '../errors.js';
import { shuffleInPlace } from '../rng.js';
import { foldsFromParts } from './assemble.js';
import { indexCodes } from './codes.js';
import { formatPlan } from './format.js';
import { dealGroups } from './groups.js';
import { countOf } from './input.js';
import { classIndex, smallClassWarnings } from './stratify.js';
import type { BuiltPlan, Fold, PlanInput, PlanSpec } from './types.js';

type KfoldSpec = Extract<PlanSpec, { kind: 'kfold' }>;

export function buildKfold(spec: KfoldSpec, input: PlanInput): BuiltPlan {
  const { k, repeats } = spec;
  const { n, rng } = input;
  const label = `--plan ${formatPlan(spec)}`;
  if (k > n) throw new InputError(`${label} needs at least ${countOf(k, 'row')}; the data has ${countOf(n, 'row', 'usable')}`);
  const classes = classIndex(input);
  const groups = input.groups ? indexCodes(input.groups) : undefined;
  if (groups && k > groups.count) {
    throw new InputError(`${label} needs at least ${countOf(k, 'group')}; the data has ${countOf(groups.count, 'group')}`);
  }
  const warnings = input.strata ? smallClassWarnings(input, classes, k, groups) : [];
  const folds: Fold[] = [];
  const part = new Int32Array(n);
  const pools = classes.members.map((m) => Int32Array.from(m));
  for (let r = 0; r < repeats; r++) {
    if (groups) {
      const foldOf = dealGroups(groups, k, rng, input.strata ? classes : undefined);
      for (let i = 0; i < n; i++) part[i] = foldOf[groups.ids[i]];
    } else {
      let pos = 0;
      for (const pool of pools) {
        shuffleInPlace(pool, rng);
        for (let j = 0; j < pool.length; j++) part[pool[j]] = pos++ % k;
      }
    }
    folds.push(...foldsFromParts(part, k, r));
  }
  return { folds, repeats, foldsPerRepeat: k, warnings };
}
