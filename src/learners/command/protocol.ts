/**
 * The file protocol between foldwise and a `command:` learner, version 1 (foldwise-command/1).
 *
 * For every fold, foldwise makes a fresh private folder (mode 0700) and writes into it:
 *   train.csv   header line, then one line per training row: the features, the target last
 *   test.csv    header line, then one line per test row: the features only, same columns
 *   job.json    what the program may want to know (see CommandJob)
 * With the option format=parquet or format=arrow the two data files are train.parquet and
 * test.parquet (or train.arrow and test.arrow, Arrow IPC file format) with the same columns;
 * job.json's `format` says which. The predictions file stays CSV.
 * then runs the program, without a shell, with that folder as its working directory:
 *   PROGRAM [ARGUMENT...] TRAIN_CSV TEST_CSV PREDICTIONS_CSV   (absolute paths)
 * and these environment variables added to the inherited environment:
 *   FOLDWISE_PROTOCOL=1, FOLDWISE_JOB (path of job.json), FOLDWISE_TASK (classification or
 *   regression), FOLDWISE_TARGET (target column), FOLDWISE_SEED (a seed derived for this fit),
 *   FOLDWISE_FOLD (r1.f3, ...), and FOLDWISE_OPTION_<KEY> for each option (KEY upper-cased,
 *   "-" as "_").
 * The program exits with status 0 after writing PREDICTIONS_CSV (predictions.csv in the folder):
 *   - one column (any header): one line per test row, in test.csv order: a class name, or for
 *     regression a number;
 *   - or, for classification, one column per class, the header naming the classes (each at
 *     most once; a class left out has probability 0): one line per test row of probabilities in
 *     [0, 1] summing to 1 within PROBABILITY_SUM_TOLERANCE. foldwise predicts the most probable
 *     class and uses the probabilities for probabilistic metrics.
 * Anything else (another exit status, a timeout, a missing or malformed file) fails the fold.
 */
export const COMMAND_PROTOCOL = 'foldwise-command/1';

export const TRAIN_FILE = 'train.csv';
export const TEST_FILE = 'test.csv';

/** The train and test file names for a format. */
export function dataFiles(format: 'csv' | 'parquet' | 'arrow'): { train: string; test: string } {
  return { train: `train.${format}`, test: `test.${format}` };
}
export const JOB_FILE = 'job.json';
export const PREDICTIONS_FILE = 'predictions.csv';
export const STDOUT_FILE = 'stdout.txt';
export const STDERR_FILE = 'stderr.txt';

/** How far a row of probabilities may sum from 1 (rows are then rescaled to sum to 1). */
export const PROBABILITY_SUM_TOLERANCE = 1e-4;

/** Default per-fold time limit, in seconds. */
export const DEFAULT_TIMEOUT_S = 600;

export interface CommandJob {
  readonly protocol: typeof COMMAND_PROTOCOL;
  readonly learner: string;
  readonly fold: string;
  readonly task: 'classification' | 'regression';
  readonly target: string;
  /** classification: the class names, in foldwise's order */
  readonly classes?: readonly string[];
  /** "foldwise": numeric, imputed, one-hot encoded (standardised if scale); "raw": as read */
  readonly prep: 'foldwise' | 'raw';
  /** the format of the train and test files: csv (the default), parquet or arrow (Arrow IPC file format) */
  readonly format: 'csv' | 'parquet' | 'arrow';
  readonly seed: number;
  readonly train: string;
  readonly test: string;
  readonly predictions: string;
  readonly trainRows: number;
  readonly testRows: number;
  /** the learner's free options, as text */
  readonly options: Readonly<Record<string, string>>;
}

/** The environment variable that carries option `key`. */
export function optionVariable(key: string): string {
  return `FOLDWISE_OPTION_${key.toUpperCase().replace(/-/g, '_')}`;
}
