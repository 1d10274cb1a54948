/**
 * Coefficient of determination on held-out predictions:
 *
 *   r2 = 1 - SS_res / SS_tot,  SS_res = sum_i (actual_i - predicted_i)^2,
 *                              SS_tot = sum_i (actual_i - mean(actual))^2
 *
 * i.e. one minus the squared error relative to always predicting the mean of the rows scored.
 * Range (-Infinity, 1], higher is better; negative when the predictions are worse than that
 * constant. This is not the squared correlation: on new data a model can score below 0.
 *
 * Undefined case: when every actual value is the same, SS_tot = 0 and the ratio is undefined
 * (0/0 for a perfect prediction, x/0 otherwise); foldwise returns NaN rather than picking 1,
 * 0 or -Infinity. A single-row input is such a case.
 *
 * Sources: Chicco, Warrens & Jurman (2021), "The coefficient of determination R-squared is more
 * informative than SMAPE, MAE, MAPE, MSE and RMSE in regression analysis evaluation", PeerJ
 * Computer Science 7:e623 (open access); Kvalseth (1985), "Cautionary note about R^2",
 * The American Statistician 39:279-285 (its first definition, which it recommends; from memory).
 */
import { checkRegression } from './checks.js';
import type { RegressionInput } from './types.js';

export function r2(input: RegressionInput): number {
  checkRegression('r2', input);
  const { actual, predicted } = input;
  const n = actual.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += actual[i];
  mean /= n;
  let ssRes = 0;
  let ssTot = 0;
  for (let i = 0; i < n; i++) {
    const r = actual[i] - predicted[i];
    const d = actual[i] - mean;
    ssRes += r * r;
    ssTot += d * d;
  }
  if (ssTot === 0) return NaN;
  return 1 - ssRes / ssTot;
}
