/**
 * The fitted `boost` model: base score plus the trees of every round, in the flat node layout
 * of cart/flat-forest.ts (every child after its parent, x > threshold goes right, NaN left).
 * Round t has `width` trees (one per class for softmax, else one); tree t * width + k adds to
 * score column k, so each of its leaves holds `width` values with only slot k non-zero, and the
 * scores are base + the sum of the leaf rows. Scores become outputs by the loss: the value
 * (regression), 1 / (1 + e^-F) for class 1 (logistic), softmax (more classes). The predicted
 * class is the most probable one, the lowest code on a tie.
 *
 * Prefixes: the first r rounds of a model fitted for R >= r rounds are exactly the model fitted
 * for r rounds with the same seed (every round has its own generator, see fit.ts), so
 * `predictRounds(X, r)` and `probaRounds(X, r)` score a grid over `rounds` from one fit.
 *
 * JSON form: { format: "foldwise-boost", version: 1, task, loss, classCount, width, rounds,
 *   featureCount, base, gain, settings, notes, trees } where trees is the "foldwise-cart" form
 * of the nodes (checked by its own reader) or null when rounds is 0.
 */
import { InputError, UsageError } from '../../errors.js';
import { type FlatForestParts, partsFromJSON, partsToJSON } from '../cart/flat-forest.js';
import type { Matrix, Model, Task } from '../../learning.js';
import { type LossName, sigmoid, softmaxRow } from './loss.js';

export const BOOST_FORMAT = 'foldwise-boost';
export const BOOST_VERSION = 1;

export interface BoostParts {
  readonly task: Task;
  readonly loss: LossName;
  /** classes of the target (1 for regression) */
  readonly classCount: number;
  /** scores per row: 1, or classCount for softmax */
  readonly width: number;
  readonly rounds: number;
  readonly featureCount: number;
  readonly base: Float64Array;
  /** total split gain per feature over all trees */
  readonly gain: Float64Array;
  readonly settings: ReadonlyMap<string, number | string>;
  /** per-fit facts for the report, such as the round early stopping chose */
  readonly notes: ReadonlyMap<string, number>;
  /** the nodes; undefined when rounds is 0 */
  readonly trees: FlatForestParts | undefined;
}

export interface BoostModel extends Model {
  readonly task: Task;
  /** the fitted parts (read only) */
  readonly parts: BoostParts;
  readonly rounds: number;
  predict(X: Matrix): Int32Array | Float64Array;
  probabilities?(X: Matrix): Float64Array;
  /** predictions from the base score and the first r rounds (0 <= r <= rounds) */
  predictRounds(X: Matrix, r: number): Int32Array | Float64Array;
  probaRounds?(X: Matrix, r: number): Float64Array;
  /** raw scores (rows x width) after each r of `at`, in that order (ascending not required) */
  scoresAt(X: Matrix, at: readonly number[]): Float64Array[];
  /** total gain per feature, as shares summing to 1 (all 0 without splits) */
  importance(): Float64Array;
  /** total gain per feature, unscaled */
  gainTotals(): Float64Array;
  /** facts about this fit for the report (stopped-at, rounds-run); empty without early stopping */
  notes(): Readonly<Record<string, number>>;
  toJSON(): Record<string, unknown>;
}

export function isBoostModel(m: Model): m is BoostModel {
  const b = m as Partial<BoostModel>;
  return typeof b.predictRounds === 'function' && typeof b.scoresAt === 'function';
}

function checkMatrix(parts: BoostParts, X: Matrix): void {
  if (!Number.isInteger(X.rows) || !Number.isInteger(X.cols) || X.rows < 0 || X.data.length !== X.rows * X.cols) {
    throw new InputError(`boost: matrix data length ${X.data.length} is not rows x cols = ${X.rows} x ${X.cols}`);
  }
  if (X.cols !== parts.featureCount) throw new InputError(`boost: model was fitted on ${parts.featureCount} features, got ${X.cols}`);
}

function checkRounds(parts: BoostParts, r: number): void {
  if (!Number.isInteger(r) || r < 0 || r > parts.rounds) throw new UsageError(`boost: rounds must be an integer between 0 and ${parts.rounds}, got ${r}`);
}

/** Scores after each of `at` rounds, walking every tree once. */
export function scoresAt(parts: BoostParts, X: Matrix, at: readonly number[]): Float64Array[] {
  checkMatrix(parts, X);
  for (const r of at) checkRounds(parts, r);
  const n = X.rows;
  const p = X.cols;
  const w = parts.width;
  const x = X.data;
  const F = new Float64Array(n * w);
  for (let i = 0; i < n; i++) for (let k = 0; k < w; k++) F[i * w + k] = parts.base[k];
  const out = new Array<Float64Array>(at.length);
  const order = at.map((r, q) => [r, q] as const).sort((a, b) => a[0] - b[0]);
  let next = 0;
  const emit = (done: number) => {
    while (next < order.length && order[next][0] === done) out[order[next++][1]] = F.slice();
  };
  emit(0);
  const t = parts.trees;
  const last = order.length ? order[order.length - 1][0] : 0;
  if (t) {
    const { roots, feature, threshold, left, right, offset, values } = t;
    for (let round = 0; round < last; round++) {
      for (let k = 0; k < w; k++) {
        const root = roots[round * w + k];
        for (let i = 0; i < n; i++) {
          const b = i * p;
          let node = root;
          let f = feature[node];
          while (f >= 0) {
            node = x[b + f] > threshold[node] ? right[node] : left[node];
            f = feature[node];
          }
          F[i * w + k] += values[offset[node] + k];
        }
      }
      emit(round + 1);
    }
  }
  return out;
}

/** Probabilities (rows x classes) from scores. */
export function probaOf(parts: BoostParts, F: Float64Array, n: number): Float64Array {
  const C = parts.classCount;
  const out = new Float64Array(n * C);
  if (parts.loss === 'logistic') {
    for (let i = 0; i < n; i++) {
      const p1 = sigmoid(F[i]);
      out[2 * i] = 1 - p1;
      out[2 * i + 1] = p1;
    }
  } else for (let i = 0; i < n; i++) softmaxRow(F, i * C, C, out, i * C);
  return out;
}

function classesOf(proba: Float64Array, n: number, C: number): Int32Array {
  const codes = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let bestK = 0;
    for (let k = 1; k < C; k++) if (proba[i * C + k] > proba[i * C + bestK]) bestK = k;
    codes[i] = bestK;
  }
  return codes;
}

/** Predictions (and probabilities, for classes) from raw scores: what predict and probabilities give. */
export function outputsOf(parts: BoostParts, F: Float64Array, rows: number): { predicted: Int32Array | Float64Array; probs?: Float64Array } {
  if (parts.task === 'regression') return { predicted: F };
  const proba = probaOf(parts, F, rows);
  return { predicted: classesOf(proba, rows, parts.classCount), probs: proba };
}

export function makeBoostModel(parts: BoostParts): BoostModel {
  const R = parts.rounds;
  const predictRounds = (X: Matrix, r: number): Int32Array | Float64Array => outputsOf(parts, scoresAt(parts, X, [r])[0], X.rows).predicted;
  const probaRounds = (X: Matrix, r: number): Float64Array => probaOf(parts, scoresAt(parts, X, [r])[0], X.rows);
  const base = {
    task: parts.task,
    parts,
    rounds: R,
    predict: (X: Matrix) => predictRounds(X, R),
    predictRounds,
    scoresAt: (X: Matrix, at: readonly number[]) => scoresAt(parts, X, at),
    importance: () => {
      const g = parts.gain.slice();
      let s = 0;
      for (const v of g) s += v;
      if (s > 0) for (let j = 0; j < g.length; j++) g[j] /= s;
      return g;
    },
    gainTotals: () => parts.gain.slice(),
    notes: () => Object.fromEntries(parts.notes) as Record<string, number>,
    toJSON: () => boostToJSON(parts),
  };
  if (parts.task === 'regression') return base;
  return { ...base, probabilities: (X: Matrix) => probaRounds(X, R), probaRounds };
}

export function boostToJSON(parts: BoostParts): Record<string, unknown> {
  return {
    format: BOOST_FORMAT,
    version: BOOST_VERSION,
    task: parts.task,
    loss: parts.loss,
    classCount: parts.classCount,
    width: parts.width,
    rounds: parts.rounds,
    featureCount: parts.featureCount,
    base: Array.from(parts.base),
    gain: Array.from(parts.gain),
    settings: [...parts.settings].map(([k, v]) => [k, v]),
    notes: [...parts.notes].map(([k, v]) => [k, v]),
    trees: parts.trees ? partsToJSON(parts.trees) : null,
  };
}

const LOSSES: readonly LossName[] = ['squared', 'absolute', 'huber', 'logistic', 'softmax'];

/** Checks a model's JSON form and rebuilds it; throws InputError on anything malformed. */
export function boostFromJSON(json: unknown): BoostParts {
  const bad = (why: string): InputError => new InputError(`boost: not a boost model: ${why}`);
  if (typeof json !== 'object' || json === null || Array.isArray(json)) throw bad('expected an object');
  const o = json as Record<string, unknown>;
  const field = (name: string): unknown => (Object.prototype.hasOwnProperty.call(o, name) ? o[name] : undefined);
  if (field('format') !== BOOST_FORMAT) throw bad(`format must be "${BOOST_FORMAT}"`);
  if (field('version') !== BOOST_VERSION) throw bad(`version must be ${BOOST_VERSION}`);
  const task = field('task');
  if (task !== 'classification' && task !== 'regression') throw bad('task must be classification or regression');
  const loss = field('loss') as LossName;
  if (!LOSSES.includes(loss)) throw bad(`loss must be one of ${LOSSES.join(', ')}`);
  if ((task === 'regression') !== (loss === 'squared' || loss === 'absolute' || loss === 'huber')) throw bad(`loss ${loss} does not fit task ${task}`);
  const int = (name: string, min: number): number => {
    const v = field(name);
    if (typeof v !== 'number' || !Number.isInteger(v) || v < min) throw bad(`${name} must be an integer >= ${min}`);
    return v;
  };
  const classCount = int('classCount', 1);
  const width = int('width', 1);
  const rounds = int('rounds', 0);
  const featureCount = int('featureCount', 0);
  const expectedWidth = loss === 'softmax' ? classCount : 1;
  if (width !== expectedWidth) throw bad(`width must be ${expectedWidth}`);
  if (loss === 'logistic' && classCount !== 2) throw bad('logistic loss needs classCount 2');
  if (task === 'regression' && classCount !== 1) throw bad('classCount must be 1 for regression');
  const doubles = (name: string, length: number): Float64Array => {
    const v = field(name);
    if (!Array.isArray(v) || v.length !== length || !v.every((e) => typeof e === 'number' && Number.isFinite(e))) {
      throw bad(`${name} must be ${length} finite numbers`);
    }
    return Float64Array.from(v as number[]);
  };
  const base = doubles('base', width);
  const gain = doubles('gain', featureCount);
  const pairs = (name: string): [string, unknown][] => {
    const v = field(name);
    if (!Array.isArray(v) || !v.every((p) => Array.isArray(p) && p.length === 2 && typeof p[0] === 'string')) throw bad(`${name} must be a list of [name, value] pairs`);
    return v as [string, unknown][];
  };
  const settings = new Map<string, number | string>();
  for (const [k, v] of pairs('settings')) {
    if (typeof v !== 'number' && typeof v !== 'string') throw bad('settings values must be numbers or strings');
    settings.set(k, v);
  }
  const notes = new Map<string, number>();
  for (const [k, v] of pairs('notes')) {
    if (typeof v !== 'number') throw bad('notes values must be numbers');
    notes.set(k, v);
  }
  const rawTrees = field('trees');
  let trees: FlatForestParts | undefined;
  if (rounds === 0) {
    if (rawTrees !== null) throw bad('trees must be null when rounds is 0');
  } else {
    trees = partsFromJSON(rawTrees, 'forest');
    if (trees.roots.length !== rounds * width) throw bad(`trees must hold rounds x width = ${rounds * width} trees`);
    if (trees.classCount !== width || trees.featureCount !== featureCount || trees.task !== task) throw bad('trees do not match the model (width, features or task)');
  }
  return { task, loss, classCount, width, rounds, featureCount, base, gain, settings, notes, trees };
}
