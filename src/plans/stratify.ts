/**
 * Class helpers for stratified plans: the class index of the strata codes (or one class of
 * all rows when the plan does not stratify), and the warnings for classes too small to reach
 * every fold. Class names come from `strataNames` when given, else the code itself.
 */
import { indexCodes, singleCode, type CodeIndex } from './codes.js';
import { countOf } from './input.js';
import type { PlanInput } from './types.js';

export function classIndex(input: PlanInput): CodeIndex {
  return input.strata ? indexCodes(input.strata) : singleCode(input.n);
}

export function className(input: PlanInput, code: number): string {
  return JSON.stringify(input.strataNames?.[code] ?? String(code));
}

/**
 * `class "reject" has 3 rows, fewer than the 5 folds: some folds have none of it`, for each
 * class with fewer rows than folds; with groups, also for each class found in fewer groups
 * than folds.
 */
export function smallClassWarnings(input: PlanInput, classes: CodeIndex, k: number, groups?: CodeIndex): string[] {
  const warnings: string[] = [];
  const folds = countOf(k, 'fold');
  let groupsOfClass: Int32Array | undefined;
  if (groups) {
    groupsOfClass = new Int32Array(classes.count);
    const seen = new Set<number>();
    for (let i = 0; i < input.n; i++) {
      const key = groups.ids[i] * classes.count + classes.ids[i];
      if (!seen.has(key)) {
        seen.add(key);
        groupsOfClass[classes.ids[i]]++;
      }
    }
  }
  for (let c = 0; c < classes.count; c++) {
    const name = className(input, classes.codes[c]);
    if (classes.sizes[c] < k) {
      warnings.push(`class ${name} has ${countOf(classes.sizes[c], 'row')}, fewer than the ${folds}: some folds have none of it`);
    } else if (groupsOfClass && groupsOfClass[c] < k) {
      warnings.push(
        `class ${name} occurs in ${countOf(groupsOfClass[c], 'group')}, fewer than the ${folds}: some folds have none of it`,
      );
    }
  }
  return warnings;
}
