/**
 * Murphy's (1973) partition of the Brier score into reliability, resolution and uncertainty,
 * in the vector form that matches foldwise's multi-class `brier`. Group the rows by their
 * probability vector (rows whose vectors are equal in every class share a group); for group g
 * with n_g rows, forecast vector f_g and observed class shares o_g (the share of its rows in
 * each class), and overall class shares obar,
 *
 *   reliability = (1/n) sum_g n_g * sum_k (f_gk - o_gk)^2       (lower is better)
 *   resolution  = (1/n) sum_g n_g * sum_k (o_gk - obar_k)^2     (higher is better)
 *   uncertainty = sum_k obar_k * (1 - obar_k)                    (a property of the data)
 *
 * and brier = reliability - resolution + uncertainty holds exactly (up to rounding). Binning
 * the forecasts instead of grouping equal ones would break the identity (extra within-bin
 * terms), so none is done here. With continuous probabilities nearly every row is its own
 * group; the parts are then exact but reliability and resolution both run high, and the
 * reliability curve (binned) is the better picture.
 *
 * Two classes: every part is twice the one-column form (p - y)^2, as `brier` is.
 *
 * Source: Murphy (1973), "A new vector partition of the probability score", Journal of
 * Applied Meteorology 12:595-600 (free from the AMS archive).
 */
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

export interface BrierParts {
  readonly brier: number;
  readonly reliability: number;
  readonly resolution: number;
  readonly uncertainty: number;
  /** number of distinct probability vectors */
  readonly groups: number;
}

/**
 * Whether the rows' probability vectors take at most `limit` distinct values; stops reading at
 * the first vector past the limit, so it is cheap on continuous forecasts (where the partition
 * says little: nearly every row is its own group).
 */
export function fewForecasts(proba: Float64Array, classes: number, limit: number): boolean {
  const seen = new Set<string>();
  const n = proba.length / classes;
  for (let i = 0; i < n; i++) {
    seen.add(Array.prototype.join.call(proba.subarray(i * classes, (i + 1) * classes), ','));
    if (seen.size > limit) return false;
  }
  return true;
}

export function brierParts(input: ClassificationInput): BrierParts {
  const proba = checkProbabilities('brier_parts', input);
  const { actual, classes } = input;
  const n = actual.length;
  // group rows by their exact probability vector (key: the vector's numbers as text)
  const groupOf = new Map<string, number>();
  const first: number[] = [];
  const counts: number[] = [];
  const hits: number[] = []; // groups x classes, flat
  const total = new Float64Array(classes);
  let brier = 0;
  for (let i = 0; i < n; i++) {
    const row = proba.subarray(i * classes, (i + 1) * classes);
    const key = Array.prototype.join.call(row, ',');
    let g = groupOf.get(key);
    if (g === undefined) {
      g = counts.length;
      groupOf.set(key, g);
      first.push(i);
      counts.push(0);
      for (let k = 0; k < classes; k++) hits.push(0);
    }
    counts[g]++;
    hits[g * classes + actual[i]]++;
    total[actual[i]]++;
    for (let k = 0; k < classes; k++) {
      const d = row[k] - (k === actual[i] ? 1 : 0);
      brier += d * d;
    }
  }
  let reliability = 0;
  let resolution = 0;
  for (let g = 0; g < counts.length; g++) {
    const f = first[g] * classes;
    for (let k = 0; k < classes; k++) {
      const o = hits[g * classes + k] / counts[g];
      reliability += counts[g] * (proba[f + k] - o) ** 2;
      resolution += counts[g] * (o - total[k] / n) ** 2;
    }
  }
  let uncertainty = 0;
  for (let k = 0; k < classes; k++) uncertainty += (total[k] / n) * (1 - total[k] / n);
  return { brier: brier / n, reliability: reliability / n, resolution: resolution / n, uncertainty, groups: counts.length };
}
