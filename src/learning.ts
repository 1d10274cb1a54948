/**
 * The one learner interface. A learner is a description plus `fit`, which returns a model.
 * Features arrive as a row-major matrix of doubles after fold-local preprocessing; targets as
 * class codes 0..C-1 (classification) or doubles (regression).
 */
import type { Rng } from './rng.js';

export type Task = 'classification' | 'regression';
export const TASKS = ['classification', 'regression'] as const;

/**
 * A dense row-major matrix: element (i, j) is data[i * cols + j].
 *
 * The runner's matrices are made on demand from the table's columns: `data` is built the first
 * time it is read (and kept), while `column` and `block` give a fresh copy of one column or of a
 * run of rows without building `data`. A learner that reads columns (the trees) or rows in
 * blocks (their prediction) uses those when present and so never holds the whole row-major copy;
 * the values are the same as in `data`, bit for bit.
 */
export interface Matrix {
  readonly rows: number;
  readonly cols: number;
  readonly data: Float64Array;
  /**
   * column j (0 <= j < cols) as `rows` values equal to data[i * cols + j]: written into `out`
   * (of length `rows`) and returned when it is given, else in a new array
   */
  column?(j: number, out?: Float64Array): Float64Array;
  /** rows start..end-1 row-major as a new array of (end - start) * cols values */
  block?(start: number, end: number): Float64Array;
}

/**
 * Column j of X: X.column(j) when the matrix has it, else read from X.data; into `into` (of
 * length X.rows) when given, so a caller reading every column in turn reuses one buffer.
 */
export function matrixColumn(X: Matrix, j: number, into?: Float64Array): Float64Array {
  if (into !== undefined && into.length !== X.rows) throw new RangeError(`a column buffer of ${into.length} values for a matrix of ${X.rows} rows`);
  if (X.column) return X.column(j, into);
  const { rows: n, cols: p, data } = X;
  const out = into ?? new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = data[i * p + j];
  return out;
}

/** Rows start..end-1 of X row-major: X.block when the matrix has it, else a view of X.data. */
export function matrixBlock(X: Matrix, start: number, end: number): Float64Array {
  if (X.block) return X.block(start, end);
  return X.data.subarray(start * X.cols, end * X.cols);
}

export type Target =
  | { readonly task: 'classification'; readonly codes: Int32Array; readonly classes: readonly string[] }
  | { readonly task: 'regression'; readonly values: Float64Array };

export type ParamValue = number | string | boolean;
export type Params = Record<string, ParamValue>;

/** Declares one option of a learner: its kind, limits, default, and which way is simpler. */
export type ParamSpec =
  | {
      readonly name: string;
      readonly kind: 'int' | 'number';
      readonly min?: number;
      readonly max?: number;
      /** exclusive lower bound, for options such as a fraction that must be > 0 */
      readonly minExclusive?: boolean;
      readonly default: number;
      /** 'lower' when a smaller value gives a simpler model, 'higher' when a larger one does */
      readonly simpler?: 'lower' | 'higher';
      readonly doc: string;
    }
  | {
      readonly name: string;
      readonly kind: 'choice';
      readonly choices: readonly string[];
      readonly default: string;
      readonly doc: string;
    }
  | {
      /** a free-form string checked by `parse`, which returns the canonical form or throws */
      readonly name: string;
      readonly kind: 'text';
      readonly default: string;
      readonly parse: (raw: string) => string;
      readonly doc: string;
    };

/**
 * The fold a fit belongs to, as the runner sees it. Learners that fit and predict in one step
 * outside foldwise (`command:` learners) need it; the others ignore it.
 */
export interface FoldView {
  /** the task id, such as r1.f3 or final */
  readonly label: string;
  /** the fold's test rows, preprocessed exactly as the training matrix (what predict gets) */
  readonly test: Matrix;
  /** a name per matrix column: the numeric column, or `column=level` */
  readonly columns: readonly string[];
  /** the target column's name */
  readonly target: string;
  /**
   * The fold's rows as foldwise read them, before any preprocessing, as CSV text (header line
   * first): the feature columns, and for `train` the target as the last column.
   */
  rawCsv(part: 'train' | 'test'): string;
  /** The same rows as Parquet or Arrow bytes (for `format=` of command learners). */
  rawBytes?(part: 'train' | 'test', format: 'parquet' | 'arrow'): Uint8Array;
}

export interface FitContext {
  /** Generator for this fit only, derived by the runner from the run's seed. */
  readonly rng: Rng;
  /** The derived seed the generator was made from (for learners that make their own). */
  readonly seed: number;
  /** the fold of this fit, when the caller runs folds (the runner and tune always give it) */
  readonly fold?: FoldView;
  /**
   * True when the caller will use the model only to predict `fold.test` (predict, probabilities,
   * notes): no other rows, no saving, no importance. A learner may then predict those rows while
   * it fits and keep no model (forest does, so its trees are never all in memory at once).
   */
  readonly predictOnly?: boolean;
}

export interface Model {
  /** Class codes (Int32Array) for classification, values (Float64Array) for regression. */
  predict(X: Matrix): Int32Array | Float64Array;
  /** Row-major rows x classes probabilities, each row summing to 1 (classification only). */
  probabilities?(X: Matrix): Float64Array;
  /** A plain-JSON form that `Learner.load` turns back into an equal model. */
  toJSON(): unknown;
  /**
   * Facts about this fit that the report lists beside the fold's scores (for example the round
   * early stopping chose); lower-case hyphenated names, finite numbers. Optional.
   */
  notes?(): Readonly<Record<string, number>>;
}

export interface Learner {
  readonly name: string;
  readonly tasks: readonly Task[];
  readonly params: readonly ParamSpec[];
  /** true when features must be standardised (distance-based learners) */
  readonly needsScaling: boolean;
  /** one line for `foldwise learners` */
  readonly doc: string;
  /**
   * true when options not in `params` are accepted as free text (learners outside foldwise,
   * whose options foldwise passes on without knowing them)
   */
  readonly openOptions?: boolean;
  /** where a learner from outside comes from: the program and its arguments, or the module path */
  readonly origin?: string;
  /**
   * Optional check of options that depend on the task (or on each other), run by
   * resolveParams before any fit: a refusal naming the option and its rule, or undefined.
   */
  checkParams?(params: Params, task: Task): string | undefined;
  fit(X: Matrix, y: Target, params: Params, ctx: FitContext): Model;
  load(json: unknown): Model;
}
