/**
 * Informative missingness: whether a feature is missing is associated with the target, so
 * filling it with a median or mean hides a signal (or lets a recording artefact pass as one).
 *
 * For every feature with at least AUDIT_LIMITS.missingnessMinRows (5) missing and 5 present
 * used rows: Pearson's chi-square test (chi-square.ts) of the 2 x K table missing/present by
 * class (for regression by target quarter, target-bins.ts), with Cramer's V (phi) as the
 * effect size. A column is flagged when p < 0.01 / m, Bonferroni over the m columns tested (so
 * on data where missingness is unrelated to the target, the chance that any column of one
 * audit is flagged is at most about 1%), and V >= 0.1 (Cohen's "small" effect, so that huge
 * files do not flag negligible differences; J. Cohen, Statistical Power Analysis for the
 * Behavioral Sciences, 2nd ed., 1988, section 7.2).
 */
import type { Target } from '../learning.js';
import { chiSquareTest } from './chi-square.js';
import { cramersVOf } from './cramers-v.js';
import { isPresent, type FeatureData } from './feature-data.js';
import { targetBins } from './target-bins.js';
import { AUDIT_LIMITS, type MissingnessTest, type Suspect } from './types.js';
import { fig, pct, pValue, q } from './wording.js';

export interface MissingnessResult {
  readonly tests: readonly MissingnessTest[];
  readonly suspects: readonly Suspect[];
}

export function missingnessTests(features: readonly FeatureData[], y: Target): MissingnessResult {
  const { bins, count: k, names } = targetBins(y);
  const n = bins.length;
  const candidates = features.filter((f) => f.missing >= AUDIT_LIMITS.missingnessMinRows && n - f.missing >= AUDIT_LIMITS.missingnessMinRows);
  const m = candidates.length;
  const cut = AUDIT_LIMITS.missingnessLevel / Math.max(1, m);
  const tests: MissingnessTest[] = [];
  const suspects: Suspect[] = [];
  for (const f of candidates) {
    // row 0: missing, row 1: present
    const table = new Float64Array(2 * k);
    for (let i = 0; i < n; i++) table[(isPresent(f, i) ? k : 0) + bins[i]]++;
    const t = chiSquareTest(table, 2, k);
    const v = cramersVOf(t) ?? 0;
    const flagged = t.p < cut && v >= AUDIT_LIMITS.missingnessEffect;
    tests.push({ column: f.name, missing: f.missing, chiSquare: t.chiSquare, df: t.df, p: t.p, cramersV: v, smallExpected: t.smallExpected, flagged });
    if (!flagged) continue;
    // the categories with the highest and lowest missing share
    let hi = -1;
    let lo = -1;
    const share = (c: number): number => table[c] / (table[c] + table[k + c]);
    for (let c = 0; c < k; c++) {
      if (table[c] + table[k + c] === 0) continue;
      if (hi < 0 || share(c) > share(hi)) hi = c;
      if (lo < 0 || share(c) < share(lo)) lo = c;
    }
    const label = (c: number): string => (y.task === 'classification' ? `class ${q(names[c])}` : names[c]);
    suspects.push({
      kind: 'informative-missingness',
      severity: 'warn',
      columns: [f.name],
      reasons: [y.task === 'classification' ? 'by-class' : 'by-target-quarter'],
      evidence: `${q(f.name)} is missing in ${f.missing} of ${n} used rows, in ${pct(share(hi))} of ${label(hi)} against ${pct(share(lo))} of ${label(lo)} (chi-square ${fig(t.chiSquare, 1)}, df ${t.df}, p ${pValue(t.p)}, Cramer's V ${fig(v)}; cut-off p < ${cut.toPrecision(2)}, Bonferroni over ${m} columns)`,
      action: `that ${q(f.name)} is missing carries signal: median or mean imputation alone hides it; add a 0/1 column marking where it is missing before imputing, or find out why it is missing`,
      figures: { missing: f.missing, chiSquare: t.chiSquare, df: t.df, p: t.p, cramersV: v },
    });
  }
  return { tests, suspects };
}
