/** `--threshold RULE` and `--threshold-folds K`, shared by eval and tune. */
import { UsageError } from '../errors.js';

export const THRESHOLD_HELP = 'two-class targets: choose the threshold on an inner split of each outer training fold by RULE (max-f1, youden, precision>=P, recall>=R, cost:FP=a,FN=b) and report the scores at it beside 0.5';
export const THRESHOLD_FOLDS_HELP = 'inner folds of each outer training fold for --threshold (default 5)';

/** --threshold-folds: a whole number (its range is checked with the run's options). */
export function parseThresholdFolds(text: string): number {
  if (!/^\d+$/.test(text)) throw new UsageError(`--threshold-folds ${text}: expected a whole number from 2 to 20`);
  return Number(text);
}
