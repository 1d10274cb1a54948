/**
 * Column standardisation used inside the linear learners (linear, logistic): each column is
 * centred on its training mean and divided by its training standard deviation (population form,
 * divide by n), so a penalty on the coefficients treats every column alike whatever its units.
 * A column whose standard deviation is zero (or negligible against its mean, 1e-12 relative) carries
 * no information on the training rows; it is marked unused and gets coefficient 0.
 * Formula: z_ij = (x_ij - mean_j) / sd_j, sd_j = sqrt(sum_i (x_ij - mean_j)^2 / n).
 * Source: any regression text, e.g. Hastie, Tibshirani & Friedman, The Elements of Statistical
 * Learning, 2nd ed., section 3.4.1 (free PDF from the authors).
 */
import { InputError } from '../../errors.js';
import type { Matrix } from '../../learning.js';

export interface Standardiser {
  readonly mean: Float64Array;
  readonly sd: Float64Array;
  /** indices of the columns with sd > 0, in column order */
  readonly used: Int32Array;
}

export function fitStandardiser(X: Matrix): Standardiser {
  const { rows: n, cols: p, data } = X;
  const mean = new Float64Array(p);
  const sd = new Float64Array(p);
  for (let i = 0; i < n; i++) for (let j = 0; j < p; j++) mean[j] += data[i * p + j];
  for (let j = 0; j < p; j++) mean[j] /= n;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < p; j++) {
      const d = data[i * p + j] - mean[j];
      sd[j] += d * d;
    }
  }
  const used: number[] = [];
  for (let j = 0; j < p; j++) {
    sd[j] = Math.sqrt(sd[j] / n);
    if (sd[j] > 0 && sd[j] > 1e-12 * Math.abs(mean[j])) used.push(j);
    else sd[j] = 0;
  }
  return { mean, sd, used: Int32Array.from(used) };
}

/** The used columns of X standardised, row-major rows x used.length. */
export function standardise(X: Matrix, s: Standardiser): Float64Array {
  const q = s.used.length;
  const out = new Float64Array(X.rows * q);
  for (let i = 0; i < X.rows; i++) {
    for (let k = 0; k < q; k++) {
      const j = s.used[k];
      out[i * q + k] = (X.data[i * X.cols + j] - s.mean[j]) / s.sd[j];
    }
  }
  return out;
}

/** Every value finite: learners that cannot handle missing values say so with this check. */
export function checkFinite(who: string, X: Matrix): void {
  for (let i = 0; i < X.data.length; i++) {
    if (!Number.isFinite(X.data[i])) {
      throw new InputError(`${who}: feature matrix has a non-finite value at row ${Math.floor(i / X.cols) + 1}, column ${(i % X.cols) + 1}`);
    }
  }
}
