/**
 * `logistic`: logistic regression with an L2 penalty, binary and multinomial.
 *
 * Features are standardised on the training rows (external/standardise.ts). With classes
 * c = 0..K-1 present in the training rows and z a standardised row, the class probabilities are
 *   p_c(z) = exp(b_c + w_c . z) / sum_k exp(b_k + w_k . z)
 * and the fitted (b, w) minimise the penalised negative log-likelihood
 *   f = - sum_i v_i log p_{y_i}(z_i) + (l2 / 2) * sum_c |w_c|^2      (intercepts not penalised),
 * v_i = 1, or with rebalance=equal the class weight of row i (class-balance.ts).
 * Two parameterisations of the same family:
 * - two classes: the reference form, b_0 = 0 and w_0 = 0 fixed (ordinary binary logistic
 *   regression, p_1 = 1 / (1 + exp(-(b_1 + w_1 . z))));
 * - three or more: the symmetric form, every class has its own (b_c, w_c), which keeps the
 *   penalty the same for every class (the intercepts are centred after the fit).
 * On two classes the symmetric form with penalty 2 * l2 has the optimum w_1 = -w_0 = w/2 of the
 * reference form with l2, so both give the same probabilities (checked in the tests).
 * f is convex; it is minimised by truncated Newton steps (Newton-CG: Nocedal & Wright, Numerical
 * Optimization, 2nd ed., 7.1 and algorithm 5.3; Hastie, Tibshirani & Friedman, ESL, 4.4, free PDF
 * for the gradient and Hessian): the Newton system H d = g with
 * H = sum_i (diag(p) - p p') (x) [1 z][1 z]' + l2 * I_w is solved by conjugate gradients that use H
 * only through products H v (two passes over the rows, no D x D matrix), preconditioned by diag(H),
 * to the relative residual min(0.5, sqrt |g|) (so the steps turn quadratic near the optimum), then
 * a backtracking (Armijo) line search. The cost of a step grows with rows x classes x columns
 * times the CG iterations, not with the square of the columns, and the memory is that of the data.
 * Iteration stops after the full Newton step taken once the decrement g'd / 2 (d the CG solution)
 * is below 1e-12 * (1 + f), or after `iterations` Newton steps.
 * Classes absent from the training rows get probability 0. With l2 = 0 on separable data the
 * coefficients grow without bound until `iterations` runs out (as the maximum-likelihood
 * estimate does not exist); a positive l2 always has a unique optimum.
 */
import { argmaxRows } from './argmax.js';
import { InputError } from '../errors.js';
import { checkFinite, fitStandardiser, standardise, type Standardiser } from './external/standardise.js';
import { numberOption, readOptions, stringOption } from './cart/options.js';
import { REBALANCE_SPEC, classWeights } from './class-balance.js';
import type { Learner, Matrix, Model, ParamSpec } from '../learning.js';

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

/**
 * Minimises f over the free classes. Z is row-major n x q standardised, y holds indices into
 * the K modelled classes (0..K-1). Reference form: K = 2 and only class 1 is free.
 * Parameters are theta[c * P + u], u = 0 the intercept; `D = F * P` of them are free.
 */
export function fitSoftmax(
  Z: Float64Array,
  n: number,
  q: number,
  y: Int32Array,
  K: number,
  l2: number,
  form: LogisticForm,
  maxIter: number,
  /** per-row weights of the log-likelihood terms (null: all 1) */
  rowWeight: Float64Array | null = null,
): {
  theta: Float64Array;
  iterations: number;
  objective: number;
  converged: boolean;
} {
  if (form === 'reference' && K !== 2) throw new InputError('logistic: the reference form needs exactly 2 classes');
  const P = q + 1;
  const free = Int32Array.from(form === 'reference' ? [1] : Array.from({ length: K }, (_, c) => c));
  const F = free.length;
  const D = F * P;
  // theta over all K classes (fixed ones stay 0)
  let theta = new Float64Array(K * P);
  /** per row and class: probabilities at the current theta (n x K) */
  const prob = new Float64Array(n * K);
  /** per row and free class: a scratch of linear scores, then of residuals (n x F) */
  const rowScratch = new Float64Array(n * F);
  const eta = new Float64Array(K);

  /** eta_i = Theta z_i for every row (linear scores, all K classes); returns f and fills `prob` when asked. */
  const objective = (th: Float64Array, keep: boolean): number => {
    let f = 0;
    for (let i = 0; i < n; i++) {
      const zi = i * q;
      let mx = -Infinity;
      for (let c = 0; c < K; c++) {
        const tc = c * P;
        let s = th[tc];
        for (let k = 0; k < q; k++) s += th[tc + 1 + k] * Z[zi + k];
        eta[c] = s;
        if (s > mx) mx = s;
      }
      let tot = 0;
      for (let c = 0; c < K; c++) tot += Math.exp(eta[c] - mx);
      f -= (rowWeight ? rowWeight[i] : 1) * (eta[y[i]] - mx - Math.log(tot));
      if (keep) for (let c = 0; c < K; c++) prob[i * K + c] = Math.exp(eta[c] - mx) / tot;
    }
    let pen = 0;
    for (const c of free) for (let k = 1; k < P; k++) pen += th[c * P + k] * th[c * P + k];
    return f + 0.5 * l2 * pen;
  };
  /** out (D) = sum_i R_i (x) [1 z_i] over the free classes, R = rowScratch (n x F), plus l2 * v on the weights */
  const backward = (out: Float64Array, v: Float64Array): void => {
    out.fill(0);
    for (let i = 0; i < n; i++) {
      const zi = i * q;
      for (let a = 0; a < F; a++) {
        const r = rowScratch[i * F + a];
        if (r === 0) continue;
        const o = a * P;
        out[o] += r;
        for (let k = 0; k < q; k++) out[o + 1 + k] += r * Z[zi + k];
      }
    }
    for (let a = 0; a < F; a++) for (let k = 1; k < P; k++) out[a * P + k] += l2 * v[a * P + k];
  };
  /** Hessian-vector product at the theta `prob` belongs to: out = H v (v over the free classes) */
  const hessTimes = (v: Float64Array, out: Float64Array): void => {
    for (let i = 0; i < n; i++) {
      const zi = i * q;
      const pi = i * K;
      let mean = 0;
      for (let a = 0; a < F; a++) {
        const o = a * P;
        let s = v[o];
        for (let k = 0; k < q; k++) s += v[o + 1 + k] * Z[zi + k];
        rowScratch[i * F + a] = s;
        mean += prob[pi + free[a]] * s;
      }
      const wi = rowWeight ? rowWeight[i] : 1;
      for (let a = 0; a < F; a++) rowScratch[i * F + a] = wi * prob[pi + free[a]] * (rowScratch[i * F + a] - mean);
    }
    backward(out, v);
  };

  const thetaFree = (th: Float64Array): Float64Array => {
    const v = new Float64Array(D);
    for (let a = 0; a < F; a++) v.set(th.subarray(free[a] * P, free[a] * P + P), a * P);
    return v;
  };
  const dot = (a: Float64Array, b: Float64Array): number => {
    let s = 0;
    for (let r = 0; r < D; r++) s += a[r] * b[r];
    return s;
  };

  let f = objective(theta, true);
  let iterations = 0;
  let converged = false;
  const g = new Float64Array(D);
  const diag = new Float64Array(D);
  const d = new Float64Array(D);
  const r = new Float64Array(D);
  const s = new Float64Array(D);
  const u = new Float64Array(D);
  const Hu = new Float64Array(D);
  while (iterations < maxIter) {
    // gradient: residuals p - 1[y = c]; Jacobi preconditioner: diag H = sum_i p(1 - p) [1 z]^2 (+ l2)
    diag.fill(0);
    for (let i = 0; i < n; i++) {
      const zi = i * q;
      const wi = rowWeight ? rowWeight[i] : 1;
      for (let a = 0; a < F; a++) {
        const pc = prob[i * K + free[a]];
        rowScratch[i * F + a] = wi * (pc - (y[i] === free[a] ? 1 : 0));
        const h = wi * pc * (1 - pc);
        if (h === 0) continue;
        const o = a * P;
        diag[o] += h;
        for (let k = 0; k < q; k++) diag[o + 1 + k] += h * Z[zi + k] * Z[zi + k];
      }
    }
    backward(g, thetaFree(theta));
    for (let a = 0; a < F; a++) for (let k = 1; k < P; k++) diag[a * P + k] += l2;
    let gg = 0;
    for (let t = 0; t < D; t++) {
      gg += g[t] * g[t];
      if (!(diag[t] > 0)) diag[t] = 1;
    }
    const gnorm = Math.sqrt(gg);
    // preconditioned conjugate gradients on H d = g (Nocedal & Wright, algorithm 5.3), stopped at
    // the relative residual min(0.5, sqrt |g|) of the truncated-Newton forcing sequence (7.3);
    // a direction of (numerically) zero curvature ends it (H is singular in the symmetric form with l2 = 0)
    const tol = Math.min(0.5, Math.sqrt(gnorm)) * gnorm;
    d.fill(0);
    r.set(g);
    for (let t = 0; t < D; t++) s[t] = r[t] / diag[t];
    u.set(s);
    let rs = dot(r, s);
    for (let cg = 0; cg < 2 * D + 10 && Math.sqrt(dot(r, r)) > tol; cg++) {
      hessTimes(u, Hu);
      const curv = dot(u, Hu);
      if (!(curv > 1e-14 * dot(u, u) * Math.max(1, l2))) {
        if (cg === 0) d.set(s); // no curvature along the first direction: a preconditioned gradient step
        break;
      }
      const alpha = rs / curv;
      for (let t = 0; t < D; t++) {
        d[t] += alpha * u[t];
        r[t] -= alpha * Hu[t];
        s[t] = r[t] / diag[t];
      }
      const rsNext = dot(r, s);
      const beta = rsNext / rs;
      rs = rsNext;
      for (let t = 0; t < D; t++) u[t] = s[t] + beta * u[t];
    }
    const dec = dot(g, d); // the Newton decrement g'H^-1 g (step is -d)
    iterations++;
    if (!(dec / 2 > 1e-12 * (1 + Math.abs(f)))) {
      // close to the optimum: one last full Newton step (quadratic convergence squares the error)
      const last = theta.slice();
      for (let a = 0; a < F; a++) for (let t = 0; t < P; t++) last[free[a] * P + t] -= d[a * P + t];
      const fl = objective(last, false);
      if (fl <= f) {
        theta = last;
        f = fl;
      }
      converged = true;
      break;
    }
    let step = 1;
    let next = theta;
    let fn = Infinity;
    for (let ls = 0; ls < 60; ls++) {
      next = theta.slice();
      for (let a = 0; a < F; a++) for (let t = 0; t < P; t++) next[free[a] * P + t] -= step * d[a * P + t];
      fn = objective(next, true); // the accepted point's probabilities stay in `prob`
      if (fn <= f - 1e-4 * step * dec) break;
      step /= 2;
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
export function fitLogistic(
  X: Matrix,
  codes: Int32Array,
  classes: number,
  l2: number,
  maxIter: number,
  form?: LogisticForm,
  rebalance = 'none',
): LogisticFit & { std: Standardiser } {
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
  const cw = classWeights('logistic', rebalance, codes, classes);
  const rowWeight = cw ? Float64Array.from(codes, (c) => cw[c]) : null;
  const r = fitSoftmax(Z, X.rows, q, y, present.length, l2, chosen, maxIter, rowWeight);
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

export const LOGISTIC_PARAMS: readonly ParamSpec[] = [
  { name: 'l2', kind: 'number', min: 0, max: 1e12, default: 0.1, simpler: 'higher', doc: 'L2 penalty on the coefficients of the standardised features' },
  { name: 'iterations', kind: 'int', min: 1, max: 10_000, default: 50, simpler: 'lower', doc: 'at most this many Newton steps (each solved by conjugate gradients)' },
  REBALANCE_SPEC,
];

export const logistic: Learner = {
  name: 'logistic',
  tasks: ['classification'],
  params: LOGISTIC_PARAMS,
  needsScaling: false,
  doc: 'logistic regression (binary, or multinomial for 3+ classes) with an L2 penalty, by Newton-CG steps',
  fit(X, y, params) {
    if (y.task !== 'classification') throw new InputError('logistic: does classification only');
    const o = readOptions('logistic', LOGISTIC_PARAMS, params);
    const r = fitLogistic(X, y.codes, y.classes.length, numberOption(o, 'l2'), numberOption(o, 'iterations'), undefined, stringOption(o, 'rebalance'));
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
