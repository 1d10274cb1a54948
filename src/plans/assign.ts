/**
 * Row-to-fold assignments of a built plan, as rows any tool can reuse: one entry per
 * (row, fold) membership with its role (train, test), plus the holdout rows of a holdout plan.
 */
import type { BuiltPlan } from './types.js';

export interface Membership {
  readonly row: number;
  readonly repeat: number;
  readonly fold: number;
  readonly role: 'train' | 'test' | 'holdout';
}

/** Memberships in a fixed order: by fold, then role (train before test), then row. */
export function memberships(plan: BuiltPlan): Membership[] {
  const out: Membership[] = [];
  for (const f of plan.folds) {
    for (const row of f.train) out.push({ row, repeat: f.repeat, fold: f.fold, role: 'train' });
    for (const row of f.test) out.push({ row, repeat: f.repeat, fold: f.fold, role: 'test' });
  }
  if (plan.holdout) for (const row of plan.holdout) out.push({ row, repeat: 0, fold: 0, role: 'holdout' });
  return out;
}
