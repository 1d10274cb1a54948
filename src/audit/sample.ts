/**
 * The audit's sample for large files (issue #14): above AUDIT_LIMITS.sampleRows used rows, the
 * scored checks (single-feature scores and the leakage they feed, informative missingness,
 * strong associations, the shared-outcome part of group-like, correlated clusters) run on a
 * seeded stratified sample of exactly AUDIT_LIMITS.sampleRows rows, while the exact checks
 * (duplicate and conflicting rows, constant and near-constant, id-like, high-cardinality,
 * rare classes, date-like, missing markers) read every row.
 *
 * How it is drawn: strata are the classes (classification) or ten bins of equal count of the
 * sorted target (regression; ties split by row order). Each stratum gets its proportional
 * share of the sample, floor(n_s m / n), and the m - sum of floors remaining rows go one each
 * to the strata with the largest remainders (lowest stratum first on a tie): largest remainder
 * (Hamilton) apportionment. Within a stratum the rows are shuffled (Fisher-Yates) with a
 * generator seeded from the run's seed and the label "audit-sample", and the first quota kept.
 * The sample is returned in ascending row order, so the plan built on it is the plan's own
 * rule applied to the sample.
 */
import type { Problem } from '../data/problem.js';
import type { Target } from '../learning.js';
import { createRng, deriveSeed, shuffleInPlace } from '../rng.js';
import { argsortPresent } from './feature-data.js';

export interface AuditSample {
  /** rows in the sample and used rows in all */
  readonly rows: number;
  readonly of: number;
  readonly seed: number;
  /** "stratified by class" or "stratified by target decile" */
  readonly how: string;
}

/** Stratum per used row: the class, or the decile of the sorted target. */
function strata(y: Target): { ids: Int32Array; count: number } {
  if (y.task === 'classification') return { ids: y.codes, count: y.classes.length };
  const n = y.values.length;
  const order = argsortPresent(y.values);
  const ids = new Int32Array(n);
  for (let r = 0; r < order.length; r++) ids[order[r]] = Math.min(9, Math.floor((10 * r) / n));
  return { ids, count: 10 };
}

/** Used-row indices of the sample, ascending. */
export function sampleRows(y: Target, m: number, seed: number): Int32Array {
  const { ids, count } = strata(y);
  const n = ids.length;
  const members: number[][] = Array.from({ length: count }, () => []);
  for (let i = 0; i < n; i++) members[ids[i]].push(i);
  const quota = members.map((s) => Math.floor((s.length * m) / n));
  let left = m - quota.reduce((a, b) => a + b, 0);
  const byRemainder = members
    .map((s, k) => ({ k, r: (s.length * m) / n - quota[k] }))
    .sort((a, b) => b.r - a.r || a.k - b.k);
  for (const { k } of byRemainder) {
    if (left <= 0) break;
    if (quota[k] < members[k].length) {
      quota[k]++;
      left--;
    }
  }
  const rng = createRng(deriveSeed(seed, 'audit-sample'));
  const out: number[] = [];
  members.forEach((s, k) => {
    const rows = shuffleInPlace(Int32Array.from(s), rng);
    for (let j = 0; j < quota[k]; j++) out.push(rows[j]);
  });
  return Int32Array.from(out).sort();
}

/** The problem restricted to used rows `pick` (ascending used-row indices). */
export function subProblem(problem: Problem, pick: Int32Array): Problem {
  const y = problem.target;
  const take = <T extends Int32Array | Float64Array>(a: T): T => {
    const out = new (a.constructor as new (n: number) => T)(pick.length);
    for (let j = 0; j < pick.length; j++) out[j] = a[pick[j]];
    return out;
  };
  const target: Target = y.task === 'classification' ? { task: 'classification', codes: take(y.codes), classes: y.classes } : { task: 'regression', values: take(y.values) };
  return {
    ...problem,
    rows: take(problem.rows),
    target,
    ...(problem.groups ? { groups: take(problem.groups) } : {}),
    ...(problem.order ? { order: take(problem.order) } : {}),
  };
}

export function sampleHow(y: Target): string {
  return y.task === 'classification' ? 'stratified by class' : 'stratified by target decile';
}
