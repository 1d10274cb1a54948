/**
 * `audit(table, options)`: everything in the data that could make a cross-validated score a
 * lie, found before any learner is trusted. The problem and the intended plan are built
 * exactly as `eval` builds them (defineProblem, planFor with the run's seed), so duplicate
 * straddling and the single-feature scores refer to the folds eval would use. Pure: no
 * printing, no clock, no randomness beyond the plan's seeded generator.
 */
import { dataSection, defineProblem } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { parsePlan } from '../plans/index.js';
import { checkSeed, DEFAULT_PLAN, DEFAULT_SEED } from '../plans/defaults.js';
import { VERSION } from '../version.js';
import { auditContext, checkClusterThreshold } from './audit-context.js';
import { clusterSuspects, findClusters } from './clusters.js';
import { profileColumns } from './column-profile.js';
import { fastChecks, sortSuspects } from './fast-checks.js';
import { recommendations } from './recommendations.js';
import { targetProfile } from './target-profile.js';
import { AUDIT_LIMITS, AUDIT_SCHEMA, type AuditOptions, type AuditReport } from './types.js';

export function audit(table: Table, options: AuditOptions): AuditReport {
  const seed = checkSeed(options.seed ?? DEFAULT_SEED);
  const threshold = checkClusterThreshold(options.clusterThreshold ?? AUDIT_LIMITS.clusterThreshold);
  const problem = defineProblem(table, options);
  const spec = typeof options.plan === 'object' ? options.plan : parsePlan(options.plan ?? DEFAULT_PLAN);
  const ctx = auditContext(problem, spec, options.stratify, seed);
  const { plan, stratified } = ctx.planned;

  const fast = fastChecks(ctx);
  const clusters = findClusters(ctx.scoreFeatures, ctx.scoreProblem.rows.length, fast.unusable, threshold, ctx.warnings);
  const positionOf = (name: string): number => table.byName.get(name)?.position ?? -1;
  const suspects = sortSuspects([...fast.suspects, ...clusterSuspects(clusters, threshold)], positionOf);
  const target = targetProfile(problem, plan);

  const warnings = [...table.warnings, ...plan.warnings];
  if (problem.excludedRows > 0) {
    warnings.push(`${problem.excludedRows} row${problem.excludedRows === 1 ? '' : 's'} with a missing target ("${problem.targetName}") left out`);
  }
  warnings.push(...ctx.warnings);
  const y = problem.target;
  return {
    schema: AUDIT_SCHEMA,
    tool: { name: 'foldwise', version: VERSION },
    command: 'audit',
    data: dataSection(problem),
    plan: {
      kind: spec.kind,
      text: ctx.planText,
      folds: plan.foldsPerRepeat,
      repeats: plan.repeats,
      stratified,
      ...(problem.groupName !== undefined ? { group: problem.groupName } : {}),
      ...(problem.orderName !== undefined ? { order: problem.orderName } : {}),
      seed,
    },
    settings: { clusterThreshold: threshold },
    ...(ctx.sample ? { sample: ctx.sample } : {}),
    columns: profileColumns(table, problem, ctx.features),
    target,
    suspects,
    recommendations: recommendations(suspects, target, spec, stratified),
    singleFeature: fast.singleFeature,
    clusters,
    duplicates: fast.duplicates,
    missingness: fast.missingness,
    warnings: [...new Set(warnings)],
  };
}
