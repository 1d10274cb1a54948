/**
 * Id-like columns: identifiers give a learner row-specific values that do not generalise, and
 * an id that follows the row order also follows whatever the rows were sorted by.
 *
 * A feature is id-like when it has at least AUDIT_LIMITS.minRows present values on the used
 * rows and at least 95% of them are distinct, and
 * - it is categorical (texts unique or near unique per row), or
 * - it is numeric, not a date, every value a whole number, and either monotone in row order
 *   (at least 95% of steps between consecutive present rows go the same way) or dense (the
 *   distinct values fill at least half of the range max - min + 1), as running numbers do.
 * Measured numbers with decimals are never id-like, however unique, and neither is a numeric
 * column whose name suggests time (DATE_WORDS in date-like.ts: a "year" running with the rows
 * is a time axis, reported as date-like). Rule of our own.
 */
import type { FeatureData } from './feature-data.js';
import { ONE_HOT_LIMIT } from '../prep/fold-prep.js';
import { AUDIT_LIMITS, type Suspect } from './types.js';
import { DATE_WORDS } from './date-like.js';
import { dropOptions, nameTokens, pct, q } from './wording.js';

export interface IdLikeEvidence {
  readonly present: number;
  readonly distinct: number;
  /** "text", "monotone" or "dense" */
  readonly why: 'text' | 'monotone' | 'dense';
}

export function idLikeEvidence(f: FeatureData, n: number): IdLikeEvidence | null {
  const present = n - f.missing;
  if (present < AUDIT_LIMITS.minRows || f.distinct < AUDIT_LIMITS.idShare * present) return null;
  if (f.kind === 'categorical') return { present, distinct: f.distinct, why: 'text' };
  if (f.dates || nameTokens(f.name).some((t) => DATE_WORDS.has(t))) return null;
  for (const v of f.uniques) if (!Number.isInteger(v)) return null;
  let up = 0;
  let down = 0;
  let prev = NaN;
  for (let i = 0; i < n; i++) {
    const v = f.values[i];
    if (Number.isNaN(v)) continue;
    if (!Number.isNaN(prev)) {
      if (v > prev) up++;
      else if (v < prev) down++;
    }
    prev = v;
  }
  const steps = present - 1;
  if (up >= AUDIT_LIMITS.idShare * steps || down >= AUDIT_LIMITS.idShare * steps) return { present, distinct: f.distinct, why: 'monotone' };
  const lo = f.uniques[0];
  const hi = f.uniques[f.uniques.length - 1];
  if (f.distinct >= 0.5 * (hi - lo + 1)) return { present, distinct: f.distinct, why: 'dense' };
  return null;
}

export function idLikeSuspects(features: readonly FeatureData[], n: number): Suspect[] {
  const out: Suspect[] = [];
  for (const f of features) {
    const e = idLikeEvidence(f, n);
    if (!e) continue;
    const how =
      e.why === 'text' ? 'texts' : e.why === 'monotone' ? 'whole numbers that run with the row order' : 'whole numbers filling most of their range, like running numbers';
    out.push({
      kind: 'id-like',
      severity: 'warn',
      columns: [f.name],
      reasons: [e.why],
      evidence: `${q(f.name)} has ${e.distinct} distinct values in ${e.present} present rows (${pct(e.distinct / e.present)}), ${how}`,
      action: `an identifier does not generalise to new rows; leave it out (${dropOptions([f.name])}), or if rows sharing it belong together, pass it with --group`,
      figures: { distinct: e.distinct, present: e.present },
    });
  }
  return out;
}

/**
 * High-cardinality categorical features (issue #25 item 16): more levels than the one-hot
 * limit of the preprocessing (ONE_HOT_LIMIT, 50; src/prep/fold-prep.ts codes such a column by
 * the frequency of its level in the training rows instead), and not already id-like. "warn"
 * when it has a level for more than half of its present rows (most rows then carry a level
 * seen a few times at most, which behaves like an identifier), "note" otherwise. Rule of our own.
 */
export function highCardinalitySuspects(features: readonly FeatureData[], n: number, idLike: ReadonlySet<string>): Suspect[] {
  const out: Suspect[] = [];
  for (const f of features) {
    if (f.kind !== 'categorical' || idLike.has(f.name) || f.distinct <= ONE_HOT_LIMIT) continue;
    const present = n - f.missing;
    const sparse = f.distinct > 0.5 * present;
    out.push({
      kind: 'high-cardinality',
      severity: sparse ? 'warn' : 'note',
      columns: [f.name],
      reasons: [sparse ? 'level-per-few-rows' : 'many-levels'],
      evidence: `${q(f.name)} has ${f.distinct} levels in ${present} present rows (${pct(f.distinct / present)}), more than the ${ONE_HOT_LIMIT} that are one-hot encoded; the preprocessing codes it by the frequency of its level in each training fold instead`,
      action: sparse
        ? `most of its levels hold a row or two, like an identifier: leave it out (${dropOptions([f.name])}), or if rows sharing a level belong together, pass it with --group`
        : `check that its levels are known at prediction time; group rare levels yourself if their identity matters more than their frequency`,
      figures: { distinct: f.distinct, present },
    });
  }
  return out;
}
