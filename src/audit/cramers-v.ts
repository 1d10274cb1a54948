/**
 * Cramer's V, the association of two categorical variables on a 0..1 scale:
 *
 *   V = sqrt(X^2 / (n (min(r', c') - 1)))
 *
 * with X^2 Pearson's chi-square statistic of their contingency table over the rows where both
 * are present (chi-square.ts), r' and c' the numbers of levels that occur. V = 1 when either
 * variable determines the other; null when fewer than two levels occur on either side.
 * Free source: H. Cramer, Mathematical Methods of Statistics (1946), p. 282; summarised at
 * https://en.wikipedia.org/wiki/Cram%C3%A9r%27s_V. As a rule of thumb (common practice)
 * V >= 0.5 is read as a strong association.
 */
import { chiSquareTest, type ChiSquareResult } from './chi-square.js';

/** Row-major counts of (a, b) over rows where both codes are >= 0. */
export function contingency(a: Int32Array, aLevels: number, b: Int32Array, bLevels: number): Float64Array {
  const counts = new Float64Array(aLevels * bLevels);
  for (let i = 0; i < a.length; i++) if (a[i] >= 0 && b[i] >= 0) counts[a[i] * bLevels + b[i]]++;
  return counts;
}

/** Cramer's V of a chi-square result, or null when undefined. */
export function cramersVOf(t: ChiSquareResult): number | null {
  if (t.minSide < 2 || t.n === 0) return null;
  return Math.min(1, Math.sqrt(t.chiSquare / (t.n * (t.minSide - 1))));
}

export function cramersV(a: Int32Array, aLevels: number, b: Int32Array, bLevels: number): number | null {
  return cramersVOf(chiSquareTest(contingency(a, aLevels, b, bLevels), aLevels, bLevels));
}
