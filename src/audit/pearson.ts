/**
 * Pearson's correlation coefficient over the rows where both values are present:
 *
 *   r = sum (x - mean_x)(y - mean_y) / sqrt(sum (x - mean_x)^2 * sum (y - mean_y)^2)
 *
 * with the means taken over those same rows (two passes). Null with fewer than 3 such rows or
 * when either column does not vary on them. `correlationMatrix` standardises every column
 * without missing values once, so a pair of complete columns costs one dot product.
 * Free source: https://en.wikipedia.org/wiki/Pearson_correlation_coefficient (the sample
 * coefficient r_xy); the same as jstat's corrcoeff on complete data.
 */

export function pearson(x: Float64Array, y: Float64Array): number | null {
  const n = x.length;
  let m = 0;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(x[i]) || Number.isNaN(y[i])) continue;
    m++;
    sx += x[i];
    sy += y[i];
  }
  if (m < 3) return null;
  const mx = sx / m;
  const my = sy / m;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(x[i]) || Number.isNaN(y[i])) continue;
    const dx = x[i] - mx;
    const dy = y[i] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (sxx === 0 || syy === 0) return null;
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
}

/** Centred and scaled to unit sum of squares, or null when the column has missing values or no spread. */
function standardised(x: Float64Array): Float64Array | null {
  const n = x.length;
  let s = 0;
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(x[i])) return null;
    s += x[i];
  }
  const mean = s / n;
  const z = new Float64Array(n);
  let ss = 0;
  for (let i = 0; i < n; i++) {
    z[i] = x[i] - mean;
    ss += z[i] * z[i];
  }
  if (ss === 0) return null;
  const scale = 1 / Math.sqrt(ss);
  for (let i = 0; i < n; i++) z[i] *= scale;
  return z;
}

/** All pairwise correlations as a symmetric p x p row-major matrix; NaN where undefined. */
export function correlationMatrix(columns: readonly Float64Array[]): Float64Array {
  const p = columns.length;
  const out = new Float64Array(p * p).fill(NaN);
  const z = columns.map((c) => (c.length >= 3 ? standardised(c) : null));
  for (let a = 0; a < p; a++) {
    for (let b = a + 1; b < p; b++) {
      let r: number | null;
      const za = z[a];
      const zb = z[b];
      if (za && zb) {
        let dot = 0;
        for (let i = 0; i < za.length; i++) dot += za[i] * zb[i];
        r = Math.max(-1, Math.min(1, dot));
      } else {
        r = pearson(columns[a], columns[b]);
      }
      out[a * p + b] = out[b * p + a] = r ?? NaN;
    }
    out[a * p + a] = 1;
  }
  return out;
}
