/**
 * The inverse power law learning curve score(n) = a - b n^(-c) (Frey & Fisher 1999, "Modeling
 * decision tree performance with the power law", AISTATS; Figueroa et al. 2012, "Predicting
 * sample size required for classification performance", BMC Med Inform Decis Mak 12:8), fitted
 * by profile least squares: for each c on a grid 0.02, 0.04, ..., 3 the model is linear in a and
 * b, solved exactly by ordinary least squares on (n^(-c), score); the c with the least residual
 * sum of squares wins (the first on a tie). For a metric where lower is better the same form is
 * fitted to the negated scores, so b > 0 always means "improves with more data".
 * Needs at least 3 distinct sizes; fewer give null.
 */
export interface PowerLawFit {
  readonly a: number;
  readonly b: number;
  readonly c: number;
  readonly rss: number;
}

export const C_GRID: readonly number[] = Array.from({ length: 150 }, (_, i) => Number(((i + 1) * 0.02).toFixed(2)));

export function fitPowerLaw(n: readonly number[], y: readonly number[]): PowerLawFit | null {
  if (new Set(n).size < 3 || n.length !== y.length) return null;
  let best: PowerLawFit | null = null;
  for (const c of C_GRID) {
    const x = n.map((v) => v ** -c);
    const mx = x.reduce((s, v) => s + v, 0) / x.length;
    const my = y.reduce((s, v) => s + v, 0) / y.length;
    let sxx = 0;
    let sxy = 0;
    for (let i = 0; i < x.length; i++) {
      sxx += (x[i] - mx) ** 2;
      sxy += (x[i] - mx) * (y[i] - my);
    }
    if (!(sxx > 0)) continue;
    const slope = sxy / sxx; // = -b
    const a = my - slope * mx;
    let rss = 0;
    for (let i = 0; i < x.length; i++) rss += (y[i] - a - slope * x[i]) ** 2;
    if (!best || rss < best.rss) best = { a, b: -slope, c, rss };
  }
  return best;
}

/** The gain from doubling n under a fit: score(2n) - score(n) = b n^-c (1 - 2^-c). */
export function doublingGain(fit: PowerLawFit, n: number): number {
  return fit.b * n ** -fit.c * (1 - 2 ** -fit.c);
}
