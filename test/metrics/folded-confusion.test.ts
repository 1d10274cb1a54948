import { describe, expect, it } from 'vitest';
import { accuracy } from '../../src/metrics/accuracy.js';
import { confusionMatrix } from '../../src/metrics/confusion-matrix.js';
import { CONFUSION_CLASS_LIMIT, foldedConfusion } from '../../src/metrics/folded-confusion.js';
import { createRng } from '../../src/rng.js';

describe('foldedConfusion', () => {
  it('keeps the classes with the most rows and folds the rest into the last row and column (worked by hand)', () => {
    // class sizes: 0 has 4 rows, 1 has 3, 2 has 2, 3 has 1, 4 has 2; limit 3 keeps classes 0 and 1
    const actual = Int32Array.from([0, 0, 0, 0, 1, 1, 1, 2, 2, 3, 4, 4]);
    const predicted = Int32Array.from([0, 0, 1, 2, 1, 1, 0, 2, 3, 3, 4, 0]);
    const f = foldedConfusion(actual, predicted, 5, 3);
    expect(f.kept).toEqual([0, 1]);
    expect(f.otherClasses).toBe(3);
    // row 0: 0->0 twice, 0->1 once, 0->2 (other) once
    // row 1: 1->0 once, 1->1 twice
    // other: 4->0 once; 2->2, 2->3, 3->3, 4->4 in the corner, three of them right
    expect(f.matrix).toEqual([
      [2, 1, 1],
      [1, 2, 0],
      [1, 0, 4],
    ]);
    expect(f.otherCorrect).toBe(3);
  });

  it('breaks ties in row count by class code', () => {
    // sizes 1, 3, 3, 2: classes 1 and 2 tie at 3 rows and are kept in code order
    const actual = Int32Array.from([0, 1, 1, 1, 2, 2, 2, 3, 3]);
    expect(foldedConfusion(actual, actual, 4, 3).kept).toEqual([1, 2]);
    const reversed = Int32Array.from([0, 2, 2, 2, 1, 1, 1, 3, 3]);
    expect(foldedConfusion(reversed, reversed, 4, 3).kept).toEqual([1, 2]);
  });

  it('is a sum of cells of the full matrix, keeps every row and the correct count (random 40-class data)', () => {
    const rng = createRng(20261203);
    const n = 3000;
    const classes = 40;
    // skewed class sizes, so the kept set is not the first codes
    const actual = Int32Array.from({ length: n }, () => classes - 1 - Math.floor(classes * rng.next() ** 2));
    const predicted = Int32Array.from(actual, (a) => (rng.next() < 0.6 ? a : Math.floor(classes * rng.next())));
    const full = confusionMatrix(actual, predicted, classes);
    const f = foldedConfusion(actual, predicted, classes);
    expect(f.kept).toHaveLength(CONFUSION_CLASS_LIMIT - 1);
    expect(f.matrix).toHaveLength(CONFUSION_CLASS_LIMIT);
    expect(f.otherClasses).toBe(classes - f.kept.length);
    // the kept classes are the ones with the most rows: no other class is larger than the smallest kept
    const size = full.map((row) => row.reduce((a, b) => a + b, 0));
    const smallestKept = Math.min(...f.kept.map((c) => size[c]));
    const others = size.filter((_, c) => !f.kept.includes(c));
    expect(others).toHaveLength(classes - f.kept.length);
    expect(Math.max(...others)).toBeLessThanOrEqual(smallestKept);
    // each cell re-added from the full matrix
    const slot = (c: number) => (f.kept.includes(c) ? f.kept.indexOf(c) : f.kept.length);
    const expected = Array.from({ length: f.kept.length + 1 }, () => new Array<number>(f.kept.length + 1).fill(0));
    for (let a = 0; a < classes; a++) for (let p = 0; p < classes; p++) expected[slot(a)][slot(p)] += full[a][p];
    expect(f.matrix).toEqual(expected);
    const otherTrace = others.length > 0 ? full.reduce((acc, row, c) => acc + (f.kept.includes(c) ? 0 : row[c]), 0) : NaN;
    expect(f.otherCorrect).toBe(otherTrace);
    // the accuracy reads off the folded matrix: kept diagonal plus otherCorrect, over all rows
    const keptTrace = f.kept.reduce((acc, _, k) => acc + f.matrix[k][k], 0);
    expect((keptTrace + f.otherCorrect) / n).toBe(accuracy({ actual, predicted, classes }));
  });

  it('refuses a limit below 2 and a target that fits the limit', () => {
    const a = Int32Array.from([0, 1, 2]);
    expect(() => foldedConfusion(a, a, 3, 1)).toThrow('foldedConfusion: limit must be a whole number of at least 2 (got 1)');
    expect(() => foldedConfusion(a, a, 3, 3)).toThrow('foldedConfusion: 3 classes fit in the limit of 3; use the full confusion matrix');
    expect(() => foldedConfusion(a, Int32Array.from([0, 1, 3]), 3, 2)).toThrow('foldedConfusion: predicted[2] = 3 is not a class code in 0..2');
  });
});
