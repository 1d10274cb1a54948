/**
 * Metric descriptions. Each metric is one pure function in its own file; this registry entry
 * says which task it belongs to, whether it needs probabilities, and which direction is better.
 */

/** Inputs of a classification metric. `probs` is row-major n x classes, present when the model gives it. */
export interface ClassificationInput {
  readonly actual: Int32Array;
  readonly predicted: Int32Array;
  readonly classes: number;
  readonly probs?: Float64Array;
}

export interface RegressionInput {
  readonly actual: Float64Array;
  readonly predicted: Float64Array;
}

/**
 * What the fold statistics need to know about a metric's values (src/stats/summary.ts,
 * src/compare): the range a score can take, whether a fold score is a share of the fold's test
 * rows (so that its variance is at least the binomial one), and whether it ranks rows against
 * each other (so that pooling the predictions of different fold models distorts it).
 */
export interface ScoreRules {
  /** smallest and largest value a score can take (either end may be infinite) */
  readonly range: readonly [number, number];
  /** the score is (correct rows) / (test rows): accuracy */
  readonly proportion: boolean;
  /** the score compares rows' predicted scores with each other: roc-auc */
  readonly rank: boolean;
}

export type Metric = ScoreRules &
  (
    | {
        readonly name: string;
        readonly task: 'classification';
        readonly needsProba: boolean;
        readonly higherIsBetter: boolean;
        readonly doc: string;
        readonly fn: (input: ClassificationInput) => number;
      }
    | {
        readonly name: string;
        readonly task: 'regression';
        readonly needsProba: false;
        readonly higherIsBetter: boolean;
        readonly doc: string;
        readonly fn: (input: RegressionInput) => number;
      }
  );
