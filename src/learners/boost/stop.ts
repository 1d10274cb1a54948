/**
 * Early stopping that cannot peek: the number of rounds is chosen on rows of the training fold
 * only. The training rows are split once into an inner training part and a validation part
 * (share `stop-share`), stratified: within each class (classification) or each fifth of the
 * sorted target (regression) the rows are shuffled with the fit's own generator,
 * createRng(deriveSeed(seed, "boost", "stop")), and round(share * count) of them are held out,
 * always leaving at least one row of the stratum in the inner training part. The fold's test
 * rows are never seen: the runner does not pass them to fit.
 */
import { InputError } from '../../errors.js';
import { createRng, deriveSeed, shuffleInPlace } from '../../rng.js';
import type { Matrix, Target } from '../../learning.js';

export interface InnerSplit {
  /** ascending row indices */
  readonly train: Int32Array;
  readonly valid: Int32Array;
}

/** Stratum of every row: its class, or its fifth of the sorted target (ties by row order). */
function strata(y: Target): { of: Int32Array; count: number } {
  if (y.task === 'classification') return { of: y.codes, count: y.classes.length };
  const n = y.values.length;
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => y.values[a] - y.values[b] || a - b);
  const of = new Int32Array(n);
  for (let r = 0; r < n; r++) of[order[r]] = Math.min(4, Math.floor((5 * r) / n));
  return { of, count: 5 };
}

export function innerSplit(y: Target, share: number, seed: number): InnerSplit {
  const { of, count } = strata(y);
  const n = of.length;
  const rng = createRng(deriveSeed(seed, 'boost', 'stop'));
  const members: number[][] = Array.from({ length: count }, () => []);
  for (let i = 0; i < n; i++) members[of[i]].push(i);
  const isValid = new Uint8Array(n);
  let v = 0;
  for (const list of members) {
    if (list.length < 2) continue;
    const a = shuffleInPlace(Int32Array.from(list), rng);
    const take = Math.min(a.length - 1, Math.round(share * a.length));
    for (let q = 0; q < take; q++) isValid[a[q]] = 1;
    v += take;
  }
  if (v === 0) {
    throw new InputError(
      `boost: option "stop" needs a validation part, but ${n} training rows at stop-share=${share} give none; use more rows, a larger stop-share, or stop=0`,
    );
  }
  const train = new Int32Array(n - v);
  const valid = new Int32Array(v);
  let a = 0;
  let b = 0;
  for (let i = 0; i < n; i++) if (isValid[i]) valid[b++] = i;
    else train[a++] = i;
  return { train, valid };
}

export function subsetRows(X: Matrix, rows: Int32Array): Matrix {
  const p = X.cols;
  const data = new Float64Array(rows.length * p);
  for (let r = 0; r < rows.length; r++) data.set(X.data.subarray(rows[r] * p, rows[r] * p + p), r * p);
  return { rows: rows.length, cols: p, data };
}

export function subsetTargetRows(y: Target, rows: Int32Array): Target {
  return y.task === 'classification'
    ? { task: 'classification', codes: Int32Array.from(rows, (i) => y.codes[i]), classes: y.classes }
    : { task: 'regression', values: Float64Array.from(rows, (i) => y.values[i]) };
}
