/**
 * The features of a problem restricted to its used rows (target present), prepared once for
 * every check: numeric values with the present rows presorted by value, or categorical codes
 * with level counts. Index i everywhere in src/audit is a used row of the problem.
 */
import type { Problem } from '../data/problem.js';
import type { Column } from '../data/types.js';

export type FeatureData =
  | {
      readonly kind: 'numeric';
      readonly name: string;
      readonly column: Column;
      /** value per used row, NaN when missing */
      readonly values: Float64Array;
      /** used rows with a present value, sorted by value (ties by row) */
      readonly order: Int32Array;
      readonly missing: number;
      readonly distinct: number;
      readonly dates: boolean;
    }
  | {
      readonly kind: 'categorical';
      readonly name: string;
      readonly column: Column;
      /** level code per used row, -1 when missing */
      readonly codes: Int32Array;
      readonly levels: readonly string[];
      /** used rows per level */
      readonly counts: Int32Array;
      readonly missing: number;
      readonly distinct: number;
    };

/** Number of distinct present values of a feature on the used rows. */
function distinctOf(values: Float64Array, order: Int32Array): number {
  let d = order.length > 0 ? 1 : 0;
  for (let j = 1; j < order.length; j++) if (values[order[j]] !== values[order[j - 1]]) d++;
  return d;
}

/**
 * The rows with a present value, sorted by value, ties by row: the values are sorted natively
 * (no comparison callback), then each row is placed at the first sorted position of its value
 * (binary search) plus the number of earlier rows with that value.
 */
export function argsortPresent(values: Float64Array): Int32Array {
  const n = values.length;
  let m = 0;
  for (let i = 0; i < n; i++) if (!Number.isNaN(values[i])) m++;
  const sorted = new Float64Array(m);
  m = 0;
  for (let i = 0; i < n; i++) if (!Number.isNaN(values[i])) sorted[m++] = values[i];
  sorted.sort();
  const order = new Int32Array(m);
  const taken = new Int32Array(m);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (Number.isNaN(v)) continue;
    let lo = 0;
    let hi = m;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (sorted[mid] < v) lo = mid + 1;
      else hi = mid;
    }
    order[lo + taken[lo]++] = i;
  }
  return order;
}

export function featureData(problem: Problem, col: Column): FeatureData {
  const rows = problem.rows;
  const n = rows.length;
  if (col.kind === 'numeric') {
    const values = new Float64Array(n);
    for (let i = 0; i < n; i++) values[i] = col.values[rows[i]];
    const order = argsortPresent(values);
    return {
      kind: 'numeric',
      name: col.name,
      column: col,
      values,
      order,
      missing: n - order.length,
      distinct: distinctOf(values, order),
      dates: col.dates === true,
    };
  }
  const codes = new Int32Array(n);
  for (let i = 0; i < n; i++) codes[i] = col.codes[rows[i]];
  const counts = new Int32Array(col.levels.length);
  let missing = 0;
  for (let i = 0; i < n; i++) {
    if (codes[i] < 0) missing++;
    else counts[codes[i]]++;
  }
  let distinct = 0;
  for (const c of counts) if (c > 0) distinct++;
  return { kind: 'categorical', name: col.name, column: col, codes, levels: col.levels, counts, missing, distinct };
}

/** Feature data of every feature of the problem, in feature order. */
export function featuresOf(problem: Problem): FeatureData[] {
  return problem.features.map((c) => featureData(problem, c));
}

/** True when used row i has a value for the feature. */
export function isPresent(f: FeatureData, i: number): boolean {
  return f.kind === 'numeric' ? !Number.isNaN(f.values[i]) : f.codes[i] >= 0;
}

/**
 * True when a categorical feature has at most one level per 5 present rows: only then is a
 * chi-square based association (Cramer's V) not inflated by sparse levels (a column with a
 * level per row has V = 1 against anything). Rule of thumb in the spirit of Cochran (1954),
 * "expected counts of about 5"; see chi-square.ts.
 */
export function fewLevels(f: FeatureData, n: number): boolean {
  return f.kind === 'categorical' && f.distinct >= 2 && f.distinct <= (n - f.missing) / 5;
}
