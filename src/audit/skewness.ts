/**
 * Sample skewness, the adjusted Fisher-Pearson standardized moment coefficient:
 *
 *   G1 = sqrt(n (n - 1)) / (n - 2) * m3 / m2^(3/2),   m_k = (1/n) sum (x - mean)^k
 *
 * Null with fewer than 3 values or when all values are equal (no spread to standardise by).
 * Free source: D. N. Joanes and C. A. Gill, "Comparing measures of sample skewness and
 * kurtosis", The Statistician 47(1), 1998 (the G1 of their paper); M. G. Bulmer, Principles of
 * Statistics (Dover, 1979), for the rule of thumb that |skewness| > 1 is highly skewed.
 */
import { compensatedSum } from './numeric-summary.js';

export function sampleSkewness(values: ArrayLike<number>): number | null {
  const n = values.length;
  if (n < 3) return null;
  const mean = compensatedSum(values) / n;
  let m2 = 0;
  let m3 = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i] - mean;
    m2 += d * d;
    m3 += d * d * d;
  }
  m2 /= n;
  m3 /= n;
  if (m2 === 0) return null;
  return (Math.sqrt(n * (n - 1)) / (n - 2)) * (m3 / m2 ** 1.5);
}
