/**
 * The inner split of one outer training fold for `--threshold`: every training row gets an inner
 * fold 0..k-1, and each inner fold's rows are predicted by a model fitted on the other inner
 * folds, so the threshold is chosen on out-of-fold predictions of the training rows only.
 *
 * Without groups the split is stratified by class: the rows of each class are shuffled and
 * dealt to the folds in turn, the next class continuing where the previous one stopped, so fold
 * sizes differ by at most one and every class is spread as evenly as it can be. With groups
 * (the outer plan keeps a group's rows together) whole groups are shuffled and dealt to the
 * fold with the fewest rows so far, so no group straddles an inner training part and its
 * inner test part. The generator is passed in (the runner derives it from the run seed and the
 * outer fold, never from the learner), so every learner of a fold sees the same inner split.
 */
import { InputError } from '../errors.js';
import { shuffleInPlace, type Rng } from '../rng.js';

export const DEFAULT_INNER_FOLDS = 5;
export const MAX_INNER_FOLDS = 20;

/**
 * Inner fold of each row. `classOf[i]` is row i's class code (0..classes-1), `groupOf[i]`
 * its group code when the plan has groups. Throws InputError when fewer than k rows (or groups)
 * are there to deal.
 */
export function innerFolds(classOf: Int32Array, classes: number, k: number, rng: Rng, groupOf?: Int32Array): Int32Array {
  const n = classOf.length;
  const out = new Int32Array(n);
  if (groupOf) {
    const members = new Map<number, number[]>();
    for (let i = 0; i < n; i++) {
      const list = members.get(groupOf[i]);
      if (list) list.push(i);
      else members.set(groupOf[i], [i]);
    }
    const order = shuffleInPlace(Int32Array.from([...members.keys()].sort((a, b) => a - b)), rng);
    if (order.length < k) throw new InputError(`--threshold: an outer training fold has ${order.length} groups, fewer than the ${k} inner folds; use --threshold-folds ${Math.max(2, order.length)} or fewer`);
    const sizes = new Float64Array(k);
    for (let q = 0; q < order.length; q++) {
      // the first k groups open the k folds; then each group goes to the smallest fold (lowest index on ties)
      let f = 0;
      if (q < k) f = q;
      else for (let j = 1; j < k; j++) if (sizes[j] < sizes[f]) f = j;
      const list = members.get(order[q])!;
      for (const i of list) out[i] = f;
      sizes[f] += list.length;
    }
    return out;
  }
  if (n < k) throw new InputError(`--threshold: an outer training fold has ${n} rows, fewer than the ${k} inner folds; use --threshold-folds ${Math.max(2, n)} or fewer`);
  const byClass: number[][] = Array.from({ length: classes }, () => []);
  for (let i = 0; i < n; i++) byClass[classOf[i]].push(i);
  let next = 0;
  for (const list of byClass) {
    const a = shuffleInPlace(Int32Array.from(list), rng);
    for (let q = 0; q < a.length; q++) {
      out[a[q]] = next;
      next = (next + 1) % k;
    }
  }
  return out;
}
