import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/rng.js';
import { holm } from '../../src/stats/holm.js';

/**
 * Brute force: the closed testing procedure with Bonferroni tests of every intersection
 * (Marcus, Peritz & Gabriel 1976). H_i is rejected when every intersection H_S with i in S is;
 * H_S is rejected when |S| * min_{j in S} p_j <= alpha, so the adjusted p of H_i is
 * max over S containing i of min(1, |S| min_{j in S} p_j).
 */
function closedBonferroni(p: readonly number[]): number[] {
  const m = p.length;
  const out = new Array<number>(m).fill(0);
  for (let mask = 1; mask < 1 << m; mask++) {
    let size = 0;
    let min = Infinity;
    for (let j = 0; j < m; j++) if (mask & (1 << j)) (size++, (min = Math.min(min, p[j])));
    const q = Math.min(1, size * min);
    for (let j = 0; j < m; j++) if (mask & (1 << j)) out[j] = Math.max(out[j], q);
  }
  return out;
}

describe('Holm (1979) step-down', () => {
  it('the worked example of the Holm-Bonferroni article of Wikipedia (from memory): four p-values at alpha 0.05', () => {
    // p = 0.01, 0.04, 0.03, 0.005: sorted 0.005 < 0.05/4, 0.01 < 0.05/3, 0.03 > 0.05/2 stops:
    // the first and the fourth are rejected, the other two kept
    const r = holm([0.01, 0.04, 0.03, 0.005], 0.05);
    expect(r.rejected).toEqual([true, false, false, true]);
    // adjusted: 4 * 0.005 = 0.02, max(0.02, 3 * 0.01) = 0.03, max(0.03, 2 * 0.03) = 0.06, max(0.06, 0.04) = 0.06
    const want = [0.03, 0.06, 0.06, 0.02];
    expect(r.adjusted.length).toBe(4);
    r.adjusted.forEach((q, i) => expect(Math.abs(q - want[i])).toBeLessThan(1e-12));
  });

  it("the example in the documentation of the Python library pingouin's holm function", () => {
    // pingouin.holm([.50, .003, .32, .054, .0003], alpha=.05) -> reject [F, T, F, F, T],
    // corrected [0.64, 0.012, 0.64, 0.162, 0.0015] (https://pingouin-stats.org, holm)
    const r = holm([0.5, 0.003, 0.32, 0.054, 0.0003], 0.05);
    expect(r.rejected).toEqual([false, true, false, false, true]);
    const want = [0.64, 0.012, 0.64, 0.162, 0.0015];
    r.adjusted.forEach((q, i) => expect(Math.abs(q - want[i])).toBeLessThan(1e-12));
  });

  it('equals the closed Bonferroni procedure (brute force over every subset) on 300 seeded families', () => {
    const rng = createRng(17);
    let checked = 0;
    for (let t = 0; t < 300; t++) {
      const m = 1 + Math.floor(rng.next() * 8);
      // some ties and some p-values of 0 and 1
      const p = Array.from({ length: m }, () => {
        const u = rng.next();
        return u < 0.1 ? 0 : u > 0.95 ? 1 : Math.round(rng.next() * 200) / 1000;
      });
      const got = holm(p, 0.05).adjusted;
      const want = closedBonferroni(p);
      expect(got.length).toBe(m);
      got.forEach((q, i) => expect(Math.abs(q - want[i])).toBeLessThan(1e-12));
      checked++;
    }
    expect(checked).toBe(300);
  });

  it('one test is the plain test; bad input is refused', () => {
    expect(holm([0.04], 0.05)).toEqual({ adjusted: [0.04], rejected: [true] });
    expect(holm([], 0.05)).toEqual({ adjusted: [], rejected: [] });
    expect(() => holm([1.2], 0.05)).toThrow(/\[0, 1\]/);
    expect(() => holm([Number.NaN], 0.05)).toThrow(/\[0, 1\]/);
    expect(() => holm([0.1], 0)).toThrow(/alpha/);
  });

  it('rejects at an adjusted p equal to alpha (Holm 1979: reject while p_(i) <= alpha / (m - i + 1)), by hand', () => {
    // m = 2: p_(1) = 0.025 = 0.05 / 2 is rejected at 0.05; its adjusted p is exactly 2 * 0.025 = 0.05
    // (0.025 is not exact in binary, but 2 * 0.025 rounds to the double 0.05)
    expect(2 * 0.025).toBe(0.05);
    expect(holm([0.025, 0.5], 0.05)).toEqual({ adjusted: [0.05, 0.5], rejected: [true, false] });
    // the step-down stops at the first kept hypothesis: a larger p behind it is kept too
    expect(holm([0.01, 0.04, 0.045], 0.05)).toEqual({ adjusted: [0.03, 0.08, 0.08], rejected: [true, false, false] });
  });

  it('alpha must lie strictly between 0 and 1; p-values at 0 and 1 are fine, outside [0, 1] refused, with the value named', () => {
    expect(() => holm([0.1], 1)).toThrow('holm: alpha must be above 0 and below 1, got 1');
    expect(() => holm([0.1], Number.NaN)).toThrow(/alpha/);
    expect(holm([0.1], 0.999).rejected).toEqual([true]);
    expect(holm([0, 1], 0.05)).toEqual({ adjusted: [0, 1], rejected: [true, false] });
    expect(() => holm([0.2, -0.01], 0.05)).toThrow('holm: every p-value must be in [0, 1], got -0.01');
    expect(() => holm([1.0000001], 0.05)).toThrow('holm: every p-value must be in [0, 1], got 1.0000001');
  });
});
