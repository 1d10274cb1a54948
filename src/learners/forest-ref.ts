/**
 * `forest-ref`: the design's reference random forest (npm ml-random-forest), kept to
 * cross-check our own forest. It is far too slow for real data (its split search makes a full
 * pass per candidate threshold) and has traps this wrapper steps around:
 * - its default out-of-bag pass throws on small data, so it always gets `noOOB: true`;
 * - its probability output is wrong, so class probabilities here are per-tree vote shares;
 * - labels must be integer codes (ours are);
 * - `maxFeatures: 1` means 100%, so one feature is asked for as a fraction;
 * - it draws one feature subset per tree, not per split: `features` has that meaning here.
 */
import { argmaxRows } from './argmax.js';
import { InputError } from '../errors.js';
import { refForest, rowsOf, type RefForest } from './reference-libs.js';
import type { Learner, Matrix, Model } from '../learning.js';

export const REF_FEATURES = ['all', 'sqrt', 'log2'] as const;

/** The library's maxFeatures for m of p features (integers > 1 are counts, fractions are shares). */
export function maxFeaturesFor(m: number, p: number): number {
  if (m >= p) return p === 1 ? 1.0 : p;
  if (m === 1) return 1.5 / p;
  return m;
}

function featureCount(mode: string, p: number): number {
  if (mode === 'sqrt') return Math.max(1, Math.floor(Math.sqrt(p)));
  if (mode === 'log2') return Math.max(1, Math.floor(Math.log2(p)));
  return p;
}

interface SavedRef {
  readonly learner: 'forest-ref';
  readonly task: 'classification' | 'regression';
  readonly classes: number;
  readonly model: unknown;
}

function wrap(saved: SavedRef, rf: RefForest): Model {
  if (saved.task === 'regression') {
    return { predict: (X) => Float64Array.from(rf.predict(rowsOf(X))), toJSON: () => saved };
  }
  const C = saved.classes;
  const probs = (X: Matrix): Float64Array => {
    const votes = rf.predictionValues(rowsOf(X));
    const out = new Float64Array(X.rows * C);
    for (let i = 0; i < X.rows; i++) {
      const row = votes.getRow(i);
      for (const c of row) out[i * C + c] += 1 / row.length;
    }
    return out;
  };
  return {
    predict: (X) => argmaxRows(probs(X), C),
    probabilities: probs,
    toJSON: () => saved,
  };
}

export const forestRef: Learner = {
  name: 'forest-ref',
  tasks: ['classification', 'regression'],
  params: [
    { name: 'trees', kind: 'int', min: 1, max: 10_000, default: 30, simpler: 'lower', doc: 'number of trees' },
    { name: 'depth', kind: 'int', min: 1, max: 64, default: 32, simpler: 'lower', doc: 'maximum tree depth' },
    { name: 'features', kind: 'choice', choices: REF_FEATURES, default: 'sqrt', doc: 'features drawn per tree (not per split)' },
  ],
  needsScaling: false,
  doc: 'reference random forest from ml-random-forest (slow; for cross-checks)',
  fit(X, y, params, ctx) {
    if (X.rows === 0) throw new InputError('forest-ref: no training rows');
    const lib = refForest();
    const m = featureCount(String(params.features), X.cols);
    const options = {
      nEstimators: Number(params.trees),
      maxFeatures: maxFeaturesFor(m, X.cols),
      replacement: false,
      seed: ctx.seed >>> 1,
      useSampleBagging: true,
      noOOB: true,
      treeOptions: { maxDepth: Number(params.depth) },
    };
    const rf = y.task === 'classification' ? new lib.RandomForestClassifier(options) : new lib.RandomForestRegression(options);
    rf.train(rowsOf(X), y.task === 'classification' ? Array.from(y.codes) : Array.from(y.values));
    const saved: SavedRef = {
      learner: 'forest-ref',
      task: y.task,
      classes: y.task === 'classification' ? y.classes.length : 0,
      model: JSON.parse(JSON.stringify(rf.toJSON())),
    };
    return wrap(saved, rf);
  },
  load(json) {
    const saved = json as SavedRef;
    if (saved?.learner !== 'forest-ref') throw new InputError('forest-ref: not a saved forest-ref model');
    const lib = refForest();
    const rf = saved.task === 'classification' ? lib.RandomForestClassifier.load(saved.model) : lib.RandomForestRegression.load(saved.model);
    return wrap(saved, rf);
  },
};
