/** eval --threshold: the threshold chosen inside each outer training fold and the scores at it (src/threshold/). */
import type { ScoreSummary } from './summary.js';

/** The report-level settings of --threshold. */
export interface ReportThreshold {
  /** the rule as given, e.g. "max-f1" or "cost:FP=1,FN=5" */
  readonly rule: string;
  /** the class called positive at or above the threshold (the second class of data.classes) */
  readonly positive: string;
  /** folds of the inner split of each outer training fold on whose out-of-fold predictions the threshold is chosen (absent when `given`) */
  readonly innerFolds?: number;
  /** present (true) in score reports of `score --threshold T`: the threshold T was given, the same for every fold, and nothing was chosen (`rule` is T) */
  readonly given?: true;
  /** present (true) under a forward plan: the inner split is in time order, each inner fold fitting on earlier rows and predicting the block after them */
  readonly timeOrdered?: true;
}

/** One outer fold: the threshold its inner split chose and the positive class's figures on the outer test rows at it. */
export interface ThresholdFold {
  readonly repeat: number;
  readonly fold: number;
  /** the chosen probability of the positive class; null when the rule called nothing positive (+Infinity) */
  readonly threshold: number | null;
  /** false when a precision>= or recall>= rule was not met inside and the closest threshold was used */
  readonly met: boolean;
  readonly precision: number | null;
  readonly recall: number | null;
  readonly f1: number | null;
  /** the report's label metrics (those not needing probabilities) at this threshold */
  readonly scores: Readonly<Record<string, number | null>>;
}

/** A learner's --threshold results: per fold, the spread of the thresholds, and summaries at the threshold beside 0.5. */
export interface LearnerThreshold {
  readonly folds: readonly ThresholdFold[];
  /** the chosen thresholds across outer folds (a fold that called nothing positive counts as 1) */
  readonly spread: ScoreSummary | null;
  /** positive-class precision, recall and F1 and each label metric at the chosen threshold, with corrected intervals */
  readonly summary: Readonly<Record<string, ScoreSummary | null>>;
  /** the same figures at the default 0.5 (the class with the highest probability for two classes) */
  readonly atDefault: Readonly<Record<string, ScoreSummary | null>>;
}

/**
 * tune --threshold: the threshold to deploy with the recommended settings, chosen by the rule on
 * out-of-fold predictions of an inner split of all search rows (as eval chooses one for a fold
 * that trains on those rows). Not an estimate of performance: the outer folds' thresholds and the
 * figures at them (`outer.threshold`) are.
 */
export interface DeployThreshold {
  /** the probability of the positive class at or above which a row is called positive; null when the rule called nothing positive */
  readonly value: number | null;
  /** false when a precision>= or recall>= rule was not met inside and the closest threshold was used */
  readonly met: boolean;
  /** the rows whose inner split chose it (all search rows) */
  readonly rows: number;
}
