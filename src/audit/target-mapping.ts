/**
 * Does a feature map onto the target? Over the used rows where the feature is present (at
 * least AUDIT_LIMITS.minRows of them):
 *
 * - classification, "one-to-one": every distinct feature value occurs with a single class and
 *   there are as many values as classes, so value and class are a relabelling of each other;
 * - classification, "determines": every value occurs with a single class, with more values
 *   than classes but at most one value per 5 rows (so it is not merely unique per row);
 * - regression, "one-to-one": a numeric feature whose sorted distinct values carry strictly
 *   increasing (or strictly decreasing) targets, equal values equal targets (Spearman's rho
 *   of exactly +1 or -1 without ties broken), with at least 3 distinct targets;
 * - regression, "determines": a categorical feature whose every level has a single target
 *   value, with at least 3 levels and at most one level per 5 rows.
 *
 * Any of these is a copy or recoding of the target unless the relation is known to hold at
 * prediction time. Pure definitions; no source needed beyond that of a function.
 */
import type { Target } from '../learning.js';
import type { FeatureData } from './feature-data.js';
import { AUDIT_LIMITS } from './types.js';

export interface TargetMapping {
  readonly reason: 'one-to-one' | 'determines';
  /** distinct feature values among the present rows */
  readonly values: number;
  /** present rows the mapping holds on */
  readonly rows: number;
}

/** Distinct values of a feature as group ids over the present used rows, with their count. */
function valueIds(f: FeatureData, n: number): { ids: Int32Array; count: number; present: number } {
  const ids = new Int32Array(n).fill(-1);
  if (f.kind === 'categorical') {
    const remap = new Int32Array(f.levels.length).fill(-1);
    let count = 0;
    let present = 0;
    for (let i = 0; i < n; i++) {
      const c = f.codes[i];
      if (c < 0) continue;
      present++;
      if (remap[c] < 0) remap[c] = count++;
      ids[i] = remap[c];
    }
    return { ids, count, present };
  }
  let count = 0;
  const order = f.order;
  for (let j = 0; j < order.length; j++) {
    if (j > 0 && f.values[order[j]] !== f.values[order[j - 1]]) count++;
    ids[order[j]] = count;
  }
  return { ids, count: order.length ? count + 1 : 0, present: order.length };
}

export function targetMapping(f: FeatureData, y: Target, minRows: number = AUDIT_LIMITS.minRows): TargetMapping | null {
  const n = y.task === 'classification' ? y.codes.length : y.values.length;
  const { ids, count, present } = valueIds(f, n);
  if (present < minRows || count < 2) return null;
  const targetOf = (i: number): number => (y.task === 'classification' ? y.codes[i] : y.values[i]);
  // the single target value of each feature value, or NaN when it has more than one
  const single = new Float64Array(count).fill(Infinity);
  for (let i = 0; i < n; i++) {
    const v = ids[i];
    if (v < 0) continue;
    const t = targetOf(i);
    if (single[v] === Infinity) single[v] = t;
    else if (single[v] !== t) single[v] = NaN;
  }
  if (single.some((s) => Number.isNaN(s))) return null;
  const targets = new Set(single).size;
  if (targets < 2) return null;
  const fewValues = count <= present / 5;
  if (y.task === 'classification') {
    if (count === targets) return { reason: 'one-to-one', values: count, rows: present };
    return fewValues ? { reason: 'determines', values: count, rows: present } : null;
  }
  if (f.kind === 'categorical') return fewValues && count >= 3 ? { reason: 'determines', values: count, rows: present } : null;
  if (targets < 3 || targets !== count) return null;
  // ids follow the sorted order of the feature: check the targets are strictly monotone in it
  let up = true;
  let down = true;
  for (let v = 1; v < count; v++) {
    if (!(single[v] > single[v - 1])) up = false;
    if (!(single[v] < single[v - 1])) down = false;
  }
  return up || down ? { reason: 'one-to-one', values: count, rows: present } : null;
}

export interface TargetMeanCoding {
  /** distinct values of the feature */
  readonly values: number;
  /** present rows */
  readonly rows: number;
  /** largest |value - mean target of its rows| */
  readonly gap: number;
}

/**
 * Target encoding on all rows: a numeric feature whose every distinct value v equals, within
 * rounding, the mean target of the used rows holding v (for classification the share of one
 * class c among them, for the c that fits best). Rounding: half a unit of the last decimal the
 * values are written with (at most 6 decimals) plus 1e-9. Needs at least 5 distinct values,
 * at least AUDIT_LIMITS.minRows present rows, and at most one distinct value per 2 present rows
 * (an encoded column has a value per level; a feature unique per row matches nothing by
 * construction unless it is the target itself, which one-to-one and near-perfect catch). A rule of our own: an honest feature equals the
 * mean of the target over its own rows only by accident, and then for few values.
 */
export function targetMeanCoding(f: FeatureData, y: Target): TargetMeanCoding | null {
  if (f.kind !== 'numeric' || f.values.length - f.missing < AUDIT_LIMITS.minRows) return null;
  const order = f.order;
  // runs of equal values in sorted order
  const starts: number[] = [];
  for (let j = 0; j < order.length; j++) if (j === 0 || f.values[order[j]] !== f.values[order[j - 1]]) starts.push(j);
  // a value per level of an encoded column: at most one value per 2 rows on average
  if (starts.length < 5 || starts.length > order.length / 2) return null;
  // decimals written: the most among (up to 200 of) the values, capped at 6, from their shortest text
  let decimals = 0;
  const step = Math.max(1, Math.floor(starts.length / 200));
  for (let r = 0; r < starts.length; r += step) {
    const j = starts[r];
    const t = String(f.values[order[j]]);
    const dot = t.indexOf('.');
    if (t.includes('e')) decimals = 6;
    else if (dot >= 0) decimals = Math.max(decimals, Math.min(6, t.length - dot - 1));
  }
  const tol = 0.5 * 10 ** -decimals + 1e-9;
  const classes = y.task === 'classification' ? y.classes.length : 1;
  let best: number | null = null;
  for (let c = 0; c < classes; c++) {
    let gap = 0;
    for (let r = 0; r < starts.length && gap <= tol; r++) {
      const end = r + 1 < starts.length ? starts[r + 1] : order.length;
      let sum = 0;
      for (let j = starts[r]; j < end; j++) {
        const i = order[j];
        sum += y.task === 'classification' ? (y.codes[i] === c ? 1 : 0) : y.values[i];
      }
      gap = Math.max(gap, Math.abs(sum / (end - starts[r]) - f.values[order[starts[r]]]));
    }
    if (gap <= tol && (best === null || gap < best)) best = gap;
  }
  return best === null ? null : { values: starts.length, rows: order.length, gap: best };
}
