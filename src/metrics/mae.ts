/**
 * Mean absolute error: the mean over rows of |actual - predicted|, in the target's own unit.
 * Range [0, Infinity), lower is better.
 *
 * Source: Willmott & Matsuura (2005), "Advantages of the mean absolute error (MAE) over the
 * root mean square error (RMSE) in assessing average model performance", Climate Research
 * 30:79-82 (open access).
 */
import { checkRegression } from './checks.js';
import type { RegressionInput } from './types.js';

export function mae(input: RegressionInput): number {
  checkRegression('mae', input);
  const { actual, predicted } = input;
  let sum = 0;
  for (let i = 0; i < actual.length; i++) sum += Math.abs(actual[i] - predicted[i]);
  return sum / actual.length;
}
