/** Test helpers for the metric tests: expand published count tables into row-level inputs. */
import type { ClassificationInput } from '../../src/metrics/types.js';

/**
 * Rows from a contingency table of counts: table[i][j] rows with actual class i and predicted
 * class j (rows = actual, columns = predicted, as in src/metrics/confusion-matrix.ts).
 */
export function fromTable(table: readonly (readonly number[])[]): ClassificationInput {
  const classes = table.length;
  let n = 0;
  for (const row of table) for (const c of row) n += c;
  const actual = new Int32Array(n);
  const predicted = new Int32Array(n);
  let at = 0;
  for (let i = 0; i < classes; i++) {
    for (let j = 0; j < classes; j++) {
      for (let r = 0; r < table[i][j]; r++) {
        actual[at] = i;
        predicted[at] = j;
        at++;
      }
    }
  }
  return { actual, predicted, classes };
}

/** A two-class table from Chicco & Jurman's four counts; class 1 = positive. */
export function fromBinary(tp: number, fn: number, tn: number, fp: number): ClassificationInput {
  // rows = actual (0 = negative, 1 = positive), columns = predicted
  return fromTable([
    [tn, fp],
    [fn, tp],
  ]);
}

/** Two-class input with scores for class 1; probs rows are [1 - s, s]. */
export function binaryScores(labels: readonly number[], scores: readonly number[]): ClassificationInput {
  const n = labels.length;
  const probs = new Float64Array(2 * n);
  const predicted = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    probs[2 * i] = 1 - scores[i];
    probs[2 * i + 1] = scores[i];
    predicted[i] = scores[i] >= 0.5 ? 1 : 0;
  }
  return { actual: Int32Array.from(labels), predicted, classes: 2, probs };
}

export function absDiff(a: number, b: number): number {
  return Math.abs(a - b);
}
