/**
 * Fold-local preprocessing. Everything here is fitted on the training rows of one fold only and
 * then applied unchanged to that fold's test rows, so no statistic of a test row can leak into
 * what the model learns:
 * - numeric columns: missing values imputed with the training median (or mean); for
 *   distance-based learners standardised to zero mean and unit sd, both from the training rows
 *   (a column with sd 0 is centred only);
 * - categorical columns: missing values imputed with the most frequent training level (ties go
 *   to the level seen first in the file), then one-hot encoded over the levels seen in training;
 *   a level never seen in training maps to all zeros. One-hot columns are never rescaled.
 * - high-cardinality categorical columns: a column with more than ONE_HOT_LIMIT (50) levels
 *   seen in the training rows is not one-hot encoded (a level per row would give as many
 *   columns as rows) but frequency coded: one numeric column `name(frequency)` holding the
 *   share of the training rows that have the row's level (a level never seen in training: 0;
 *   a missing value takes the most frequent training level first). The shares come from the
 *   training rows only; for distance-based learners the column is standardised with the
 *   training mean and sd like any numeric column. Columns at or under the limit are encoded
 *   exactly as before. The limit is our own choice: 50 levels keep one-hot width modest for
 *   the learners here, and the audit flags columns above it (`high-cardinality`).
 */

/** Most levels seen in training that a categorical column is one-hot encoded with. */
export const ONE_HOT_LIMIT = 50;
import type { Problem } from '../data/problem.js';
import type { Matrix } from '../learning.js';

export const IMPUTE_CHOICES = ['median', 'mean'] as const;
export type Impute = (typeof IMPUTE_CHOICES)[number];

export type PrepColumn =
  | { readonly kind: 'numeric'; readonly name: string; readonly fill: number; readonly mean: number; readonly sd: number }
  | { readonly kind: 'categorical'; readonly name: string; readonly fill: number; readonly levels: readonly number[] }
  | {
      readonly kind: 'frequency';
      readonly name: string;
      readonly fill: number;
      /** share of the training rows per level code (0 for levels not seen in training) */
      readonly shares: Float64Array;
      readonly mean: number;
      readonly sd: number;
    };

export interface FittedPrep {
  readonly columns: readonly PrepColumn[];
  /** number of matrix columns after one-hot encoding */
  readonly width: number;
  /** a name per matrix column: the numeric column, or `column=level` */
  readonly names: readonly string[];
  /** which source feature (index into columns) each matrix column comes from */
  readonly source: Int32Array;
}

/** The k-th smallest value (0-based) of `a`, reordering `a` in place (Hoare's selection, 1961). */
function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

/** The median of `a` (mean of the two middle values for an even count); reorders `a`. */
function medianInPlace(a: Float64Array): number {
  const n = a.length;
  const upper = select(a, n >> 1);
  if (n % 2) return upper;
  // the lower middle is the largest value left of the upper middle after selection
  let lower = -Infinity;
  for (let i = 0; i < n >> 1; i++) if (a[i] > lower) lower = a[i];
  return (lower + upper) / 2;
}

/** Fits the preprocessing on `train`, a list of used-row indices of the problem. */
export function fitPrep(problem: Problem, train: Int32Array, impute: Impute = 'median'): FittedPrep {
  const columns: PrepColumn[] = [];
  const names: string[] = [];
  const source: number[] = [];
  const rows = problem.rows;
  const buf = new Float64Array(train.length);
  problem.features.forEach((col, f) => {
    if (col.kind === 'numeric') {
      const values = col.values;
      let m = 0;
      let sum = 0;
      for (let t = 0; t < train.length; t++) {
        const v = values[rows[train[t]]];
        if (v === v) {
          buf[m++] = v;
          sum += v;
        }
      }
      const seen = buf.subarray(0, m);
      let fill = 0;
      if (m > 0) fill = impute === 'median' ? medianInPlace(seen) : sum / m;
      // mean and sd of the imputed training column (two-pass for accuracy)
      const n = train.length;
      const mean = (sum + fill * (n - m)) / n;
      let ss = (n - m) * (fill - mean) ** 2;
      for (let t = 0; t < m; t++) ss += (seen[t] - mean) ** 2;
      const sd = Math.sqrt(ss / n);
      columns.push({ kind: 'numeric', name: col.name, fill, mean, sd: sd > 0 ? sd : 1 });
      names.push(col.name);
      source.push(f);
    } else {
      const counts = new Int32Array(col.levels.length);
      for (let t = 0; t < train.length; t++) {
        const c = col.codes[rows[train[t]]];
        if (c >= 0) counts[c]++;
      }
      let fill = -1;
      const levels: number[] = [];
      for (let k = 0; k < counts.length; k++) {
        if (counts[k] === 0) continue;
        levels.push(k);
        if (fill < 0 || counts[k] > counts[fill]) fill = k;
      }
      if (levels.length > ONE_HOT_LIMIT) {
        const shares = new Float64Array(counts.length);
        const n = train.length;
        for (let k = 0; k < counts.length; k++) shares[k] = counts[k] / n;
        let sum = 0;
        let ss = 0;
        for (let t = 0; t < n; t++) {
          const c = col.codes[rows[train[t]]];
          sum += shares[c < 0 ? fill : c];
        }
        const mean = sum / n;
        for (let t = 0; t < n; t++) {
          const c = col.codes[rows[train[t]]];
          ss += (shares[c < 0 ? fill : c] - mean) ** 2;
        }
        const sd = Math.sqrt(ss / n);
        columns.push({ kind: 'frequency', name: col.name, fill, shares, mean, sd: sd > 0 ? sd : 1 });
        names.push(`${col.name}(frequency)`);
        source.push(f);
        return;
      }
      columns.push({ kind: 'categorical', name: col.name, fill, levels });
      for (const k of levels) {
        names.push(`${col.name}=${col.levels[k]}`);
        source.push(f);
      }
    }
  });
  return { columns, width: names.length, names, source: Int32Array.from(source) };
}

/**
 * Writes rows k = start..end-1 of the prepared matrix of used rows `idx`, prep column f only,
 * into out[(k - start) * stride + at + slot] (slot = 0, or the one-hot slot of the row's level).
 * One-hot cells of other levels are left as they are (zero in a fresh array).
 */
function writeColumn(problem: Problem, prep: FittedPrep, f: number, idx: Int32Array, start: number, end: number, scale: boolean, out: Float64Array, stride: number, at: number): void {
  const pc = prep.columns[f];
  const col = problem.features[f];
  const rows = problem.rows;
  if (pc.kind === 'numeric' && col.kind === 'numeric') {
    const shift = scale ? pc.mean : 0;
    const div = scale ? pc.sd : 1;
    for (let i = start; i < end; i++) {
      const v = col.values[rows[idx[i]]];
      out[(i - start) * stride + at] = ((Number.isNaN(v) ? pc.fill : v) - shift) / div;
    }
  } else if (pc.kind === 'categorical' && col.kind === 'categorical') {
    const slot = new Int32Array(col.levels.length).fill(-1);
    pc.levels.forEach((k, s) => (slot[k] = s));
    for (let i = start; i < end; i++) {
      let c = col.codes[rows[idx[i]]];
      if (c < 0) c = pc.fill;
      const s = c < 0 ? -1 : slot[c];
      if (s >= 0) out[(i - start) * stride + at + s] = 1;
    }
  } else if (pc.kind === 'frequency' && col.kind === 'categorical') {
    const shift = scale ? pc.mean : 0;
    const div = scale ? pc.sd : 1;
    for (let i = start; i < end; i++) {
      let c = col.codes[rows[idx[i]]];
      if (c < 0) c = pc.fill;
      out[(i - start) * stride + at] = ((c < 0 ? 0 : pc.shares[c]) - shift) / div;
    }
  }
}

/** Matrix columns per prep column (1, or the one-hot levels). */
function widthOf(pc: PrepColumn): number {
  return pc.kind === 'categorical' ? pc.levels.length : 1;
}

/** Rows start..end-1 of the prepared matrix of used rows `idx`, row-major. */
function prepBlock(problem: Problem, prep: FittedPrep, idx: Int32Array, start: number, end: number, scale: boolean): Float64Array {
  const width = prep.width;
  const data = new Float64Array((end - start) * width);
  let offset = 0;
  for (let f = 0; f < prep.columns.length; f++) {
    writeColumn(problem, prep, f, idx, start, end, scale, data, width, offset);
    offset += widthOf(prep.columns[f]);
  }
  return data;
}

/** Applies a fitted preprocessing to used rows `idx`, giving a row-major matrix. */
export function applyPrep(problem: Problem, prep: FittedPrep, idx: Int32Array, scale: boolean): Matrix {
  return { rows: idx.length, cols: prep.width, data: prepBlock(problem, prep, idx, 0, idx.length, scale) };
}

/**
 * The same matrix as applyPrep, made on demand: `data` is built the first time it is read;
 * `column(j)` and `block(start, end)` copy only what they are asked for (see Matrix in
 * src/learning.ts). The values are those of applyPrep, bit for bit.
 */
export function lazyPrep(problem: Problem, prep: FittedPrep, idx: Int32Array, scale: boolean): Matrix {
  let data: Float64Array | undefined;
  // matrix column j -> (prep column, one-hot slot)
  const owner = new Int32Array(prep.width);
  const slotOf = new Int32Array(prep.width);
  let at = 0;
  prep.columns.forEach((pc, f) => {
    for (let s = 0; s < widthOf(pc); s++) {
      owner[at] = f;
      slotOf[at++] = s;
    }
  });
  return {
    rows: idx.length,
    cols: prep.width,
    get data(): Float64Array {
      if (!data) data = prepBlock(problem, prep, idx, 0, idx.length, scale);
      return data;
    },
    column(j: number, into?: Float64Array): Float64Array {
      if (!Number.isInteger(j) || j < 0 || j >= prep.width) throw new RangeError(`column ${j} of a matrix of ${prep.width} columns`);
      const f = owner[j];
      const pc = prep.columns[f];
      const n = idx.length;
      if (into !== undefined && into.length !== n) throw new RangeError(`a column buffer of ${into.length} values for a matrix of ${n} rows`);
      if (pc.kind !== 'categorical') {
        const out = into ?? new Float64Array(n);
        writeColumn(problem, prep, f, idx, 0, n, scale, out, 1, 0);
        return out;
      }
      // one level's indicator: write the column's slots into a narrow block, keep slot j
      const w = pc.levels.length;
      const out = into ?? new Float64Array(n);
      const chunk = 4096;
      const tmp = new Float64Array(Math.min(n, chunk) * w);
      for (let s = 0; s < n; s += chunk) {
        const e = Math.min(n, s + chunk);
        tmp.fill(0);
        writeColumn(problem, prep, f, idx, s, e, scale, tmp, w, 0);
        for (let i = s; i < e; i++) out[i] = tmp[(i - s) * w + slotOf[j]];
      }
      return out;
    },
    block(start: number, end: number): Float64Array {
      if (!(Number.isInteger(start) && Number.isInteger(end) && 0 <= start && start <= end && end <= idx.length)) {
        throw new RangeError(`rows ${start}..${end} of a matrix of ${idx.length} rows`);
      }
      if (data) return data.slice(start * prep.width, end * prep.width);
      return prepBlock(problem, prep, idx, start, end, scale);
    },
  };
}
