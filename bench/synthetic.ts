/**
 * Seeded synthetic problems for benchmarks, with a known generating process:
 * x ~ N(0, 1)^p (Box-Muller on the project's seeded generator) and
 *   f(x) = x0 + x1 * x2 + sin(2 * x3)   (features 4..p-1 carry no signal; p >= 4)
 * classification: class 1 when f(x) + 0.5 e > 0, e ~ N(0, 1), else class 0
 * regression:     y = f(x) + 0.5 e
 */
import type { Matrix, Target } from '../src/learners/types.js';
import { type Rng, createRng } from '../src/run/rng.js';

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
