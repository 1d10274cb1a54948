/**
 * Cohen's kappa: agreement between actual and predicted classes corrected for chance,
 *
 *   kappa = (p_o - p_c) / (1 - p_c)
 *
 * where p_o is the observed share of rows with predicted = actual and p_c = sum_k
 * (share actually k) * (share predicted k) is the agreement expected if the two were
 * independent with the same marginal shares. Range [-1, 1] (the lower limit depends on the
 * marginals), higher is better, 0 for chance agreement.
 *
 * Undefined case: p_c = 1 happens only when every actual and every predicted row is the same
 * single class; kappa is then 0/0 and foldwise returns 0, as it does for mcc.
 *
 * Sources: Cohen (1960), "A coefficient of agreement for nominal scales", Educational and
 * Psychological Measurement 20:37-46; McHugh (2012), "Interrater reliability: the kappa
 * statistic", Biochemia Medica 22:276-282 (open access, PMC3900052).
 */
import { checkClassification } from './checks.js';
import { classTallies } from './tally.js';
import type { ClassificationInput } from './types.js';

export function kappa(input: ClassificationInput): number {
  checkClassification('kappa', input);
  const t = classTallies(input.actual, input.predicted, input.classes);
  const n = t.n;
  let chance = 0;
  for (let k = 0; k < input.classes; k++) chance += t.actualCount[k] * t.predictedCount[k];
  // in counts: kappa = (n * correct - sum a_k p_k) / (n^2 - sum a_k p_k)
  const den = n * n - chance;
  if (den === 0) return 0;
  return (n * t.totalCorrect - chance) / den;
}
