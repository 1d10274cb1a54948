/**
 * Stratified split sizes: how many rows of each class go to each part of a split with part
 * fractions f_1..f_P (summing to 1).
 *
 * Each class c of n_c rows has quotas q_cp = f_p * n_c. Every cell gets floor(q_cp) or
 * ceil(q_cp) rows, and each class's cells sum to n_c exactly: after the floors, the
 * n_c - sum_p floor(q_cp) leftover rows go one each to parts with a fractional quota (the
 * largest remainder idea of Hamilton's apportionment; free account: Wikipedia, "Largest
 * remainder method"). Which parts get them is chosen to keep the running totals close to the
 * overall quotas: classes are taken in code order, and a leftover row goes to the part whose
 * running total is furthest below f_p * (rows so far), the later part on a tie.
 *
 * Guarantees: |cell - q_cp| < 1 for every class and part, and the row sum of each class is
 * n_c. With two parts the running shortfall of each part stays within 1/2 (the shortfalls of
 * two parts are opposite numbers, and the part that gets the leftover row had a shortfall of
 * at least 1/2 before it), so part totals are round(f_p * n) up to exact halves. With three
 * or more parts totals are kept close but not bounded by a proof.
 *
 * No randomness: split sizes depend only on the class counts, so repeated splits of one plan
 * all have the same sizes.
 */

const SNAP = 1e-9;

/** counts[c][p] = rows of class c in part p. */
export function apportion(classSizes: ArrayLike<number>, fractions: readonly number[]): Int32Array[] {
  const parts = fractions.length;
  const shortfall = new Float64Array(parts);
  const out: Int32Array[] = [];
  for (let c = 0; c < classSizes.length; c++) {
    const n = classSizes[c];
    const cell = new Int32Array(parts);
    const remainder = new Float64Array(parts);
    let placed = 0;
    for (let p = 0; p < parts; p++) {
      let q = fractions[p] * n;
      const r = Math.round(q);
      if (Math.abs(q - r) < SNAP) q = r;
      cell[p] = Math.floor(q);
      remainder[p] = q - cell[p];
      shortfall[p] += q - cell[p];
      placed += cell[p];
    }
    const candidates: number[] = [];
    for (let p = 0; p < parts; p++) if (remainder[p] > 0) candidates.push(p);
    candidates.sort((a, b) => (Math.abs(shortfall[b] - shortfall[a]) > SNAP ? shortfall[b] - shortfall[a] : b - a));
    // left = sum of the remainders, a whole number below the count of fractional cells
    const left = Math.min(n - placed, candidates.length);
    for (let i = 0; i < left; i++) {
      cell[candidates[i]]++;
      shortfall[candidates[i]] -= 1;
    }
    out.push(cell);
  }
  return out;
}
