/**
 * Holm's step-down procedure: adjusted p-values and decisions for a family of m hypotheses
 * that keep the family-wise error rate (the chance of rejecting at least one true hypothesis)
 * at most alpha, whatever the dependence between the tests.
 *
 * In words: sort the p-values p_(1) <= ... <= p_(m). Compare the smallest with alpha / m, the
 * next with alpha / (m - 1), ..., the i-th with alpha / (m - i + 1); reject hypotheses in this
 * order and stop at the first one that is not below its bound (it and every larger p are kept).
 * The adjusted p-value of the i-th smallest is
 *
 *   q_(i) = min(1, max_{k <= i} (m - k + 1) p_(k)),
 *
 * and a hypothesis is rejected at level alpha exactly when its q <= alpha. Ties keep their
 * input order (the same q either way). With m = 1 it is the plain test.
 *
 * Source: S. Holm, "A simple sequentially rejective multiple test procedure", Scandinavian
 * Journal of Statistics 6(2):65-70, 1979 (free on JSTOR's early-journal content,
 * https://www.jstor.org/stable/4615733). Holm's procedure equals the closed testing procedure
 * (Marcus, Peritz & Gabriel, Biometrika 63:655-660, 1976) with Bonferroni tests of the
 * intersections, which is how test/stats/holm.test.ts checks it by brute force.
 */
import { InputError } from '../errors.js';

export interface HolmResult {
  /** adjusted p-values, in the input order */
  readonly adjusted: number[];
  /** rejected at alpha (adjusted <= alpha), in the input order */
  readonly rejected: boolean[];
}

/** Holm-adjusted p-values of `p` (each in [0, 1]) and the decisions at `alpha`. */
export function holm(p: readonly number[], alpha: number): HolmResult {
  if (!(alpha > 0 && alpha < 1)) throw new InputError(`holm: alpha must be above 0 and below 1, got ${alpha}`);
  for (const v of p) if (!(v >= 0 && v <= 1)) throw new InputError(`holm: every p-value must be in [0, 1], got ${v}`);
  const m = p.length;
  const order = p.map((_, i) => i).sort((a, b) => p[a] - p[b] || a - b);
  const adjusted = new Array<number>(m);
  let running = 0;
  order.forEach((i, k) => {
    running = Math.max(running, Math.min(1, (m - k) * p[i]));
    adjusted[i] = running;
  });
  return { adjusted, rejected: adjusted.map((q) => q <= alpha) };
}
