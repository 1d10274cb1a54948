/**
 * The baseline every model must clear: for classification the majority class of the training
 * rows (ties go to the lower class code), with the training class shares as probabilities; for
 * regression the training mean. It ignores the features.
 */
import { InputError } from '../errors.js';
import type { Learner, Matrix, Model } from './types.js';

interface BaselineJSON {
  readonly learner: 'baseline';
  readonly task: 'classification' | 'regression';
  /** class shares (classification) or [mean] (regression) */
  readonly values: number[];
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
  params: [],
  needsScaling: false,
  doc: 'majority class with the training class shares as probabilities, or the training mean',
  fit(X, y) {
    if (X.rows === 0) throw new InputError('baseline: no training rows');
    if (y.task === 'regression') {
      let s = 0;
      for (const v of y.values) s += v;
      return model({ learner: 'baseline', task: 'regression', values: [s / y.values.length] });
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
