/**
 * Whole-group assignment: groups (of rows that must stay together) are given to folds or to
 * split parts as units, so no group is ever on both sides of a split.
 *
 * `dealGroups` (k-fold) takes the groups in a random order made coarsely largest-first (sorted
 * by floor(log2(size)), descending, ties in shuffled order) and gives each group to a fold:
 * - without classes, to the currently smallest fold (lowest number on a tie): the longest
 *   processing time rule of Graham (1969), "Bounds on multiprocessing timing anomalies", SIAM
 *   J. Appl. Math. 17:416-429. Placing any group on the smallest fold keeps
 *   (largest fold - smallest fold) <= the largest group's size, whatever the order, so that
 *   bound holds; every fold gets a group, as the first k groups go to the k empty folds.
 * - with classes, to the fold where adding it least increases the squared deviation from the
 *   proportional targets, sum over classes c of (count_fc - n_c / k)^2 plus
 *   (size_f - n / k)^2, ties to the smaller fold, then the lower number; empty folds are
 *   filled first, so every fold gets a group. Class balance is best effort, not a bound.
 * The coarse order (rather than strictly largest first) keeps groups of similar size in random
 * order, so repeats and seeds give different folds even when all group sizes differ.
 *
 * `drawGroups` (shuffle, holdout) takes the groups in shuffled order and fills the parts in
 * turn: a part takes groups while it is below its target; the group that would cross the
 * target is taken when that leaves the part at least as close to it, and filling moves on to
 * the next part. So a part ends within half the crossing group's size of its target, except
 * where each part with a positive target must take one group or the last part (training)
 * must keep one.
 */
import { shuffleInPlace, type Rng } from '../rng.js';
import type { CodeIndex } from './codes.js';

function coarseLargestFirst(groups: CodeIndex, rng: Rng): number[] {
  const order = shuffleInPlace(Int32Array.from({ length: groups.count }, (_, g) => g), rng);
  const bucket = (g: number) => 31 - Math.clz32(groups.sizes[g]);
  // Array.prototype.sort is stable (ECMA-262 since 2019), so shuffled order survives ties
  return Array.from(order).sort((a, b) => bucket(b) - bucket(a));
}

/**
 * Fold number (0..k-1) per group. `classOf` is the class index of each row when the deal
 * should balance classes. Requires 2 <= k <= groups.count.
 */
export function dealGroups(groups: CodeIndex, k: number, rng: Rng, classOf?: CodeIndex): Int32Array {
  const order = coarseLargestFirst(groups, rng);
  const foldOf = new Int32Array(groups.count);
  const size = new Float64Array(k);
  const n = groups.ids.length;
  if (!classOf) {
    for (const g of order) {
      let best = 0;
      for (let f = 1; f < k; f++) if (size[f] < size[best]) best = f;
      foldOf[g] = best;
      size[best] += groups.sizes[g];
    }
    return foldOf;
  }
  const classes = classOf.count;
  const inGroup = new Float64Array(groups.count * classes);
  for (let i = 0; i < n; i++) inGroup[groups.ids[i] * classes + classOf.ids[i]]++;
  const inFold = new Float64Array(k * classes);
  const target = Float64Array.from(classOf.sizes, (s) => s / k);
  const sizeTarget = n / k;
  let empty = k;
  for (const g of order) {
    const s = groups.sizes[g];
    let best = -1;
    let bestCost = Infinity;
    for (let f = 0; f < k; f++) {
      if (empty > 0 && size[f] > 0) continue;
      let cost = s * (2 * size[f] + s - 2 * sizeTarget);
      for (let c = 0; c < classes; c++) {
        const gc = inGroup[g * classes + c];
        if (gc > 0) cost += gc * (2 * inFold[f * classes + c] + gc - 2 * target[c]);
      }
      if (best < 0 || cost < bestCost - 1e-9 || (Math.abs(cost - bestCost) <= 1e-9 && size[f] < size[best])) {
        best = f;
        bestCost = cost;
      }
    }
    if (size[best] === 0) empty--;
    foldOf[g] = best;
    size[best] += s;
    for (let c = 0; c < classes; c++) inFold[best * classes + c] += inGroup[g * classes + c];
  }
  return foldOf;
}

/**
 * Part number per group for a split whose parts are filled in the order given by `fill`
 * (part numbers with their row targets); groups left over go to `restPart`. A fill part
 * with a positive target always gets a group, and `restPart` always keeps one, provided
 * there are enough groups (the caller checks).
 */
export function drawGroups(
  groups: CodeIndex,
  fill: readonly { readonly part: number; readonly target: number }[],
  restPart: number,
  rng: Rng,
): Int32Array {
  const order = shuffleInPlace(Int32Array.from({ length: groups.count }, (_, g) => g), rng);
  const partOf = new Int32Array(groups.count).fill(restPart);
  let pos = 0;
  fill.forEach(({ part, target }, j) => {
    // groups that later fill parts and the rest part must still be able to take
    const reserve = 1 + fill.slice(j + 1).filter((p) => p.target > 0).length;
    const limit = groups.count - reserve;
    let size = 0;
    let taken = 0;
    while (pos < limit) {
      const s = groups.sizes[order[pos]];
      const mustTake = target > 0 && taken === 0;
      if (!mustTake && (size >= target || size + s - target > target - size)) break;
      partOf[order[pos]] = part;
      size += s;
      taken++;
      pos++;
    }
  });
  return partOf;
}
