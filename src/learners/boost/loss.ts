/**
 * The losses of `boost`: base score, per-row first and second derivatives of the loss in the
 * score F, Friedman's leaf line search for absolute and Huber loss, and the mean loss used by
 * early stopping.
 *
 * - squared:  L = (y - F)^2 / 2, g = F - y, h = 1; base = training mean.
 * - absolute: L = |y - F|; trees are fitted to the signs of the residuals (g = -sign(y - F),
 *             h = 1) and each leaf then takes the median of its residuals (Friedman 2001,
 *             "Greedy function approximation: a gradient boosting machine", Ann. Statist.
 *             29(5):1189-1232, Algorithm 3, LAD_TreeBoost); base = training median.
 * - huber:    threshold delta = the q-quantile of |y - F| this round; g = -clip(y - F, delta),
 *             h = 1; leaf value = r~ + mean(sign(r - r~) min(delta, |r - r~|)), r~ the leaf's
 *             median residual (Friedman 2001, Algorithm 4, M_TreeBoost); base = training median.
 * - logistic (two classes, one score per row, P(class 1) = 1 / (1 + e^-F)): g = p - y,
 *             h = p (1 - p); base = log-odds of the training share of class 1.
 * - softmax (more classes, one score per class, p_k = e^F_k / sum_j e^F_j): g_k = p_k - [y = k],
 *             h_k = p_k (1 - p_k) (the diagonal of the Hessian, as in Chen & Guestrin 2016,
 *             "XGBoost: a scalable tree boosting system", KDD, free: https://arxiv.org/abs/1603.02754);
 *             base = log of the training shares.
 * A class share of 0 or 1 in the training rows is floored at 1 / (2n) (and capped at
 * 1 - 1 / (2n)) before its log, so a class the fold lacks gets a small, finite score instead of
 * minus infinity: the model does not claim a class impossible because one fold lacked it.
 */
import type { Target } from '../../learning.js';

export type LossName = 'squared' | 'absolute' | 'huber' | 'logistic' | 'softmax';

/** The loss for a target and the `loss` option; width = scores per row. */
export function lossFor(y: Target, option: string): { loss: LossName; width: number } {
  if (y.task === 'regression') return { loss: option === 'auto' ? 'squared' : (option as LossName), width: 1 };
  const C = y.classes.length;
  return C === 2 ? { loss: 'logistic', width: 1 } : { loss: 'softmax', width: C };
}

/** The q-quantile of values[0..m) by the "type 7" rule (linear between order statistics); sorts a copy. */
export function quantile(values: Float64Array, m: number, q: number): number {
  if (m === 0) return 0;
  const s = values.slice(0, m).sort();
  const pos = q * (m - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(m - 1, lo + 1);
  return s[lo] + (pos - lo) * (s[hi] - s[lo]);
}

function floorShare(count: number, n: number): number {
  const f = 1 / (2 * n);
  return Math.min(1 - f, Math.max(f, count / n));
}

/** The score every row starts from, over the given rows (width entries). */
export function baseScore(loss: LossName, y: Target, rows: Int32Array): Float64Array {
  const n = rows.length;
  if (y.task === 'regression') {
    const v = Float64Array.from(rows, (i) => y.values[i]);
    if (loss === 'squared') {
      let s = 0;
      for (let i = 0; i < n; i++) s += v[i];
      return Float64Array.of(n ? s / n : 0);
    }
    return Float64Array.of(quantile(v, n, 0.5));
  }
  const C = y.classes.length;
  const counts = new Float64Array(C);
  for (let i = 0; i < n; i++) counts[y.codes[rows[i]]]++;
  if (loss === 'logistic') {
    const p = floorShare(counts[1], n);
    return Float64Array.of(Math.log(p / (1 - p)));
  }
  return Float64Array.from(counts, (c) => Math.log(floorShare(c, n)));
}

/** Softmax of F[i*w .. i*w+w) into out (same place), stable against overflow. */
export function softmaxRow(F: Float64Array, at: number, w: number, out: Float64Array, outAt: number): void {
  let max = -Infinity;
  for (let k = 0; k < w; k++) if (F[at + k] > max) max = F[at + k];
  let s = 0;
  for (let k = 0; k < w; k++) {
    const e = Math.exp(F[at + k] - max);
    out[outAt + k] = e;
    s += e;
  }
  for (let k = 0; k < w; k++) out[outAt + k] /= s;
}

export function sigmoid(f: number): number {
  return f >= 0 ? 1 / (1 + Math.exp(-f)) : Math.exp(f) / (1 + Math.exp(f));
}

/**
 * First and second derivatives of the loss for every row of `rows` (into g[i], h[i] for row
 * i), for score column k. `probs` holds the softmax probabilities (n x width) for softmax;
 * `delta` the Huber threshold for huber.
 */
export function fillDerivatives(
  loss: LossName,
  y: Target,
  F: Float64Array,
  width: number,
  k: number,
  rows: Int32Array,
  g: Float64Array,
  h: Float64Array,
  probs: Float64Array | undefined,
  delta: number,
): void {
  const m = rows.length;
  if (y.task === 'regression') {
    const v = y.values;
    for (let r = 0; r < m; r++) {
      const i = rows[r];
      const res = v[i] - F[i];
      h[i] = 1;
      if (loss === 'squared') g[i] = -res;
      else if (loss === 'absolute') g[i] = res > 0 ? -1 : res < 0 ? 1 : 0;
      else g[i] = res > delta ? -delta : res < -delta ? delta : -res;
    }
    return;
  }
  const codes = y.codes;
  if (loss === 'logistic') {
    for (let r = 0; r < m; r++) {
      const i = rows[r];
      const p = sigmoid(F[i]);
      g[i] = p - (codes[i] === 1 ? 1 : 0);
      h[i] = p * (1 - p);
    }
    return;
  }
  for (let r = 0; r < m; r++) {
    const i = rows[r];
    const p = probs![i * width + k];
    g[i] = p - (codes[i] === k ? 1 : 0);
    h[i] = p * (1 - p);
  }
}

/**
 * Friedman's (2001) line-search value of one leaf for absolute or Huber loss, from the
 * residuals y - F of its rows (res[0..m)): the median (absolute), or the Huber step (huber).
 */
export function leafLineSearch(loss: 'absolute' | 'huber', res: Float64Array, m: number, delta: number): number {
  const med = quantile(res, m, 0.5);
  if (loss === 'absolute' || m === 0) return med;
  let s = 0;
  for (let i = 0; i < m; i++) {
    const d = res[i] - med;
    s += Math.sign(d) * Math.min(delta, Math.abs(d));
  }
  return med + s / m;
}

/** Mean loss over rows at scores F (n x width): the quantity early stopping watches. */
export function meanLoss(loss: LossName, y: Target, F: Float64Array, width: number, rows: Int32Array, delta: number): number {
  const m = rows.length;
  let s = 0;
  if (y.task === 'regression') {
    for (let r = 0; r < m; r++) {
      const i = rows[r];
      const a = Math.abs(y.values[i] - F[i]);
      s += loss === 'squared' ? a * a / 2 : loss === 'absolute' ? a : a <= delta ? a * a / 2 : delta * (a - delta / 2);
    }
    return s / m;
  }
  const tmp = new Float64Array(width);
  for (let r = 0; r < m; r++) {
    const i = rows[r];
    let p: number;
    if (loss === 'logistic') {
      const p1 = sigmoid(F[i]);
      p = y.codes[i] === 1 ? p1 : 1 - p1;
    } else {
      softmaxRow(F, i * width, width, tmp, 0);
      p = tmp[y.codes[i]];
    }
    s -= Math.log(Math.max(p, 1e-300));
  }
  return s / m;
}
