/**
 * Root mean squared error: the square root of the mean over rows of (actual - predicted)^2,
 * in the target's own unit. Range [0, Infinity), lower is better; never below mae.
 *
 * Source: Willmott & Matsuura (2005), "Advantages of the mean absolute error (MAE) over the
 * root mean square error (RMSE) in assessing average model performance", Climate Research
 * 30:79-82 (open access), which defines both and compares them.
 */
import { checkRegression } from './checks.js';
import type { RegressionInput } from './types.js';

export function rmse(input: RegressionInput): number {
  checkRegression('rmse', input);
  const { actual, predicted } = input;
  let sum = 0;
  for (let i = 0; i < actual.length; i++) {
    const d = actual[i] - predicted[i];
    sum += d * d;
  }
  return Math.sqrt(sum / actual.length);
}
