/** The curves of one learner in the eval report (`learners[].curves`); built by src/curves/build.ts. */
import type { ScoreSummary } from './summary.js';

export interface CurveBand {
  /** the common grid: false-positive rate (ROC) or recall (PR) */
  readonly grid: readonly number[];
  /** folds whose curve is in the band */
  readonly folds: number;
  readonly q1: readonly number[];
  readonly median: readonly number[];
  readonly q3: readonly number[];
}

export interface Curve {
  /** exact area on every pooled point: trapezoid for ROC, step-wise sum for PR; null when undefined */
  readonly area: number | null;
  /** the area in each fold, summarised with the corrected interval; null when no fold defines it */
  readonly foldAreas: ScoreSummary | null;
  /** operating points of the pooled curve before thinning */
  readonly pointsTotal?: number;
  /** the pooled curve, thinned to at most MAX_CURVE_POINTS: x is FPR (ROC) or recall (PR) */
  readonly x?: readonly number[];
  readonly y?: readonly number[];
  /** pointwise quartiles of the per-fold curves (two folds or more) */
  readonly band?: CurveBand;
}

export interface ClassCurves {
  /** the class counted as positive (one-vs-rest) */
  readonly class: string;
  /** pooled rows of that class, and their share */
  readonly positives: number;
  readonly prevalence: number;
  readonly roc: Curve;
  readonly pr: Curve;
}

export interface ReliabilityBin {
  readonly count: number;
  readonly meanScore: number;
  readonly observed: number;
  /** Wilson 95% interval of the observed share */
  readonly interval: readonly [number, number];
  readonly lowScore: number;
  readonly highScore: number;
}

export interface Calibration {
  /** positive-class: probability of the second class; top-label: the largest probability against "predicted class is right" */
  readonly form: 'positive-class' | 'top-label';
  /** equal-count bins of the pooled out-of-fold rows (at most RELIABILITY_BINS) */
  readonly bins: readonly ReliabilityBin[];
  /** expected and maximum calibration error over those bins */
  readonly ece: number;
  readonly mce: number;
  /** Murphy's partition of the pooled Brier score, when forecasts take at most BRIER_GROUP_LIMIT distinct vectors */
  readonly brierParts?: {
    readonly brier: number;
    readonly reliability: number;
    readonly resolution: number;
    readonly uncertainty: number;
    readonly groups: number;
  };
  /** when brierParts is left out: the forecasts take more distinct vectors than this (BRIER_GROUP_LIMIT) */
  readonly distinctForecastsAbove?: number;
}

export interface LearnerCurves {
  /** pooled out-of-fold rows the curves use (rows times repeats) */
  readonly rows: number;
  /** two classes: one entry (the second class positive); more: one per class, one-vs-rest */
  readonly classes: readonly ClassCurves[];
  /** more than two classes: how many classes keep their points (the most frequent ones); the others keep areas only */
  readonly classesDrawn?: number;
  /** more than two classes: mean of the pooled one-vs-rest areas, unweighted and weighted by prevalence, over the classes that define them */
  readonly average?: {
    readonly macro: { readonly roc: number | null; readonly pr: number | null };
    readonly weighted: { readonly roc: number | null; readonly pr: number | null };
  };
  readonly calibration: Calibration;
}
