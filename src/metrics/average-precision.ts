/**
 * Average precision: the area under the precision-recall curve taken as a step-wise sum, never
 * by joining the points with straight lines. Sort the rows by score, highest first; at each
 * distinct score t (all rows tied at t enter together) recall R(t) = TP(t) / P and precision
 * Prec(t) = TP(t) / (TP(t) + FP(t)). Then
 *
 *   AP = sum over distinct scores t, in descending order, of (R(t) - R(previous t)) * Prec(t)
 *
 * with R = 0 before the first score. Without ties this is the mean, over the positive rows, of
 * the precision at the rank of that row. Straight lines between PR points overstate the area:
 * precision does not change linearly with recall between two operating points (Davis &
 * Goadrich 2006 show the correct interpolation, see `prInterpolate` in src/curves/pr.ts).
 *
 * - Two classes: class 1 is the positive class and its probability column is the score.
 * - More classes: one-vs-rest, class k against all others with column k as score, averaged
 *   without weights (macro) over the classes that occur in `actual`.
 * - Undefined case: no positive row (for two classes: class 1 never occurs) gives NaN.
 *
 * Range [0, 1], higher is better; a score unrelated to the class gives about the prevalence
 * P / n (not 0.5 as for the ROC area).
 *
 * Sources: Davis & Goadrich (2006), "The relationship between precision-recall and ROC
 * curves", Proc. ICML 2006, 233-240 (free author copy); the step-wise sum as in Manning,
 * Raghavan & Schutze (2008), "Introduction to Information Retrieval", ch. 8.4 (free online).
 */
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

export function averagePrecision(input: ClassificationInput): number {
  const proba = checkProbabilities('average-precision', input);
  const { actual, classes } = input;
  const order = new Int32Array(actual.length);
  if (classes === 2) return stepwiseAp(actual, proba, 2, 1, order);
  let sum = 0;
  let used = 0;
  for (let k = 0; k < classes; k++) {
    const ap = stepwiseAp(actual, proba, classes, k, order);
    if (Number.isNaN(ap)) continue;
    sum += ap;
    used++;
  }
  return used === 0 ? NaN : sum / used;
}

/** Step-wise AP of column `positive` as the score of "actual = positive"; NaN without positives. */
function stepwiseAp(actual: Int32Array, proba: Float64Array, classes: number, positive: number, order: Int32Array): number {
  const n = actual.length;
  let nPos = 0;
  for (let i = 0; i < n; i++) {
    order[i] = i;
    if (actual[i] === positive) nPos++;
  }
  if (nPos === 0) return NaN;
  const score = (i: number): number => proba[i * classes + positive];
  order.sort((a, b) => score(b) - score(a));
  let tp = 0;
  let seen = 0;
  let prevRecall = 0;
  let ap = 0;
  let i = 0;
  while (i < n) {
    const t = score(order[i]);
    // all rows tied at t enter together
    while (i < n && score(order[i]) === t) {
      if (actual[order[i]] === positive) tp++;
      seen++;
      i++;
    }
    const recall = tp / nPos;
    ap += (recall - prevRecall) * (tp / seen);
    prevRecall = recall;
  }
  return ap;
}
