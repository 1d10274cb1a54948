/**
 * How many rows each forest tree draws for its bootstrap sample (the `sample` option).
 *
 * Forms, for n training rows:
 *   F      a fraction 0 < F <= 1: round(F * n) draws with replacement, at least 1 (1, the
 *          default, is Breiman's n draws)
 *   N      a whole number N >= 2: N draws, at most n (a larger N is capped at n, the default
 *          size, and the fitted settings record the count used)
 * Smaller samples grow smaller trees: the cost of a tree falls about in proportion, and on large
 * data the trees stay nearly as good (each still sees many rows); the trees also differ more from
 * one another, which a forest can use.
 */
import { UsageError } from '../../errors.js';

const RULE = 'a fraction F with 0 < F <= 1 of the training rows, or a whole number N >= 2 of rows';

/** Canonical form of a `sample` value ("0.1", "50000"), or a UsageError naming the option and its limits. */
export function parseSampleSize(raw: string): string {
  const s = raw.trim();
  const v = s === '' ? NaN : Number(s);
  if (Number.isFinite(v) && v > 0 && v <= 1) return String(v);
  if (Number.isInteger(v) && v >= 2) return String(v);
  throw new UsageError(`option "sample" must be ${RULE}, got ${JSON.stringify(raw)}`);
}

/** The number of bootstrap draws per tree for a canonical `sample` value and n >= 1 rows. */
export function resolveSampleSize(canonical: string, n: number): number {
  const v = Number(parseSampleSize(canonical));
  if (v <= 1) return Math.min(n, Math.max(1, Math.round(v * n)));
  return Math.min(n, v);
}
