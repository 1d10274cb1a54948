/**
 * Rare classes the plan starves: a class of which a test fold holds fewer than
 * AUDIT_LIMITS.rareClassPerFold (2) rows on average has per-fold recall, precision and F1
 * that are undefined or jump between 0 and 1, and with fewer rows than folds some test fold
 * has none of it at all (then "high"). Leave-one-out is skipped (one row per fold by design).
 */
import type { Problem } from '../data/problem.js';
import type { BuiltPlan, PlanSpec } from '../plans/types.js';
import { testShare } from './target-profile.js';
import { AUDIT_LIMITS, type Suspect } from './types.js';
import { count, fig, pct, q } from './wording.js';

export function rareClassSuspects(problem: Problem, plan: BuiltPlan, spec: PlanSpec, planText: string): Suspect[] {
  const y = problem.target;
  if (y.task !== 'classification' || spec.kind === 'loo') return [];
  const n = y.codes.length;
  const counts = new Array<number>(y.classes.length).fill(0);
  for (const c of y.codes) counts[c]++;
  const share = testShare(plan, n);
  const out: Suspect[] = [];
  counts.forEach((c, k) => {
    const perFold = c * share;
    if (perFold >= AUDIT_LIMITS.rareClassPerFold) return;
    const empty = spec.kind === 'kfold' && c < plan.foldsPerRepeat;
    out.push({
      kind: 'rare-class',
      severity: empty ? 'high' : 'warn',
      columns: [problem.targetName],
      reasons: [empty ? 'fewer-rows-than-folds' : 'few-per-fold'],
      evidence: `class ${q(y.classes[k])} has ${count(c, 'row')} (${pct(c / n)}); a test fold of ${planText} holds ${fig(perFold, 1)} of them on average${empty ? ', so some test folds have none' : ''}`,
      action: 'use fewer folds (such as kfold:3) or repeated folds (such as kfold:3x5), keep stratification on, and read the pooled out-of-fold scores for this class',
      figures: { rows: c, perTestFold: perFold },
    });
  });
  return out;
}
