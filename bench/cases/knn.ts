/**
 * kNN benchmark (issue 3, case 3): k = 5, 45,000 training rows and 5,000 queries x 10 features
 * of the seeded synthetic problem. Ours (median of --runs) against ml-knn (`knn-ref`, one run:
 * its kd-tree visits every point), and against a tight single loop that only finds the nearest
 * row (the least work any exact brute-force search must do). Throughput is counted as
 * n_test x n_train x d distance terms per second, and as GFLOP/s at 3 flops a term
 * (subtract, multiply, add).
 * Goals: ours >= 20x faster than ml-knn, and within 1.5x of the tight loop.
 */
import { knn } from '../../src/learners/knn.js';
import { knnRef } from '../../src/learners/knn-ref.js';
import type { Matrix } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';
import { type BenchCase, fixed, peakRssMb, timeMedian, timeOnce } from '../case.js';
import { syntheticProblem } from '../synthetic.js';

const N_TRAIN = 45_000;
const N_TEST = 5_000;
const D = 10;
const K = 5;

function slice(X: Matrix, from: number, to: number): Matrix {
  return { rows: to - from, cols: X.cols, data: X.data.slice(from * X.cols, to * X.cols) };
}

/** The tight loop: squared distance to every training row, keeping only the nearest. */
function tightLoop(train: Matrix, queries: Matrix): Int32Array {
  const out = new Int32Array(queries.rows);
  const d = train.cols;
  const T = train.data;
  const Q = queries.data;
  for (let q = 0; q < queries.rows; q++) {
    let best = Infinity;
    let at = -1;
    const qo = q * d;
    for (let i = 0; i < train.rows; i++) {
      const to = i * d;
      let s = 0;
      for (let j = 0; j < d; j++) {
        const e = Q[qo + j] - T[to + j];
        s += e * e;
      }
      if (s < best) {
        best = s;
        at = i;
      }
    }
    out[q] = at;
  }
  return out;
}

export const cases: BenchCase[] = [
  {
    name: 'knn-vs-ref',
    doc: `knn k=${K}, ${N_TRAIN} train / ${N_TEST} test x ${D}: ours vs ml-knn and a tight loop`,
    run({ runs, log }) {
      const { X, y } = syntheticProblem('classification', N_TRAIN + N_TEST, D, 3);
      if (y.task !== 'classification') throw new Error('expected classes');
      const train = slice(X, 0, N_TRAIN);
      const test = slice(X, N_TRAIN, N_TRAIN + N_TEST);
      const yTrain = { ...y, codes: y.codes.slice(0, N_TRAIN) };
      const ctx = { rng: createRng(1), seed: 1 };
      log('ours...');
      const ours = timeMedian(runs, () => knn.fit(train, yTrain, { k: K, vote: 'equal' }, ctx).predict(test));
      log('tight loop...');
      const tight = timeMedian(runs, () => tightLoop(train, test));
      log('ml-knn (one run)...');
      const ref = timeOnce(() => knnRef.fit(train, yTrain, { k: K }, ctx).predict(test));
      let same = 0;
      for (let i = 0; i < N_TEST; i++) if (ours.value[i] === ref.value[i]) same++;
      const terms = N_TEST * N_TRAIN * D;
      const rate = (ms: number) => terms / (ms / 1000);
      const row = (name: string, ms: number) => [name, fixed(ms / 1000, 3), fixed(rate(ms) / 1e9, 2), fixed((3 * rate(ms)) / 1e9, 2)];
      return [
        {
          title: `kNN, k=${K}, ${N_TRAIN} x ${D} training rows, ${N_TEST} queries`,
          columns: ['implementation', 'seconds', 'G terms/s', 'GFLOP/s'],
          rows: [row('ours (knn)', ours.time.wallMs), row('tight 1-NN loop', tight.time.wallMs), row('ml-knn (knn-ref)', ref.time.wallMs)],
          notes: [
            `ours / ml-knn time: ${fixed(ours.time.wallMs / ref.time.wallMs, 4)} (ml-knn is ${fixed(ref.time.wallMs / ours.time.wallMs, 1)}x slower; goal >= 20x)`,
            `ours / tight loop time: ${fixed(ours.time.wallMs / tight.time.wallMs, 2)} (goal <= 1.5)`,
            `predictions equal to ml-knn on ${same} of ${N_TEST} queries`,
            `peak RSS ${fixed(peakRssMb(), 0)} MB`,
          ],
        },
      ];
    },
  },
];
