/**
 * Picking one candidate from inner cross-validation scores.
 *
 * `best`: the candidate with the best inner mean of the headline metric (highest, or lowest for
 * a metric where lower is better). Exact ties go to the simplest of the tied candidates of the
 * first tied candidate's learner (complexity.ts), then to the earliest candidate.
 *
 * `one-se`, the one-standard-error rule (Breiman et al. 1984, sec. 3.4.3; Hastie, Tibshirani &
 * Friedman, Elements of Statistical Learning, 2nd ed., sec. 7.10): with the best candidate's
 * inner scores x_1..x_J, its standard error is
 *
 *   SE = sd(x) / sqrt(J)       (sd with denominator J - 1)
 *
 * and the pick is the simplest candidate of the best candidate's learner whose inner mean is
 * within SE of the best mean (mean >= best - SE, or <= best + SE when lower is better); ties in
 * complexity go to the better mean, then to the best candidate, then the earliest candidate. The best candidate is always
 * eligible, so the pick is never more complex than it, and equals it when nothing simpler is
 * close enough (or when there is one candidate). With fewer than two inner scores there is no
 * SE and the rule falls back to `best` (the result says so).
 *
 * Candidates whose inner mean is undefined (the metric was undefined in every inner fold) are
 * never picked; if no candidate has a mean, the result's pick is -1.
 */
import type { SearchCandidate } from './space.js';
import { compareComplexity } from './complexity.js';

export const PICK_RULES = ['best', 'one-se'] as const;
export type PickRule = (typeof PICK_RULES)[number];

/** The inner scores of one candidate, summarised. */
export interface InnerStat {
  /** number of inner folds with a defined score */
  readonly n: number;
  readonly mean: number | null;
  /** sample sd (denominator n - 1); null when n < 2 */
  readonly sd: number | null;
}

export interface Pick {
  /** index of the picked candidate, -1 when no candidate has a mean */
  readonly pick: number;
  /** index of the candidate with the best mean, -1 when none */
  readonly best: number;
  /** the standard error of the best mean, for one-se (null when it has fewer than 2 scores) */
  readonly se: number | null;
  /** true when one-se was asked but had no standard error, so `best` was used */
  readonly fellBack: boolean;
}

/** Mean and sample sd of the defined values (NaN and null are skipped). */
export function innerStat(values: readonly (number | null)[]): InnerStat {
  const xs = values.filter((v): v is number => v !== null && Number.isFinite(v));
  const n = xs.length;
  if (n === 0) return { n, mean: null, sd: null };
  const mean = xs.reduce((s, v) => s + v, 0) / n;
  if (n < 2) return { n, mean, sd: null };
  const ss = xs.reduce((s, v) => s + (v - mean) ** 2, 0);
  return { n, mean, sd: Math.sqrt(ss / (n - 1)) };
}

function simplestOf(cands: readonly SearchCandidate[], stats: readonly InnerStat[], pool: readonly number[], better: (a: number, b: number) => boolean): number {
  let pick = pool[0];
  for (const i of pool.slice(1)) {
    const c = compareComplexity(cands[i].learner, cands[i].params, cands[pick].learner, cands[pick].params);
    if (c === null) continue;
    if (c < 0 || (c === 0 && better(stats[i].mean!, stats[pick].mean!))) pick = i;
  }
  return pick;
}

export function pickCandidate(cands: readonly SearchCandidate[], stats: readonly InnerStat[], rule: PickRule, higherIsBetter: boolean): Pick {
  const better = (a: number, b: number): boolean => (higherIsBetter ? a > b : a < b);
  let top = -1;
  stats.forEach((s, i) => {
    if (s.mean !== null && (top < 0 || better(s.mean, stats[top].mean!))) top = i;
  });
  if (top < 0) return { pick: -1, best: -1, se: null, fellBack: false };
  const same = (i: number): boolean => cands[i].learner === cands[top].learner;
  const ties = stats.flatMap((s, i) => (s.mean === stats[top].mean && same(i) ? [i] : []));
  const best = simplestOf(cands, stats, ties, better);
  const b = stats[best];
  if (rule === 'best') return { pick: best, best, se: null, fellBack: false };
  if (b.sd === null || b.n < 2) return { pick: best, best, se: null, fellBack: true };
  const se = b.sd / Math.sqrt(b.n);
  const slack = 1e-12 * Math.max(1, Math.abs(b.mean!));
  const within = (m: number): boolean => (higherIsBetter ? m >= b.mean! - se - slack : m <= b.mean! + se + slack);
  const pool = [best, ...stats.flatMap((s, i) => (i !== best && s.mean !== null && same(i) && within(s.mean) ? [i] : []))];
  return { pick: simplestOf(cands, stats, pool, better), best, se, fellBack: false };
}
