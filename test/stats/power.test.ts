import jStat from 'jstat';
import { describe, expect, it, vi } from 'vitest';
import { createRng } from '../../src/rng.js';
import { correctedSe, mddInSe, mddLimit, minimalDetectable, powerAt, repeatsFor } from '../../src/stats/power.js';

const S = { alpha: 0.05, power: 0.8 };

describe('power of the one-sided corrected t test', () => {
  it('is alpha at no difference and grows with it', () => {
    expect(Math.abs(powerAt(0, 9, 0.05) - 0.05)).toBeLessThan(1e-6);
    expect(powerAt(1, 9, 0.05)).toBeGreaterThan(0.05);
    expect(powerAt(3, 9, 0.05)).toBeGreaterThan(powerAt(2, 9, 0.05));
  });

  it('many folds: the MDD is (z_0.95 + z_0.80) standard errors, a hand calculation with the normal table', () => {
    // standard normal quantiles (any printed normal table; NIST/SEMATECH e-Handbook sec. 1.3.6.7.1):
    // z_0.95 = 1.6449, z_0.80 = 0.8416, so MDD -> 2.4865 SE as the degrees of freedom grow
    expect(Math.abs(mddInSe(5000, S) - (1.6449 + 0.8416))).toBeLessThan(2e-3);
  });

  it('ten folds: within 1% of the t approximation (t_9,0.95 + t_9,0.80); the simulation below checks the exact value', () => {
    // NIST/SEMATECH e-Handbook sec. 1.3.6.7.2 (t critical values): t_{9, 0.95} = 1.833; the
    // 0.80 quantile 0.883 is not in that table (from memory of wider tables; jstat gives 0.8834)
    const approx = 1.833 + 0.883;
    const exact = mddInSe(9, S);
    expect(Math.abs(exact / approx - 1)).toBeLessThan(0.01);
  });

  it('reaches the stated power in a simulation of the classic one-sample t test (seeded, 20,000 runs)', () => {
    // with 1/J as the only variance factor the corrected test is the one-sample t test: draw J
    // normal differences with sd 1 and true mean MDD * sd / sqrt(J), count rejections
    const rng = createRng(20261202);
    const normal = (): number => {
      const u = 1 - rng.next();
      const v = rng.next();
      return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    };
    const J = 10;
    const delta = minimalDetectable({ folds: J, variance: 1, testRows: 1, trainRows: Number.MAX_VALUE }, S);
    expect(Math.abs(delta - mddInSe(J - 1, S) / Math.sqrt(J))).toBeLessThan(1e-9);
    const crit = 1.833; // t_{9, 0.95}, NIST table
    const runs = 20000;
    let rejected = 0;
    for (let r = 0; r < runs; r++) {
      const d = Array.from({ length: J }, () => delta + normal());
      const m = d.reduce((a, b) => a + b, 0) / J;
      const sd = Math.sqrt(d.reduce((a, b) => a + (b - m) ** 2, 0) / (J - 1));
      if (m / (sd / Math.sqrt(J)) > crit) rejected++;
    }
    // binomial standard error sqrt(0.8 * 0.2 / 20000) = 0.0028: four of them
    expect(Math.abs(rejected / runs - 0.8)).toBeLessThan(4 * 0.0028);
  });

  it('the corrected standard error follows Nadeau & Bengio (1/J + n_test/n_train) s^2', () => {
    expect(correctedSe({ folds: 10, variance: 0.0004, testRows: 100, trainRows: 900 })).toBe(Math.sqrt((1 / 10 + 100 / 900) * 0.0004));
  });
});

describe('repeats for a drop', () => {
  const x = { variance: 0.0004, testRows: 100, trainRows: 900, foldsPerRepeat: 10 };
  it('recommends the fewest repeats that reach the target', () => {
    const target = 0.02;
    const a = repeatsFor(target, x, S);
    expect(a.repeats).not.toBeNull();
    const r = a.repeats!;
    expect(minimalDetectable({ ...x, folds: 10 * r }, S)).toBeLessThanOrEqual(target);
    if (r > 1) expect(minimalDetectable({ ...x, folds: 10 * (r - 1) }, S)).toBeGreaterThan(target);
    expect(r).toBeGreaterThanOrEqual(1);
  });
  it('says no repeats suffice below the limit set by the shared rows', () => {
    const limit = mddLimit(x, S);
    // (z_0.95 + z_0.80) sqrt(n_test / n_train * s^2) = 2.4865 * sqrt(0.0004 / 9)
    expect(Math.abs(limit - 2.4865 * Math.sqrt(0.0004 / 9))).toBeLessThan(1e-4);
    const a = repeatsFor(limit * 0.9, x, S);
    expect(a.repeats).toBeNull();
    expect(a.mdd).toBeGreaterThan(limit * 0.9);
  });
});

describe('power: outside reference values and the edges of the search (issue 24, mutation testing)', () => {
  // R's stats::power.t.test help page examples (two-sample, two-sided, sd 1, level 0.05; values
  // from memory of that page's output): power.t.test(n = 20, delta = 1) gives power = 0.8689528;
  // power.t.test(power = .90, delta = 1) gives n = 22.02110. R computes the power of the two-sided
  // test as the upper tail only, P(T' > t_{df, 0.975}) with df = 2(n - 1) and noncentrality
  // delta sqrt(n / 2): the one-sided power at alpha 0.025 here.
  it('powerAt reproduces power.t.test(n = 20, delta = 1): 0.8689528', () => {
    expect(Math.abs(powerAt(Math.sqrt(20 / 2), 2 * (20 - 1), 0.025) - 0.8689528)).toBeLessThan(1e-7);
  });

  it('mddInSe reproduces power.t.test(power = .90, delta = 1): n = 22.02110, so delta sqrt(n/2) = 3.31821 standard errors', () => {
    const n = 22.0211;
    // R prints n to 5 decimals: sqrt(n / 2) is known to about 4e-7
    expect(Math.abs(mddInSe(2 * (n - 1), { alpha: 0.025, power: 0.9 }) - Math.sqrt(n / 2))).toBeLessThan(1e-6);
  });

  it('one-sample t test, n = 10, effect size 1, one-sided 0.05: power 0.8975 (G*Power and R, from memory)', () => {
    expect(Math.abs(powerAt(Math.sqrt(10), 9, 0.05) - 0.8975)).toBeLessThan(5e-5);
  });

  it('few degrees of freedom, where the starting bracket is too low: the MDD still has exactly the asked power', () => {
    // df 2, alpha 0.01, power 0.9: t_{2,0.99} + t_{2,0.90} + 1 = 9.85 has power 0.856 only
    // (jstat's noncentral t), so the bracket must be widened before bisecting
    const s = { alpha: 0.01, power: 0.9 };
    const m = mddInSe(2, s);
    expect(powerAt(9.85, 2, 0.01)).toBeLessThan(0.9);
    expect(m).toBeGreaterThan(9.85);
    expect(Math.abs(powerAt(m, 2, 0.01) - 0.9)).toBeLessThan(1e-8);
    expect(powerAt(m * (1 - 1e-6), 2, 0.01)).toBeLessThan(0.9);
    // the same answer on a second call (the cache) and for another setting a different one
    expect(mddInSe(2, s)).toBe(m);
    expect(mddInSe(2, { alpha: 0.01, power: 0.8 })).toBeLessThan(m);
    expect(mddInSe(3, s)).toBeLessThan(m);
  });

  it('the MDD at the usual setting is the delta of power 0.8, to the bisection tolerance (jstat noncentral t)', () => {
    for (const df of [1, 4, 9, 29]) {
      const m = mddInSe(df, S);
      expect(Math.abs(powerAt(m, df, 0.05) - 0.8)).toBeLessThan(1e-8);
    }
  });

  it('refuses settings outside 0 < alpha < 0.5 and alpha < power < 1, and df <= 0', () => {
    expect(() => mddInSe(9, { alpha: 0, power: 0.8 })).toThrow('--alpha 0: expected a number above 0 and below 0.5 (such as 0.05)');
    expect(() => mddInSe(9, { alpha: 0.5, power: 0.8 })).toThrow('--alpha 0.5: expected a number above 0 and below 0.5 (such as 0.05)');
    expect(() => mddInSe(9, { alpha: 0.05, power: 0.05 })).toThrow('--power 0.05: expected a number above alpha and below 1 (such as 0.8)');
    expect(() => mddInSe(9, { alpha: 0.05, power: 1 })).toThrow('--power 1: expected a number above alpha and below 1 (such as 0.8)');
    expect(() => mddLimit({ variance: 1, testRows: 1, trainRows: 9 }, { alpha: 0.05, power: 1 })).toThrow(/--power 1/);
    expect(mddInSe(9, { alpha: 0.4999, power: 0.5 })).toBeGreaterThan(0);
    expect(() => powerAt(1, 0, 0.05)).toThrow('powerAt: df must be > 0, got 0');
    expect(powerAt(1, 0.5, 0.05)).toBeGreaterThan(0.05);
  });

  it('correctedSe refuses fewer than 2 or fractional folds, a negative variance and empty folds; 2 folds and 0 variance are fine', () => {
    const ok = { folds: 2, variance: 0, testRows: 1, trainRows: 1 };
    expect(correctedSe(ok)).toBe(0);
    expect(correctedSe({ ...ok, variance: 1 })).toBe(Math.sqrt(1 / 2 + 1));
    expect(() => correctedSe({ ...ok, folds: 1 })).toThrow('power: need at least 2 paired folds, got 1');
    expect(() => correctedSe({ ...ok, folds: 2.5 })).toThrow('power: need at least 2 paired folds, got 2.5');
    const bad = 'power: the variance must be >= 0 and the fold sizes > 0';
    expect(() => correctedSe({ ...ok, variance: -1 })).toThrow(bad);
    expect(() => correctedSe({ ...ok, testRows: 0 })).toThrow(bad);
    expect(() => correctedSe({ ...ok, trainRows: 0 })).toThrow(bad);
    expect(() => correctedSe({ ...ok, variance: Number.NaN })).toThrow(bad);
  });

  it('minimalDetectable is mddInSe(J - 1) corrected standard errors', () => {
    const x = { folds: 3, variance: 0.0004, testRows: 100, trainRows: 900 };
    expect(minimalDetectable(x, S)).toBe(mddInSe(2, S) * correctedSe(x));
  });
});

describe('repeatsFor at the edges', () => {
  const x = { variance: 0.0004, testRows: 100, trainRows: 900, foldsPerRepeat: 10 };
  const mddAt = (r: number): number => minimalDetectable({ ...x, folds: 10 * r }, S);

  it('a target equal to the MDD of R repeats is met by R repeats, not R + 1 (at most the target)', () => {
    expect(repeatsFor(mddAt(3), x, S)).toEqual({ repeats: 3, mdd: mddAt(3), limit: mddLimit(x, S) });
    expect(repeatsFor(mddAt(1000), x, S).repeats).toBe(1000);
    expect(repeatsFor(mddAt(1000) * (1 - 1e-9), x, S).repeats).toBeNull();
    expect(repeatsFor(mddAt(1000) * (1 - 1e-9), x, S).mdd).toBe(mddAt(1000));
  });

  it('a target met by one repeat gives 1; one fold per repeat still pairs at least 2 folds', () => {
    expect(repeatsFor(1, x, S)).toEqual({ repeats: 1, mdd: mddAt(1), limit: mddLimit(x, S) });
    const one = { ...x, foldsPerRepeat: 1 };
    const two = minimalDetectable({ ...x, folds: 2 }, S);
    expect(repeatsFor(1, one, S)).toEqual({ repeats: 1, mdd: two, limit: mddLimit(x, S) });
    expect(repeatsFor(two, one, S, 1).repeats).toBe(1);
    expect(repeatsFor(mddAt(2), x, S, 2).repeats).toBe(2);
  });

  it('refuses a target that is not above 0', () => {
    expect(() => repeatsFor(0, x, S)).toThrow('the drop to detect must be > 0, got 0');
    expect(() => repeatsFor(Number.NaN, x, S)).toThrow(/must be > 0/);
  });
});

describe('mddInSe: the bisection bracket and its stop rule (issue 24, mutation testing)', () => {
  // The root is checked against jstat's noncentral t directly (not through powerAt): the
  // power 1 - F_nct(t_{df, 1-alpha}; df, m) must reach the asked power at m and fall short of it
  // 1e-9 below m (relative), the bisection stopping once hi - lo <= 1e-10 hi.
  const power = (m: number, df: number, alpha: number): number => 1 - jStat.noncentralt.cdf(jStat.studentt.inv(1 - alpha, df), df, m);

  it('finds the root to 1e-9 relative where the approximation bracket starts below zero and where the MDD is far below one standard error', () => {
    const cases: [number, number, number][] = [
      // df 1, power 0.99: t_{1,0.95} = 6.314 and t_{1,0.99} = 31.82 (NIST/SEMATECH e-Handbook
      // sec. 1.3.6.7.2), so t_{1,0.95} - t_{1,0.99} is far below zero: a bracket built from the
      // difference of the two quantiles would start at a negative noncentrality
      [1, 0.05, 0.99],
      // alpha near 0.5: t_{9,0.5001} + t_{9,0.5} is about 2.5e-4, so the MDD is about 2.5e-4 SE
      // (the normal quantile z_{0.5001} = 2.5066e-4, from the normal density 1/sqrt(2 pi) at 0)
      [9, 0.4999, 0.5],
      [9, 0.05, 0.8],
      [2, 0.01, 0.9],
    ];
    let checked = 0;
    for (const [df, alpha, p] of cases) {
      const m = mddInSe(df, { alpha, power: p });
      expect(m).toBeGreaterThan(0);
      expect(power(m, df, alpha)).toBeGreaterThanOrEqual(p);
      expect(power(m * (1 - 1e-9), df, alpha)).toBeLessThan(p);
      checked++;
    }
    expect(checked).toBe(4);
    expect(Math.abs(mddInSe(9, { alpha: 0.4999, power: 0.5 }) - 2.5066e-4)).toBeLessThan(1e-7);
    // above the critical value t_{1,0.95} = 6.314 (NIST table) and below the approximation
    // 6.314 + 31.82, which overshoots at one degree of freedom (jstat gives 16.466)
    const one = mddInSe(1, { alpha: 0.05, power: 0.99 });
    expect(one).toBeGreaterThan(6.314);
    expect(one).toBeLessThan(6.314 + 31.82);
  });

  it('stops once the bracket is within 1e-10 of its top (34 halvings), and asks jstat nothing for a setting it has seen', () => {
    // By hand: the bracket starts at [0, t_{10,0.9499} + t_{10,0.80} + 1], about [0, 3.69]
    // (NIST/SEMATECH table: t_{10,0.95} = 1.812; t_{10,0.80} = 0.879 from memory), around a root
    // near 2.67 (the t approximation 1.812 + 0.879 = 2.69). Halving a width of 3.69 until it is at
    // most 1e-10 x 2.67 takes ceil(log2(3.69 / 2.67e-10)) = ceil(33.7) = 34 steps, one noncentral
    // t CDF each, plus one to check that the top of the bracket already has the power.
    const cdf = vi.spyOn(jStat.noncentralt, 'cdf');
    try {
      const s = { alpha: 0.0501, power: 0.8 }; // a setting no other test asks for: not cached yet
      const m = mddInSe(10, s);
      expect(cdf).toHaveBeenCalledTimes(35);
      cdf.mockClear();
      expect(mddInSe(10, s)).toBe(m);
      expect(cdf).toHaveBeenCalledTimes(0);
      // another setting asked for in between keeps the first one cached
      expect(mddInSe(10, { alpha: 0.0502, power: 0.8 })).toBeLessThan(m);
      cdf.mockClear();
      expect(mddInSe(10, s)).toBe(m);
      expect(cdf).toHaveBeenCalledTimes(0);
    } finally {
      cdf.mockRestore();
    }
  });

  it('keeps at most 10,001 settings: the cache starts again with the next one (a bound on memory)', () => {
    // Wiring only: jstat's noncentral t and t quantile are swapped for the normal distribution
    // (cheap, and increasing in the noncentrality as the real ones) so that 20,000 settings can
    // be asked for; the values are not checked. A setting is cached when asking for it again makes
    // no CDF call. The cache's size at the start depends on the tests before, so it is measured:
    // ask for new settings until a first one (the sentinel) is dropped, which leaves the cache
    // holding the setting that emptied it and the sentinel asked for again: 2 entries. From there
    // 9,999 new settings fill it to 10,001, and the 10,000th empties it.
    const nct = jStat.noncentralt as { cdf: (x: number, df: number, ncp: number) => number };
    const st = jStat.studentt as { inv: (p: number, df: number) => number };
    const { cdf, inv } = { cdf: nct.cdf, inv: st.inv };
    let calls = 0;
    nct.cdf = (x, _df, ncp) => {
      calls++;
      return jStat.normal.cdf(x - ncp, 0, 1);
    };
    st.inv = (p) => jStat.normal.inv(p, 0, 1);
    try {
      const s = { alpha: 0.05, power: 0.8 };
      let df = 1e6; // degrees of freedom no other test asks for
      const sentinel = (): boolean => {
        calls = 0;
        mddInSe(0.5, s);
        return calls === 0;
      };
      sentinel();
      expect(sentinel()).toBe(true);
      let first = 0;
      while (first < 10_002 && sentinel()) {
        mddInSe(df++, s);
        first++;
      }
      expect(first).toBeGreaterThan(0);
      expect(first).toBeLessThanOrEqual(10_001);
      expect(sentinel()).toBe(true); // asked for again above, now cached
      let added = 0;
      while (added < 10_002 && sentinel()) {
        mddInSe(df++, s);
        added++;
      }
      expect(added).toBe(10_000);
    } finally {
      nct.cdf = cdf;
      st.inv = inv;
    }
  });
});
