/**
 * The baseline every model must clear: for classification the majority class of the training
 * rows (ties go to the lower class code), with the training class shares as probabilities; for
 * regression one constant from the training targets, chosen by `constant`:
 *   mean    the training mean: the constant with the least squared error (rmse, r2)
 *   median  the training median (the mean of the two middle values for an even count): the
 *           constant with the least absolute error (mae, and the median absolute error). Any value between the two middle
 *           values minimises the summed absolute error; the midpoint is the usual choice.
 * (Both are textbook facts: the mean minimises sum (y - c)^2, a median minimises sum |y - c|;
 * e.g. Hastie, Tibshirani & Friedman, ESL, 2nd ed., 2.4 and 10.6, free PDF.)
 * The runner's automatic baseline takes the constant that is best for the run's headline
 * metric (`baselineConstantFor`), so a learner is never measured against a weaker constant than
 * the metric's own. It ignores the features.
 */
import { InputError } from '../errors.js';
import { METRICS, type MetricName } from '../metrics/index.js';
import { mae } from '../metrics/mae.js';
import * as medianAbsolute from '../metrics/medae.js';
import { readOptions, stringOption } from './cart/options.js';
import type { Learner, Matrix, Model, ParamSpec } from '../learning.js';

interface BaselineJSON {
  readonly learner: 'baseline';
  readonly task: 'classification' | 'regression';
  /** class shares (classification) or [constant] (regression) */
  readonly values: number[];
  /** regression: which constant (absent in models saved before the option: the mean) */
  readonly constant?: 'mean' | 'median';
}

export const BASELINE_PARAMS: readonly ParamSpec[] = [
  {
    name: 'constant',
    kind: 'choice',
    choices: ['mean', 'median'],
    default: 'mean',
    doc: 'regression: predict the training mean (least squared error) or median (least absolute error); classification ignores it',
  },
];

/**
 * Metrics whose best constant prediction is the median: the absolute-error metrics, known by
 * their functions (so a metric's name can change without this list).
 */
const MEDIAN_BEST: ReadonlySet<unknown> = new Set<unknown>([mae, ...Object.values(medianAbsolute)]);

/** The regression constant that scores best on a metric (by name): median for absolute errors, else mean. */
export function baselineConstantFor(metric: string): 'mean' | 'median' {
  const m = METRICS.get(metric as MetricName);
  return m && MEDIAN_BEST.has(m.fn) ? 'median' : 'mean';
}

function median(values: Float64Array): number {
  const s = Float64Array.from(values).sort();
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : s[m - 1] + (s[m] - s[m - 1]) / 2;
}

function model(json: BaselineJSON): Model {
  const values = Float64Array.from(json.values);
  if (json.task === 'regression') {
    return {
      predict: (X: Matrix) => new Float64Array(X.rows).fill(values[0]),
      toJSON: () => json,
    };
  }
  let best = 0;
  for (let c = 1; c < values.length; c++) if (values[c] > values[best]) best = c;
  return {
    predict: (X: Matrix) => new Int32Array(X.rows).fill(best),
    probabilities: (X: Matrix) => {
      const out = new Float64Array(X.rows * values.length);
      for (let i = 0; i < X.rows; i++) out.set(values, i * values.length);
      return out;
    },
    toJSON: () => json,
  };
}

export const baseline: Learner = {
  name: 'baseline',
  tasks: ['classification', 'regression'],
  params: BASELINE_PARAMS,
  needsScaling: false,
  doc: 'majority class with the training class shares as probabilities, or the training mean (or median)',
  fit(X, y, params) {
    const o = readOptions('baseline', BASELINE_PARAMS, params);
    if (X.rows === 0) throw new InputError('baseline: no training rows');
    if (y.task === 'regression') {
      if (stringOption(o, 'constant') === 'median') {
        return model({ learner: 'baseline', task: 'regression', values: [median(y.values)], constant: 'median' });
      }
      let s = 0;
      for (const v of y.values) s += v;
      return model({ learner: 'baseline', task: 'regression', values: [s / y.values.length], constant: 'mean' });
    }
    const counts = new Float64Array(y.classes.length);
    for (const c of y.codes) counts[c]++;
    return model({ learner: 'baseline', task: 'classification', values: Array.from(counts, (c) => c / y.codes.length) });
  },
  load(json) {
    const j = json as BaselineJSON;
    if (j?.learner !== 'baseline') throw new InputError('baseline: not a saved baseline model');
    return model(j);
  },
};
