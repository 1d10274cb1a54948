/**
 * A task's outcome as assembly, predictions files, slices and curves read it: produced by the
 * runner (src/run/evaluate.ts recordsOf), by merge from shard parts, and by `foldwise score`
 * from a predictions file.
 */
import type { Target } from '../learning.js';

/** One task's outcome with what scoring needs: its place, sizes, actual and predicted values. */
export interface TaskRecord {
  readonly id: string;
  readonly candidateIndex: number;
  /** -1 for the final (holdout) task */
  readonly foldIndex: number;
  readonly repeat: number;
  readonly fold: number;
  readonly trainRows: number;
  readonly actual: Target;
  readonly predicted: Int32Array | Float64Array;
  readonly probs?: Float64Array;
  readonly fitMs: number;
  readonly predictMs: number;
  /** why the task failed; `predicted` is then empty */
  readonly failed?: string;
  /** 0-based data row in the input file of each test row (for --predictions) */
  readonly rows?: Int32Array;
  /** 1-based line in the input file of each test row */
  readonly lines?: Int32Array;
  /** --predictions-keep: the kept columns' text, row by row (rows x kept columns) */
  readonly keep?: readonly string[];
  /** tune: the candidate this outer fold picked (the predictions file's pick column) */
  readonly pick?: string;
  /** the model's notes about this fit (Model.notes) */
  readonly notes?: Readonly<Record<string, number>>;
  /** --importance: mean drop of the headline metric per input of frame.importance (NaN: undefined) */
  readonly drops?: Float64Array;
  /** --importance: the model's own importance per feature (forest, boost) */
  readonly own?: Float64Array;
  /** --threshold: the threshold the inner split of this fold's training rows chose (+Infinity: nothing positive) */
  readonly threshold?: { readonly value: number; readonly met: boolean };
}
