/**
 * k-nearest neighbours (Fix & Hodges 1951; Cover & Hart 1967), brute force on a row-major
 * Float64Array.
 *
 * Distance: Euclidean, on features the runner has standardised on the training fold. For each
 * query the squared distance to every training row is computed in one tight loop, in blocks of
 * four queries so each training row is read once per block, and the k nearest are kept by
 * insertion into a sorted list of length k (partial selection; no full sort).
 *
 * Deterministic tie rules:
 * - equal distances: the training row that comes first wins a place among the k;
 * - classification: each neighbour votes 1 (`vote=equal`) or 1/d (`vote=inverse`;
 *   when any neighbour is at distance 0, only those at distance 0 vote, 1 each). The class with
 *   the largest vote wins; on a tied vote, the tied class of the nearest neighbour wins.
 * - regression: the mean of the neighbours' values, or their 1/d-weighted mean.
 * When k exceeds the number of training rows, all training rows are the neighbours.
 */
import { InputError } from '../errors.js';
import type { Learner, Matrix, Model, Target } from '../learning.js';

export const KNN_VOTES = ['equal', 'inverse'] as const;
type Vote = (typeof KNN_VOTES)[number];

interface KnnJSON {
  readonly learner: 'knn';
  readonly k: number;
  readonly vote: Vote;
  readonly task: 'classification' | 'regression';
  readonly classes: number;
  readonly cols: number;
  readonly X: number[];
  readonly y: number[];
}

/**
 * The k nearest training rows of every query: indices and squared distances, row-major
 * queries x k, nearest first. `k` must be <= train.rows.
 */
export function nearest(train: Matrix, queries: Matrix, k: number): { index: Int32Array; dist2: Float64Array } {
  const d = train.cols;
  if (queries.cols !== d) throw new InputError(`knn: queries have ${queries.cols} columns, training rows ${d}`);
  const n = train.rows;
  const q = queries.rows;
  const index = new Int32Array(q * k);
  const dist2 = new Float64Array(q * k).fill(Infinity);
  const T = train.data;
  const Q = queries.data;
  const B = 4;
  const dd = new Float64Array(B);
  for (let q0 = 0; q0 < q; q0 += B) {
    const nb = Math.min(B, q - q0);
    for (let i = 0; i < n; i++) {
      const ti = i * d;
      if (nb === B) {
        const a0 = q0 * d;
        const a1 = a0 + d;
        const a2 = a1 + d;
        const a3 = a2 + d;
        let s0 = 0;
        let s1 = 0;
        let s2 = 0;
        let s3 = 0;
        for (let j = 0; j < d; j++) {
          const t = T[ti + j];
          const e0 = Q[a0 + j] - t;
          const e1 = Q[a1 + j] - t;
          const e2 = Q[a2 + j] - t;
          const e3 = Q[a3 + j] - t;
          s0 += e0 * e0;
          s1 += e1 * e1;
          s2 += e2 * e2;
          s3 += e3 * e3;
        }
        dd[0] = s0;
        dd[1] = s1;
        dd[2] = s2;
        dd[3] = s3;
      } else {
        for (let b = 0; b < nb; b++) {
          const a = (q0 + b) * d;
          let s = 0;
          for (let j = 0; j < d; j++) {
            const e = Q[a + j] - T[ti + j];
            s += e * e;
          }
          dd[b] = s;
        }
      }
      for (let b = 0; b < nb; b++) {
        const s = dd[b];
        const base = (q0 + b) * k;
        if (s >= dist2[base + k - 1]) continue;
        // insert, keeping nearest first; strict < keeps the earlier row on equal distance
        let p = base + k - 1;
        while (p > base && dist2[p - 1] > s) {
          dist2[p] = dist2[p - 1];
          index[p] = index[p - 1];
          p--;
        }
        dist2[p] = s;
        index[p] = i;
      }
    }
  }
  return { index, dist2 };
}

/** Neighbour weights for one query: 1 each, or 1/d with the distance-0 rule. */
function weightsOf(dist2: Float64Array, base: number, k: number, mode: Vote, out: Float64Array): void {
  if (mode === 'equal') {
    out.fill(1, 0, k);
    return;
  }
  let zero = false;
  for (let j = 0; j < k; j++) if (dist2[base + j] === 0) zero = true;
  for (let j = 0; j < k; j++) {
    const d2 = dist2[base + j];
    out[j] = zero ? (d2 === 0 ? 1 : 0) : 1 / Math.sqrt(d2);
  }
}

/** One neighbour list as `nearest` makes it: `stride` neighbours per query, nearest first. */
export interface NeighbourList {
  readonly index: Int32Array;
  readonly dist2: Float64Array;
  /** neighbours kept per query (the k given to `nearest`) */
  readonly stride: number;
  /** number of queries */
  readonly rows: number;
}

/**
 * Predictions of the knn model with `k` neighbours and `vote`, made from a neighbour list
 * found once for a larger k (the search in `foldwise tune` scores every k of a grid and both
 * weightings from one list). The list of the K nearest is sorted by (distance, training row),
 * so its first k entries are exactly the list `nearest` gives for k; the votes, the 1/d weights
 * with the distance-0 rule and the tie rule below are those of the model's predict and
 * probabilities, step for step, so the results are identical (test/search/knn-shared.test.ts).
 *
 * `y` holds the training targets as the model stores them (class codes as doubles, or values);
 * `trainRows` the number of training rows (k is capped at it, as in the model); `classes` is 0
 * for regression. Needs min(k, trainRows) <= list.stride.
 */
export function predictFromNeighbours(
  list: NeighbourList,
  y: Float64Array,
  trainRows: number,
  classes: number,
  k: number,
  vote: (typeof KNN_VOTES)[number],
): { predicted: Int32Array | Float64Array; probs?: Float64Array } {
  const kk = Math.min(k, trainRows);
  if (!(kk >= 1 && kk <= list.stride)) {
    throw new InputError(`knn: ${k} neighbours asked from a list of ${list.stride} per query`);
  }
  const { index, dist2, stride, rows } = list;
  const w = new Float64Array(kk);
  if (classes === 0) {
    const out = new Float64Array(rows);
    for (let i = 0; i < rows; i++) {
      weightsOf(dist2, i * stride, kk, vote, w);
      let s = 0;
      let ws = 0;
      for (let j = 0; j < kk; j++) {
        s += w[j] * y[index[i * stride + j]];
        ws += w[j];
      }
      out[i] = s / ws;
    }
    return { predicted: out };
  }
  const C = classes;
  const v = new Float64Array(rows * C);
  for (let i = 0; i < rows; i++) {
    weightsOf(dist2, i * stride, kk, vote, w);
    for (let j = 0; j < kk; j++) v[i * C + y[index[i * stride + j]]] += w[j];
  }
  const predicted = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    let top = -Infinity;
    for (let c = 0; c < C; c++) if (v[i * C + c] > top) top = v[i * C + c];
    let best = -1;
    for (let j = 0; j < kk && best < 0; j++) {
      const c = y[index[i * stride + j]];
      if (v[i * C + c] === top) best = c;
    }
    predicted[i] = best;
  }
  for (let i = 0; i < rows; i++) {
    let s = 0;
    for (let c = 0; c < C; c++) s += v[i * C + c];
    for (let c = 0; c < C; c++) v[i * C + c] /= s;
  }
  return { predicted, probs: v };
}

interface KnnState {
  readonly k: number;
  readonly vote: Vote;
  readonly task: 'classification' | 'regression';
  readonly classes: number;
  readonly train: Matrix;
  readonly y: Float64Array;
}

function knnModel(st: KnnState): Model {
  const { train, y, vote } = st;
  const k = Math.min(st.k, train.rows);
  const C = st.classes;
  const w = new Float64Array(k);
  const toJSON = (): KnnJSON => ({
    learner: 'knn',
    k: st.k,
    vote,
    task: st.task,
    classes: C,
    cols: train.cols,
    X: Array.from(train.data),
    y: Array.from(y),
  });

  const votes = (X: Matrix): { v: Float64Array; index: Int32Array } => {
    const { index, dist2 } = nearest(train, X, k);
    const v = new Float64Array(X.rows * C);
    for (let i = 0; i < X.rows; i++) {
      weightsOf(dist2, i * k, k, vote, w);
      for (let j = 0; j < k; j++) v[i * C + y[index[i * k + j]]] += w[j];
    }
    return { v, index };
  };

  if (st.task === 'regression') {
    return {
      predict(X) {
        const { index, dist2 } = nearest(train, X, k);
        const out = new Float64Array(X.rows);
        for (let i = 0; i < X.rows; i++) {
          weightsOf(dist2, i * k, k, vote, w);
          let s = 0;
          let ws = 0;
          for (let j = 0; j < k; j++) {
            s += w[j] * y[index[i * k + j]];
            ws += w[j];
          }
          out[i] = s / ws;
        }
        return out;
      },
      toJSON,
    };
  }
  return {
    predict(X) {
      const { v, index } = votes(X);
      const out = new Int32Array(X.rows);
      for (let i = 0; i < X.rows; i++) {
        let top = -Infinity;
        for (let c = 0; c < C; c++) if (v[i * C + c] > top) top = v[i * C + c];
        // tied vote: the tied class of the nearest neighbour
        let best = -1;
        for (let j = 0; j < k && best < 0; j++) {
          const c = y[index[i * k + j]];
          if (v[i * C + c] === top) best = c;
        }
        out[i] = best;
      }
      return out;
    },
    probabilities(X) {
      const { v } = votes(X);
      for (let i = 0; i < X.rows; i++) {
        let s = 0;
        for (let c = 0; c < C; c++) s += v[i * C + c];
        for (let c = 0; c < C; c++) v[i * C + c] /= s;
      }
      return v;
    },
    toJSON,
  };
}

function targetValues(y: Target): { task: 'classification' | 'regression'; classes: number; values: Float64Array } {
  return y.task === 'classification'
    ? { task: y.task, classes: y.classes.length, values: Float64Array.from(y.codes) }
    : { task: y.task, classes: 0, values: y.values.slice() };
}

export const knn: Learner = {
  name: 'knn',
  tasks: ['classification', 'regression'],
  params: [
    { name: 'k', kind: 'int', min: 1, max: 100_000, default: 5, simpler: 'higher', doc: 'number of neighbours' },
    { name: 'vote', kind: 'choice', choices: KNN_VOTES, default: 'equal', doc: 'equal: one vote per neighbour; inverse: votes of 1/distance' },
  ],
  needsScaling: true,
  doc: 'k-nearest neighbours, brute force, Euclidean on standardised features',
  fit(X, y, params) {
    if (X.rows === 0) throw new InputError('knn: no training rows');
    const t = targetValues(y);
    return knnModel({
      k: Number(params.k),
      vote: params.vote as Vote,
      task: t.task,
      classes: t.classes,
      train: { rows: X.rows, cols: X.cols, data: X.data.slice() },
      y: t.values,
    });
  },
  load(json) {
    const j = json as KnnJSON;
    if (j?.learner !== 'knn') throw new InputError('knn: not a saved knn model');
    return knnModel({
      k: j.k,
      vote: j.vote,
      task: j.task,
      classes: j.classes,
      train: { rows: j.y.length, cols: j.cols, data: Float64Array.from(j.X) },
      y: Float64Array.from(j.y),
    });
  },
};
