/**
 * Log loss (cross-entropy of the predicted probabilities): the mean over rows of minus the
 * natural logarithm of the probability given to the row's actual class,
 *
 *   log-loss = -(1/n) * sum_i ln(clip(p_i,actual_i))
 *
 * Each probability is first clipped to [1e-15, 1 - 1e-15], so a confident wrong answer costs
 * at most -ln(1e-15) ~ 34.54 instead of Infinity. Probabilities are used as given: a row is
 * not renormalised to sum to 1, and only the actual class's entry enters the sum. Range
 * [0, ~34.54], lower is better; a uniform guess over k classes scores ln(k).
 *
 * Source: Good (1952), "Rational decisions", Journal of the Royal Statistical Society B
 * 14:107-114 (the logarithmic scoring rule); Gneiting & Raftery (2007), "Strictly proper
 * scoring rules, prediction, and estimation", JASA 102:359-378 (free as a University of
 * Washington Statistics technical report).
 */
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

/** Lower clip bound; the upper bound is 1 - LOG_LOSS_EPS. */
export const LOG_LOSS_EPS = 1e-15;

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
