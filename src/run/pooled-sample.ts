/**
 * The bounded sample of a regression learner's pooled out-of-fold predictions that an eval
 * report carries (`pooledSample`), for the predicted-against-actual and residual charts.
 */
import type { PooledSample } from '../report/types.js';

/** At most this many (actual, predicted) pairs are kept per learner. */
export const POOLED_SAMPLE_MAX = 1000;

/**
 * An evenly spaced sample of `actual[i]`, `predicted[i]` pairs, by position in the pooled
 * order (folds in run order, rows in each fold's test order). With n pairs and a bound of m:
 *
 *   n <= m: every pair, in order;
 *   n >  m: the pairs at positions floor(j * n / m) for j = 0 .. m-1
 *
 * so the first pair is always kept, the gaps differ by at most one, and the positions rise
 * strictly (n / m > 1). It depends on n, m and the pooled order only: no randomness, so a run
 * on one thread, on worker threads or in merged shards, whose pooled order is the same, keeps
 * the same pairs. `j * n` stays exact in doubles (n is at most 2^27 row numbers, m 1,000), and
 * a non-whole quotient is at least 1/m away from a whole number, so the floor is exact too.
 * `total` is n.
 */
export function pooledSample(actual: ArrayLike<number>, predicted: ArrayLike<number>, max: number = POOLED_SAMPLE_MAX): PooledSample {
  const n = actual.length;
  if (predicted.length !== n) throw new RangeError(`pooledSample: ${n} actual values but ${predicted.length} predictions`);
  if (!Number.isInteger(max) || max < 1) throw new RangeError(`pooledSample: the bound must be a whole number of at least 1, got ${max}`);
  const size = Math.min(n, max);
  const a: number[] = new Array<number>(size);
  const p: number[] = new Array<number>(size);
  for (let j = 0; j < size; j++) {
    const i = n <= max ? j : Math.floor((j * n) / max);
    a[j] = actual[i];
    p[j] = predicted[i];
  }
  return { total: n, actual: a, predicted: p };
}
