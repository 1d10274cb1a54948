import { describe, expect, it } from 'vitest';
import { confusionMatrix } from '../../src/metrics/confusion-matrix.js';
import { kappa } from '../../src/metrics/kappa.js';
import { fromTable } from './helpers.js';

describe('kappa against Cohen (1960), Educational and Psychological Measurement 20:37-46', () => {
  it('Table 2 frequencies, N = 200: p_o = .70, p_c = .41, kappa = .492', () => {
    // Cohen (1960) Table 2, cell frequencies of two judges over three categories (N = 200).
    // Cells as transcribed in a public MATLAB implementation that cites "Cohen's test set,
    // Table 2.b, page 45"; the published p_o = .70, p_c = .41 and kappa = .492 are reproduced
    // exactly below, which is our check that the transcription is right.
    const table = [
      [88, 14, 18],
      [10, 40, 10],
      [2, 6, 12],
    ];
    const input = fromTable(table);
    expect(input.actual.length).toBe(200);
    // published intermediate values: p_o = 140/200 = .70; p_c = (120*100 + 60*60 + 20*40)/200^2 = .41
    expect(confusionMatrix(input.actual, input.predicted, 3)).toEqual(table);
    const k = kappa(input);
    expect(Math.abs(k - (0.7 - 0.41) / (1 - 0.41))).toBeLessThan(1e-12);
    expect(Math.abs(k - 0.492)).toBeLessThan(5e-4); // published to three decimals
  });

  it('Table 1 proportions: p_o = .29, p_c = .35, kappa = -.0923', () => {
    // Cohen (1960) Table 1 ("Agreement matrix of proportions"): the published diagonal is
    // p_o = .25 + .02 + .02 = .29 and the chance diagonal p_c = .20 + .09 + .06 = .35 (read from
    // a scan of page 37). The full table was NOT available to us, so the table below is a
    // RECONSTRUCTION, as counts out of 100: the diagonal is the published one; the marginals
    // (judge A .50/.30/.20, judge B .40/.30/.30) are inferred because their products give the
    // published chance diagonal .20, .09, .06; the off-diagonal cells are one arbitrary filling
    // of those marginals. Kappa depends only on the diagonal and the marginals, so any such
    // filling reproduces the published value; the test checks that it does.
    const table = [
      [25, 13, 12],
      [12, 2, 16],
      [3, 15, 2],
    ];
    const input = fromTable(table);
    expect(input.actual.length).toBe(100);
    const rows = table.map((r) => r.reduce((a, b) => a + b, 0) / 100);
    const cols = [0, 1, 2].map((j) => table.reduce((a, r) => a + r[j], 0) / 100);
    expect(rows).toEqual([0.5, 0.3, 0.2]);
    expect(cols).toEqual([0.4, 0.3, 0.3]);
    const k = kappa(input);
    expect(Math.abs(k - (0.29 - 0.35) / (1 - 0.35))).toBeLessThan(1e-12);
    expect(Math.abs(k - -0.0923)).toBeLessThan(5e-5); // published to four decimals
  });

  it('is 1 for perfect agreement and 0 for the undefined single-class case (documented)', () => {
    expect(kappa(fromTable([[3, 0], [0, 2]]))).toBe(1);
    // everything one class on both sides: p_o = p_c = 1, 0/0; foldwise returns 0
    expect(kappa(fromTable([[5, 0], [0, 0]]))).toBe(0);
  });
});
