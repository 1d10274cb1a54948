/**
 * Expected calibration error with equal-count bins: sort the rows by score, cut them into
 * ECE_BINS bins of (nearly) equal size (ties kept together, see calibration-bins.ts), and take
 * the row-weighted mean over the bins of |observed frequency - mean score|,
 *
 *   ECE = sum over bins b of (n_b / n) * | o_b - e_b |
 *
 * where o_b is the share of the bin's rows whose outcome is 1 and e_b its mean score. The score
 * and outcome are the probability of class 1 and "actual = 1" for two classes, and the largest
 * probability and "predicted class is right" (top-label form) for more (`calibrationPairs`).
 *
 * - ECE_BINS = 10, the number Naeini et al. used (from memory; common practice). With fewer
 *   rows than bins each row is its own bin (tied scores still share one).
 * - Range [0, 1], lower is better. A small ECE on few rows is weak evidence: every bin's
 *   observed frequency is itself noisy (the report's reliability curve shows each bin's
 *   interval).
 *
 * Source: Naeini, Cooper & Hauskrecht (2015), "Obtaining well calibrated probabilities using
 * Bayesian binning", Proc. AAAI 2015, 2901-2907 (free author copy), ECE and MCE.
 */
import { calibrationPairs, equalCountBins } from './calibration-bins.js';
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

export const ECE_BINS = 10;

export function ece(input: ClassificationInput): number {
  const proba = checkProbabilities('ece', input);
  const { score, outcome } = calibrationPairs(input.actual, proba, input.classes);
  const n = score.length;
  let sum = 0;
  for (const bin of equalCountBins(score, outcome, ECE_BINS)) sum += (bin.count / n) * Math.abs(bin.observed - bin.meanScore);
  return sum;
}
