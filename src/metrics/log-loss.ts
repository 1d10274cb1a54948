/**
 * Log loss (cross-entropy of the predicted probabilities): the mean over rows of minus the
 * natural logarithm of the probability given to the row's actual class,
 *
 *   log-loss = -(1/n) * sum_i ln(clip(p_i,actual_i))
 *
 * Each probability is first clipped to [2^-53, 1 - 2^-53] (about 1.1e-16). Our reason: 2^-53 is
 * the spacing of doubles just below 1, so 1 - 2^-53 is the largest double below 1 and the clip
 * changes only probabilities a double cannot tell from 0 or 1 (a model saying exactly 0 or 1,
 * or less than 1.1e-16); a confident wrong answer then costs 53 ln 2 ~ 36.74 instead of
 * Infinity. Probabilities are used as given: a row is not renormalised to sum to 1, and only the
 * actual class's entry enters the sum. Range [0, ~36.74], lower is better; a uniform guess over
 * k classes scores ln(k).
 *
 * Source: Good (1952), "Rational decisions", Journal of the Royal Statistical Society B
 * 14:107-114 (the logarithmic scoring rule); Gneiting & Raftery (2007), "Strictly proper
 * scoring rules, prediction, and estimation", JASA 102:359-378 (free as a University of
 * Washington Statistics technical report).
 */
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

/** Lower clip bound; the upper bound is 1 - LOG_LOSS_EPS. */
export const LOG_LOSS_EPS = 2 ** -53;

export function logLoss(input: ClassificationInput): number {
  const probs = checkProbabilities('log-loss', input);
  const { actual, classes } = input;
  const lo = LOG_LOSS_EPS;
  const hi = 1 - LOG_LOSS_EPS;
  let sum = 0;
  for (let i = 0; i < actual.length; i++) {
    let p = probs[i * classes + actual[i]];
    if (p < lo) p = lo;
    else if (p > hi) p = hi;
    sum -= Math.log(p);
  }
  return sum / actual.length;
}
