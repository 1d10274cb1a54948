/**
 * Pearson's chi-square test of independence of an r x c contingency table:
 *
 *   X^2 = sum_ij (O_ij - E_ij)^2 / E_ij,   E_ij = (row total i)(column total j) / n,
 *   df = (r' - 1)(c' - 1)
 *
 * over the r' rows and c' columns with a non-zero total (empty ones are dropped). The p-value
 * is the upper tail of the chi-square distribution with df degrees of freedom, 1 - F(X^2),
 * from jstat's `chisquare.cdf`. `smallExpected` reports Cochran's caution (some expected
 * count below 5), when the approximation is rough.
 * Free sources: https://en.wikipedia.org/wiki/Pearson%27s_chi-squared_test ; W. G. Cochran,
 * "Some methods for strengthening the common chi-square tests", Biometrics 10(4), 1954;
 * jstat (https://jstat.github.io/distributions.html#jStat.chisquare.cdf).
 */
import jStat from 'jstat';
import { InputError } from '../errors.js';

export interface ChiSquareResult {
  readonly chiSquare: number;
  readonly df: number;
  readonly n: number;
  /** upper-tail p-value; 1 when df is 0 */
  readonly p: number;
  /** smaller of r' and c' (for Cramer's V) */
  readonly minSide: number;
  readonly smallExpected: boolean;
}

/** Tests a table given as row-major counts with `rows` rows and `cols` columns. */
export function chiSquareTest(counts: ArrayLike<number>, rows: number, cols: number): ChiSquareResult {
  if (counts.length !== rows * cols) throw new InputError(`chiSquareTest: ${counts.length} counts for a ${rows} x ${cols} table`);
  const rowTotal = new Float64Array(rows);
  const colTotal = new Float64Array(cols);
  let n = 0;
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) {
      const v = counts[i * cols + j];
      if (!(v >= 0)) throw new InputError(`chiSquareTest: count ${v} at (${i}, ${j}) must be a number >= 0`);
      rowTotal[i] += v;
      colTotal[j] += v;
      n += v;
    }
  }
  const r = rowTotal.filter((t) => t > 0).length;
  const c = colTotal.filter((t) => t > 0).length;
  const df = Math.max(0, (r - 1) * (c - 1));
  if (n === 0 || df === 0) return { chiSquare: 0, df, n, p: 1, minSide: Math.min(r, c), smallExpected: n < 5 };
  let x2 = 0;
  let small = false;
  for (let i = 0; i < rows; i++) {
    if (rowTotal[i] === 0) continue;
    for (let j = 0; j < cols; j++) {
      if (colTotal[j] === 0) continue;
      const e = (rowTotal[i] * colTotal[j]) / n;
      if (e < 5) small = true;
      const d = counts[i * cols + j] - e;
      x2 += (d * d) / e;
    }
  }
  const p = Math.min(1, Math.max(0, 1 - jStat.chisquare.cdf(x2, df)));
  return { chiSquare: x2, df, n, p, minSide: Math.min(r, c), smallExpected: small };
}
