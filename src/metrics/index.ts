/**
 * The metric registry: every metric foldwise knows, by its snake_case name, with its task,
 * whether it needs class probabilities, which direction is better and a one-line description.
 * Each metric is one pure function in its own file of this folder; see there for the formula,
 * the undefined cases and the source.
 */
import { closeNames, UsageError } from '../errors.js';
import { accuracy } from './accuracy.js';
import { averagePrecision } from './average-precision.js';
import { balancedAccuracy } from './balanced-accuracy.js';
import { brier } from './brier.js';
import { ece } from './ece.js';
import { kappa } from './kappa.js';
import { logLoss } from './log-loss.js';
import { macroF1 } from './macro-f1.js';
import { macroPrecision } from './macro-precision.js';
import { macroRecall } from './macro-recall.js';
import { mae } from './mae.js';
import { mcc } from './mcc.js';
import { medianAbsoluteError } from './median-absolute-error.js';
import { r2 } from './r2.js';
import { rmse } from './rmse.js';
import { rocAuc } from './roc-auc.js';
import type { ClassificationInput, Metric, RegressionInput } from './types.js';

export type { ClassificationInput, Metric, RegressionInput } from './types.js';
export { confusionMatrix } from './confusion-matrix.js';
export { brierParts, type BrierParts } from './brier-parts.js';
export { calibrationPairs, equalCountBins, type CalibrationBin } from './calibration-bins.js';
export { ECE_BINS } from './ece.js';
export { perClassScores, type PerClassScores } from './per-class.js';
export {
  accuracy,
  averagePrecision,
  balancedAccuracy,
  brier,
  ece,
  kappa,
  logLoss,
  macroF1,
  macroPrecision,
  macroRecall,
  mae,
  mcc,
  medianAbsoluteError,
  r2,
  rmse,
  rocAuc,
};

export const METRIC_NAMES = [
  'accuracy',
  'balanced_accuracy',
  'macro_precision',
  'macro_recall',
  'macro_f1',
  'mcc',
  'kappa',
  'log_loss',
  'brier',
  'roc_auc',
  'average_precision',
  'ece',
  'mae',
  'rmse',
  'r2',
  'median_absolute_error',
] as const;

export type MetricName = (typeof METRIC_NAMES)[number];

export type Task = Metric['task'];

function classification(
  name: MetricName,
  fn: (input: ClassificationInput) => number,
  needsProba: boolean,
  higherIsBetter: boolean,
  doc: string,
): [MetricName, Metric] {
  return [name, { name, task: 'classification', needsProba, higherIsBetter, doc, fn }];
}

function regression(
  name: MetricName,
  fn: (input: RegressionInput) => number,
  higherIsBetter: boolean,
  doc: string,
): [MetricName, Metric] {
  return [name, { name, task: 'regression', needsProba: false, higherIsBetter, doc, fn }];
}

export const METRICS: ReadonlyMap<MetricName, Metric> = new Map<MetricName, Metric>([
  classification('accuracy', accuracy, false, true, 'share of rows predicted correctly'),
  classification('balanced_accuracy', balancedAccuracy, false, true, 'mean per-class recall over the classes present in actual'),
  classification('macro_precision', macroPrecision, false, true, 'unweighted mean of per-class precision (never-predicted class counts 0)'),
  classification('macro_recall', macroRecall, false, true, 'unweighted mean of per-class recall over classes in actual or predicted'),
  classification('macro_f1', macroF1, false, true, 'unweighted mean of per-class F1 over classes in actual or predicted'),
  classification('mcc', mcc, false, true, 'Matthews correlation, k-class form (Gorodkin R_K); 0 when undefined'),
  classification('kappa', kappa, false, true, "Cohen's kappa: agreement corrected for chance; 0 when undefined"),
  classification('log_loss', logLoss, true, false, 'mean -ln(probability of the actual class), clipped to [1e-15, 1-1e-15]'),
  classification('brier', brier, true, false, 'mean over rows of the sum of squared probability errors over classes (0..2)'),
  classification('roc_auc', rocAuc, true, true, 'area under the ROC curve; macro one-vs-rest for more than two classes'),
  classification('average_precision', averagePrecision, true, true, 'step-wise area under the precision-recall curve; macro one-vs-rest for more than two classes'),
  classification('ece', ece, true, false, 'expected calibration error, 10 equal-count bins; top-label form for more than two classes'),
  regression('mae', mae, false, 'mean absolute error'),
  regression('rmse', rmse, false, 'root mean squared error'),
  regression('r2', r2, true, '1 - SS_res / SS_tot; NaN when actual is constant'),
  regression('median_absolute_error', medianAbsoluteError, false, 'median absolute error'),
]);

/** The metric called `name`; throws UsageError for an unknown name, with close names if any. */
export function getMetric(name: string): Metric {
  const metric = METRICS.get(name as MetricName);
  if (metric !== undefined) return metric;
  const hint = closeNames(name, METRIC_NAMES);
  throw new UsageError(`--metric ${JSON.stringify(name)}: unknown metric; known: ${METRIC_NAMES.join(', ')}${hint ? `; ${hint}` : ''}`);
}

/** The metrics reported when the user names none. */
export function defaultMetrics(task: Task): MetricName[] {
  return task === 'classification'
    ? ['accuracy', 'balanced_accuracy', 'macro_f1', 'log_loss']
    : ['rmse', 'mae', 'r2'];
}
