/**
 * Recall of each class from a confusion matrix (rows actual, columns predicted): the share of
 * the rows of class k that were predicted as k,
 *
 *   recall_k = C[k][k] / sum_j C[k][j]
 *
 * null for a class with no rows. Source: any confusion-matrix text, e.g. the "Precision and
 * recall" article of Wikipedia (free).
 */
export function classRecall(confusion: readonly (readonly number[])[]): (number | null)[] {
  const k = confusion.length;
  for (const row of confusion) {
    if (row.length !== k) throw new RangeError(`classRecall: the confusion matrix must be square, got a row of ${row.length} in ${k} rows`);
  }
  return confusion.map((row, i) => {
    const total = row.reduce((a, b) => a + b, 0);
    return total > 0 ? row[i] / total : null;
  });
}
