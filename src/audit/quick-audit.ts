/**
 * `quickSuspects(input, options) -> string[]`: the fast part of the audit (fast-checks.ts) as
 * one line per finding, for `eval` and `tune` to record in their reports (`audit`) and print
 * before they run. Only findings of severity "high" and "warn" are returned (notes stay in the
 * full `foldwise audit` report), most severe first, each as "<kind>: <evidence>; <action>".
 * `quickAudit` gives the same lines as warnings, each prefixed "audit: ".
 *
 * The input is a loaded Table (then `options` needs the target, as for `audit`) or an already
 * defined Problem. The plan and seed are required: they are the run's (this module imports
 * nothing from src/run/evaluate.ts, so evaluate.ts can import it without an import cycle).
 * `planned` lets a caller that has built the plan with planFor pass it in, so it is not built
 * twice (it must come from the same problem, spec, stratify and seed).
 */
import { defineProblem, type Problem, type ProblemOptions } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { UsageError } from '../errors.js';
import { parsePlan } from '../plans/index.js';
import type { PlanSpec } from '../plans/types.js';
import type { PlannedProblem } from '../plans/plan-for.js';
import { auditContext, checkAuditSeed } from './audit-context.js';
import { fastChecks, sortSuspects } from './fast-checks.js';
import type { Suspect } from './types.js';

export interface QuickAuditOptions {
  /** the run's plan, as text or spec (no default here: the caller's plan is the one to check) */
  readonly plan: string | PlanSpec;
  readonly stratify?: boolean;
  /** the run's seed */
  readonly seed: number;
  /** the plan as already built by planFor(problem, plan, stratify, seed) */
  readonly planned?: PlannedProblem;
}

function isProblem(input: Table | Problem): input is Problem {
  return 'targetName' in input && 'target' in input;
}

/** What a warning line of the audit starts with. */
export const AUDIT_WARNING_PREFIX = 'audit: ';

/** One line for a suspect: "<kind>: <evidence>; <action>". */
export function suspectLine(s: Suspect): string {
  return `${s.kind}: ${s.evidence}; ${s.action}`;
}

/** One warning line for a suspect. */
export function warningLine(s: Suspect): string {
  return `${AUDIT_WARNING_PREFIX}${suspectLine(s)}`;
}

/** The quick audit's findings as warning lines ("audit: <kind>: <evidence>; <action>"). */
export function quickAudit(input: Table | Problem, options: QuickAuditOptions & Partial<ProblemOptions>): string[] {
  return quickSuspects(input, options).map((line) => `${AUDIT_WARNING_PREFIX}${line}`);
}

export function quickSuspects(input: Table | Problem, options: QuickAuditOptions & Partial<ProblemOptions>): string[] {
  let problem: Problem;
  if (isProblem(input)) problem = input;
  else {
    if (options.target === undefined) throw new UsageError('quickAudit: a table needs options.target');
    problem = defineProblem(input, { target: options.target, drop: options.drop, task: options.task, group: options.group, order: options.order });
  }
  const seed = checkAuditSeed(options.seed);
  const spec = typeof options.plan === 'object' ? options.plan : parsePlan(options.plan);
  const ctx = auditContext(problem, spec, options.stratify, seed, options.planned);
  const found = fastChecks(ctx).suspects.filter((s) => s.severity !== 'note');
  const positionOf = (name: string): number => problem.table.byName.get(name)?.position ?? -1;
  return sortSuspects(found, positionOf).map(suspectLine);
}
