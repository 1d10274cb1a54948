/**
 * Leakage suspects from the single-feature scores and the target mappings:
 *
 * - "near-perfect": the feature alone reaches skill >= AUDIT_LIMITS.nearPerfectSkill (0.9)
 *   out of fold (balanced-accuracy skill or R^2, see single-feature-scores.ts);
 * - "far-above": the best feature's skill is >= 0.5 and at least 0.3 above the second best
 *   (needs two or more scored features);
 * - "one-to-one" / "determines": see target-mapping.ts.
 *
 * - "target-mean": a numeric feature whose every value equals the mean target (the share of
 *   one class, or the mean of a numeric target) of the used rows holding that value, within
 *   rounding: target encoding computed on all rows, test rows included (targetMeanCoding).
 *
 * Severity "high" for every reason but a lone "far-above", which is a "note" in the full audit
 * only (so not printed before eval): a data set whose signal sits in one feature (a dose, a
 * temperature, a price) is the normal case in many trades, and a lone strong feature is no
 * pattern that leaks produce. The cut-offs are our own choice; no published threshold exists
 * for this check; the rates they give on our corpus are in the README ("False alarms").
 */
import type { FeatureData } from './feature-data.js';
import { targetMapping, targetMeanCoding, type TargetMapping } from './target-mapping.js';
import { AUDIT_LIMITS, type SingleFeatureScores, type Suspect } from './types.js';
import { count, dropOptions, fig, q } from './wording.js';
import type { Target } from '../learning.js';

export function leakageSuspects(features: readonly FeatureData[], y: Target, scores: SingleFeatureScores): Suspect[] {
  const ranked = scores.scores
    .map((s, j) => ({ s, j }))
    .filter(({ s }) => s.skill !== null)
    .sort((a, b) => b.s.skill! - a.s.skill! || a.j - b.j);
  const top = ranked[0];
  const second = ranked[1];
  const farAbove =
    top !== undefined &&
    second !== undefined &&
    top.s.skill! >= AUDIT_LIMITS.farAboveSkill &&
    top.s.skill! - second.s.skill! >= AUDIT_LIMITS.farAboveMargin
      ? top.j
      : -1;
  const metric = scores.metric === 'r2' ? 'R^2' : 'balanced accuracy';
  const out: Suspect[] = [];
  features.forEach((f, j) => {
    const s = scores.scores[j];
    const reasons: string[] = [];
    const parts: string[] = [];
    const figures: Record<string, number> = {};
    if (s.score !== null) figures.score = s.score;
    if (s.skill !== null) figures.skill = s.skill;
    const scored = `alone it scores ${metric} ${fig(s.score)} out of fold under ${scores.plan} (skill ${fig(s.skill)}; 0 is chance, 1 perfect)`;
    if (s.skill !== null && s.skill >= AUDIT_LIMITS.nearPerfectSkill) {
      reasons.push('near-perfect');
      parts.push(`${scored}, near perfect`);
    }
    if (farAbove === j) {
      reasons.push('far-above');
      figures.secondSkill = second.s.skill!;
      if (!parts.length) parts.push(scored);
      parts.push(`far above the next best feature ${q(second.s.feature)} (skill ${fig(second.s.skill)})`);
    }
    const mapping: TargetMapping | null = targetMapping(f, y);
    if (mapping) {
      reasons.push(mapping.reason);
      figures.values = mapping.values;
      parts.push(
        mapping.reason === 'one-to-one'
          ? y.task === 'classification'
            ? `its ${count(mapping.values, 'value')} and the classes correspond one to one in all ${mapping.rows} rows where it is present`
            : `the target is a strictly monotone function of it in all ${mapping.rows} rows where it is present`
          : `each of its ${count(mapping.values, 'value')} occurs with a single target value in all ${mapping.rows} rows where it is present`,
      );
    }
    const encoded = targetMeanCoding(f, y);
    if (encoded) {
      reasons.push('target-mean');
      figures.values = encoded.values;
      parts.push(`each of its ${count(encoded.values, 'value')} equals the mean target of the ${encoded.rows} rows holding it (largest gap ${encoded.gap.toPrecision(2)}): target encoding computed on all rows, test rows included`);
    }
    if (!reasons.length) return;
    const severity = reasons.length === 1 && reasons[0] === 'far-above' ? 'note' : 'high';
    out.push({
      kind: 'leakage',
      severity,
      columns: [f.name],
      reasons,
      evidence: `${q(f.name)}: ${parts.join('; ')}`,
      action: `check that ${q(f.name)} is known before the outcome and not derived from it; if not, leave it out (${dropOptions([f.name])})`,
      figures,
    });
  });
  return out;
}
