/**
 * What eval and tune say about a metric's summary and pooled score when the data cannot carry
 * a claim (README "The report"):
 *
 * - no interval: every fold scored the same value of a metric that has no variance floor
 *   (anything but accuracy, see summary.ts); the summary's ci95 is null, without a warning: it
 *   happens in every report for the baseline's balanced accuracy (1 / classes on every fold),
 *   and a warning there would bury the ones that matter (README, "The report");
 * - no pooled rank score: when every test fold holds a single row (leave-one-out, or kfold with
 *   as many folds as rows), a rank metric (ROC AUC) on the pooled out-of-fold predictions
 *   compares scores of different models, one per row. Under leave-one-out each row's own class
 *   has one row less in its training fold, so a model that predicts training shares ranks every
 *   row the wrong way round (pooled AUC 0 for a constant learner). Airola et al. 2011 measure
 *   this bias of pooled leave-one-out AUC (A. Airola, T. Pahikkala, W. Waegeman, B. De Baets,
 *   T. Salakoski, "An experimental comparison of cross-validation techniques for estimating the
 *   area under the ROC curve", Computational Statistics & Data Analysis 55:1828-1844, 2011; from
 *   memory). foldwise refuses it: pooled null, with a warning naming a plan that can score it.
 */
import type { ScoreRules } from '../metrics/types.js';

interface Named extends ScoreRules {
  readonly name: string;
}

/** True when every fold tests one row and the metric ranks rows: the pooled score is refused. */
export function pooledRefused(metric: Named, folds: readonly { readonly testRows: number }[]): boolean {
  return metric.rank && folds.length > 0 && folds.every((f) => f.testRows === 1);
}

/** The warning for a refused pooled score; undefined otherwise. */
export function scoreNote(metric: Named, folds: readonly { readonly testRows: number }[]): string | undefined {
  if (pooledRefused(metric, folds)) {
    return `${metric.name} is not scored on the pooled predictions: every test fold holds one row, and ranking rows scored by different fold models is biased (under leave-one-out it ranks every row the wrong way round); use a plan with larger test folds, such as kfold:10x5`;
  }
  return undefined;
}
