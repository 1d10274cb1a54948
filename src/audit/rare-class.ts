/**
 * Classes the plan starves: a class of which a test fold holds fewer than
 * AUDIT_LIMITS.rareClassPerFold (2) rows on average has per-fold recall, precision and F1 that
 * are undefined or jump between 0 and 1, and with fewer rows than folds some test fold has none
 * of it at all (then "high"). Leave-one-out is skipped (one row per fold by design).
 *
 * Two findings, never both for one class:
 * - "few-per-fold" / "fewer-rows-than-folds" for a starved class that really is rare: its share
 *   of the used rows is below AUDIT_LIMITS.rareClassShare (0.5) times the even share 1/K (for
 *   two classes: below 25%). A rule of our own.
 * - "small-folds" when a starved class is not rare by that rule (a majority class, or any class
 *   of a small data set): the data set is too small for the plan's test folds, and the finding
 *   says so once, naming the plan, without calling any class rare.
 *
 * The advice names a plan that fixes it: the largest K <= the plan's folds for which every
 * test fold holds at least 2 rows of the starved class (K = floor(rows / 2), at least 2), and
 * when no K-fold plan can (fewer than 4 rows), repeats and pooled scores instead. It never
 * advises a plan with more folds than the current one.
 */
import type { Problem } from '../data/problem.js';
import type { BuiltPlan, PlanSpec } from '../plans/types.js';
import { testShare } from './target-profile.js';
import { AUDIT_LIMITS, type Suspect } from './types.js';
import { count, fig, pct, q } from './wording.js';

/** What to do for a class of `rows` rows under `spec` (the plan text is `planText`). */
export function rareClassAdvice(rows: number, spec: PlanSpec, planText: string, whole = false): string {
  const its = whole ? 'the smallest class' : 'this class';
  const per = AUDIT_LIMITS.rareClassPerFold;
  const k = Math.floor(rows / per);
  if (spec.kind === 'kfold') {
    if (k >= 2 && k < spec.k) {
      return `use kfold:${k} (each test fold then holds about ${fig(rows / k, 1)} rows of ${its}) or repeat it (kfold:${k}x5), keep stratification on, and read the pooled out-of-fold scores per class`;
    }
    return `no k-fold plan gives every test fold ${per} rows of ${its} (${count(rows, 'row')}): repeat a 2-fold plan (such as kfold:2x10), keep stratification on, read the pooled out-of-fold scores per class, or collect more rows`;
  }
  return `repeat the plan more often or give the test part a larger share, keep stratification on, and read the pooled out-of-fold scores per class`;
}

export function rareClassSuspects(problem: Problem, plan: BuiltPlan, spec: PlanSpec, planText: string): Suspect[] {
  const y = problem.target;
  if (y.task !== 'classification' || spec.kind === 'loo') return [];
  const n = y.codes.length;
  const counts = new Array<number>(y.classes.length).fill(0);
  for (const c of y.codes) counts[c]++;
  const present = counts.filter((c) => c > 0).length;
  const share = testShare(plan, n);
  const rareBelow = AUDIT_LIMITS.rareClassShare / Math.max(1, present);
  const out: Suspect[] = [];
  const small: number[] = [];
  counts.forEach((c, k) => {
    if (c === 0) return;
    const perFold = c * share;
    if (perFold >= AUDIT_LIMITS.rareClassPerFold) return;
    if (c / n >= rareBelow) {
      small.push(k);
      return;
    }
    const empty = spec.kind === 'kfold' && c < plan.foldsPerRepeat;
    out.push({
      kind: 'rare-class',
      severity: empty ? 'high' : 'warn',
      columns: [problem.targetName],
      reasons: [empty ? 'fewer-rows-than-folds' : 'few-per-fold'],
      evidence: `class ${q(y.classes[k])} has ${count(c, 'row')} (${pct(c / n)}); a test fold of ${planText} holds ${fig(perFold, 1)} of them on average${empty ? ', so some test folds have none' : ''}`,
      action: rareClassAdvice(c, spec, planText),
      figures: { rows: c, perTestFold: perFold },
    });
  });
  if (small.length) {
    const fewest = small.reduce((a, b) => (counts[b] < counts[a] ? b : a));
    const c = counts[fewest];
    const empty = spec.kind === 'kfold' && c < plan.foldsPerRepeat;
    const listed = small.map((k) => `${q(y.classes[k])} ${fig(counts[k] * share, 1)}`).join(', ');
    out.push({
      kind: 'rare-class',
      severity: empty ? 'high' : 'warn',
      columns: [problem.targetName],
      reasons: ['small-folds'],
      evidence: `the data set is small for ${planText}: a test fold holds ${fig(n * share, 1)} of the ${count(n, 'used row')} on average, and fewer than ${AUDIT_LIMITS.rareClassPerFold} rows per class (${listed})${empty ? ', so some test folds lack a class' : ''}`,
      action: rareClassAdvice(c, spec, planText, true),
      figures: { rows: n, perTestFold: n * share, smallestClassRows: c },
    });
  }
  return out;
}
