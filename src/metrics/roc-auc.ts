/**
 * Area under the ROC curve, in its Mann-Whitney form: the probability that a randomly chosen
 * positive row gets a higher score than a randomly chosen negative row, a tie counting one half,
 *
 *   AUC = (1 / (P * N)) * sum over (positive i, negative j) of ([s_i > s_j] + 0.5 * [s_i = s_j])
 *
 * which equals the trapezoidal area under the empirical ROC curve. It is computed by sorting
 * the positive and the negative scores and sweeping both once: O(n log n), no pair loop.
 *
 * - Two classes: class 1 is the positive class and its probability column is the score.
 * - More classes: one-vs-rest, class k against all others with column k as score, averaged
 *   without weights (macro) over the classes that have both positive and negative rows.
 *   (Provost & Domingos weight the same one-vs-rest areas by class prevalence instead; Hand &
 *   Till 2001 average over pairs of classes. foldwise uses neither.)
 * - Undefined case: when no class has both positive and negative rows (for two classes: only
 *   one class occurs in `actual`), the result is NaN.
 *
 * Range [0, 1], higher is better, 0.5 for scores unrelated to the class.
 *
 * Sources: Fawcett (2006), "An introduction to ROC analysis", Pattern Recognition Letters
 * 27:861-874 (free author copy; the area and its multi-class averages); Hanley & McNeil (1982),
 * "The meaning and use of the area under a receiver operating characteristic (ROC) curve",
 * Radiology 143:29-36 (the Mann-Whitney reading, ties counted one half).
 */
import { checkProbabilities } from './checks.js';
import type { ClassificationInput } from './types.js';

export function rocAuc(input: ClassificationInput): number {
  const probs = checkProbabilities('roc-auc', input);
  const { actual, classes } = input;
  const n = actual.length;
  // two buffers reused for every class: scores of the positive rows, of the negative rows
  const pos = new Float64Array(n);
  const neg = new Float64Array(n);
  if (classes === 2) return oneVsRest(actual, probs, 2, 1, pos, neg);
  let sum = 0;
  let used = 0;
  for (let k = 0; k < classes; k++) {
    const auc = oneVsRest(actual, probs, classes, k, pos, neg);
    if (Number.isNaN(auc)) continue;
    sum += auc;
    used++;
  }
  return used === 0 ? NaN : sum / used;
}

/** AUC of column `positive` as a score for "actual = positive"; NaN without both kinds of rows. */
function oneVsRest(
  actual: Int32Array,
  probs: Float64Array,
  classes: number,
  positive: number,
  posBuf: Float64Array,
  negBuf: Float64Array,
): number {
  let nPos = 0;
  let nNeg = 0;
  for (let i = 0; i < actual.length; i++) {
    const s = probs[i * classes + positive];
    if (actual[i] === positive) posBuf[nPos++] = s;
    else negBuf[nNeg++] = s;
  }
  if (nPos === 0 || nNeg === 0) return NaN;
  const pos = posBuf.subarray(0, nPos).sort();
  const neg = negBuf.subarray(0, nNeg).sort();
  // For each positive score v (ascending): below = negatives < v, upTo = negatives <= v.
  let below = 0;
  let upTo = 0;
  let wins = 0;
  for (let i = 0; i < nPos; i++) {
    const v = pos[i];
    while (below < nNeg && neg[below] < v) below++;
    if (upTo < below) upTo = below;
    while (upTo < nNeg && neg[upTo] <= v) upTo++;
    wins += below + 0.5 * (upTo - below);
  }
  return wins / (nPos * nNeg);
}
