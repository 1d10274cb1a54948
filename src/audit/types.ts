/**
 * The audit report: what in the data could make a cross-validated score a lie (leaking
 * columns, id columns, duplicates across folds, redundant feature clusters, informative
 * missingness, unused group or time structure), with the evidence and what to do about it.
 * Its JSON Schema is schema/audit.schema.json (format `foldwise-audit/2`).
 */
import type { DataSection } from '../model/report.js';
import type { ProblemOptions } from '../data/problem.js';
import type { Task } from '../learning.js';
import type { PlanSpec } from '../plans/types.js';

export const AUDIT_SCHEMA = 'foldwise-audit/2';

/** Cut-offs of the checks, in one place; each is explained where it is used. */
export const AUDIT_LIMITS = {
  /** |Pearson r| or Cramer's V at which two features are joined into one cluster */
  clusterThreshold: 0.9,
  /** single-feature skill (0 = chance, 1 = perfect) counted as near perfect */
  nearPerfectSkill: 0.9,
  /** the best single feature is "far above" the others when its skill is at least this ... */
  farAboveSkill: 0.5,
  /** ... and at least this much above the second best */
  farAboveMargin: 0.3,
  /** share of distinct values among present values for an id-like column */
  idShare: 0.95,
  /** fewest present values before a column is judged id-like, constant or one-to-one */
  minRows: 20,
  /** share of the most frequent value for a near-constant column */
  nearConstantShare: 0.95,
  /** family-wise level of the missingness tests (Bonferroni over the columns tested) */
  missingnessLevel: 0.01,
  /** smallest Cramer's V of the missing-indicator against the target worth reporting */
  missingnessEffect: 0.1,
  /** fewest missing (and present) rows for a missingness test */
  missingnessMinRows: 5,
  /** Cramer's V of a categorical feature against a categorical target counted as strong */
  strongAssociation: 0.5,
  /** fewest levels of a group-like column (unless its name suggests a group) */
  groupMinLevels: 10,
  /** single-feature skill of a group-like column above which grouping matters (warn) */
  groupSkill: 0.2,
  /** expected rows of the smallest class per test fold below which it is rare */
  rareClassPerFold: 2,
  /** a starved class is called rare only below this share of the even share 1/K (else: small folds) */
  rareClassShare: 0.5,
  /** folds of repeat 0 above which the single-feature scores use a 5-fold plan instead */
  maxScoreFolds: 20,
  /** |skewness| of a regression target reported as strongly skewed (Bulmer 1979) */
  strongSkew: 1,
  /** used rows above which the scored checks run on a seeded stratified sample of this many (sample.ts) */
  sampleRows: 20_000,
  /** most frequent levels listed per categorical column */
  topLevels: 5,
} as const;

export interface AuditOptions extends ProblemOptions {
  /** plan text such as "kfold:10" or a parsed spec (default kfold:10, as for eval) */
  readonly plan?: string | PlanSpec;
  /** stratify classification plans by class (default true) */
  readonly stratify?: boolean;
  /** integer seed, 0 to 2^32-1 (default 1) */
  readonly seed?: number;
  /** |Pearson r| / Cramer's V for correlated clusters, above 0 and at most 1 (default 0.9) */
  readonly clusterThreshold?: number;
}

export type Severity = 'high' | 'warn' | 'note';
export const SEVERITIES: readonly Severity[] = ['high', 'warn', 'note'];

export type SuspectKind =
  | 'leakage'
  | 'id-like'
  | 'high-cardinality'
  | 'constant'
  | 'near-constant'
  | 'duplicate-rows'
  | 'conflicting-duplicates'
  | 'correlated-cluster'
  | 'informative-missingness'
  | 'strong-association'
  | 'group-like'
  | 'date-like'
  | 'rare-class'
  | 'missing-marker';

export interface Suspect {
  readonly kind: SuspectKind;
  readonly severity: Severity;
  /** the columns concerned, in header order (empty for row-level findings) */
  readonly columns: readonly string[];
  /** finer reasons, e.g. ["near-perfect", "one-to-one"] for leakage */
  readonly reasons: readonly string[];
  /** one sentence of evidence with the figures */
  readonly evidence: string;
  /** what to do about it */
  readonly action: string;
  /** the figures behind the evidence, by fixed names of ours */
  readonly figures: Readonly<Record<string, number>>;
}

export type RecommendationKind = 'drop' | 'group' | 'order' | 'stratify' | 'impute' | 'deduplicate' | 'keep-one' | 'missing-marker' | 'folds' | 'metric' | 'labels';

export interface Recommendation {
  readonly kind: RecommendationKind;
  readonly columns: readonly string[];
  readonly text: string;
}

export interface NumericProfile {
  readonly min: number;
  readonly q1: number;
  readonly median: number;
  readonly mean: number;
  readonly q3: number;
  readonly max: number;
  /** sample standard deviation (n-1); null with fewer than 2 values */
  readonly sd: number | null;
  /** every present value is a whole number */
  readonly integer: boolean;
}

export interface LevelCount {
  readonly level: string;
  readonly count: number;
}

export interface ColumnProfile {
  readonly name: string;
  readonly position: number;
  readonly role: 'feature' | 'target' | 'dropped' | 'group' | 'order';
  /** "date" for ISO dates (numbers are days since 1970-01-01 UTC) */
  readonly type: 'numeric' | 'date' | 'categorical';
  readonly missing: number;
  readonly missingShare: number;
  readonly distinct: number;
  readonly numeric?: NumericProfile;
  /** the most frequent levels, then the number of present rows in all other levels */
  readonly levels?: { readonly top: readonly LevelCount[]; readonly otherRows: number };
}

export interface ClassCount {
  readonly name: string;
  readonly count: number;
  readonly share: number;
}

export type TargetProfile =
  | {
      readonly task: 'classification';
      readonly classes: readonly ClassCount[];
      /** largest class count over smallest */
      readonly imbalanceRatio: number;
      readonly smallest: { readonly name: string; readonly count: number };
      readonly foldsPerRepeat: number;
      /** expected rows of the smallest class in one test fold of the plan */
      readonly smallestPerTestFold: number;
    }
  | {
      readonly task: 'regression';
      readonly summary: NumericProfile;
      /** adjusted Fisher-Pearson sample skewness; null with fewer than 3 values or no spread */
      readonly skewness: number | null;
    };

export interface FeatureScore {
  readonly feature: string;
  readonly model: 'one-feature-tree' | 'level-table';
  /** pooled out-of-fold balanced accuracy (classification) or R^2 (regression); null if undefined */
  readonly score: number | null;
  /** 0 = chance, 1 = perfect: (BA - 1/K) / (1 - 1/K) for classification, R^2 for regression */
  readonly skill: number | null;
}

export interface SingleFeatureScores {
  /** the plan the scores were cross-validated with (the run's, or kfold:5 when it has too many folds) */
  readonly plan: string;
  readonly metric: 'balanced-accuracy' | 'r2';
  readonly scores: readonly FeatureScore[];
}

export interface Cluster {
  readonly kind: 'numeric' | 'categorical';
  readonly members: readonly string[];
  /** the member with the highest mean association with the others: the shared source */
  readonly representative: string;
  /** number of member pairs at or above the threshold */
  readonly links: number;
  /** smallest and largest |r| (or V) among those pairs */
  readonly minLink: number;
  readonly maxLink: number;
}

export interface DuplicateSummary {
  /** sets of two or more used rows equal on every feature and the target */
  readonly exactSets: number;
  readonly exactRows: number;
  /** rows of an exact set tested in some fold while a copy is in that fold's training rows */
  readonly exactStraddling: number;
  /** sets of used rows equal on every feature with more than one target value */
  readonly conflictingSets: number;
  readonly conflictingRows: number;
  readonly conflictingStraddling: number;
}

export interface MissingnessTest {
  readonly column: string;
  readonly missing: number;
  readonly chiSquare: number;
  readonly df: number;
  readonly p: number;
  readonly cramersV: number;
  /** some expected count is below 5, so the chi-square p-value is rough (Cochran 1954) */
  readonly smallExpected: boolean;
  readonly flagged: boolean;
}

export interface AuditReport {
  readonly schema: typeof AUDIT_SCHEMA;
  readonly tool: { readonly name: 'foldwise'; readonly version: string };
  readonly command: 'audit';
  readonly data: DataSection;
  readonly plan: {
    readonly kind: string;
    readonly text: string;
    readonly folds: number;
    readonly repeats: number;
    readonly stratified: boolean;
    readonly group?: string;
    readonly order?: string;
    readonly seed: number;
  };
  readonly settings: { readonly clusterThreshold: number };
  /** present when the scored checks ran on a sample (above AUDIT_LIMITS.sampleRows used rows) */
  readonly sample?: { readonly rows: number; readonly of: number; readonly seed: number; readonly how: string };
  readonly columns: readonly ColumnProfile[];
  readonly target: TargetProfile;
  readonly suspects: readonly Suspect[];
  readonly recommendations: readonly Recommendation[];
  readonly singleFeature: SingleFeatureScores;
  readonly clusters: readonly Cluster[];
  readonly duplicates: DuplicateSummary;
  readonly missingness: readonly MissingnessTest[];
  readonly warnings: readonly string[];
}
