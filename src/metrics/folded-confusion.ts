/**
 * The confusion matrix folded to a bounded size, for targets with many classes. A full matrix
 * has classes x classes cells: 1,000 classes make a million cells, which a report can neither
 * store nor draw in a useful way. Folding keeps `limit - 1` classes with their own row and
 * column, the ones with the most actual rows (ties in class order), and puts every other class
 * into one last row and column, "the other classes":
 *
 *   matrix[i][j], i, j < kept: the rows of kept class i predicted as kept class j (as in the
 *     full matrix, so the diagonal of a kept class is exact and its recall reads off its row);
 *   matrix[i][kept]: rows of kept class i predicted as any other class; matrix[kept][j]: rows of
 *     any other class predicted as kept class j;
 *   matrix[kept][kept]: rows of another class predicted as another class, right or wrong.
 *     `otherCorrect` says how many of them were predicted as their own class, so the number of
 *     correct predictions (the trace of the full matrix) is still the diagonal of the kept
 *     classes plus otherCorrect.
 *
 * Row sums are the kept classes' sizes and, last, the other classes' rows together; every cell
 * is a sum of cells of the full matrix (confusion-matrix.ts, after Fawcett 2006, section 2),
 * so the total is the number of rows. It is built from the codes in one pass, without the full
 * matrix, so memory is limit^2, whatever the number of classes.
 */
import { checkClassification } from './checks.js';
import { InputError } from '../errors.js';

/** The most rows and columns a report's confusion matrix has; beyond it the matrix is folded. */
export const CONFUSION_CLASS_LIMIT = 25;

export interface FoldedConfusion {
  /** class codes with their own row and column, by descending row count (ties by code) */
  readonly kept: readonly number[];
  /** how many classes share the last row and column */
  readonly otherClasses: number;
  /** (kept + 1) x (kept + 1); the last row and column are the other classes */
  readonly matrix: number[][];
  /** rows of the other classes predicted as their own class (inside matrix[kept][kept]) */
  readonly otherCorrect: number;
}

export function foldedConfusion(actual: Int32Array, predicted: Int32Array, classes: number, limit = CONFUSION_CLASS_LIMIT): FoldedConfusion {
  checkClassification('foldedConfusion', { actual, predicted, classes });
  if (!Number.isInteger(limit) || limit < 2) throw new InputError(`foldedConfusion: limit must be a whole number of at least 2 (got ${limit})`);
  if (classes <= limit) throw new InputError(`foldedConfusion: ${classes} classes fit in the limit of ${limit}; use the full confusion matrix`);
  const sizes = new Float64Array(classes);
  for (let i = 0; i < actual.length; i++) sizes[actual[i]]++;
  const order = Array.from({ length: classes }, (_, c) => c).sort((a, b) => sizes[b] - sizes[a] || a - b);
  const kept = order.slice(0, limit - 1);
  const slot = new Int32Array(classes).fill(kept.length);
  kept.forEach((c, k) => {
    slot[c] = k;
  });
  const side = kept.length + 1;
  const flat = new Float64Array(side * side);
  let otherCorrect = 0;
  for (let i = 0; i < actual.length; i++) {
    const a = slot[actual[i]];
    flat[a * side + slot[predicted[i]]]++;
    if (a === kept.length && actual[i] === predicted[i]) otherCorrect++;
  }
  const matrix: number[][] = [];
  for (let r = 0; r < side; r++) matrix.push(Array.from(flat.subarray(r * side, (r + 1) * side)));
  return { kept, otherClasses: classes - kept.length, matrix, otherCorrect };
}
