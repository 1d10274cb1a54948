/**
 * Resampling plans. A plan spec is parsed from text (`kfold:10`, `kfold:5x3`, `loo`,
 * `resplit:20@0.25`, `holdout:0.6/0.2/0.2`, `forward:5`) and built into folds over the rows.
 */
import type { Rng } from '../rng.js';

export const PLAN_KINDS = ['kfold', 'loo', 'resplit', 'holdout', 'forward'] as const;
export type PlanKind = (typeof PLAN_KINDS)[number];

export type PlanSpec =
  | { readonly kind: 'kfold'; readonly k: number; readonly repeats: number }
  | { readonly kind: 'loo' }
  | { readonly kind: 'resplit'; readonly splits: number; readonly testFraction: number }
  | { readonly kind: 'holdout'; readonly train: number; readonly validation: number; readonly holdout: number }
  | { readonly kind: 'forward'; readonly k: number };

/** One train/test split. Indices are row positions in the plan's input (0..n-1), ascending. */
export interface Fold {
  /** 0-based repeat number */
  readonly repeat: number;
  /** 0-based fold number within the repeat */
  readonly fold: number;
  readonly train: Int32Array;
  readonly test: Int32Array;
}

export interface PlanInput {
  /** number of rows */
  readonly n: number;
  /** class code per row, when the plan should stratify */
  readonly strata?: Int32Array;
  /** names of the strata codes, for warnings */
  readonly strataNames?: readonly string[];
  /** group code per row (0..G-1): no group is split across train and test */
  readonly groups?: Int32Array;
  /** the order column for forward plans; ties never straddle a boundary */
  readonly order?: Float64Array;
  readonly rng: Rng;
}

export interface BuiltPlan {
  readonly folds: readonly Fold[];
  /** rows set aside by a holdout plan; scored only on request */
  readonly holdout?: Int32Array;
  readonly repeats: number;
  readonly foldsPerRepeat: number;
  readonly warnings: readonly string[];
}
