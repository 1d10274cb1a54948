/**
 * Group-like features the plan does not group by: rows that share a value of such a column
 * (a subject, a site, a batch) are often not independent, and a random split lets a model
 * recognise the group instead of learning what generalises.
 *
 * A feature is group-like when it is not id-like, its values repeat (at least 2 rows per
 * value on average and a median of at least 2), and either it is categorical with at least
 * AUDIT_LIMITS.groupMinLevels (10) levels, or its name contains a word that usually names a
 * unit of grouping (GROUP_WORDS; then any kind and at least 2 values). Severity "warn" (printed
 * before eval) when all three hold: the feature alone predicts the target with skill >=
 * AUDIT_LIMITS.groupSkill (0.2) under the random plan (its rows share outcomes, so a random
 * split can move the score), its name suggests a unit of grouping, and it has at least
 * AUDIT_LIMITS.groupMinLevels (10) values (units drawn from many, so new ones are to be
 * expected at prediction time). Otherwise "note": statistically a strong categorical feature
 * and an ignored grouping look the same, and a name alone, or a few fixed levels (6 sites of a
 * field trial), cannot tell them apart. A rule of our own; the rates it gives on our corpus are
 * in the README ("False alarms").
 */
import type { FeatureData } from './feature-data.js';
import { AUDIT_LIMITS, type FeatureScore, type Suspect } from './types.js';
import { fig, nameTokens, q } from './wording.js';

export const GROUP_WORDS: ReadonlySet<string> = new Set([
  'id', 'group', 'subject', 'patient', 'participant', 'person', 'individual', 'animal', 'site', 'batch', 'user', 'customer',
  'client', 'session', 'household', 'family', 'store', 'shop', 'plot', 'farm', 'orchard', 'lot', 'school', 'hospital',
  'clinic', 'device', 'machine', 'herd', 'cluster', 'account', 'donor', 'litter',
]);

/** Rows per distinct present value of a feature, ascending. */
function valueSizes(f: FeatureData): number[] {
  const sizes: number[] = [];
  if (f.kind === 'categorical') {
    for (const c of f.counts) if (c > 0) sizes.push(c);
  } else for (const c of f.runs) sizes.push(c);
  return sizes.sort((a, b) => a - b);
}

export function groupLikeSuspects(
  features: readonly FeatureData[],
  n: number,
  idLike: ReadonlySet<string>,
  scores: readonly FeatureScore[],
  planText: string,
): Suspect[] {
  const out: Suspect[] = [];
  features.forEach((f, j) => {
    if (idLike.has(f.name) || f.distinct < 2) return;
    const named = nameTokens(f.name).some((t) => GROUP_WORDS.has(t));
    if (!named && (f.kind !== 'categorical' || f.distinct < AUDIT_LIMITS.groupMinLevels)) return;
    const sizes = valueSizes(f);
    const present = n - f.missing;
    const mean = present / sizes.length;
    const median = sizes.length % 2 ? sizes[(sizes.length - 1) / 2] : (sizes[sizes.length / 2 - 1] + sizes[sizes.length / 2]) / 2;
    if (mean < 2 || median < 2) return;
    const skill = scores[j]?.skill ?? null;
    const shares = skill !== null && skill >= AUDIT_LIMITS.groupSkill;
    out.push({
      kind: 'group-like',
      severity: shares && named && sizes.length >= AUDIT_LIMITS.groupMinLevels ? 'warn' : 'note',
      columns: [f.name],
      reasons: [...(named ? ['name'] : []), ...(f.distinct >= AUDIT_LIMITS.groupMinLevels ? ['many-levels'] : []), ...(shares ? ['shared-outcomes'] : [])],
      evidence: `${q(f.name)} has ${sizes.length} values repeated over ${present} rows (${fig(mean, 1)} rows each on average, median ${median}, largest ${sizes[sizes.length - 1]})${shares ? `, and alone it predicts the target with skill ${fig(skill)} under ${planText}` : ''}; the plan does not group by it`,
      action: `if rows sharing a ${q(f.name)} are not independent (one subject, site or batch), pass --group ${q(f.name)} so that each value stays on one side of every split`,
      figures: { values: sizes.length, meanRows: mean, medianRows: median, ...(skill !== null ? { skill } : {}) },
    });
  });
  return out;
}
