/**
 * `bayes`: Gaussian naive Bayes. Each class c present in the training rows gets a prior
 * pi_c = n_c / n and, per feature j, the mean m_cj and variance v_cj of its training rows
 * (maximum likelihood, divide by n_c), plus a variance floor e = var-floor * (largest variance of
 * any feature over all training rows) so a feature constant within a class stays usable.
 * A row x gets
 *   log P(c | x) = log pi_c + sum_j [ -log(2 pi (v_cj + e)) / 2 - (x_j - m_cj)^2 / (2 (v_cj + e)) ] - log Z,
 * normalised by log-sum-exp; the predicted class is the most probable (ties: the lower class
 * code). Classes absent from the training rows get probability 0.
 * Source: Hastie, Tibshirani & Friedman, ESL 2nd ed., 6.6.3 (free PDF); Murphy, Machine
 * Learning: a Probabilistic Perspective, 3.5.
 */
import { argmaxRows } from './argmax.js';
import { InputError } from '../errors.js';
import { checkFinite } from './external/standardise.js';
import type { Learner, Matrix, Model } from '../learning.js';

interface BayesJSON {
  readonly learner: 'bayes';
  readonly cols: number;
  readonly classes: number;
  /** log prior per class (null for classes absent from the training rows) */
  readonly logPrior: (number | null)[];
  /** per class: means then variances (floor included), 2 * cols numbers; empty for absent classes */
  readonly stats: number[][];
}

function model(json: BayesJSON): Model {
  const { cols: p, classes: C } = json;
  const present = json.logPrior.map((v, c) => (v === null ? -1 : c)).filter((c) => c >= 0);
  const mean = present.map((c) => Float64Array.from(json.stats[c].slice(0, p)));
  const varr = present.map((c) => Float64Array.from(json.stats[c].slice(p)));
  const base = present.map((c, k) => {
    let s = json.logPrior[c] as number;
    for (let j = 0; j < p; j++) s -= 0.5 * Math.log(2 * Math.PI * varr[k][j]);
    return s;
  });
  const probs = (X: Matrix): Float64Array => {
    if (X.cols !== p) throw new InputError(`bayes: ${X.cols} feature columns, the model has ${p}`);
    const out = new Float64Array(X.rows * C);
    const lp = new Float64Array(present.length);
    for (let i = 0; i < X.rows; i++) {
      let mx = -Infinity;
      for (let k = 0; k < present.length; k++) {
        let s = base[k];
        for (let j = 0; j < p; j++) {
          const d = X.data[i * p + j] - mean[k][j];
          s -= (d * d) / (2 * varr[k][j]);
        }
        lp[k] = s;
        if (s > mx) mx = s;
      }
      let tot = 0;
      for (let k = 0; k < present.length; k++) tot += Math.exp(lp[k] - mx);
      for (let k = 0; k < present.length; k++) out[i * C + present[k]] = Math.exp(lp[k] - mx) / tot;
    }
    return out;
  };
  return {
    predict: (X) => argmaxRows(probs(X), C),
    probabilities: probs,
    toJSON: () => json,
  };
}

export const bayes: Learner = {
  name: 'bayes',
  tasks: ['classification'],
  params: [
    {
      name: 'var-floor',
      kind: 'number',
      min: 0,
      max: 1,
      default: 1e-6,
      simpler: 'higher',
      doc: 'added to every variance, as a fraction of the largest feature variance',
    },
  ],
  needsScaling: false,
  doc: 'Gaussian naive Bayes with class probabilities',
  fit(X, y, params) {
    if (y.task !== 'classification') throw new InputError('bayes: does classification only');
    if (X.rows === 0) throw new InputError('bayes: no training rows');
    checkFinite('bayes', X);
    const { rows: n, cols: p, data } = X;
    const C = y.classes.length;
    const count = new Float64Array(C);
    const sum = new Float64Array(C * p);
    for (let i = 0; i < n; i++) {
      const c = y.codes[i];
      count[c]++;
      for (let j = 0; j < p; j++) sum[c * p + j] += data[i * p + j];
    }
    const mean = sum.map((s, t) => (count[Math.floor(t / p)] > 0 ? s / count[Math.floor(t / p)] : 0));
    const ss = new Float64Array(C * p);
    for (let i = 0; i < n; i++) {
      const c = y.codes[i];
      for (let j = 0; j < p; j++) {
        const d = data[i * p + j] - mean[c * p + j];
        ss[c * p + j] += d * d;
      }
    }
    // overall variance per feature, for the floor
    let maxVar = 0;
    for (let j = 0; j < p; j++) {
      let m = 0;
      for (let i = 0; i < n; i++) m += data[i * p + j];
      m /= n;
      let v = 0;
      for (let i = 0; i < n; i++) v += (data[i * p + j] - m) ** 2;
      maxVar = Math.max(maxVar, v / n);
    }
    // every feature constant: any positive variance gives equal likelihoods, so use 1
    const floor = maxVar > 0 ? Number(params['var-floor']) * maxVar : 1;
    const logPrior: (number | null)[] = [];
    const stats: number[][] = [];
    for (let c = 0; c < C; c++) {
      if (count[c] === 0) {
        logPrior.push(null);
        stats.push([]);
        continue;
      }
      logPrior.push(Math.log(count[c] / n));
      const means = Array.from(mean.subarray(c * p, c * p + p));
      const vars = Array.from(ss.subarray(c * p, c * p + p), (s) => s / count[c] + floor);
      if (vars.some((v) => !(v > 0))) {
        throw new InputError('bayes: a feature has zero variance within a class; set var-floor above 0');
      }
      stats.push([...means, ...vars]);
    }
    return model({ learner: 'bayes', cols: p, classes: C, logPrior, stats });
  },
  load(json) {
    const j = json as BayesJSON;
    if (j?.learner !== 'bayes' || !Array.isArray(j.logPrior) || !Array.isArray(j.stats)) throw new InputError('bayes: not a saved bayes model');
    return model(j);
  },
};
