/**
 * The report of `foldwise tune` (format foldwise-tune/2). schema/tune.schema.json describes
 * exactly this shape; tests validate every tune report they make against it.
 *
 * Two numbers must not be confused, and the report keeps them apart:
 * - `outer.summary` is the nested estimate: each outer fold's pick, chosen on that fold's
 *   training rows only, scored on its test rows. This is the number to quote.
 * - `recommendation.innerMean` (and `recommendation.bestInnerMean`) come from the search on all
 *   search rows: the best of many inner means, optimistic by construction (Varma & Simon 2006,
 *   BMC Bioinformatics 7:91). The recommended candidate is the one to deploy, not its score.
 */
import type { DataSection, ReportAudit, ReportCosts } from './report.js';
import type { ReportComparisons } from './compare.js';
import type { Params, Task } from '../learning.js';
import type { ScoreSummary } from './report.js';
import type { DeployThreshold, LearnerThreshold, ReportThreshold } from './threshold.js';

/** Inner cross-validation of one candidate on the headline metric. */
export interface TuneInnerStat {
  /** inner folds with a defined score */
  readonly n: number;
  readonly mean: number | null;
  readonly sd: number | null;
}

export interface TuneCandidate {
  /** 0-based position in the search */
  readonly id: number;
  readonly name: string;
  /** canonical spec: name plus the options that differ from the defaults */
  readonly spec: string;
  readonly params: Params;
  /** inner scores on each outer fold's training rows, in outer fold order */
  readonly inner: readonly TuneInnerStat[];
  /** inner scores on all search rows (the search behind the recommendation) */
  readonly all: TuneInnerStat;
  /** outer folds whose pick this candidate was */
  readonly wins: number;
}

export interface TuneOuterFold {
  readonly repeat: number;
  readonly fold: number;
  readonly trainRows: number;
  readonly testRows: number;
  /** folds of the inner plan run on this fold's training rows */
  readonly innerFolds: number;
  /** id of the picked candidate */
  readonly pick: number;
  readonly pickSpec: string;
  /** id of the candidate with the best inner mean (differs from pick under one-se) */
  readonly best: number;
  /** the pick's inner mean and sd on this fold's training rows */
  readonly innerMean: number;
  readonly innerSd: number | null;
  /** the pick, refitted on the fold's training rows, scored on its test rows */
  readonly scores: Readonly<Record<string, number | null>>;
  /** what the pick's learner said about that refit (Model.notes), e.g. boost's stopped-at */
  readonly notes?: Readonly<Record<string, number>>;
}

export interface TuneWinner {
  readonly id: number;
  readonly spec: string;
  /** outer folds it won */
  readonly folds: number;
}

export interface TunePlanInfo {
  readonly kind: string;
  readonly text: string;
  readonly folds: number;
  readonly repeats: number;
  readonly stratified: boolean;
}

export interface TuneReport {
  readonly schema: string;
  readonly tool: { readonly name: 'foldwise'; readonly version: string };
  readonly command: 'tune';
  readonly data: DataSection;
  readonly plan: {
    readonly outer: TunePlanInfo;
    /** the inner plan; folds and repeats as built on all search rows */
    readonly inner: TunePlanInfo;
    readonly group?: string;
    readonly order?: string;
    readonly seed: number;
    /** rows the search used (all used rows minus the holdout) */
    readonly searchRows: number;
    readonly holdout?: {
      readonly rows: number;
      /** "option" for --holdout F, "plan" for the holdout part of a holdout outer plan */
      readonly from: 'option' | 'plan';
      readonly fraction?: number;
    };
  };
  /** imputation; the --costs matrix of the cost metric (absent without it) */
  readonly settings: { readonly impute: string; readonly costs?: ReportCosts };
  /** the reported metrics; the first is the headline, used for selection */
  readonly metrics: readonly string[];
  readonly selection: {
    readonly metric: string;
    readonly higherIsBetter: boolean;
    readonly rule: 'best' | 'one-se';
    /** the complexity order used by one-se, one line per learner searched */
    readonly complexity: readonly string[];
  };
  readonly search: {
    /** the --learner specs as given */
    readonly specs: readonly string[];
    /** candidates in the grid; null when a continuous range makes it unbounded */
    readonly gridSize: number | null;
    /** candidates tried */
    readonly tried: number;
    readonly sampled: boolean;
    /** the candidate limit in force */
    readonly limit: number;
    /** fits and neighbour searches run, and what a plain loop over candidates would run */
    readonly fits: number;
    readonly plainLoopFits: number;
  };
  readonly candidates: readonly TuneCandidate[];
  /** --threshold: the rule, the positive class and the inner folds, as in eval (absent without it) */
  readonly threshold?: ReportThreshold;
  /** the nested estimate: quote this */
  readonly outer: {
    readonly folds: readonly TuneOuterFold[];
    readonly summary: Readonly<Record<string, ScoreSummary | null>>;
    /** each metric on the outer test predictions of all folds pooled together */
    readonly pooled: Readonly<Record<string, number | null>>;
    /** --threshold: per outer fold, the threshold chosen for its pick on an inner split of its training rows, and the figures at it beside 0.5 */
    readonly threshold?: LearnerThreshold;
  };
  /** how often the outer folds agreed on a pick */
  readonly stability: {
    /** distinct picks over the outer folds */
    readonly distinct: number;
    /** the picks, most frequent first (ties by candidate id) */
    readonly winners: readonly TuneWinner[];
    /** share of outer folds that took the most frequent pick */
    readonly topShare: number;
  };
  /** the candidate picked by the inner plan on all search rows: deploy this */
  readonly recommendation: {
    readonly id: number;
    readonly spec: string;
    readonly params: Params;
    /** its inner mean and sd on all search rows (optimistic: do not quote) */
    readonly innerMean: number;
    readonly innerSd: number | null;
    /** the candidate with the best inner mean on all search rows (the same under rule best) */
    readonly best: number;
    readonly bestSpec: string;
    readonly bestInnerMean: number;
    /** true when the recommendation is also the outer folds' most frequent pick */
    readonly matchesTopWinner: boolean;
    /** --threshold: the threshold to deploy with these settings (absent without --threshold, or when none could be chosen: see the warnings) */
    readonly threshold?: DeployThreshold;
  };
  /** the recommendation fitted on all search rows and scored once on the holdout rows */
  readonly holdout?: {
    readonly trainRows: number;
    readonly testRows: number;
    readonly spec: string;
    readonly scores: Readonly<Record<string, number | null>>;
  };
  /**
   * the tuned outer estimate ("tuned": each outer fold's pick) against the baseline fitted on the
   * same outer folds, on the headline metric, with the statistics of eval's comparisons
   */
  readonly comparisons?: ReportComparisons;
  readonly warnings: readonly string[];
  /** the quick audit's findings, as in eval reports (absent in reports of older versions) */
  readonly audit?: ReportAudit;
  /** wall-clock figures; left out with --no-timing so that reports compare byte for byte */
  readonly timing?: {
    readonly totalMs: number;
    readonly fitMs: number;
    readonly predictMs: number;
  };
}
