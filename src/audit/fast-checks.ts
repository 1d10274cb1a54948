/**
 * The fast part of the audit, shared by `audit` and `quickAudit`: every check that costs
 * O(features x rows x folds) or less (single-feature scores and leakage, target mappings,
 * id-like, constant and near-constant columns, duplicates against the plan, informative
 * missingness, strong associations, group-like and date-like columns, rare classes, missing
 * markers). Only the pairwise correlated clusters (O(features^2 x rows)) are left to `audit`.
 */
import type { AuditContext } from './audit-context.js';
import { constantSuspects } from './constant.js';
import { DATE_WORDS, dateLikeSuspects } from './date-like.js';
import { duplicateSuspects, findDuplicates, timeStamps } from './duplicates.js';
import { groupLikeSuspects } from './group-like.js';
import { highCardinalitySuspects, idLikeSuspects } from './id-like.js';
import { leakageSuspects } from './leakage.js';
import { missingMarkerSuspects } from './missing-marker.js';
import { missingnessTests } from './missingness.js';
import { rareClassSuspects } from './rare-class.js';
import { singleFeatureScores } from './single-feature-scores.js';
import { strongAssociationSuspects } from './strong-association.js';
import { SEVERITIES, type DuplicateSummary, type MissingnessTest, type SingleFeatureScores, type Suspect, type SuspectKind } from './types.js';

export interface FastFindings {
  readonly singleFeature: SingleFeatureScores;
  readonly duplicates: DuplicateSummary;
  readonly missingness: readonly MissingnessTest[];
  readonly suspects: Suspect[];
  /** names of the id-like and constant features (left out of the clusters) */
  readonly unusable: ReadonlySet<string>;
}

export const SUSPECT_ORDER: readonly SuspectKind[] = [
  'leakage',
  'rare-class',
  'duplicate-rows',
  'conflicting-duplicates',
  'id-like',
  'high-cardinality',
  'group-like',
  'informative-missingness',
  'correlated-cluster',
  'constant',
  'near-constant',
  'date-like',
  'strong-association',
  'missing-marker',
];

/** Sorts suspects by severity, then kind (SUSPECT_ORDER), then the first column's position. */
export function sortSuspects(suspects: readonly Suspect[], positionOf: (name: string) => number): Suspect[] {
  const first = (s: Suspect): number => (s.columns.length ? Math.min(...s.columns.map(positionOf)) : -1);
  return suspects
    .map((s, i) => ({ s, i }))
    .sort(
      (a, b) =>
        SEVERITIES.indexOf(a.s.severity) - SEVERITIES.indexOf(b.s.severity) ||
        SUSPECT_ORDER.indexOf(a.s.kind) - SUSPECT_ORDER.indexOf(b.s.kind) ||
        first(a.s) - first(b.s) ||
        a.i - b.i,
    )
    .map(({ s }) => s);
}

export function fastChecks(ctx: AuditContext): FastFindings {
  const { problem, features } = ctx;
  const y = problem.target;
  const n = problem.rows.length;
  // scored checks on ctx.scoreProblem (every row, or the sample above the row limit)
  const sy = ctx.scoreProblem.target;
  const singleFeature = singleFeatureScores(ctx.scoreProblem, ctx.scoreFeatures, ctx.scoreFolds, ctx.scorePlanText);
  const leakage = leakageSuspects(ctx.scoreFeatures, sy, singleFeature);
  const idLike = idLikeSuspects(features, n);
  const constant = constantSuspects(features, n);
  const idNames = new Set(idLike.map((s) => s.columns[0]));
  const unusable = new Set([...idNames, ...constant.filter((s) => s.kind === 'constant').map((s) => s.columns[0])]);
  const dups = findDuplicates(features, y, ctx.planned.plan.folds, timeStamps(problem, DATE_WORDS));
  const missing = missingnessTests(ctx.scoreFeatures, sy);
  const leaking = new Set(leakage.map((s) => s.columns[0]));
  const targetColumn = ctx.table.byName.get(problem.targetName)!;
  const suspects: Suspect[] = [
    ...leakage,
    ...rareClassSuspects(problem, ctx.planned.plan, ctx.spec, ctx.planText),
    ...duplicateSuspects(dups, ctx.planText, ctx.lineOf, features, y),
    ...idLike,
    ...highCardinalitySuspects(features, n, idNames),
    ...groupLikeSuspects(features, n, idNames, singleFeature.scores, ctx.scorePlanText),
    ...missing.suspects,
    ...constant,
    ...dateLikeSuspects(features, problem, ctx.spec, ctx.planText),
    ...strongAssociationSuspects(ctx.scoreFeatures, sy, new Set([...leaking, ...idNames])),
    ...missingMarkerSuspects([...problem.features, targetColumn]),
  ];
  return { singleFeature, duplicates: dups.summary, missingness: missing.tests, suspects, unusable };
}
