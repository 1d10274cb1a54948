/**
 * Forward plans (`forward:K`), for rows in time order: sort the rows by the order column,
 * cut them into K + 1 contiguous blocks of nearly equal size, and let fold i (0..K-1) train on
 * blocks 0..i and test on block i + 1 (an expanding window; Hyndman & Athanasopoulos,
 * Forecasting: Principles and Practice, 3rd ed., section 5.10, "time series
 * cross-validation", free at otexts.com/fpp3).
 *
 * Cuts: the j-th cut (j = 1..K) aims at sorted position round(j n / (K + 1)) and moves forward
 * to the next place where the order value changes, so equal values are never split; if that
 * would leave too few such places for the cuts still to come, it takes the last place that
 * leaves enough. With groups, a cut is also never placed inside the sorted span of a group,
 * so no group is split either. Hence every test row's order value is greater than every
 * training row's in its fold. No randomness (one repeat, numbered 0); strata are not used.
 *
 * Errors: no order column (UsageError), rows without an order value (NaN), fewer than K + 1
 * rows, or ties (and groups) that allow fewer than K + 1 blocks.
 */
import { InputError, UsageError } from '../errors.js';
import { rowsWhere } from './assemble.js';
import { indexCodes } from './codes.js';
import { formatPlan } from './format.js';
import { countOf } from './input.js';
import type { BuiltPlan, Fold, PlanInput, PlanSpec } from './types.js';

type ForwardSpec = Extract<PlanSpec, { kind: 'forward' }>;

export function buildForward(spec: ForwardSpec, input: PlanInput): BuiltPlan {
  const { k } = spec;
  const { n, order } = input;
  const label = `--plan ${formatPlan(spec)}`;
  if (!order) throw new UsageError('forward plans need --order COL');
  let missing = 0;
  for (let i = 0; i < n; i++) if (Number.isNaN(order[i])) missing++;
  if (missing > 0) {
    throw new InputError(`${label}: ${countOf(missing, 'row')} ${missing === 1 ? 'has' : 'have'} no order value; drop or fill ${missing === 1 ? 'it' : 'them'}`);
  }
  const blocks = k + 1;
  if (n < blocks) throw new InputError(`${label} needs at least ${countOf(blocks, 'row')}; the data has ${countOf(n, 'row', 'usable')}`);

  const sorted = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => order[a] - order[b] || a - b);
  // cut p lies between sorted positions p - 1 and p; groups block the cuts inside their span
  const blocked = new Int32Array(n + 1);
  if (input.groups) {
    const groups = indexCodes(input.groups);
    const first = new Int32Array(groups.count).fill(n);
    const last = new Int32Array(groups.count).fill(-1);
    for (let p = 0; p < n; p++) {
      const g = groups.ids[sorted[p]];
      if (p < first[g]) first[g] = p;
      if (p > last[g]) last[g] = p;
    }
    for (let g = 0; g < groups.count; g++) {
      blocked[first[g] + 1]++;
      blocked[last[g] + 1]--;
    }
  }
  const cuts: number[] = [];
  let inside = 0;
  for (let p = 1; p < n; p++) {
    inside += blocked[p];
    if (inside === 0 && order[sorted[p - 1]] !== order[sorted[p]]) cuts.push(p);
  }
  if (cuts.length < k) {
    const by = input.groups ? 'ties in the order column and whole groups allow' : 'ties in the order column allow';
    throw new InputError(`${label} needs ${blocks} blocks of rows; ${by} only ${cuts.length + 1}`);
  }
  const block = new Int32Array(n);
  let prev = -1;
  let start = 0;
  for (let j = 1; j <= k; j++) {
    const aim = Math.round((j * n) / blocks);
    let next = prev + 1;
    while (next < cuts.length && cuts[next] < aim) next++;
    const at = Math.max(prev + 1, Math.min(next, cuts.length - 1 - (k - j)));
    for (let p = start; p < cuts[at]; p++) block[sorted[p]] = j - 1;
    start = cuts[at];
    prev = at;
  }
  for (let p = start; p < n; p++) block[sorted[p]] = k;
  const folds: Fold[] = [];
  for (let i = 0; i < k; i++) {
    folds.push({ repeat: 0, fold: i, train: rowsWhere(block, (b) => b <= i), test: rowsWhere(block, (b) => b === i + 1) });
  }
  return { folds, repeats: 1, foldsPerRepeat: k, warnings: [] };
}
