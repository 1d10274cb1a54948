/**
 * The class of each row of a row-major rows x classes probability table: the column with the
 * largest value, the lower class code on a tie.
 */
export function argmaxRows(p: Float64Array, classes: number): Int32Array {
  const rows = p.length / classes;
  const out = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    let best = 0;
    for (let c = 1; c < classes; c++) if (p[i * classes + c] > p[i * classes + best]) best = c;
    out[i] = best;
  }
  return out;
}
