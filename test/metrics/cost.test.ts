/**
 * The `cost` metric and the --costs file (src/metrics/cost.ts, cost-matrix.ts): a hand-computed
 * example, the identity with accuracy under a 0/1 matrix, and every refusal of the reader.
 */
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { accuracy, costMatrixOf, costRows, getMetric, meanCost, metricFor, parseCostMatrix } from '../../src/metrics/index.js';

const CLASSES = ['a', 'b', 'c'];
const FILE = ['actual\\predicted,a,b,c', 'a,0,1,4', 'b,2,0,1', 'c,3,1,0', ''].join('\n');

function refusal(text: string, classes = CLASSES): string {
  try {
    parseCostMatrix(text, 'costs.csv', classes);
  } catch (e) {
    expect(e).toBeInstanceOf(UsageError);
    return (e as Error).message;
  }
  throw new Error('not refused');
}

describe('cost metric', () => {
  it('hand-computed: six rows, costs 4 + 0 + 0 + 0 + 1 + 2 = 7, mean 7/6', () => {
    // by hand from the matrix of FILE: (a,c) 4, (a,a) 0, (b,b) 0, (c,c) 0, (c,b) 1, (b,a) 2
    // (the first and last rows cost something, so a loop that skips either shows)
    const m = parseCostMatrix(FILE, 'costs.csv', CLASSES);
    expect(Array.from(m.values)).toEqual([0, 1, 4, 2, 0, 1, 3, 1, 0]);
    const input = { actual: Int32Array.from([0, 0, 1, 2, 2, 1]), predicted: Int32Array.from([2, 0, 1, 2, 1, 0]), classes: 3 };
    expect(Math.abs(meanCost(input, m.values) - 7 / 6)).toBeLessThan(1e-15);
    expect(Math.abs(metricFor('cost', m).fn(input as never) - 7 / 6)).toBeLessThan(1e-15);
  });

  it('rows and columns in any order give the same matrix, in the target class order', () => {
    const shuffled = ['x,c,a,b', 'b,1,2,0', 'c,0,3,1', 'a,4,0,1'].join('\r\n');
    const m = parseCostMatrix(shuffled, 'costs.csv', CLASSES);
    expect(Array.from(m.values)).toEqual([0, 1, 4, 2, 0, 1, 3, 1, 0]);
    // the file's bytes differ, so its SHA-256 does
    expect(m.sha256).not.toBe(parseCostMatrix(FILE, 'costs.csv', CLASSES).sha256);
  });

  it('a 0/1 matrix (1 for every error) gives 1 - accuracy (identity, Elkan 2001 section 1)', () => {
    const m = parseCostMatrix(['', 'a,b,c'].join(',') + '\na,0,1,1\nb,1,0,1\nc,1,1,0\n', 'zero-one.csv', CLASSES);
    const actual = Int32Array.from({ length: 50 }, (_, i) => (i * 7) % 3);
    const predicted = Int32Array.from({ length: 50 }, (_, i) => (i * 5 + (i % 4)) % 3);
    const input = { actual, predicted, classes: 3 };
    expect(Math.abs(meanCost(input, m.values) - (1 - accuracy(input)))).toBeLessThan(1e-15);
  });

  it('is registered as lower-is-better, needing no probabilities, and unusable unbound', () => {
    const m = getMetric('cost');
    expect(m.higherIsBetter).toBe(false);
    expect(m.needsProba).toBe(false);
    expect(m.task).toBe('classification');
    expect(() => metricFor('cost', undefined)).toThrow(/--metric cost: give the cost matrix with --costs FILE/);
    expect(() => (m.fn as (x: unknown) => number)({})).toThrow(/without its matrix/);
  });

  it('quoted class names with a comma and a quote', () => {
    const classes = ['no', 'yes, "late"'];
    const m = parseCostMatrix(',no,"yes, ""late"""\nno,0,1\n"yes, ""late""",5,0\n', 'q.csv', classes);
    expect(Array.from(m.values)).toEqual([0, 1, 5, 0]);
  });
});

describe('--costs file refusals name the file and the line', () => {
  it('empty file', () => expect(refusal('\n\n')).toMatch(/^--costs costs\.csv: the file is empty/));
  it('a header class the target lacks, with a close name', () =>
    expect(refusal('x,Adelie,Chinstrap,Gentto\n', ['Adelie', 'Chinstrap', 'Gentoo'])).toBe(
      '--costs costs.csv: line 1: "Gentto" is not a class of the target (predicted, in the header); the classes are "Adelie", "Chinstrap", "Gentoo"; did you mean "Gentoo"?',
    ));
  it('a class twice in the header', () => expect(refusal('x,a,b,a\n')).toMatch(/^--costs costs\.csv: line 1: the predicted class "a" is named twice \(columns 2 and 4\)/));
  it('a class missing from the header', () => expect(refusal('x,a,b\n')).toMatch(/^--costs costs\.csv: line 1: the header lacks the predicted class "c"/));
  it('a row with too few cells', () => expect(refusal('x,a,b,c\na,0,1\n')).toMatch(/^--costs costs\.csv: line 2: 3 cells, but the header has 4/));
  it('an actual class the target lacks', () => expect(refusal('x,a,b,c\nd,0,1,1\n')).toMatch(/^--costs costs\.csv: line 2: "d" is not a class of the target \(actual, in the first column\)/));
  it('an actual class twice', () => expect(refusal('x,a,b,c\na,0,1,1\na,0,1,1\n')).toMatch(/^--costs costs\.csv: line 3: the actual class "a" has a line already \(line 2\)/));
  it('an actual class without a line', () => expect(refusal('x,a,b,c\na,0,1,1\nb,1,0,1\n')).toMatch(/^--costs costs\.csv: line 3: no line for the actual class "c"/));
  it('a negative cost', () => expect(refusal('x,a,b,c\na,0,-1,1\n')).toBe('--costs costs.csv: line 2, column 3: "-1" is below 0; a cost is 0 or more'));
  it('not a number, empty, infinite, NaN', () => {
    for (const bad of ['ten', '', 'Infinity', 'NaN', '1e999', '0x10', ' 1']) {
      expect(refusal(`x,a,b,c\na,0,${bad},1\n`)).toMatch(new RegExp(`^--costs costs\\.csv: line 2, column 3: ${JSON.stringify(bad).replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} is not a cost`));
    }
  });
  it('every cost 0', () => expect(refusal('x,a,b,c\na,0,0,0\nb,0,0,0\nc,0,0,0\n')).toMatch(/every cost is 0/));
  it('an empty line inside the matrix', () => expect(refusal('x,a,b,c\na,0,1,1\n\nb,1,0,1\nc,1,1,0\n')).toBe('--costs costs.csv: line 3: empty line inside the matrix'));
  it('an unclosed quote and a stray quote', () => {
    expect(refusal('x,"a,b,c\n')).toMatch(/^--costs costs\.csv: line 1: a quoted cell is not closed/);
    expect(refusal('x,a"b,c\n')).toMatch(/^--costs costs\.csv: line 1: cell 2 has a quote inside/);
  });
});

describe('the cost matrix as read and as saved', () => {
  it('keeps the target classes and the SHA-256 of the text as hex (checked with coreutils sha256sum)', () => {
    const m = parseCostMatrix(FILE, 'costs.csv', CLASSES);
    expect(m.classes).toEqual(CLASSES);
    // `printf 'actual\\predicted,a,b,c\na,0,1,4\nb,2,0,1\nc,3,1,0\n' | sha256sum` (GNU coreutils 9)
    expect(m.sha256).toBe('a1c3502bc062506faf26c0b118f9aebb6fb4e4c25a434ad0eaa2107766027918');
  });

  it('costRows gives the rows actual by predicted, costMatrixOf reads them back', () => {
    const m = parseCostMatrix(FILE, 'costs.csv', CLASSES);
    const rows = costRows(m);
    expect(rows).toEqual([
      [0, 1, 4],
      [2, 0, 1],
      [3, 1, 0],
    ]);
    const back = costMatrixOf({ sha256: m.sha256, classes: m.classes, matrix: rows });
    expect(back.classes).toEqual(CLASSES);
    expect(Array.from(back.values)).toEqual([0, 1, 4, 2, 0, 1, 3, 1, 0]);
    expect(back.sha256).toBe(m.sha256);
  });

  it('meanCost refuses a matrix of the wrong size', () => {
    const input = { actual: Int32Array.from([0, 1]), predicted: Int32Array.from([1, 1]), classes: 2 };
    let caught: unknown;
    try {
      meanCost(input, Float64Array.from([0, 1, 1, 0, 0]));
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(InputError);
    expect((caught as Error).message).toBe('cost: the cost matrix has 5 entries, expected 2 x 2 = 4');
  });
});

describe('--costs file: number forms and cell rules', () => {
  it('reads plain decimals: integers of two digits, fractions, a leading point, exponents with and without a sign', () => {
    const m = parseCostMatrix('x,a,b,c\na,0,12,0.25\nb,.25,0,1e3\nc,2.5e-1,1E+1,+3\n', 'costs.csv', CLASSES);
    expect(Array.from(m.values)).toEqual([0, 12, 0.25, 0.25, 0, 1000, 0.25, 10, 3]);
    const n = parseCostMatrix('x,a,b,c\na,0,1e10,.5\nb,1,0,1\nc,1,1,0\n', 'costs.csv', CLASSES);
    expect(Array.from(n.values.subarray(0, 3))).toEqual([0, 1e10, 0.5]);
  });

  it('calls a minus sign, with spaces or before a point, below 0; a minus inside a cell is not a cost', () => {
    expect(refusal('x,a,b,c\na,0,- 1,1\n')).toBe('--costs costs.csv: line 2, column 3: "- 1" is below 0; a cost is 0 or more');
    expect(refusal('x,a,b,c\na,0,-.5,1\n')).toBe('--costs costs.csv: line 2, column 3: "-.5" is below 0; a cost is 0 or more');
    expect(refusal('x,a,b,c\na,0,1-2,1\n')).toMatch(/^--costs costs\.csv: line 2, column 3: "1-2" is not a cost/);
  });

  it('refuses text after a closing quote, naming the cell', () =>
    expect(refusal('x,"a"b,c\n')).toBe('--costs costs.csv: line 1: text after the closing quote of cell 2'));

  it('a comma at the end of a line is one more, empty cell', () =>
    expect(refusal('x,a,b,c,\n')).toMatch(/^--costs costs\.csv: line 1: "" is not a class of the target \(predicted, in the header\)/));

  it('skips a byte-order mark, so a quoted corner cell still reads', () => {
    const m = parseCostMatrix('\uFEFF"x",a,b,c\na,0,1,4\nb,2,0,1\nc,3,1,0\n', 'costs.csv', CLASSES);
    expect(Array.from(m.values)).toEqual([0, 1, 4, 2, 0, 1, 3, 1, 0]);
  });

  it('a class name with no close name gets no hint', () =>
    expect(refusal('x,a,b,zzzzzz\n')).toBe('--costs costs.csv: line 1: "zzzzzz" is not a class of the target (predicted, in the header); the classes are "a", "b", "c"'));

  it('names one or more missing classes in full', () => {
    expect(refusal('x,a,b\n')).toBe('--costs costs.csv: line 1: the header lacks the predicted class "c"; it needs every class of the target once ("a", "b", "c")');
    expect(refusal('x,b\n')).toBe('--costs costs.csv: line 1: the header lacks the predicted classes "a", "c"; it needs every class of the target once ("a", "b", "c")');
    expect(refusal('x,a,b,c\nb,1,0,1\n')).toBe('--costs costs.csv: line 2: no line for the actual classes "a", "c"; the matrix needs one line per class of the target ("a", "b", "c")');
    expect(refusal('x,a,b,c\na,0,1,1\nb,1,0,1\n')).toBe('--costs costs.csv: line 3: no line for the actual class "c"; the matrix needs one line per class of the target ("a", "b", "c")');
  });
});
