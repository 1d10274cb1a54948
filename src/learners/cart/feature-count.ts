/**
 * How many features a forest draws at random at every split (the `features` option).
 *
 * Forms, for p features:
 *   breiman  floor(sqrt(p)) for classification, floor(p / 3) for regression (at least 1). This is
 *            common practice, from Liaw & Wiener (2002), "Classification and Regression by
 *            randomForest", R News 2(3):18-22 (free: https://journal.r-project.org/articles/RN-2002-022/);
 *            Breiman (2001) himself tried small counts such as floor(log2(p) + 1).
 *   sqrt     floor(sqrt(p)), at least 1
 *   log2     floor(log2(p)), at least 1
 *   all      p (bagged trees, no feature sampling)
 *   frac:F   floor(F * p), at least 1, for 0 < F <= 1
 *   count:M  min(M, p), for an integer M >= 1
 */
import { UsageError } from '../../errors.js';
import type { Task } from '../../learning.js';

const RULE =
  'breiman, sqrt, log2, all, frac:F with 0 < F <= 1, or count:M with M an integer >= 1';

/** Canonical form of a `features` value, or a UsageError naming the option and its limits. */
export function parseFeatureCount(raw: string): string {
  const s = raw.trim().toLowerCase();
  if (s === 'breiman' || s === 'sqrt' || s === 'log2' || s === 'all') return s;
  const bad = (why: string) => new UsageError(`option "features" must be ${why}, got ${JSON.stringify(raw)}`);
  const m = /^(frac|count):(.*)$/.exec(s);
  if (!m) throw bad(RULE);
  const num = m[2].trim();
  const v = num === '' ? NaN : Number(num);
  if (m[1] === 'frac') {
    if (!(Number.isFinite(v) && v > 0 && v <= 1)) throw bad('frac:F with 0 < F <= 1');
    return `frac:${v}`;
  }
  if (!(Number.isInteger(v) && v >= 1)) throw bad('count:M with M an integer >= 1');
  return `count:${v}`;
}

/** The number of features drawn at each split, in 1..p, for a canonical `features` value (p >= 1). */
export function resolveFeatureCount(canonical: string, p: number, task: Task): number {
  if (p < 1) return 0;
  // the 1e-9 keeps products such as 0.29 * 100 = 28.999999999999996 from losing a feature
  const atLeastOne = (k: number) => Math.min(p, Math.max(1, Math.floor(k + 1e-9)));
  switch (canonical) {
    case 'breiman':
      return task === 'classification' ? atLeastOne(Math.sqrt(p)) : atLeastOne(p / 3);
    case 'sqrt':
      return atLeastOne(Math.sqrt(p));
    case 'log2':
      return atLeastOne(Math.log2(p));
    case 'all':
      return p;
  }
  const c = parseFeatureCount(canonical);
  const v = Number(c.slice(c.indexOf(':') + 1));
  return c.startsWith('frac:') ? atLeastOne(v * p) : Math.min(p, v);
}
