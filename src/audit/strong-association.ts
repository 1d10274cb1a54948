/**
 * Strong association of a categorical feature with a categorical target: Cramer's V >=
 * AUDIT_LIMITS.strongAssociation (0.5, a common rule of thumb for "strong"; cramers-v.ts) over
 * the used rows where the feature is present. The evidence names the classes confined to one
 * level (every row of the class with a present value has that level) and the levels holding a
 * single class, since those are what a model will learn by heart. Reported as a note: a
 * strong predictor is no fault, but it should be known at prediction time, and the model may
 * not carry over to levels it has not seen. Features already reported as leakage are skipped,
 * and so are features with more than one level per 5 present rows (fewLevels in feature-data.ts).
 */
import type { Target } from '../learning.js';
import { chiSquareTest } from './chi-square.js';
import { contingency, cramersVOf } from './cramers-v.js';
import { fewLevels, type FeatureData } from './feature-data.js';
import { AUDIT_LIMITS, type Suspect } from './types.js';
import { fig, q } from './wording.js';

export function strongAssociationSuspects(features: readonly FeatureData[], y: Target, skip: ReadonlySet<string>): Suspect[] {
  if (y.task !== 'classification') return [];
  const k = y.classes.length;
  const out: Suspect[] = [];
  for (const f of features) {
    if (f.kind !== 'categorical' || !fewLevels(f, y.codes.length) || skip.has(f.name)) continue;
    const levels = f.levels.length;
    const table = contingency(f.codes, levels, y.codes, k);
    const v = cramersVOf(chiSquareTest(table, levels, k));
    if (v === null || v < AUDIT_LIMITS.strongAssociation) continue;
    const confined: string[] = [];
    for (let c = 0; c < k; c++) {
      let total = 0;
      let at = -1;
      let places = 0;
      for (let l = 0; l < levels; l++) {
        const x = table[l * k + c];
        if (x === 0) continue;
        total += x;
        places++;
        at = l;
      }
      if (places === 1 && total > 0) confined.push(`${q(y.classes[c])} occurs only at ${q(f.levels[at])}`);
    }
    const pure: string[] = [];
    for (let l = 0; l < levels; l++) {
      let classes = 0;
      let only = -1;
      for (let c = 0; c < k; c++) if (table[l * k + c] > 0) (classes++, (only = c));
      if (classes === 1) pure.push(`level ${q(f.levels[l])} holds only ${q(y.classes[only])}`);
    }
    const detail = [...confined, ...pure].slice(0, 6).join(', ');
    out.push({
      kind: 'strong-association',
      severity: 'note',
      columns: [f.name],
      reasons: confined.length ? ['confined-classes'] : ['cramers-v'],
      evidence: `${q(f.name)} is strongly associated with the target (Cramer's V ${fig(v)})${detail ? `: ${detail}` : ''}`,
      action: `fine if ${q(f.name)} is known at prediction time and new rows come from the same levels; if the model must work on levels it has not seen, evaluate with --group ${q(f.name)}`,
      figures: { cramersV: v, confinedClasses: confined.length, pureLevels: pure.length },
    });
  }
  return out;
}
