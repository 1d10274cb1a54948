/**
 * The bounded sample of a regression learner's pooled out-of-fold predictions that an eval
 * report carries (`pooledSample`), for the predicted-against-actual and residual charts.
 */
import type { PooledSample } from '../model/report.js';

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

/** How many pooled pairs the HTML charts of a run draw when the run's own predictions are at hand. */
export const HTML_ROWS_MAX = 5000;

/**
 * The report with each regression learner's `pooledSample` drawn again from the run's own task
 * records, bounded by `max` instead of the report's 1,000: what `eval --html` draws, since the
 * page is made where every prediction is known. The JSON report keeps its own sample.
 */
export function withWiderSamples<R extends { readonly learners: readonly L[] }, L extends { readonly spec: string; readonly pooledSample?: PooledSample }>(
  report: R,
  records: readonly { readonly candidateIndex: number; readonly foldIndex: number; readonly failed?: string; readonly actual: { task: string; values?: Float64Array }; readonly predicted: ArrayLike<number> }[],
  max: number = HTML_ROWS_MAX,
): R {
  const learners = report.learners.map((l, li) => {
    if (!l.pooledSample) return l;
    const mine = records.filter((r) => r.candidateIndex === li && r.foldIndex >= 0 && !r.failed);
    const n = mine.reduce((s, r) => s + r.predicted.length, 0);
    const actual = new Float64Array(n);
    const predicted = new Float64Array(n);
    let at = 0;
    for (const r of mine) {
      actual.set(r.actual.values!, at);
      predicted.set(r.predicted as Float64Array, at);
      at += r.predicted.length;
    }
    return { ...l, pooledSample: pooledSample(actual, predicted, max) };
  });
  return { ...report, learners };
}
