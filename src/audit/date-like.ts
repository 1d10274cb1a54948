/**
 * Date-like columns when the plan is not time-ordered: if the model will predict later rows
 * from earlier ones, shuffled folds let it train on the future of its test rows.
 *
 * A feature is date-like when the loader read it as ISO dates, or its name contains a word of
 * DATE_WORDS and it is numeric. Reported (as a note) when the plan is not a forward plan; an
 * --order column with a plan that is not forward is reported too. A rule of our own.
 */
import type { Problem } from '../data/problem.js';
import type { PlanSpec } from '../plans/types.js';
import type { FeatureData } from './feature-data.js';
import type { Suspect } from './types.js';
import { isoDate, nameTokens, q } from './wording.js';

export const DATE_WORDS: ReadonlySet<string> = new Set([
  'date', 'time', 'timestamp', 'datetime', 'year', 'month', 'week', 'day', 'quarter', 'period', 'created', 'updated', 'season',
]);

export function dateLikeSuspects(features: readonly FeatureData[], problem: Problem, spec: PlanSpec, planText: string): Suspect[] {
  if (spec.kind === 'forward') return [];
  const out: Suspect[] = [];
  const action = (name: string): string =>
    `if the model will predict later rows from earlier ones, pass --order ${q(name)} with a forward plan (such as --plan forward:5) so that every test fold lies after its training rows`;
  if (problem.orderName !== undefined) {
    out.push({
      kind: 'date-like',
      severity: 'note',
      columns: [problem.orderName],
      reasons: ['order-unused'],
      evidence: `--order ${q(problem.orderName)} is given but the plan ${planText} is not time-ordered, so the order column is not used`,
      action: 'use a forward plan (such as --plan forward:5) for a time-ordered evaluation, or leave --order out',
      figures: {},
    });
  }
  for (const f of features) {
    if (f.kind !== 'numeric' || f.uniques.length === 0) continue;
    const named = nameTokens(f.name).some((t) => DATE_WORDS.has(t));
    if (!f.dates && !named) continue;
    const lo = f.uniques[0];
    const hi = f.uniques[f.uniques.length - 1];
    const range = f.dates ? `ISO dates from ${isoDate(lo)} to ${isoDate(hi)}` : `values from ${lo} to ${hi} and a name that suggests time`;
    out.push({
      kind: 'date-like',
      severity: 'note',
      columns: [f.name],
      reasons: [f.dates ? 'iso-dates' : 'name'],
      evidence: `${q(f.name)} holds ${range}; the plan ${planText} mixes earlier and later rows in training and test`,
      action: action(f.name),
      figures: { min: lo, max: hi },
    });
  }
  return out;
}
