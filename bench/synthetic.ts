/**
 * Seeded synthetic problems for benchmarks, with a known generating process:
 * x ~ N(0, 1)^p (Box-Muller on the project's seeded generator) and
 *   f(x) = x0 + x1 * x2 + sin(2 * x3)   (features 4..p-1 carry no signal; p >= 4)
 * classification: class 1 when f(x) + 0.5 e > 0, e ~ N(0, 1), else class 0
 * regression:     y = f(x) + 0.5 e
 */
import type { Matrix, Target } from '../src/learning.js';
import { type Rng, createRng } from '../src/rng.js';

export interface Problem {
  readonly X: Matrix;
  readonly y: Target;
}

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

export function syntheticProblem(task: 'classification' | 'regression', n: number, p: number, seed: number): Problem {
  if (p < 4) throw new Error('syntheticProblem needs p >= 4');
  const rng = createRng(seed);
  const data = new Float64Array(n * p);
  const codes = new Int32Array(n);
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const o = i * p;
    for (let j = 0; j < p; j++) data[o + j] = gauss(rng);
    const v = data[o] + data[o + 1] * data[o + 2] + Math.sin(2 * data[o + 3]) + 0.5 * gauss(rng);
    values[i] = v;
    codes[i] = v > 0 ? 1 : 0;
  }
  const X = { rows: n, cols: p, data };
  return task === 'classification'
    ? { X, y: { task, codes, classes: ['0', '1'] } }
    : { X, y: { task, values } };
}

/** The rows of a matrix as arrays (for reference libraries that take number[][]). */
export function rowArrays(X: Matrix): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < X.rows; i++) out.push(Array.from(X.data.subarray(i * X.cols, (i + 1) * X.cols)));
  return out;
}

/**
 * A one-hot-heavy classification problem, as a file with several categorical columns becomes
 * after one-hot encoding: `numeric` N(0, 1) columns, then `factors` categorical columns of
 * `levels` levels each (uniform), one 0/1 column per level, so p = numeric + factors * levels.
 * Class scores: s_c = sum_j b_cj x_j + sum_f e_cf[level_f] + Gumbel noise, b and e ~ N(0, 1)
 * scaled so that no one column decides; the class is the argmax of the scores over `classes`.
 * The coefficients are drawn from a fixed generator (seed 4242), the rows from `seed`, so two
 * seeds give two samples of one process (training and hold-out rows).
 */
export function oneHotProblem(n: number, numeric: number, factors: number, levels: number, classes: number, seed: number): Problem {
  const fixed = createRng(4242);
  const p = numeric + factors * levels;
  const beta = Float64Array.from({ length: classes * numeric }, () => 0.6 * gauss(fixed));
  const effect = Float64Array.from({ length: classes * factors * levels }, () => 0.5 * gauss(fixed));
  const rng = createRng(seed);
  const data = new Float64Array(n * p);
  const codes = new Int32Array(n);
  const score = new Float64Array(classes);
  for (let i = 0; i < n; i++) {
    const o = i * p;
    for (let j = 0; j < numeric; j++) data[o + j] = gauss(rng);
    score.fill(0);
    for (let f = 0; f < factors; f++) {
      const level = rng.int(levels);
      data[o + numeric + f * levels + level] = 1;
      for (let c = 0; c < classes; c++) score[c] += effect[(c * factors + f) * levels + level];
    }
    let best = 0;
    for (let c = 0; c < classes; c++) {
      for (let j = 0; j < numeric; j++) score[c] += beta[c * numeric + j] * data[o + j];
      let u = 0;
      while (u === 0) u = rng.next();
      score[c] -= Math.log(-Math.log(u));
      if (score[c] > score[best]) best = c;
    }
    codes[i] = best;
  }
  return { X: { rows: n, cols: p, data }, y: { task: 'classification', codes, classes: Array.from({ length: classes }, (_, c) => `c${c}`) } };
}
