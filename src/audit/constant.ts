/**
 * Constant and near-constant features. Constant: at most one distinct value among the present
 * used rows (or no present value at all): no learner can use it. Near-constant: the most
 * frequent value covers at least 95% of at least AUDIT_LIMITS.minRows present rows, so many
 * training folds see few or none of the other values (95/5 is common practice for this check;
 * a rare but meaningful indicator is reported too, as a note).
 */
import type { FeatureData } from './feature-data.js';
import { AUDIT_LIMITS, type Suspect } from './types.js';
import { count, dropOptions, pct, q } from './wording.js';

/** The most frequent present value of a feature (as text) and its count. */
export function mostFrequent(f: FeatureData): { text: string; count: number } | null {
  if (f.kind === 'categorical') {
    let best = -1;
    for (let k = 0; k < f.counts.length; k++) if (f.counts[k] > 0 && (best < 0 || f.counts[k] > f.counts[best])) best = k;
    return best < 0 ? null : { text: f.levels[best], count: f.counts[best] };
  }
  // the smallest value among the most frequent (the first longest run of the sorted column)
  if (f.uniques.length === 0) return null;
  let best = 0;
  for (let j = 1; j < f.runs.length; j++) if (f.runs[j] > f.runs[best]) best = j;
  return { text: String(f.uniques[best]), count: f.runs[best] };
}

export function constantSuspects(features: readonly FeatureData[], n: number): Suspect[] {
  const out: Suspect[] = [];
  for (const f of features) {
    const present = n - f.missing;
    const top = mostFrequent(f);
    if (f.distinct <= 1) {
      out.push({
        kind: 'constant',
        severity: 'warn',
        columns: [f.name],
        reasons: [present === 0 ? 'all-missing' : 'one-value'],
        evidence: present === 0 ? `${q(f.name)} is missing in every used row` : `${q(f.name)} has the single value ${q(top!.text)} in all ${count(present, 'present row')}`,
        action: `it cannot help any learner; leave it out (${dropOptions([f.name])})`,
        figures: { present, distinct: f.distinct },
      });
      continue;
    }
    if (present >= AUDIT_LIMITS.minRows && top && top.count >= AUDIT_LIMITS.nearConstantShare * present) {
      out.push({
        kind: 'near-constant',
        severity: 'note',
        columns: [f.name],
        reasons: ['dominant-value'],
        evidence: `${q(f.name)} is ${q(top.text)} in ${pct(top.count / present)} of ${present} present rows; the other ${count(present - top.count, 'row')} hold ${count(f.distinct - 1, 'value')}`,
        action: `few training folds see the rare values; check the column is meant to be so, or leave it out (${dropOptions([f.name])})`,
        figures: { present, topShare: top.count / present, distinct: f.distinct },
      });
    }
  }
  return out;
}
