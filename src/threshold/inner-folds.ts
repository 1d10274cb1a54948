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
 *
 * When the outer plan is in time order (forward plans) the inner split is too (`innerForward`):
 * the training rows are cut by the same splitter as the outer plan (src/plans/forward.ts), so
 * each inner fold fits on earlier rows and predicts the block after them, and the threshold is
 * never chosen by predicting the past from the future.
 */
import { InputError } from '../errors.js';
import { buildForward } from '../plans/forward.js';
import { shuffleInPlace, type Rng } from '../rng.js';

/** One inner fit: positions (into the outer training rows) to fit on and to predict, ascending. */
export interface InnerPart {
  readonly train: Int32Array;
  readonly test: Int32Array;
}

/** The k parts of an inner fold assignment (`innerFolds`): part q predicts fold q from the others. */
export function partsOf(assign: Int32Array, k: number): InnerPart[] {
  const out: InnerPart[] = [];
  for (let q = 0; q < k; q++) {
    const test: number[] = [];
    const train: number[] = [];
    for (let i = 0; i < assign.length; i++) (assign[i] === q ? test : train).push(i);
    out.push({ train: Int32Array.from(train), test: Int32Array.from(test) });
  }
  return out;
}

/**
 * The time-ordered inner split of an outer training fold of a forward plan: the rows (their
 * order values `order`, their groups `groupOf` when the plan has groups) cut into k + 1 blocks
 * by the forward plans' own splitter, inner fold q fitting on blocks 0..q and predicting block
 * q + 1. The first block is never predicted. Throws InputError when the rows (their ties or
 * groups) allow fewer than k + 1 blocks.
 */
export function innerForward(order: Float64Array, k: number, rng: Rng, groupOf?: Int32Array): InnerPart[] {
  try {
    const built = buildForward({ kind: 'forward', k }, { n: order.length, order, rng, ...(groupOf ? { groups: groupOf } : {}) });
    return built.folds.map((f) => ({ train: f.train, test: f.test }));
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    const why = e.message.replace(/^--plan forward:\d+:? ?/, '');
    throw new InputError(`--threshold: the time-ordered inner split of an outer training fold ${why}; use a smaller --threshold-folds`);
  }
}

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
