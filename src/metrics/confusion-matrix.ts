/**
 * Confusion matrix: entry [i][j] counts the rows whose actual class is i and whose predicted
 * class is j (rows = actual, columns = predicted). Row sums are the class sizes, column sums
 * the prediction counts, and the diagonal the correct predictions.
 *
 * Source: Fawcett (2006), "An introduction to ROC analysis", Pattern Recognition Letters
 * 27:861-874, section 2 (the two-class case; the k-class table is the same cross-tabulation).
 * Orientations differ between texts; foldwise always puts the actual class in rows.
 */
import { checkClassification } from './checks.js';

export function confusionMatrix(actual: Int32Array, predicted: Int32Array, classes: number): number[][] {
  checkClassification('confusionMatrix', { actual, predicted, classes });
  const flat = new Float64Array(classes * classes);
  for (let i = 0; i < actual.length; i++) flat[actual[i] * classes + predicted[i]]++;
  const out: number[][] = [];
  for (let r = 0; r < classes; r++) out.push(Array.from(flat.subarray(r * classes, (r + 1) * classes)));
  return out;
}
