/**
 * The report contract. The JSON Schema in schema/report.schema.json describes exactly this
 * shape; tests validate every report they make against it. A score that is undefined for a fold
 * (for example ROC AUC on a fold with one class) is null.
 */
import type { DataSection } from '../data/types.js';
import type { ScoreSummary } from './summary.js';
import type { Params } from '../learning.js';
import type { ReportComparisons } from './compare.js';
import type { LearnerCurves } from './curves.js';
import type { LearnerThreshold, ReportThreshold } from './threshold.js';

export type { DataSection };
export type { ScoreSummary };


export interface FoldScores {
  readonly repeat: number;
  readonly fold: number;
  readonly trainRows: number;
  readonly testRows: number;
  /** every score is null when the fold failed */
  readonly scores: Readonly<Record<string, number | null>>;
  /** why the fold failed (a command: learner under --on-fold-error skip); absent otherwise */
  readonly failed?: string;
  /** what the learner said about this fit (Model.notes), e.g. boost's stopped-at; absent when nothing */
  readonly notes?: Readonly<Record<string, number>>;
}

export interface LearnerReport {
  readonly name: string;
  /** canonical spec text: name plus the options that differ from the defaults */
  readonly spec: string;
  readonly params: Params;
  readonly folds: readonly FoldScores[];
  readonly summary: Readonly<Record<string, ScoreSummary | null>>;
  /** each metric on the out-of-fold predictions of all folds pooled together */
  readonly pooled: Readonly<Record<string, number | null>>;
  /** pooled confusion matrix: rows are actual classes, columns predicted, in data.classes order */
  readonly confusion?: readonly (readonly number[])[];
  /** with more classes than CONFUSION_CLASS_LIMIT, the pooled confusion matrix folded in its place (src/metrics/folded-confusion.ts) */
  readonly confusionFolded?: ConfusionFolded;
  /** scores on the holdout part, present only when it was scored (--final) */
  readonly final?: {
    readonly trainRows: number;
    readonly testRows: number;
    readonly scores: Readonly<Record<string, number | null>>;
    readonly failed?: string;
    readonly notes?: Readonly<Record<string, number>>;
  };
  /** classification with probabilities: ROC, precision-recall and reliability curves of the out-of-fold predictions (src/curves/) */
  readonly curves?: LearnerCurves;
  /** regression only: an evenly spaced sample of the pooled out-of-fold predictions (src/run/pooled-sample.ts) */
  readonly pooledSample?: PooledSample;
  /** --importance: permutation importance per input of report.importance, and the model's own */
  readonly importance?: LearnerImportance;
  /** eval --threshold: the threshold chosen inside each outer training fold and the scores at it (learners with probabilities) */
  readonly threshold?: LearnerThreshold;
}

/**
 * A pooled confusion matrix folded to a bounded size: `classes` keep their own row and column
 * (the most frequent actual classes, in that order); the last row and column hold the
 * `otherClasses` other classes together, and `otherCorrect` of the rows in their corner cell
 * were predicted as their own class.
 */
export interface ConfusionFolded {
  readonly classes: readonly string[];
  readonly otherClasses: number;
  readonly matrix: readonly (readonly number[])[];
  readonly otherCorrect: number;
}

/** eval --importance: what was shuffled and how (src/run/importance.ts). */
export interface ReportImportance {
  /** the headline metric; a drop is its loss when an input is shuffled (positive: the model uses it) */
  readonly metric: string;
  readonly higherIsBetter: boolean;
  /** shuffles per input and fold; a fold's drop is their mean */
  readonly repeats: number;
  /** whether the audit's correlated clusters were shuffled as inputs too */
  readonly clusters: boolean;
  readonly inputs: readonly { readonly name: string; readonly kind: 'feature' | 'cluster'; readonly members: readonly string[] }[];
}

export interface LearnerImportance {
  /** in report.importance.inputs order */
  readonly inputs: readonly {
    readonly name: string;
    /** each fold's mean drop, in the order of the learner's folds (null: failed or undefined) */
    readonly folds: readonly (number | null)[];
    /** over the folds, with the corrected interval; null when no fold has a drop */
    readonly summary: ScoreSummary | null;
  }[];
  /** the model's own importance (forest: impurity decrease, boost: split gain), mean over folds, summing to 1 */
  readonly own?: { readonly kind: 'impurity' | 'gain'; readonly features: readonly { readonly name: string; readonly mean: number }[] };
}

/** At most 1,000 (actual, predicted) pairs taken at evenly spaced positions of the pooled out-of-fold predictions. */
export interface PooledSample {
  /** pooled out-of-fold predictions in all (rows times repeats) */
  readonly total: number;
  readonly actual: readonly number[];
  readonly predicted: readonly number[];
}

/** What the quick audit run before eval and tune found: its high and warn findings, one line each. */
export interface ReportAudit {
  /** false under --no-audit */
  readonly ran: boolean;
  /** "<kind>: <evidence>; <action>", most severe first */
  readonly suspects: readonly string[];
}


/** Where a report's predictions came from, when not from a foldwise eval run. */
export interface ReportSource {
  readonly kind: 'predictions';
  /** the predictions file as given */
  readonly file: string;
  /** the file was written by foldwise eval --predictions (true) or elsewhere (false) */
  readonly foldwise: boolean;
  /** where each fold's training size came from: the file's train_rows column, --train-rows, or assumed k-fold over the rows present */
  readonly trainRows: 'file' | 'option' | 'assumed-kfold';
}

export interface Report {
  readonly schema: string;
  readonly tool: { readonly name: 'foldwise'; readonly version: string };
  /** eval, or score for a report computed from a predictions file */
  readonly command: 'eval' | 'score';
  readonly data: DataSection;
  readonly plan: {
    readonly kind: string;
    /** the plan as text, e.g. kfold:10 */
    readonly text: string;
    readonly folds: number;
    readonly repeats: number;
    readonly stratified: boolean;
    readonly group?: string;
    readonly order?: string;
    readonly seed: number;
    readonly holdoutRows?: number;
    /** true when the holdout part was scored (--final) */
    readonly finalScored?: boolean;
    /** SHA-256 of which rows each fold tests (src/run/assignment.ts); absent when unknown */
    readonly assignment?: string;
  };
  /** present when the scores were computed by `foldwise score` from a predictions file */
  readonly source?: ReportSource;
  /** imputation; and how the data was read (absent in reports of older versions and of library calls without them) */
  readonly settings: ReportSettings;
  /** the reported metrics, headline first */
  readonly metrics: readonly string[];
  readonly warnings: readonly string[];
  /** the quick audit's findings (absent in reports of older versions, which listed them under warnings) */
  readonly audit?: ReportAudit;
  readonly learners: readonly LearnerReport[];
  /** every metric per level of each --slice column (src/slices/slice-report.ts); absent without --slice */
  readonly slices?: readonly SliceReport[];
  /** eval --importance: the inputs shuffled and the settings; each learner's drops are in its importance */
  readonly importance?: ReportImportance;
  /** eval --threshold: the rule, the positive class and the inner folds; each learner's results are in its threshold */
  readonly threshold?: ReportThreshold;
  /** paired comparisons of the learners on the headline metric (src/compare/within-report.ts); absent with one learner */
  readonly comparisons?: ReportComparisons;
  /** wall-clock figures; left out with --no-timing so that reports compare byte for byte */
  readonly timing?: {
    readonly totalMs: number;
    readonly learners: readonly { readonly spec: string; readonly fitMs: number; readonly predictMs: number }[];
  };
}

/** One learner's scores on one slice, fold by fold: FoldScores whose testRows are the whole fold's. */
export interface SliceFold extends FoldScores {
  /** test rows of this fold that fall in the slice (testRows is the whole fold's, for the correction) */
  readonly rows: number;
  /** why the fold is not scored in this slice: fewer test rows than minRows; absent when scored */
  readonly short?: 'rows';
  /** class-averaged metrics left unscored because a class is missing from the slice's test rows */
  readonly missingClasses?: readonly string[];
}

export interface SliceLearner {
  readonly name: string;
  readonly spec: string;
  readonly folds: readonly SliceFold[];
  /** over the scored folds, with the corrected interval of the whole folds' sizes; null when no fold is scored */
  readonly summary: Readonly<Record<string, ScoreSummary | null>>;
}

export interface SliceLevel {
  readonly level: string;
  /** data rows of the level among the rows the plan tests (repeat 1) */
  readonly rows: number;
  /** folds (of the first learner) with at least minRows test rows in the level */
  readonly scoredFolds: number;
  readonly learners: readonly SliceLearner[];
  /** paired comparisons of the learners in this slice, on the headline metric (as the report's) */
  readonly comparisons?: ReportComparisons;
}

export interface SliceReport {
  readonly column: string;
  /** levels of a categorical column, or quantile bins of a numeric one */
  readonly kind: 'levels' | 'bins';
  /** bin edges fixed on all rows of the file (lowest value, inner edges, highest value) */
  readonly edges?: readonly number[];
  /** a fold with fewer test rows than this in a slice is reported, not scored */
  readonly minRows: number;
  readonly levels: readonly SliceLevel[];
}

/** How the run scored and read its data: imputation, the read settings, the --costs matrix. */
export interface ReportSettings {
  readonly impute: string;
  readonly missing?: readonly string[];
  readonly categorical?: readonly string[];
  readonly delimiter?: string;
  /** --costs FILE (the `cost` metric): absent without it */
  readonly costs?: ReportCosts;
}

/** The --costs matrix as the report shows it: rows actual, columns predicted, both in `data.classes` order. */
export interface ReportCosts {
  /** sha256 (hex) of the file's text */
  readonly sha256: string;
  readonly classes: readonly string[];
  readonly matrix: readonly (readonly number[])[];
}
