/**
 * Brier score, multi-class form as Brier (1950) defined it: the mean over rows of the sum over
 * classes of (predicted probability - indicator of the actual class)^2,
 *
 *   brier = (1/n) * sum_i sum_k (p_ik - [actual_i = k])^2
 *
 * Range [0, 2], lower is better; 0 is a certain and correct forecast, 2 a certain and wrong one.
 *
 * Two-class caution: many texts score only the probability of the positive class,
 * (1/n) sum_i (p_i - y_i)^2, with range [0, 1]. When each row's two probabilities sum to 1,
 * that value is exactly half of this one. foldwise reports the original form for every number
 * of classes, so values are comparable across tasks; halve it to compare with the one-column
 * form.
 *
 * Source: Brier (1950), "Verification of forecasts expressed in terms of probability",
 * Monthly Weather Review 78:1-3 (free from the AMS archive).
 */
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

export function brier(input: ClassificationInput): number {
  const probs = checkProbabilities('brier', input);
  const { actual, classes } = input;
  let sum = 0;
  for (let i = 0; i < actual.length; i++) {
    const row = i * classes;
    const y = actual[i];
    for (let k = 0; k < classes; k++) {
      const d = probs[row + k] - (k === y ? 1 : 0);
      sum += d * d;
    }
  }
  return sum / actual.length;
}
