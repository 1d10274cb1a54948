/**
 * The `rebalance` option of the classifiers that weight their training rows (forest, tree,
 * logistic): `none` (every row weighs 1) or `equal`, where every class present in the training
 * rows gets the same total weight. A row of class k weighs
 *   n_max / n_k          (n_k rows of class k, n_max those of the most common class),
 * exactly as if every row of a rarer class had been listed n_max / n_k times (replication up to
 * the most common class's count; when the ratio is whole, the fit is that of the replicated
 * rows, which the tests check). So `minLeaf` still counts rows (a rare row counts as its
 * replicas, as a bootstrap repeat does) and a rare class counts as much as a common one in the
 * impurity or the log-likelihood. The weights are fixed on the training rows of each fit.
 * This is the inverse-frequency weighting of e.g. King & Zeng (2001), "Logistic regression in
 * rare events data", Political Analysis 9:137-163, sec. 4.2 (free preprint), and of the weighted
 * random forest of Chen, Liaw & Breiman (2004), "Using random forest to learn imbalanced data",
 * UC Berkeley tech. report 666 (free). It changes what is fitted, never how a metric is computed:
 * balanced accuracy and macro recall keep their meaning and are the scores it aims to raise.
 */
import { UsageError } from '../errors.js';
import type { ParamSpec } from '../learning.js';

export const REBALANCE_SPEC: ParamSpec = {
  name: 'rebalance',
  kind: 'choice',
  choices: ['none', 'equal'],
  default: 'none',
  doc: 'classification: none (every row weighs 1) or equal (each class present gets the total weight of the most common one: a row of class k weighs n_max / n_k)',
};

/** Per-class row weights for `rebalance` (index = class code; 0 for absent classes), or null for none. */
export function classWeights(learner: string, rebalance: string, codes: Int32Array | null, classCount: number): Float64Array | null {
  if (rebalance === 'none') return null;
  if (rebalance !== 'equal') throw new Error(`internal: rebalance=${rebalance}`);
  if (codes === null) throw new UsageError(`${learner}: option "rebalance" applies to classification only; leave it out (or none) for regression`);
  const counts = new Float64Array(classCount);
  for (const c of codes) counts[c]++;
  let most = 0;
  for (const k of counts) most = Math.max(most, k);
  return Float64Array.from(counts, (k) => (k > 0 ? most / k : 0));
}
