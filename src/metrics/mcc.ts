/**
 * Matthews correlation coefficient, k-class form (Gorodkin's R_K): the correlation between
 * the one-hot actual and one-hot predicted class matrices. From the per-class tallies
 * (n rows, c = rows correct, t_k = rows actually k, p_k = rows predicted k):
 *
 *   MCC = (c * n - sum_k p_k t_k) / sqrt((n^2 - sum_k p_k^2) * (n^2 - sum_k t_k^2))
 *
 * For two classes this equals the phi coefficient (TP*TN - FP*FN) /
 * sqrt((TP+FP)(TP+FN)(TN+FP)(TN+FN)) of Matthews (1975). Range [-1, 1], higher is better,
 * 0 for a prediction no better than chance.
 *
 * Undefined case: when all actual rows are one class, or all predictions are one class, the
 * denominator is 0; foldwise then returns 0 (no measurable correlation), never NaN.
 *
 * Sources: Gorodkin (2004), "Comparing two K-category assignments by a K-category correlation
 * coefficient", Computational Biology and Chemistry 28:367-374; Matthews (1975), Biochimica
 * et Biophysica Acta 405:442-451; Chicco & Jurman (2020), BMC Genomics 21:6 (open access).
 */
import { checkClassification } from './checks.js';
import { classTallies } from './tally.js';
import type { ClassificationInput } from './types.js';

export function mcc(input: ClassificationInput): number {
  checkClassification('mcc', input);
  const t = classTallies(input.actual, input.predicted, input.classes);
  const n = t.n;
  let pt = 0;
  let pp = 0;
  let tt = 0;
  for (let k = 0; k < input.classes; k++) {
    const p = t.predictedCount[k];
    const a = t.actualCount[k];
    pt += p * a;
    pp += p * p;
    tt += a * a;
  }
  const den = (n * n - pp) * (n * n - tt);
  if (den === 0) return 0;
  return (t.totalCorrect * n - pt) / Math.sqrt(den);
}
