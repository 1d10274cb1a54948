/**
 * Nested, stratified, seeded subsets of a fold's training rows for `foldwise growth`. One order
 * of the training rows is drawn per fold; every size takes a prefix of it, so each smaller set
 * lies inside each larger one. For classification the order interleaves the classes: each class's
 * rows are shuffled, the i-th row of a class of m rows gets the key (i + u) / m with u uniform in
 * [0, 1), and rows are taken by increasing key, so every prefix holds each class within about one
 * row of its share of the training part (a seeded variant of systematic stratified sampling).
 */
import type { Target } from '../learning.js';
import type { Rng } from '../rng.js';
import { shuffleInPlace } from '../rng.js';

export function nestedOrder(train: Int32Array, target: Target, rng: Rng): Int32Array {
  if (target.task !== 'classification') return shuffleInPlace(train.slice(), rng);
  const byClass = new Map<number, number[]>();
  for (const u of train) {
    const c = target.codes[u];
    let list = byClass.get(c);
    if (!list) byClass.set(c, (list = []));
    list.push(u);
  }
  const keyed: { u: number; key: number }[] = [];
  for (const c of [...byClass.keys()].sort((a, b) => a - b)) {
    const list = shuffleInPlace(Int32Array.from(byClass.get(c)!), rng);
    const shift = rng.next();
    list.forEach((u, i) => keyed.push({ u, key: (i + shift) / list.length }));
  }
  keyed.sort((a, b) => a.key - b.key || a.u - b.u);
  return Int32Array.from(keyed, (k) => k.u);
}

/** The sizes in rows from `--sizes` entries: fractions in (0, 1] of `n`, or whole counts above 1. */
export function sizesInRows(sizes: readonly number[], n: number): number[] {
  return sizes.map((s) => (s <= 1 ? Math.max(1, Math.round(s * n)) : Math.min(n, Math.round(s))));
}
