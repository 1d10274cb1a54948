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

/** Beyond this many small classes of one kind, their warnings are joined into one line. */
export const SMALL_CLASS_NAMED = 5;

/**
 * `class "reject" has 3 rows, fewer than the 5 folds: some folds have none of it`, for each
 * class with fewer rows than folds; with groups, also for each class found in fewer groups
 * than folds. With more than SMALL_CLASS_NAMED classes of one kind, one line names the first
 * SMALL_CLASS_NAMED (in class order) and counts the rest, so a target with hundreds of rare
 * classes does not print hundreds of lines.
 */
export function smallClassWarnings(input: PlanInput, classes: CodeIndex, k: number, groups?: CodeIndex): string[] {
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
  const fewRows: { name: string; count: number }[] = [];
  const fewGroups: { name: string; count: number }[] = [];
  for (let c = 0; c < classes.count; c++) {
    const name = className(input, classes.codes[c]);
    if (classes.sizes[c] < k) fewRows.push({ name, count: classes.sizes[c] });
    else if (groupsOfClass && groupsOfClass[c] < k) fewGroups.push({ name, count: groupsOfClass[c] });
  }
  const lines = (few: { name: string; count: number }[], unit: 'row' | 'group', one: (w: { name: string; count: number }) => string, many: string): string[] => {
    if (few.length <= SMALL_CLASS_NAMED) return few.map(one);
    const named = few.slice(0, SMALL_CLASS_NAMED).map((w) => `${w.name} (${countOf(w.count, unit)})`);
    return [`${few.length} classes ${many} than the ${folds}, so some folds have none of them: ${named.join(', ')} and ${few.length - SMALL_CLASS_NAMED} more`];
  };
  return [
    ...lines(fewRows, 'row', (w) => `class ${w.name} has ${countOf(w.count, 'row')}, fewer than the ${folds}: some folds have none of it`, 'have fewer rows'),
    ...lines(fewGroups, 'group', (w) => `class ${w.name} occurs in ${countOf(w.count, 'group')}, fewer than the ${folds}: some folds have none of it`, 'occur in fewer groups'),
  ];
}
