/**
 * Per-column profile over every row of the table: inferred type, missing count and share,
 * distinct count; for numeric columns the five-number summary with mean and standard deviation
 * (see numeric-summary.ts); for categorical columns the most frequent levels with their counts
 * (ties in order of first appearance) and the number of rows in all other levels.
 *
 * A numeric column is read in one hashing pass (valueRuns in feature-data.ts: the rows of each
 * distinct value), not sorted row by row; the sorted values the summary reads are written out
 * from those runs, so the figures are those of a sort. When every row of the table is used, a
 * feature's runs from the audit's features are reused instead of counted again.
 */
import type { Problem } from '../data/problem.js';
import type { Column, Table } from '../data/types.js';
import { sortedFromRuns, valueRuns, type FeatureData, type ValueRuns } from './feature-data.js';
import { numericProfile } from './numeric-summary.js';
import { AUDIT_LIMITS, type ColumnProfile } from './types.js';

/** The role a column plays in the problem. */
export function roleOf(problem: Problem, name: string): ColumnProfile['role'] {
  if (name === problem.targetName) return 'target';
  if (name === problem.groupName) return 'group';
  if (name === problem.orderName) return 'order';
  return problem.dropped.includes(name) ? 'dropped' : 'feature';
}

/** Level counts of a categorical column over all rows (index = code). */
export function levelCounts(codes: Int32Array, levels: number): Int32Array {
  const counts = new Int32Array(levels);
  for (let i = 0; i < codes.length; i++) if (codes[i] >= 0) counts[codes[i]]++;
  return counts;
}

export function profileColumn(
  col: Column,
  rows: number,
  role: ColumnProfile['role'],
  topLevels: number = AUDIT_LIMITS.topLevels,
  runs?: ValueRuns,
): ColumnProfile {
  const base = {
    name: col.name,
    position: col.position,
    role,
    missing: col.missing,
    missingShare: rows > 0 ? col.missing / rows : 0,
  };
  if (col.kind === 'numeric') {
    const r = runs ?? valueRuns(col.values.subarray(0, rows));
    return {
      ...base,
      type: col.dates ? 'date' : 'numeric',
      distinct: r.uniques.length,
      ...(r.present > 0 ? { numeric: numericProfile(sortedFromRuns(r)) } : {}),
    };
  }
  const counts = levelCounts(col.codes, col.levels.length);
  const order = Array.from(counts.keys()).filter((k) => counts[k] > 0);
  order.sort((a, b) => counts[b] - counts[a] || a - b);
  const top = order.slice(0, topLevels).map((k) => ({ level: col.levels[k], count: counts[k] }));
  const present = rows - col.missing;
  const otherRows = present - top.reduce((s, t) => s + t.count, 0);
  return { ...base, type: 'categorical', distinct: order.length, levels: { top, otherRows } };
}

/**
 * Profiles of every column of the table, in header order. `features` (the audit's, over the
 * used rows) lend their value runs to their columns when the used rows are all the table's rows.
 */
export function profileColumns(table: Table, problem: Problem, features: readonly FeatureData[] = []): ColumnProfile[] {
  const lent = new Map<Column, ValueRuns>();
  if (problem.rows.length === table.rows) {
    for (const f of features) if (f.kind === 'numeric' && f.values.length === table.rows) lent.set(f.column, { uniques: f.uniques, runs: f.runs, present: table.rows - f.missing });
  }
  return table.columns.map((c) => profileColumn(c, table.rows, roleOf(problem, c.name), AUDIT_LIMITS.topLevels, lent.get(c)));
}
