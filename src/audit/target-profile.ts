/**
 * The target over the used rows. Classification: class counts and shares (classes in the
 * problem's order), the imbalance ratio (largest class count over smallest), the smallest
 * class, and how many of its rows one test fold of the plan holds on average (its count times
 * the mean test-fold size over the number of used rows). Regression: the summary of
 * numeric-summary.ts and the sample skewness of skewness.ts.
 */
import type { Problem } from '../data/problem.js';
import type { BuiltPlan } from '../plans/types.js';
import { sortedFromRuns, valueRuns } from './feature-data.js';
import { numericProfile } from './numeric-summary.js';
import { sampleSkewness } from './skewness.js';
import type { TargetProfile } from './types.js';

/** Mean test-fold size of a plan over its rows: the expected share of a class per test fold. */
export function testShare(plan: BuiltPlan, n: number): number {
  if (plan.folds.length === 0 || n === 0) return 0;
  return plan.folds.reduce((s, f) => s + f.test.length, 0) / plan.folds.length / n;
}

export function targetProfile(problem: Problem, plan: BuiltPlan): TargetProfile {
  const y = problem.target;
  const n = problem.rows.length;
  if (y.task === 'regression') {
    return { task: 'regression', summary: numericProfile(sortedFromRuns(valueRuns(y.values))), skewness: sampleSkewness(y.values) };
  }
  const counts = new Array<number>(y.classes.length).fill(0);
  for (const c of y.codes) counts[c]++;
  let lo = 0;
  let hi = 0;
  counts.forEach((c, k) => {
    if (c < counts[lo]) lo = k;
    if (c > counts[hi]) hi = k;
  });
  return {
    task: 'classification',
    classes: y.classes.map((name, k) => ({ name, count: counts[k], share: counts[k] / n })),
    imbalanceRatio: counts[hi] / counts[lo],
    smallest: { name: y.classes[lo], count: counts[lo] },
    foldsPerRepeat: plan.foldsPerRepeat,
    smallestPerTestFold: counts[lo] * testShare(plan, n),
  };
}
