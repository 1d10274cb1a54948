/**
 * Wilcoxon signed-rank test for two models scored on the same folds.
 *
 * In words: take the paired differences d_j = a_j - b_j and drop the zero differences
 * (Wilcoxon's own convention, 1945; the count n that remains is reported). Rank the |d_j| from
 * 1 to n, giving tied magnitudes the mean of the ranks they occupy (midranks). T+ is the sum of
 * the ranks of the positive differences, T- that of the negative ones; T+ + T- = n(n+1)/2.
 *
 * Null distribution: under H0 each rank carries a + or - sign with probability 1/2,
 * independently. The exact distribution of T+ given the observed (mid)ranks is built by dynamic
 * programming over the ranks, on doubled ranks so that midranks are integers; this conditional
 * (permutation) distribution is exact with ties too. The two-sided p-value is
 * min(1, 2 min(P(T+ <= t), P(T+ >= t))). With method 'auto' (the default) the exact
 * distribution is used when n <= 25 and the normal approximation otherwise.
 *
 * Normal approximation: E[T+] = n(n+1)/4 and, with tie groups of sizes t_g,
 * Var[T+] = n(n+1)(2n+1)/24 - sum_g (t_g^3 - t_g)/48; z = (|T+ - E| - 0.5)/sqrt(Var), the 0.5
 * being the continuity correction (on by default; `continuity: false` drops it), and
 * p = 2 P(Z >= z).
 *
 * Ties and zeros within a tolerance (`tolerance`, default 0: exact equality). Fold scores that are
 * equal as fractions differ in their last bits once computed (0.29999999999999993 against
 * 0.30000000000000004), and exact comparison would rank them apart: then T+ and p change (in the
 * published-style example of the tests p is 0.5 instead of 0.3125). A difference with
 * |d| <= tolerance counts as zero; sorted by size, a magnitude within tolerance of the smallest
 * magnitude of its group joins that tie group. src/compare/paired-stats.ts passes
 * roundingTolerance (below), tied to the test fold size.
 *
 * Edge cases: n = 0 (all differences zero) gives T+ = T- = 0 and p = 1.
 * Inputs: two arrays of equal length >= 1 with finite values (NaN is refused with an InputError).
 *
 * Sources: F. Wilcoxon, "Individual Comparisons by Ranking Methods", Biometrics Bulletin
 * 1(6):80-83, 1945; M. Hollander and D. A. Wolfe, Nonparametric Statistical Methods, Wiley,
 * sec. 3.1 (the test, midranks, the tie-corrected variance). Free: "Wilcoxon signed-rank test"
 * in Wikipedia (https://en.wikipedia.org/wiki/Wilcoxon_signed-rank_test), sections on zeros,
 * ties and the normal approximation.
 */
import jStat from 'jstat';
import { InputError, UsageError } from '../errors.js';
import { finiteValues } from './finite-values.js';

export type WilcoxonMethod = 'exact' | 'normal';

export interface WilcoxonOptions {
  /** 'auto' (default): exact when n <= 25 non-zero differences, else normal */
  readonly method?: 'auto' | WilcoxonMethod;
  /** continuity correction of the normal approximation (default true) */
  readonly continuity?: boolean;
  /** differences and gaps between magnitudes up to this size count as equal (default 0) */
  readonly tolerance?: number;
}

/**
 * The rounding noise of comparing two fold scores, each a mean over `testRows` rows of values of
 * size up to `scale`: recursive summation of n terms errs by at most (n - 1) u sum |x_i| with
 * u = Number.EPSILON / 2 (N. J. Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed.,
 * SIAM 2002, sec. 4.2), so a difference of two scores carries at most about n EPSILON scale; a
 * factor 4 leaves room for the division and the subtraction. Two distinct fractions k/n differ by
 * at least 1/n^2, far above this for any test fold below about 80,000 rows, so real differences
 * are never merged there.
 */
export function roundingTolerance(testRows: number, scale: number): number {
  return 4 * Math.max(1, testRows) * Number.EPSILON * Math.abs(scale);
}

export interface WilcoxonResult {
  /** number of non-zero differences */
  readonly n: number;
  readonly tPlus: number;
  readonly tMinus: number;
  /** two-sided p-value */
  readonly p: number;
  readonly method: WilcoxonMethod;
}

/** Largest n for which method 'auto' uses the exact distribution. */
export const WILCOXON_EXACT_AUTO_MAX = 25;
/** Largest n accepted with method 'exact' (the dynamic programme costs about n^3 steps). */
export const WILCOXON_EXACT_MAX = 500;

export function wilcoxon(a: ArrayLike<number>, b: ArrayLike<number>, options: WilcoxonOptions = {}): WilcoxonResult {
  const xs = finiteValues('wilcoxon', 'a', a);
  const ys = finiteValues('wilcoxon', 'b', b);
  if (xs.length !== ys.length) {
    throw new InputError(`wilcoxon: a and b must pair up, got ${xs.length} and ${ys.length} scores`);
  }
  if (xs.length < 1) throw new InputError('wilcoxon: need at least 1 paired score, got 0');
  const requested = options.method ?? 'auto';
  if (requested !== 'auto' && requested !== 'exact' && requested !== 'normal') {
    throw new UsageError(`wilcoxon: method must be one of "auto", "exact", "normal", got ${JSON.stringify(requested)}`);
  }
  const tolerance = options.tolerance ?? 0;
  if (typeof tolerance !== 'number' || !(tolerance >= 0) || !Number.isFinite(tolerance)) {
    throw new UsageError(`wilcoxon: tolerance must be a finite number >= 0, got ${JSON.stringify(tolerance)}`);
  }
  const continuity = options.continuity ?? true;
  if (typeof continuity !== 'boolean') {
    throw new UsageError(`wilcoxon: continuity must be true or false, got ${JSON.stringify(continuity)}`);
  }

  const d: number[] = [];
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i] - ys[i];
    if (Math.abs(v) > tolerance) d.push(v);
  }
  const n = d.length;
  if (requested === 'exact' && n > WILCOXON_EXACT_MAX) {
    throw new UsageError(`wilcoxon: method "exact" takes at most ${WILCOXON_EXACT_MAX} non-zero differences, got ${n}`);
  }
  const method: WilcoxonMethod = requested === 'auto' ? (n <= WILCOXON_EXACT_AUTO_MAX ? 'exact' : 'normal') : requested;
  if (n === 0) return { n: 0, tPlus: 0, tMinus: 0, p: 1, method };

  // Doubled midranks: positions i..k-1 (0-based) of a tie group hold ranks i+1..k, whose mean
  // doubled is i+1+k, an integer.
  const order = d.map((_, i) => i).sort((i, j) => Math.abs(d[i]) - Math.abs(d[j]));
  const rank2 = new Int32Array(n);
  const tieSizes: number[] = [];
  for (let i = 0; i < n; ) {
    let k = i + 1;
    while (k < n && Math.abs(d[order[k]]) - Math.abs(d[order[i]]) <= tolerance) k++;
    for (let q = i; q < k; q++) rank2[order[q]] = i + 1 + k;
    if (k - i > 1) tieSizes.push(k - i);
    i = k;
  }
  let tPlus2 = 0;
  for (let i = 0; i < n; i++) if (d[i] > 0) tPlus2 += rank2[i];
  const total2 = n * (n + 1);
  const tPlus = tPlus2 / 2;
  const tMinus = (total2 - tPlus2) / 2;

  const p = method === 'exact' ? exactP(rank2, tPlus2, total2) : normalP(n, tPlus, tieSizes, continuity);
  return { n, tPlus, tMinus, p, method };
}

/** Two-sided p from the sign-flip distribution of the doubled ranks (probabilities, halved per rank). */
function exactP(rank2: Int32Array, tPlus2: number, total2: number): number {
  const dist = new Float64Array(total2 + 1);
  dist[0] = 1;
  let top = 0;
  for (const r of rank2) {
    // new[s] = (old[s] + old[s - r]) / 2, in place from the top down
    for (let s = top + r; s >= r; s--) dist[s] = 0.5 * dist[s] + 0.5 * dist[s - r];
    for (let s = Math.min(r - 1, top); s >= 0; s--) dist[s] *= 0.5;
    top += r;
  }
  let lower = 0;
  let upper = 0;
  for (let s = 0; s <= total2; s++) {
    if (s <= tPlus2) lower += dist[s];
    if (s >= tPlus2) upper += dist[s];
  }
  return Math.min(1, 2 * Math.min(lower, upper));
}

function normalP(n: number, tPlus: number, tieSizes: readonly number[], continuity: boolean): number {
  const mu = (n * (n + 1)) / 4;
  let tie = 0;
  for (const t of tieSizes) tie += t * t * t - t;
  const variance = (n * (n + 1) * (2 * n + 1)) / 24 - tie / 48;
  const dev = Math.max(0, Math.abs(tPlus - mu) - (continuity ? 0.5 : 0));
  const z = dev / Math.sqrt(variance);
  return Math.min(1, 2 * jStat.normal.cdf(-z, 0, 1));
}
