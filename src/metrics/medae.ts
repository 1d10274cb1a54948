/**
 * Median absolute error: the median over rows of |actual - predicted| (for an even number of
 * rows, the mean of the two middle values). Robust to a few wild errors. Range [0, Infinity),
 * lower is better.
 *
 * Sources: NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.5.1, "Measures of
 * location" (free; the median and its even-n convention); Rousseeuw (1984), "Least median of
 * squares regression", JASA 79:871-880 (the median of residual sizes as a robust criterion).
 */
import { checkRegression } from './checks.js';
import type { RegressionInput } from './types.js';

export function medae(input: RegressionInput): number {
  checkRegression('medae', input);
  const { actual, predicted } = input;
  const n = actual.length;
  const errors = new Float64Array(n);
  for (let i = 0; i < n; i++) errors[i] = Math.abs(actual[i] - predicted[i]);
  errors.sort();
  const mid = n >> 1;
  return n % 2 === 1 ? errors[mid] : (errors[mid - 1] + errors[mid]) / 2;
}
