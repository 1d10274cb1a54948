/**
 * Wilson's score interval for a binomial proportion: the set of p for which the observed share
 * h/n lies within z standard errors sqrt(p (1 - p) / n) of p, that is
 *
 *   centre = (phat + z^2 / (2n)) / (1 + z^2 / n)
 *   half   = z / (1 + z^2 / n) * sqrt(phat (1 - phat) / n + z^2 / (4 n^2))
 *
 * It stays inside [0, 1] and, unlike the normal (Wald) interval, does not collapse to a point
 * when h = 0 or h = n: a bin whose rows were all positive is not proof of certainty.
 *
 * Sources: Wilson (1927), "Probable inference, the law of succession, and statistical
 * inference", JASA 22:209-212; Newcombe (1998), "Two-sided confidence intervals for the single
 * proportion: comparison of seven methods", Statistics in Medicine 17:857-872 (method 3).
 */

/** z for a two-sided 95% interval (the 0.975 normal quantile). */
export const Z95 = 1.959963984540054;

export function wilsonInterval(hits: number, n: number, z = Z95): [number, number] {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`wilsonInterval: n must be a positive integer (got ${n})`);
  if (!Number.isInteger(hits) || hits < 0 || hits > n) throw new RangeError(`wilsonInterval: hits must be an integer in 0..${n} (got ${hits})`);
  const p = hits / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z / denom) * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  // the bounds are exactly 0 at h = 0 and 1 at h = n; say so rather than trust rounding
  return [hits === 0 ? 0 : Math.max(0, centre - half), hits === n ? 1 : Math.min(1, centre + half)];
}
