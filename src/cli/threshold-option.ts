/** `--threshold RULE` and `--threshold-folds K`, shared by eval and tune. */
import { UsageError } from '../errors.js';
import { parseThresholdRule } from '../threshold/rule.js';

export const THRESHOLD_HELP = 'two-class targets: choose the threshold on an inner split of each outer training fold by RULE (max-f1, youden, precision>=P, recall>=R, cost:FP=a,FN=b) and report the scores at it beside 0.5';
export const THRESHOLD_FOLDS_HELP = 'inner folds of each outer training fold for --threshold (default 5)';

/** --threshold-folds: a whole number (its range is checked with the run's options). */
export function parseThresholdFolds(text: string): number {
  if (!/^\d+$/.test(text)) throw new UsageError(`--threshold-folds ${text}: expected a whole number from 2 to 20`);
  return Number(text);
}

export const SCORE_THRESHOLD_HELP = 'two-class predictions: also report the scores with the positive class called at or above this probability T, in (0, 1), beside 0.5 (a number only: a rule would choose it on the rows being scored)';

const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * score --threshold T: a number strictly between 0 and 1. A rule (max-f1, ...) is refused: chosen
 * on the rows being scored, the threshold would be fitted to them and overstate the score.
 */
export function parseGivenThreshold(text: string): number {
  const t = text.trim();
  if (DECIMAL.test(t)) {
    const v = Number(t);
    if (!(v > 0 && v < 1)) throw new UsageError(`--threshold ${text}: a threshold is a probability of the positive class strictly between 0 and 1`);
    return v;
  }
  let rule = true;
  try {
    parseThresholdRule(t);
  } catch {
    rule = false;
  }
  if (rule) {
    throw new UsageError(
      `--threshold ${text}: score does not choose a threshold, since one chosen on the rows being scored would overstate the score; choose it without seeing the test rows with eval --threshold ${t} or tune --threshold ${t}, or give score a number in (0, 1)`,
    );
  }
  throw new UsageError(`--threshold ${text}: expected a number in (0, 1), the probability of the positive class at or above which a row is called positive`);
}
