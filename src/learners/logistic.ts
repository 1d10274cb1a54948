/**
 * `logistic`: logistic regression with an L2 penalty, binary and multinomial.
 *
 * Features are standardised on the training rows (external/standardise.ts). With classes
 * c = 0..K-1 present in the training rows and z a standardised row, the class probabilities are
 *   p_c(z) = exp(b_c + w_c . z) / sum_k exp(b_k + w_k . z)
 * and the fitted (b, w) minimise the penalised negative log-likelihood
 *   f = - sum_i log p_{y_i}(z_i) + (l2 / 2) * sum_c |w_c|^2      (intercepts not penalised).
 * Two parameterisations of the same family:
 * - two classes: the reference form, b_0 = 0 and w_0 = 0 fixed (ordinary binary logistic
 *   regression, p_1 = 1 / (1 + exp(-(b_1 + w_1 . z))));
 * - three or more: the symmetric form, every class has its own (b_c, w_c), which keeps the
 *   penalty the same for every class (the intercepts are centred after the fit).
 * On two classes the symmetric form with penalty 2 * l2 has the optimum w_1 = -w_0 = w/2 of the
 * reference form with l2, so both give the same probabilities (checked in the tests).
 * f is convex; it is minimised by Newton's method with a backtracking (Armijo) line search, the
 * Hessian sum_i (diag(p) - p p') (x) [1 z][1 z]' + l2 * I_w factored by Cholesky with a tiny
 * diagonal shift when it is singular (Nocedal & Wright, Numerical Optimization, 2nd ed., 3.1 and
 * 3.4; Hastie, Tibshirani & Friedman, ESL, 4.4, free PDF). Iteration stops after the full Newton step
 * taken once the decrement g'H^-1 g / 2 is below 1e-12 * (1 + f), or after `iterations` steps.
 * Classes absent from the training rows get probability 0. With l2 = 0 on separable data the
 * coefficients grow without bound until `iterations` runs out (as the maximum-likelihood
 * estimate does not exist); a positive l2 always has a unique optimum.
 */
import { argmaxRows } from './argmax.js';
import { InputError } from '../errors.js';
import { checkFinite, fitStandardiser, standardise, type Standardiser } from './external/standardise.js';
import type { Learner, Matrix, Model } from './types.js';

export type LogisticForm = 'reference' | 'symmetric';

export interface LogisticFit {
  /** standardised-scale parameters per present class: [b_c, w_c1..w_cq], row-major (present x (q+1)) */
  readonly theta: Float64Array;
  readonly present: Int32Array;
  readonly iterations: number;
  readonly objective: number;
  readonly converged: boolean;
}

interface LogisticJSON {
  readonly learner: 'logistic';
  readonly cols: number;
  readonly classes: number;
  readonly present: number[];
  readonly mean: number[];
  readonly sd: number[];
  readonly used: number[];
  readonly theta: number[];
}

/** Cholesky solve of (H + shift I) d = rhs, shifting more until H + shift I is positive definite. */
function solveSPD(H: Float64Array, D: number, rhs: Float64Array): Float64Array {
  let diag = 0;
  for (let i = 0; i < D; i++) diag = Math.max(diag, H[i * D + i]);
  let shift = 0;
  for (let attempt = 0; attempt < 30; attempt++) {
    const L = new Float64Array(D * D);
    let ok = true;
    for (let i = 0; i < D && ok; i++) {
      for (let j = 0; j <= i; j++) {
        let s = H[i * D + j] + (i === j ? shift : 0);
        for (let k = 0; k < j; k++) s -= L[i * D + k] * L[j * D + k];
        if (i === j) {
          if (!(s > 1e-14 * Math.max(diag, 1e-300))) {
            ok = false;
            break;
          }
          L[i * D + i] = Math.sqrt(s);
        } else L[i * D + j] = s / L[j * D + j];
      }
    }
    if (ok) {
      const z = new Float64Array(D);
      for (let i = 0; i < D; i++) {
        let s = rhs[i];
        for (let k = 0; k < i; k++) s -= L[i * D + k] * z[k];
        z[i] = s / L[i * D + i];
      }
      for (let i = D - 1; i >= 0; i--) {
        let s = z[i];
        for (let k = i + 1; k < D; k++) s -= L[k * D + i] * z[k];
        z[i] = s / L[i * D + i];
      }
      return z;
    }
    shift = shift === 0 ? 1e-10 * Math.max(diag, 1e-300) : shift * 10;
  }
  throw new InputError('logistic: Newton system could not be solved (non-finite values?)');
}

/**
 * Minimises f over the free classes. Z is row-major n x q standardised, y holds indices into
 * the K modelled classes (0..K-1). Reference form: K = 2 and only class 1 is free.
 */
export function fitSoftmax(Z: Float64Array, n: number, q: number, y: Int32Array, K: number, l2: number, form: LogisticForm, maxIter: number): {
  theta: Float64Array;
  iterations: number;
  objective: number;
  converged: boolean;
} {
  if (form === 'reference' && K !== 2) throw new InputError('logistic: the reference form needs exactly 2 classes');
  const P = q + 1;
  const free = form === 'reference' ? [1] : Array.from({ length: K }, (_, c) => c);
  const F = free.length;
  const D = F * P;
  // theta over all K classes (fixed ones stay 0)
  let theta = new Float64Array(K * P);
  const eta = new Float64Array(K);
  const prob = new Float64Array(K);

  const rowProb = (th: Float64Array, i: number): number => {
    // returns log p_{y_i}; fills prob
    let mx = -Infinity;
    for (let c = 0; c < K; c++) {
      let s = th[c * P];
      for (let k = 0; k < q; k++) s += th[c * P + 1 + k] * Z[i * q + k];
      eta[c] = s;
      if (s > mx) mx = s;
    }
    let tot = 0;
    for (let c = 0; c < K; c++) {
      prob[c] = Math.exp(eta[c] - mx);
      tot += prob[c];
    }
    for (let c = 0; c < K; c++) prob[c] /= tot;
    return eta[y[i]] - mx - Math.log(tot);
  };
  const objective = (th: Float64Array): number => {
    let f = 0;
    for (let i = 0; i < n; i++) f -= rowProb(th, i);
    let pen = 0;
    for (const c of free) for (let k = 1; k < P; k++) pen += th[c * P + k] * th[c * P + k];
    return f + 0.5 * l2 * pen;
  };

  let f = objective(theta);
  let iterations = 0;
  let converged = false;
  const g = new Float64Array(D);
  const H = new Float64Array(D * D);
  const x = new Float64Array(P);
  while (iterations < maxIter) {
    g.fill(0);
    H.fill(0);
    for (let i = 0; i < n; i++) {
      rowProb(theta, i);
      x[0] = 1;
      for (let k = 0; k < q; k++) x[k + 1] = Z[i * q + k];
      for (let a = 0; a < F; a++) {
        const ca = free[a];
        const r = prob[ca] - (y[i] === ca ? 1 : 0);
        for (let u = 0; u < P; u++) g[a * P + u] += r * x[u];
        for (let b = 0; b <= a; b++) {
          const cb = free[b];
          const h = prob[ca] * ((ca === cb ? 1 : 0) - prob[cb]);
          if (h === 0) continue;
          for (let u = 0; u < P; u++) {
            const hu = h * x[u];
            const row = (a * P + u) * D + b * P;
            for (let v = 0; v < P; v++) H[row + v] += hu * x[v];
          }
        }
      }
    }
    for (let a = 0; a < F; a++) {
      const c = free[a];
      for (let k = 1; k < P; k++) {
        g[a * P + k] += l2 * theta[c * P + k];
        H[(a * P + k) * D + a * P + k] += l2;
      }
    }
    // fill the upper triangle from the lower one
    for (let r = 0; r < D; r++) for (let s = r + 1; s < D; s++) H[r * D + s] = H[s * D + r];
    const d = solveSPD(H, D, g); // step is -d
    let dec = 0;
    for (let r = 0; r < D; r++) dec += g[r] * d[r];
    iterations++;
    if (!(dec / 2 > 1e-12 * (1 + Math.abs(f)))) {
      // close to the optimum: one last full Newton step (quadratic convergence squares the error)
      const last = theta.slice();
      for (let a = 0; a < F; a++) for (let u = 0; u < P; u++) last[free[a] * P + u] -= d[a * P + u];
      const fl = objective(last);
      if (fl <= f) {
        theta = last;
        f = fl;
      }
      converged = true;
      break;
    }
    let t = 1;
    let next = theta;
    let fn = Infinity;
    for (let ls = 0; ls < 60; ls++) {
      next = theta.slice();
      for (let a = 0; a < F; a++) for (let u = 0; u < P; u++) next[free[a] * P + u] -= t * d[a * P + u];
      fn = objective(next);
      if (fn <= f - 1e-4 * t * dec) break;
      t /= 2;
    }
    if (!(fn < f)) {
      converged = true; // no further decrease is possible in floating point
      break;
    }
    theta = next;
    f = fn;
  }
  if (form === 'symmetric') {
    // the intercepts (and, with l2 = 0, the weights) are determined up to a common shift: centre them
    for (let u = 0; u < (l2 > 0 ? 1 : P); u++) {
      let m = 0;
      for (let c = 0; c < K; c++) m += theta[c * P + u];
      m /= K;
      for (let c = 0; c < K; c++) theta[c * P + u] -= m;
    }
  }
  return { theta, iterations, objective: f, converged };
}

/** Fits on a raw feature matrix; exported for the checks. `form` defaults by class count. */
export function fitLogistic(X: Matrix, codes: Int32Array, classes: number, l2: number, maxIter: number, form?: LogisticForm): LogisticFit & { std: Standardiser } {
  if (X.rows === 0) throw new InputError('logistic: no training rows');
  checkFinite('logistic', X);
  const counts = new Int32Array(classes);
  for (const c of codes) counts[c]++;
  const present = Int32Array.from([...counts.keys()].filter((c) => counts[c] > 0));
  const index = new Int32Array(classes).fill(-1);
  present.forEach((c, i) => (index[c] = i));
  const std = fitStandardiser(X);
  const q = std.used.length;
  if (present.length === 1) {
    return { theta: new Float64Array(q + 1), present, iterations: 0, objective: 0, converged: true, std };
  }
  const Z = standardise(X, std);
  const y = Int32Array.from(codes, (c) => index[c]);
  const chosen = form ?? (present.length === 2 ? 'reference' : 'symmetric');
  const r = fitSoftmax(Z, X.rows, q, y, present.length, l2, chosen, maxIter);
  return { ...r, present, std };
}

function model(json: LogisticJSON): Model {
  const { cols, classes: C } = json;
  const present = Int32Array.from(json.present);
  const K = present.length;
  const used = Int32Array.from(json.used);
  const q = used.length;
  const P = q + 1;
  const theta = Float64Array.from(json.theta);
  const probs = (X: Matrix): Float64Array => {
    if (X.cols !== cols) throw new InputError(`logistic: ${X.cols} feature columns, the model has ${cols}`);
    const out = new Float64Array(X.rows * C);
    const eta = new Float64Array(K);
    const z = new Float64Array(q);
    for (let i = 0; i < X.rows; i++) {
      for (let k = 0; k < q; k++) z[k] = (X.data[i * cols + used[k]] - json.mean[used[k]]) / json.sd[used[k]];
      let mx = -Infinity;
      for (let c = 0; c < K; c++) {
        let s = theta[c * P];
        for (let k = 0; k < q; k++) s += theta[c * P + 1 + k] * z[k];
        eta[c] = s;
        if (s > mx) mx = s;
      }
      let tot = 0;
      for (let c = 0; c < K; c++) tot += Math.exp(eta[c] - mx);
      for (let c = 0; c < K; c++) out[i * C + present[c]] = Math.exp(eta[c] - mx) / tot;
    }
    return out;
  };
  return {
    predict: (X) => argmaxRows(probs(X), C),
    probabilities: probs,
    toJSON: () => json,
  };
}

export const logistic: Learner = {
  name: 'logistic',
  tasks: ['classification'],
  params: [
    { name: 'l2', kind: 'number', min: 0, max: 1e12, default: 0.1, simpler: 'higher', doc: 'L2 penalty on the coefficients of the standardised features' },
    { name: 'iterations', kind: 'int', min: 1, max: 10_000, default: 50, simpler: 'lower', doc: 'at most this many Newton steps' },
  ],
  needsScaling: false,
  doc: 'logistic regression (binary, or multinomial for 3+ classes) with an L2 penalty, by Newton steps',
  fit(X, y, params) {
    if (y.task !== 'classification') throw new InputError('logistic: does classification only');
    const r = fitLogistic(X, y.codes, y.classes.length, Number(params.l2), Number(params.iterations));
    return model({
      learner: 'logistic',
      cols: X.cols,
      classes: y.classes.length,
      present: Array.from(r.present),
      mean: Array.from(r.std.mean),
      sd: Array.from(r.std.sd),
      used: Array.from(r.std.used),
      theta: Array.from(r.theta),
    });
  },
  load(json) {
    const j = json as LogisticJSON;
    if (j?.learner !== 'logistic' || !Array.isArray(j.theta) || !Array.isArray(j.present)) throw new InputError('logistic: not a saved logistic model');
    return model(j);
  },
};
