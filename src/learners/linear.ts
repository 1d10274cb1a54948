/**
 * `linear`: least-squares linear regression with an optional ridge penalty.
 *
 * The features are standardised on the training rows (mean 0, population sd 1; see
 * external/standardise.ts) and the target is centred, then the coefficients b minimise
 *   sum_i (y_i - ybar - z_i . b)^2 + ridge * |b|^2
 * (the intercept is not penalised). This is solved as the ordinary least-squares problem on the
 * rows of Z stacked over sqrt(ridge) * I, by Householder QR (Golub & Van Loan, Matrix
 * Computations, 4th ed., 5.2 and 5.3.6; Hastie, Tibshirani & Friedman, ESL, 3.4.1, free PDF),
 * never by forming Z'Z, so ill-conditioned designs keep their digits.
 * Rank deficiency (ridge = 0 with collinear columns, e.g. a full one-hot set beside the
 * intercept, or fewer rows than columns): columns are taken in order and one whose remaining part
 * is below 1e-10 of its norm (common practice for a rank tolerance) is left out with coefficient 0,
 * so the fit is the basic solution over the earlier independent columns.
 * The model is stored on the original scale: y = intercept + sum_j coef_j * x_j.
 */
import { InputError } from '../errors.js';
import { checkFinite, fitStandardiser, standardise } from './external/standardise.js';
import type { Learner, Matrix, Model } from '../learning.js';

interface LinearJSON {
  readonly learner: 'linear';
  readonly cols: number;
  readonly intercept: number;
  readonly coef: number[];
}

const RANK_TOL = 1e-10;

/**
 * Least squares by Householder QR with in-order column dropping. A is column-major m x q.
 * Returns the coefficients (0 for dropped columns) and which columns were kept.
 */
export function leastSquaresQR(A: Float64Array, m: number, q: number, b: Float64Array): { x: Float64Array; kept: boolean[] } {
  const a = A.slice();
  const y = b.slice();
  const kept: boolean[] = new Array<boolean>(q).fill(false);
  const order: number[] = [];
  const v = new Float64Array(m);
  let r = 0;
  for (let j = 0; j < q && r < m; j++) {
    const cj = j * m;
    let full = 0;
    for (let i = 0; i < m; i++) full += a[cj + i] * a[cj + i];
    // norm of the part not yet explained by the kept columns (rows r..m-1 after the reflections)
    let rest = 0;
    for (let i = r; i < m; i++) rest += a[cj + i] * a[cj + i];
    // `full` is taken after earlier reflections, which preserve column norms
    if (!(Math.sqrt(rest) > RANK_TOL * Math.sqrt(full))) continue;
    const alpha = a[cj + r] > 0 ? -Math.sqrt(rest) : Math.sqrt(rest);
    for (let i = r; i < m; i++) v[i] = a[cj + i];
    v[r] -= alpha;
    let vv = 0;
    for (let i = r; i < m; i++) vv += v[i] * v[i];
    const apply = (x: Float64Array, off: number) => {
      let s = 0;
      for (let i = r; i < m; i++) s += v[i] * x[off + i];
      const f = (2 * s) / vv;
      for (let i = r; i < m; i++) x[off + i] -= f * v[i];
    };
    for (let k = j; k < q; k++) apply(a, k * m);
    apply(y, 0);
    kept[j] = true;
    order.push(j);
    r++;
  }
  // back substitution on the r x r upper triangle of the kept columns
  const x = new Float64Array(q);
  for (let t = r - 1; t >= 0; t--) {
    const j = order[t];
    let s = y[t];
    for (let u = t + 1; u < r; u++) s -= a[order[u] * m + t] * x[order[u]];
    x[j] = s / a[j * m + t];
  }
  return { x, kept };
}

function model(json: LinearJSON): Model {
  const coef = Float64Array.from(json.coef);
  const p = json.cols;
  return {
    predict(X: Matrix) {
      if (X.cols !== p) throw new InputError(`linear: ${X.cols} feature columns, the model has ${p}`);
      const out = new Float64Array(X.rows);
      for (let i = 0; i < X.rows; i++) {
        let s = json.intercept;
        for (let j = 0; j < p; j++) s += coef[j] * X.data[i * p + j];
        out[i] = s;
      }
      return out;
    },
    toJSON: () => json,
  };
}

/** Fits the coefficients on the original scale; exported for the reference checks. */
export function fitLinear(X: Matrix, y: Float64Array, ridge: number): { intercept: number; coef: Float64Array } {
  if (X.rows === 0) throw new InputError('linear: no training rows');
  if (y.length !== X.rows) throw new InputError(`linear: ${y.length} target values for ${X.rows} rows`);
  checkFinite('linear', X);
  const n = X.rows;
  const s = fitStandardiser(X);
  const q = s.used.length;
  const Z = standardise(X, s);
  let ybar = 0;
  for (let i = 0; i < n; i++) ybar += y[i];
  ybar /= n;
  const extra = ridge > 0 ? q : 0;
  const m = n + extra;
  const A = new Float64Array(m * q);
  for (let i = 0; i < n; i++) for (let k = 0; k < q; k++) A[k * m + i] = Z[i * q + k];
  const root = Math.sqrt(ridge);
  for (let k = 0; k < extra; k++) A[k * m + n + k] = root;
  const rhs = new Float64Array(m);
  for (let i = 0; i < n; i++) rhs[i] = y[i] - ybar;
  const { x: beta } = leastSquaresQR(A, m, q, rhs);
  const coef = new Float64Array(X.cols);
  let intercept = ybar;
  for (let k = 0; k < q; k++) {
    const j = s.used[k];
    coef[j] = beta[k] / s.sd[j];
    intercept -= coef[j] * s.mean[j];
  }
  return { intercept, coef };
}

export const linear: Learner = {
  name: 'linear',
  tasks: ['regression'],
  params: [
    {
      name: 'ridge',
      kind: 'number',
      min: 0,
      max: 1e12,
      default: 0,
      simpler: 'higher',
      doc: 'ridge penalty on the coefficients of the standardised features (0 = plain least squares)',
    },
  ],
  needsScaling: false,
  doc: 'least-squares linear regression (QR), optional ridge penalty on standardised features',
  fit(X, y, params) {
    if (y.task !== 'regression') throw new InputError('linear: does regression only');
    const { intercept, coef } = fitLinear(X, y.values, Number(params.ridge));
    return model({ learner: 'linear', cols: X.cols, intercept, coef: Array.from(coef) });
  },
  load(json) {
    const j = json as LinearJSON;
    if (j?.learner !== 'linear' || !Array.isArray(j.coef) || j.coef.length !== j.cols) throw new InputError('linear: not a saved linear model');
    return model(j);
  },
};
