/**
 * Turns a part number per row into folds. Every fold's `train` and `test` are ascending row
 * positions and disjoint, because each row carries exactly one part number and the rows are
 * scanned in order.
 */
import type { Fold } from './types.js';

/** The rows whose part number satisfies `accept`, ascending. */
export function rowsWhere(part: Int32Array, accept: (p: number) => boolean): Int32Array {
  let m = 0;
  for (let i = 0; i < part.length; i++) if (accept(part[i])) m++;
  const out = new Int32Array(m);
  let j = 0;
  for (let i = 0; i < part.length; i++) if (accept(part[i])) out[j++] = i;
  return out;
}

/**
 * One fold per part 0..k-1: part f is the test set of fold f and every other part (numbers
 * 0..k-1 only) its training set. Rows with a part number outside 0..k-1 are in neither.
 */
export function foldsFromParts(part: Int32Array, k: number, repeat: number): Fold[] {
  const n = part.length;
  const size = new Int32Array(k);
  let inRange = 0;
  for (let i = 0; i < n; i++) {
    const p = part[i];
    if (p >= 0 && p < k) {
      size[p]++;
      inRange++;
    }
  }
  const tests = Array.from(size, (s) => new Int32Array(s));
  const fill = new Int32Array(k);
  for (let i = 0; i < n; i++) {
    const p = part[i];
    if (p >= 0 && p < k) tests[p][fill[p]++] = i;
  }
  const folds: Fold[] = [];
  for (let f = 0; f < k; f++) {
    const train = new Int32Array(inRange - size[f]);
    for (let i = 0, t = 0; i < n; i++) {
      const p = part[i];
      if (p !== f && p >= 0 && p < k) train[t++] = i;
    }
    folds.push({ repeat, fold: f, train, test: tests[f] });
  }
  return folds;
}
