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

export type Metric =
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
    };
