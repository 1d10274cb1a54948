/**
 * Mean misclassification cost: with a cost matrix C (actual by predicted, C[a][p] >= 0 the cost
 * of predicting class p for a row of class a), the cost of a test part is
 *   (1 / n) * sum over rows i of C[actual_i][predicted_i],
 * in the matrix's units per row; lower is better. With C = 1 - identity (every error costs 1,
 * a right answer 0) it equals 1 - accuracy.
 *
 * Source: Elkan (2001), "The foundations of cost-sensitive learning", IJCAI-01, section 1 (the
 * cost matrix and the expected cost of a decision), free at
 * https://www.ijcai.org/Proceedings/01/IJCAI-01.pdf (cited from memory).
 *
 * The matrix comes from `--costs FILE` (cost-matrix.ts reads it); the registry's `cost` entry
 * has no matrix and is bound to one by `bindCost` (index.ts `metricFor`).
 */
import { InputError } from '../errors.js';
import { checkClassification } from './checks.js';
import type { ClassificationInput } from './types.js';

/** A cost matrix in the target's class order: `values[a * classes.length + p]`. */
export interface CostMatrix {
  /** the target's class names, in class code order */
  readonly classes: readonly string[];
  /** row-major, actual by predicted, every entry finite and >= 0 */
  readonly values: Float64Array;
  /** sha256 (hex) of the file's text as read */
  readonly sha256: string;
}

/** The mean cost per row of `input` under `values` (row-major, classes x classes). */
export function meanCost(input: ClassificationInput, values: Float64Array): number {
  checkClassification('cost', input);
  const k = input.classes;
  if (values.length !== k * k) throw new InputError(`cost: the cost matrix has ${values.length} entries, expected ${k} x ${k} = ${k * k}`);
  const { actual, predicted } = input;
  let sum = 0;
  for (let i = 0; i < actual.length; i++) sum += values[actual[i] * k + predicted[i]];
  return sum / actual.length;
}

/** The matrix as rows of numbers (the report's `settings.costs.matrix`). */
export function costRows(m: CostMatrix): number[][] {
  const k = m.classes.length;
  return Array.from({ length: k }, (_, a) => Array.from(m.values.subarray(a * k, a * k + k)));
}

/** The matrix back from its rows (a report's or a part's `settings.costs`), in the same class order. */
export function costMatrixOf(saved: { readonly sha256: string; readonly classes: readonly string[]; readonly matrix: readonly (readonly number[])[] }): CostMatrix {
  const k = saved.classes.length;
  const values = new Float64Array(k * k);
  saved.matrix.forEach((row, a) => values.set(row, a * k));
  return { classes: [...saved.classes], values, sha256: saved.sha256 };
}
