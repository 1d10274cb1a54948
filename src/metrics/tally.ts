/**
 * Per-class tallies of a classification: for each class k, how many rows are actually k
 * (row total of the confusion matrix), how many are predicted k (column total) and how many
 * are both (the diagonal). Every metric built on counts (accuracy, recall, precision, F1,
 * Matthews correlation, Cohen's kappa) needs only these three vectors, so they are counted
 * in one pass over the rows without building the full classes x classes matrix.
 *
 * The caller has checked the input (src/metrics/checks.ts): codes are in 0..classes-1.
 */
export interface ClassTallies {
  /** number of rows */
  readonly n: number;
  /** rows with actual = predicted = k */
  readonly correct: Float64Array;
  /** rows with actual = k */
  readonly actualCount: Float64Array;
  /** rows with predicted = k */
  readonly predictedCount: Float64Array;
  /** sum of `correct` */
  readonly totalCorrect: number;
}

export function classTallies(actual: Int32Array, predicted: Int32Array, classes: number): ClassTallies {
  const correct = new Float64Array(classes);
  const actualCount = new Float64Array(classes);
  const predictedCount = new Float64Array(classes);
  let totalCorrect = 0;
  const n = actual.length;
  for (let i = 0; i < n; i++) {
    const a = actual[i];
    const p = predicted[i];
    actualCount[a]++;
    predictedCount[p]++;
    if (a === p) {
      correct[a]++;
      totalCorrect++;
    }
  }
  return { n, correct, actualCount, predictedCount, totalCorrect };
}
