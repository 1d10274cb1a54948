/**
 * Whether two eval reports can be compared fold by fold, and if not, exactly what differs.
 *
 * Two runs see the same folds when they read the same data (data.sha256, data.rowsUsed), predict
 * the same target as the same task, and build the same plan (plan.text, plan.seed,
 * plan.stratified, plan.group, plan.order): the plan is a pure function of these (see
 * src/run/plan-for.ts). They report the same things when their metric sets match.
 *
 * Each difference has a kind:
 *   "data"  - the runs measure different things (data, rows, target, task, metric set, group,
 *             order): never comparable;
 *   "folds" - the runs measure the same thing on different folds (plan text, seed,
 *             stratification): `compare` refuses them, `gate` falls back to its unpaired rule.
 * A group or order change counts as "data": a grouped or time-ordered plan estimates a different
 * quantity (performance on new groups, on the future), not the same one on other folds.
 * Features, dropped columns, imputation and learner options may differ: they are what a change
 * under test changes. The --costs matrix (settings.costs: classes and entries) must match, as a
 * "data" difference: the `cost` metric of another matrix measures another thing.
 *
 * A report scored from a predictions file (`foldwise score`, with a `source`) has no data file or
 * plan of its own: it matches another report when both know their fold assignment (which rows
 * each fold tests, plan.assignment) and it is the same, with the same task and metric set.
 */
import { InputError } from '../errors.js';
import type { Report } from '../model/report.js';

export interface ReportDifference {
  /** dotted field name, e.g. "plan.seed" */
  readonly field: string;
  readonly a: string;
  readonly b: string;
  readonly kind: 'data' | 'folds';
}

const show = (v: string | number | boolean | undefined): string => (v === undefined ? 'none' : String(v));
const hash = (v: string | number | boolean | undefined): string => {
  const t = show(v);
  return t.length > 12 ? `${t.slice(0, 12)}…` : t;
};

/** The --costs matrix as compared: its classes and entries (the file's layout and bytes do not count). */
const matrixOf = (r: Report): string | undefined => (r.settings.costs ? JSON.stringify([r.settings.costs.classes, r.settings.costs.matrix]) : undefined);

export function reportDifferences(a: Report, b: Report): ReportDifference[] {
  const out: ReportDifference[] = [];
  const add = (field: string, x: string | number | boolean | undefined, y: typeof x, kind: ReportDifference['kind'], fmt = show): void => {
    if (x !== y) out.push({ field, a: fmt(x), b: fmt(y), kind });
  };
  // a different cost matrix scores a different quantity under the same metric name
  if (matrixOf(a) !== matrixOf(b)) {
    const which = (r: Report): string => (r.settings.costs ? `matrix of file SHA-256 ${r.settings.costs.sha256.slice(0, 12)}…` : 'none');
    out.push({ field: 'settings.costs', a: which(a), b: which(b), kind: 'data' });
  }
  if (a.source || b.source) {
    // a report scored from a predictions file: the same folds are the same rows in the same
    // folds (the fold assignment fingerprint); an unknown assignment never matches
    const [x, y] = [a.plan.assignment, b.plan.assignment];
    if (x === undefined || y === undefined || x !== y) out.push({ field: 'plan.assignment', a: x ? hash(x) : 'unknown', b: y ? hash(y) : 'unknown', kind: 'data' });
    add('data.task', a.data.task, b.data.task, 'data');
    add('metrics', [...a.metrics].sort().join(','), [...b.metrics].sort().join(','), 'data');
    return out;
  }
  add('data.sha256', a.data.sha256, b.data.sha256, 'data', hash);
  add('data.rowsUsed', a.data.rowsUsed, b.data.rowsUsed, 'data');
  add('data.target', a.data.target, b.data.target, 'data');
  add('data.task', a.data.task, b.data.task, 'data');
  const ma = [...a.metrics].sort().join(',');
  const mb = [...b.metrics].sort().join(',');
  add('metrics', ma, mb, 'data');
  add('plan.group', a.plan.group, b.plan.group, 'data');
  add('plan.order', a.plan.order, b.plan.order, 'data');
  add('plan.text', a.plan.text, b.plan.text, 'folds');
  add('plan.seed', a.plan.seed, b.plan.seed, 'folds');
  add('plan.stratified', a.plan.stratified, b.plan.stratified, 'folds');
  return out;
}

/** "data.sha256 (3f2a… vs 9c1b…) and plan.seed (1 vs 2)". */
export function describeDifferences(list: readonly ReportDifference[]): string {
  const parts = list.map((d) => `${d.field} (${d.a} vs ${d.b})`);
  return parts.length <= 1 ? parts.join('') : `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`;
}

/** The runs cannot be compared; `differences` says why (exit code 2, like any bad input). */
export class NotComparableError extends InputError {
  readonly differences: readonly ReportDifference[];
  readonly reason: string;
  constructor(command: string, differences: readonly ReportDifference[], reason?: string) {
    const why = reason ?? `the runs differ in ${describeDifferences(differences)}`;
    super(`${command}: ${why}; they are not comparable`);
    this.differences = differences;
    this.reason = why;
  }
}

/** A warning when the reports were made by different foldwise versions, or undefined. */
export function versionWarning(a: Report, b: Report): string | undefined {
  return a.tool.version === b.tool.version
    ? undefined
    : `the reports were made by foldwise ${a.tool.version} and ${b.tool.version}; pairing by (repeat, fold) assumes the plan code did not change between them`;
}
