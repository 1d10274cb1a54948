/**
 * Recommendations tied to the findings, one per kind of action with every column it concerns:
 * first group by a group-like column that shares outcomes (the fix that removes that leak; a
 * column recommended for grouping is not also recommended for leaving out); leave out leaking,
 * id-like and constant columns; order by a
 * date-like one; stratify an unstratified classification plan when the classes are unequal
 * (imbalance ratio >= 1.5, common practice) or rare; use the plan advised for starved classes
 * (rare-class.ts); mark informative missingness before imputing; list missing markers with --missing;
 * de-duplicate rows; keep one feature per correlated cluster; check conflicting labels; report
 * a robust error metric beside rmse for a strongly skewed regression target (|skewness| >= 1,
 * Bulmer's rule of thumb, see skewness.ts).
 */
import type { PlanSpec } from '../plans/types.js';
import { AUDIT_LIMITS, type Recommendation, type Suspect, type TargetProfile } from './types.js';
import { dropOptions, fig, names, q } from './wording.js';

function columnsOf(suspects: readonly Suspect[], pick: (s: Suspect) => boolean): string[] {
  const out: string[] = [];
  for (const s of suspects) if (pick(s)) for (const c of s.columns) if (!out.includes(c)) out.push(c);
  return out;
}

export function recommendations(suspects: readonly Suspect[], target: TargetProfile, spec: PlanSpec, stratified: boolean): Recommendation[] {
  const out: Recommendation[] = [];
  // grouping first: on group-leaking data it is the fix that removes the leak, while leaving a
  // column out keeps the rows' shared outcomes on both sides of every split
  const group = columnsOf(suspects, (s) => s.kind === 'group-like' && s.severity !== 'note');
  if (group.length) out.push({ kind: 'group', columns: group, text: `group the folds by the unit the rows come from, such as --group ${q(group[0])}${group.length > 1 ? ` (candidates: ${names(group)})` : ''}; this removes the leak that shared outcomes give, which leaving the column out does not` });
  const drop = columnsOf(suspects, (s) => ((s.kind === 'leakage' && s.severity === 'high') || s.kind === 'id-like' || s.kind === 'constant' || (s.kind === 'high-cardinality' && s.severity === 'warn')) && !s.columns.some((c) => group.includes(c)));
  if (drop.length) out.push({ kind: 'drop', columns: drop, text: `leave out ${names(drop, 20)} unless each is known at prediction time and not derived from the target: ${dropOptions(drop)}` });
  const far = columnsOf(suspects, (s) => s.kind === 'leakage' && s.severity !== 'high' && !s.columns.some((c) => group.includes(c)));
  if (far.length) out.push({ kind: 'drop', columns: far, text: `find out where ${names(far)} comes from before trusting a score that rests on it; evaluate once with ${dropOptions(far)} to see how much depends on it` });
  const order = columnsOf(suspects, (s) => s.kind === 'date-like');
  if (order.length) out.push({ kind: 'order', columns: order, text: `if the model will predict the future from the past, use time-ordered folds: --order ${q(order[0])} --plan forward:5` });
  const rare = suspects.some((s) => s.kind === 'rare-class');
  if (target.task === 'classification' && !stratified && spec.kind !== 'loo' && spec.kind !== 'forward' && (target.imbalanceRatio >= 1.5 || rare)) {
    out.push({ kind: 'stratify', columns: [], text: `stratify the folds by class (leave out --no-stratify): the classes are unequal (largest over smallest ${fig(target.imbalanceRatio, 2)})` });
  }
  const firstRare = suspects.find((s) => s.kind === 'rare-class');
  if (firstRare) out.push({ kind: 'folds', columns: columnsOf(suspects, (s) => s.kind === 'rare-class'), text: firstRare.action });
  const impute = columnsOf(suspects, (s) => s.kind === 'informative-missingness');
  if (impute.length) out.push({ kind: 'impute', columns: impute, text: `for ${names(impute)}: add a 0/1 column that marks missing values before imputing; median imputation (the default --impute) alone hides that the value was missing` });
  const markers = columnsOf(suspects, (s) => s.kind === 'missing-marker');
  if (markers.length) out.push({ kind: 'missing-marker', columns: markers, text: `check the marker-like levels of ${names(markers)}; if they mean missing, list them with --missing` });
  if (suspects.some((s) => s.kind === 'duplicate-rows' && s.severity !== 'note')) out.push({ kind: 'deduplicate', columns: [], text: 'remove repeated records before evaluating, or group copies together with --group on a shared key' });
  for (const s of suspects) {
    if (s.kind !== 'correlated-cluster') continue;
    out.push({ kind: 'keep-one', columns: s.columns, text: `keep one of ${names(s.columns)} or judge their importance together as one source` });
  }
  if (suspects.some((s) => s.kind === 'conflicting-duplicates' && s.severity !== 'note')) out.push({ kind: 'labels', columns: [], text: 'check the labels of rows with equal features and different targets' });
  if (target.task === 'regression' && target.skewness !== null && Math.abs(target.skewness) >= AUDIT_LIMITS.strongSkew) {
    out.push({ kind: 'metric', columns: [], text: `the target is strongly skewed (skewness ${fig(target.skewness, 2)}): a few large errors dominate rmse; report --metric mae or --metric medae beside it` });
  }
  return out;
}
