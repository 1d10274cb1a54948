import { describe, expect, it } from 'vitest';
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
