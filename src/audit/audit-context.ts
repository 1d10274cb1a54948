/**
 * What every check of the audit reads: the problem, its features on the used rows (presorted),
 * the intended plan built by planFor exactly as eval builds it, and the folds the
 * single-feature scores use (repeat 0 of that plan, or kfold:5 built the same way when the plan
 * has more than AUDIT_LIMITS.maxScoreFolds folds per repeat).
 */
import type { Problem } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { UsageError } from '../errors.js';
import { formatPlan } from '../plans/index.js';
import type { Fold, PlanSpec } from '../plans/types.js';
import { planFor, type PlannedProblem } from '../plans/plan-for.js';
import { featuresOf, type FeatureData } from './feature-data.js';
import { sampleHow, sampleRows, subProblem, type AuditSample } from './sample.js';
import { AUDIT_LIMITS } from './types.js';

export interface AuditContext {
  readonly table: Table;
  readonly problem: Problem;
  readonly features: readonly FeatureData[];
  readonly spec: PlanSpec;
  readonly planText: string;
  readonly planned: PlannedProblem;
  readonly seed: number;
  /**
   * what the scored checks read (sample.ts): the problem and its features, the same as
   * `problem` and `features` up to AUDIT_LIMITS.sampleRows used rows, else a seeded sample
   */
  readonly scoreProblem: Problem;
  readonly scoreFeatures: readonly FeatureData[];
  /** set when the scored checks ran on a sample */
  readonly sample?: AuditSample;
  /** folds of the single-feature scores (over the rows of scoreProblem) and the text of their plan */
  readonly scoreFolds: readonly Fold[];
  readonly scorePlanText: string;
  /** used row -> table row, for line numbers in evidence */
  readonly lineOf: (i: number) => number;
  readonly warnings: string[];
}

export const SCORE_FALLBACK_PLAN: PlanSpec = { kind: 'kfold', k: 5, repeats: 1 };

/** Checks a seed: a whole number from 0 to 2^32-1 (the message of eval's --seed check). */
export function checkAuditSeed(seed: number): number {
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new UsageError(`--seed ${seed}: expected a whole number from 0 to 4294967295`);
  }
  return seed;
}

/** Checks the cluster threshold: a number above 0 and at most 1. */
export function checkClusterThreshold(r: number): number {
  if (typeof r !== 'number' || !(r > 0 && r <= 1)) {
    throw new UsageError(`--cluster-threshold ${r}: expected a number above 0 and at most 1 (such as 0.9)`);
  }
  return r;
}

export function auditContext(
  problem: Problem,
  spec: PlanSpec,
  stratify: boolean | undefined,
  seed: number,
  planned: PlannedProblem = planFor(problem, spec, stratify, seed),
): AuditContext {
  const warnings: string[] = [];
  const features = featuresOf(problem);
  let scoreProblem = problem;
  let scoreFeatures: readonly FeatureData[] = features;
  let scorePlanned = planned;
  let sample: AuditSample | undefined;
  if (problem.rows.length > AUDIT_LIMITS.sampleRows) {
    scoreProblem = subProblem(problem, sampleRows(problem.target, AUDIT_LIMITS.sampleRows, seed));
    scoreFeatures = featuresOf(scoreProblem);
    scorePlanned = planFor(scoreProblem, spec, stratify, seed);
    sample = { rows: AUDIT_LIMITS.sampleRows, of: problem.rows.length, seed, how: sampleHow(problem.target) };
    warnings.push(
      `audit: ${problem.rows.length} used rows are above the audit's limit of ${AUDIT_LIMITS.sampleRows}, so the scored checks (single-feature scores, leakage, missingness, associations, clusters) ran on a sample of ${AUDIT_LIMITS.sampleRows} rows drawn ${sample.how} (seed ${seed}); duplicates, constant, id-like and level counts read every row`,
    );
  }
  let scoreFolds: readonly Fold[] = scorePlanned.plan.folds.filter((f) => f.repeat === 0);
  let scorePlanText = formatPlan(spec);
  if (scorePlanned.plan.foldsPerRepeat > AUDIT_LIMITS.maxScoreFolds) {
    const fallback = planFor(scoreProblem, SCORE_FALLBACK_PLAN, stratify, seed);
    scoreFolds = fallback.plan.folds;
    scorePlanText = formatPlan(SCORE_FALLBACK_PLAN);
    warnings.push(
      `audit: the plan ${formatPlan(spec)} has ${scorePlanned.plan.foldsPerRepeat} folds per repeat, so the single-feature scores use ${scorePlanText} built from the same seed instead`,
    );
  }
  const table = problem.table;
  return {
    table,
    problem,
    features,
    scoreProblem,
    scoreFeatures,
    ...(sample ? { sample } : {}),
    spec,
    planText: formatPlan(spec),
    planned,
    seed,
    scoreFolds,
    scorePlanText,
    lineOf: (i) => table.lines[problem.rows[i]],
    warnings,
  };
}
