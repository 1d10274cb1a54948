/**
 * Per-column profile over every row of the table: inferred type, missing count and share,
 * distinct count; for numeric columns the five-number summary with mean and standard deviation
 * (see numeric-summary.ts); for categorical columns the most frequent levels with their counts
 * (ties in order of first appearance) and the number of rows in all other levels.
 */
import type { Problem } from '../data/problem.js';
import type { Column, Table } from '../data/types.js';
import { distinctSorted, numericProfile, sortedPresent } from './numeric-summary.js';
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

export function profileColumn(col: Column, rows: number, role: ColumnProfile['role'], topLevels: number = AUDIT_LIMITS.topLevels): ColumnProfile {
  const base = {
    name: col.name,
    position: col.position,
    role,
    missing: col.missing,
    missingShare: rows > 0 ? col.missing / rows : 0,
  };
  if (col.kind === 'numeric') {
    const sorted = sortedPresent(col.values);
    return {
      ...base,
      type: col.dates ? 'date' : 'numeric',
      distinct: distinctSorted(sorted),
      ...(sorted.length > 0 ? { numeric: numericProfile(sorted) } : {}),
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

/** Profiles of every column of the table, in header order. */
export function profileColumns(table: Table, problem: Problem): ColumnProfile[] {
  return table.columns.map((c) => profileColumn(c, table.rows, roleOf(problem, c.name)));
}
