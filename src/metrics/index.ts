/**
 * The metric registry: every metric foldwise knows, by its kebab-case name (short forms as in `mae`, `rmse`, `medae`), with its task,
 * whether it needs class probabilities, which direction is better and a one-line description.
 * Each metric is one pure function in its own file of this folder; see there for the formula,
 * the undefined cases and the source.
 */
import { closeNames, UsageError } from '../errors.js';
import { refuseOldMetric } from '../renamed.js';
import { accuracy } from './accuracy.js';
import { averagePrecision } from './average-precision.js';
import { balancedAccuracy } from './balanced-accuracy.js';
import { brier } from './brier.js';
import { type CostMatrix, meanCost } from './cost.js';
import { ece } from './ece.js';
import { kappa } from './kappa.js';
import { LOG_LOSS_EPS, logLoss } from './log-loss.js';
import { macroF1 } from './macro-f1.js';
import { macroPrecision } from './macro-precision.js';
import { macroRecall } from './macro-recall.js';
import { mae } from './mae.js';
import { mcc } from './mcc.js';
import { medae } from './medae.js';
import { r2 } from './r2.js';
import { rmse } from './rmse.js';
import { rocAuc } from './roc-auc.js';
import type { ClassificationInput, Metric, RegressionInput, ScoreRules } from './types.js';

export type { ClassificationInput, Metric, RegressionInput, ScoreRules } from './types.js';
export { confusionMatrix } from './confusion-matrix.js';
export { CONFUSION_CLASS_LIMIT, foldedConfusion, type FoldedConfusion } from './folded-confusion.js';
export { brierParts, type BrierParts } from './brier-parts.js';
export { calibrationPairs, equalCountBins, type CalibrationBin } from './calibration-bins.js';
export { ECE_BINS } from './ece.js';
export { costMatrixOf, costRows, meanCost, type CostMatrix } from './cost.js';
export { parseCostMatrix } from './cost-matrix.js';
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
  medae,
  r2,
  rmse,
  rocAuc,
};

export const METRIC_NAMES = [
  'accuracy',
  'balanced-accuracy',
  'macro-precision',
  'macro-recall',
  'macro-f1',
  'mcc',
  'kappa',
  'log-loss',
  'brier',
  'roc-auc',
  'average-precision',
  'ece',
  'cost',
  'mae',
  'rmse',
  'r2',
  'medae',
] as const;

export type MetricName = (typeof METRIC_NAMES)[number];

export type Task = Metric['task'];

/** The worst log loss: -ln(LOG_LOSS_EPS), the clip of src/metrics/log-loss.ts. */
const LOG_LOSS_MAX = -Math.log(LOG_LOSS_EPS);

const UNIT: ScoreRules = { range: [0, 1], proportion: false, rank: false };
const SIGNED: ScoreRules = { range: [-1, 1], proportion: false, rank: false };
const ERROR: ScoreRules = { range: [0, Infinity], proportion: false, rank: false };

/**
 * The fold value of a macro average (balanced-accuracy, macro_*): undefined (NaN, reported as
 * null) when a class of the problem has no row in the scored part. Averaged over the classes
 * the fold happens to hold, a constant predictor of the majority class would score a perfect
 * recall on a fold without the minority class (balanced accuracy 1.0 where its no-skill value is
 * 1/classes); a fold that cannot measure a class cannot measure the average over classes. The
 * metric functions themselves keep their documented conventions for direct use.
 */
export function everyClass(fn: (input: ClassificationInput) => number): (input: ClassificationInput) => number {
  return (input) => {
    const value = fn(input);
    const seen = new Uint8Array(input.classes);
    let missing = input.classes;
    for (let i = 0; i < input.actual.length && missing > 0; i++) {
      const c = input.actual[i];
      if (seen[c] === 0) {
        seen[c] = 1;
        missing--;
      }
    }
    return missing > 0 ? NaN : value;
  };
}

function classification(
  name: MetricName,
  fn: (input: ClassificationInput) => number,
  needsProba: boolean,
  higherIsBetter: boolean,
  doc: string,
  rules: ScoreRules = UNIT,
): [MetricName, Metric] {
  return [name, { name, task: 'classification', needsProba, higherIsBetter, doc, fn, ...rules }];
}

function regression(
  name: MetricName,
  fn: (input: RegressionInput) => number,
  higherIsBetter: boolean,
  doc: string,
  rules: ScoreRules = ERROR,
): [MetricName, Metric] {
  return [name, { name, task: 'regression', needsProba: false, higherIsBetter, doc, fn, ...rules }];
}

export const METRICS: ReadonlyMap<MetricName, Metric> = new Map<MetricName, Metric>([
  classification('accuracy', accuracy, false, true, 'share of rows predicted correctly', { ...UNIT, proportion: true }),
  classification('balanced-accuracy', everyClass(balancedAccuracy), false, true, 'mean per-class recall; null on a fold that lacks a class'),
  classification('macro-precision', everyClass(macroPrecision), false, true, 'unweighted mean of per-class precision (never-predicted class counts 0); null on a fold that lacks a class'),
  classification('macro-recall', everyClass(macroRecall), false, true, 'unweighted mean of per-class recall; null on a fold that lacks a class'),
  classification('macro-f1', everyClass(macroF1), false, true, 'unweighted mean of per-class F1; null on a fold that lacks a class'),
  classification('mcc', mcc, false, true, 'Matthews correlation, k-class form (Gorodkin R_K); 0 when undefined', SIGNED),
  classification('kappa', kappa, false, true, "Cohen's kappa: agreement corrected for chance; 0 when undefined", SIGNED),
  classification('log-loss', logLoss, true, false, 'mean -ln(probability of the actual class), clipped to [2^-53, 1-2^-53]', { ...ERROR, range: [0, LOG_LOSS_MAX] }),
  classification('brier', brier, true, false, 'mean over rows of the sum of squared probability errors over classes (0..2)', { ...ERROR, range: [0, 2] }),
  classification('roc-auc', rocAuc, true, true, 'area under the ROC curve; macro one-vs-rest for more than two classes', { ...UNIT, rank: true }),
  classification('average-precision', averagePrecision, true, true, 'step-wise area under the precision-recall curve; macro one-vs-rest for more than two classes', { ...UNIT, rank: true }),
  classification('ece', ece, true, false, 'expected calibration error, 10 equal-count bins; top-label form for more than two classes', { ...ERROR, range: [0, 1] }),
  classification('cost', unboundCost, false, false, 'mean cost per row from the --costs FILE matrix (actual by predicted)', ERROR),
  regression('mae', mae, false, 'mean absolute error'),
  regression('rmse', rmse, false, 'root mean squared error'),
  regression('r2', r2, true, '1 - SS_res / SS_tot; NaN when actual is constant', { ...ERROR, range: [-Infinity, 1] }),
  regression('medae', medae, false, 'median absolute error'),
]);

/** The registry's `cost` has no matrix: reaching it unbound is a bug (metricFor binds it). */
function unboundCost(): number {
  throw new Error('the cost metric was used without its matrix (metricFor binds it)');
}

/**
 * The metric called `name`, ready to score: `cost` bound to the run's matrix (a UsageError
 * without one), any other metric as registered.
 */
export function metricFor(name: string, costs: CostMatrix | undefined): Metric {
  const m = getMetric(name);
  if (m.name !== 'cost' || m.task !== 'classification') return m;
  if (!costs) throw new UsageError('--metric cost: give the cost matrix with --costs FILE (a CSV, actual by predicted; see the README)');
  const values = costs.values;
  return { ...m, fn: (input: ClassificationInput) => meanCost(input, values) };
}

/** The metric called `name`; throws UsageError for an unknown name, with close names if any. */
export function getMetric(name: string): Metric {
  const metric = METRICS.get(name as MetricName);
  if (metric !== undefined) return metric;
  refuseOldMetric(name, METRIC_NAMES);
  const hint = closeNames(name, METRIC_NAMES);
  throw new UsageError(`--metric ${JSON.stringify(name)}: unknown metric; known: ${METRIC_NAMES.join(', ')}${hint ? `; ${hint}` : ''}`);
}

/** The metrics reported when the user names none. */
export function defaultMetrics(task: Task): MetricName[] {
  return task === 'classification'
    ? ['accuracy', 'balanced-accuracy', 'macro-f1', 'log-loss']
    : ['rmse', 'mae', 'r2'];
}
