/**
 * Permutation importance (`eval --importance`): how much a fitted model's headline score on a
 * fold's test rows drops when one input's values are shuffled among those rows, so that the
 * input keeps its distribution but loses its tie to the target and to the other inputs. The
 * model is not refitted: the question is what this model uses, not what another fit would.
 * Breiman (2001), "Random Forests", Machine Learning 45:5-32, section 10, gives the idea;
 * Fisher, Rudin & Dominici (2019, JMLR 20:177) study it as "model reliance".
 *
 * Inputs: every feature (a categorical feature's one-hot columns move together, as one input),
 * and with `--importance-clusters` also every correlated cluster the audit finds
 * (src/audit/clusters.ts: |Pearson r| or Cramer's V at or above its threshold), whose members
 * are shuffled with one permutation. Two copies of one signal hide each other when shuffled
 * alone (the model reads the other copy); as a cluster the shared signal shows.
 *
 * drop = score(unshuffled) - score(shuffled) for a metric where higher is better, and the
 * reverse for one where lower is better, so a positive drop always means "the model uses it".
 * Each fold's drop is the mean over `repeats` shuffles; fold drops are summarised like scores
 * (corrected interval, src/stats). The permutation of repeat r of input "name" on a fold is
 * drawn from deriveSeed(seed, "importance", repeat, fold, name, r): the same for every learner
 * (paired across learners) and for every way of running (threads, shards, resumes).
 *
 * Cost: inputs x repeats predictions of each fold's test rows per learner.
 */
import { findClusters } from '../audit/clusters.js';
import { featuresOf } from '../audit/feature-data.js';
import { AUDIT_LIMITS } from '../audit/types.js';
import type { Problem } from '../data/problem.js';
import { UsageError } from '../errors.js';
import type { Matrix, Model, Target } from '../learning.js';
import type { Metric } from '../metrics/types.js';
import type { FittedPrep } from '../prep/fold-prep.js';
import { createRng, deriveSeed, shuffleInPlace } from '../rng.js';
import { scoreOf } from '../metrics/scoring.js';

export const DEFAULT_IMPORTANCE_REPEATS = 5;
export const MAX_IMPORTANCE_REPEATS = 1000;

/** One input that is shuffled as a whole: a feature or a correlated cluster of features. */
export interface ImportanceInput {
  readonly name: string;
  readonly kind: 'feature' | 'cluster';
  /** the problem's feature indices it covers, ascending */
  readonly features: readonly number[];
}

export interface ImportancePlan {
  /** the headline metric, whose drop is measured */
  readonly metric: Metric;
  readonly repeats: number;
  readonly clusters: boolean;
  readonly inputs: readonly ImportanceInput[];
}

export function checkImportanceRepeats(n: number): number {
  if (!Number.isInteger(n) || n < 1 || n > MAX_IMPORTANCE_REPEATS) {
    throw new UsageError(`--importance-repeats ${n}: expected a whole number from 1 to ${MAX_IMPORTANCE_REPEATS}`);
  }
  return n;
}

/**
 * The inputs of a problem: its features in order, then (with `clusters`) the audit's correlated
 * clusters, named `cluster(a+b+...)`. The clusters are found from the features alone, on all
 * used rows; the target plays no part, so nothing about a test row's target reaches the choice.
 */
export function importanceInputs(problem: Problem, clusters: boolean): ImportanceInput[] {
  const out: ImportanceInput[] = problem.features.map((f, i) => ({ name: f.name, kind: 'feature' as const, features: [i] }));
  if (!clusters) return out;
  const index = new Map(problem.features.map((f, i) => [f.name, i]));
  const found = findClusters(featuresOf(problem), problem.rows.length, new Set(), AUDIT_LIMITS.clusterThreshold, []);
  for (const cl of found) {
    const features = cl.members.map((m) => index.get(m)!).sort((a, b) => a - b);
    out.push({ name: `cluster(${features.map((i) => problem.features[i].name).join('+')})`, kind: 'cluster', features });
  }
  return out;
}

/** The matrix columns of each input, from the fold's preprocessing. */
function columnsOf(prep: FittedPrep, input: ImportanceInput): number[] {
  const cols: number[] = [];
  for (let c = 0; c < prep.width; c++) if (input.features.includes(prep.source[c])) cols.push(c);
  return cols;
}

/**
 * The mean drop of each input over `plan.repeats` shuffles of the test rows; NaN where the
 * metric is undefined (a fold where it cannot be computed).
 */
export function permutationDrops(
  model: Model,
  X: Matrix,
  prep: FittedPrep,
  actual: Target,
  plan: ImportancePlan,
  seedOf: (input: string, r: number) => number,
): Float64Array {
  const metric = plan.metric;
  const predictOf = (M: Matrix) => {
    const predicted = model.predict(M);
    const proba = metric.needsProba ? model.probabilities?.(M) : undefined;
    return proba ? { predicted, proba } : { predicted };
  };
  const base = scoreOf(metric, actual, predictOf(X));
  const out = new Float64Array(plan.inputs.length).fill(NaN);
  if (base === null) return out;
  const n = X.rows;
  const w = X.cols;
  const data = X.data.slice();
  const shuffled: Matrix = { rows: n, cols: w, data };
  const perm = new Int32Array(n);
  plan.inputs.forEach((input, k) => {
    const cols = columnsOf(prep, input);
    if (cols.length === 0 || n < 2) {
      out[k] = 0; // no column reaches the model (levels unseen in training), or nothing to shuffle
      return;
    }
    let sum = 0;
    for (let r = 0; r < plan.repeats; r++) {
      for (let i = 0; i < n; i++) perm[i] = i;
      shuffleInPlace(perm, createRng(seedOf(input.name, r)));
      for (let i = 0; i < n; i++) for (const c of cols) data[i * w + c] = X.data[perm[i] * w + c];
      const s = scoreOf(metric, actual, predictOf(shuffled));
      if (s === null) return; // leaves NaN
      sum += metric.higherIsBetter ? base - s : s - base;
    }
    for (let i = 0; i < n; i++) for (const c of cols) data[i * w + c] = X.data[i * w + c];
    out[k] = sum / plan.repeats;
  });
  return out;
}

/** The seeds of one fold's shuffles (shared by every learner on that fold). */
export function importanceSeeds(seed: number, repeat: number, fold: number): (input: string, r: number) => number {
  return (input, r) => deriveSeed(seed, 'importance', repeat, fold, input, r);
}

/** What a learner's own importance measures, by learner name (absent: it has none). */
export function ownImportanceKind(learner: string): 'impurity' | 'gain' | undefined {
  if (learner === 'forest' || learner === 'tree') return 'impurity';
  if (learner === 'boost') return 'gain';
  return undefined;
}

/**
 * A model's own importance (forest: mean decrease in impurity, boost: total split gain, both
 * scaled to sum 1 over the matrix columns) per feature, a categorical feature's one-hot columns
 * summed; undefined when the model has none.
 */
export function ownImportance(model: Model, prep: FittedPrep, features: number): Float64Array | undefined {
  const fn = (model as { importance?: () => Float64Array }).importance;
  if (typeof fn !== 'function') return undefined;
  const perColumn = fn.call(model);
  if (!perColumn || perColumn.length !== prep.width) return undefined;
  const out = new Float64Array(features);
  for (let c = 0; c < prep.width; c++) out[prep.source[c]] += perColumn[c];
  return out;
}

/** The importance settings as the report frame carries them (plain JSON, for parts and merge). */
export interface ImportanceFrame {
  readonly metric: string;
  readonly higherIsBetter: boolean;
  readonly repeats: number;
  readonly clusters: boolean;
  readonly inputs: readonly { readonly name: string; readonly kind: 'feature' | 'cluster'; readonly members: readonly string[] }[];
  /** the feature names, in order (own importance is per feature) */
  readonly features: readonly string[];
}

export function importanceFrameOf(plan: ImportancePlan, features: readonly string[]): ImportanceFrame {
  return {
    metric: plan.metric.name,
    higherIsBetter: plan.metric.higherIsBetter,
    repeats: plan.repeats,
    clusters: plan.clusters,
    inputs: plan.inputs.map((i) => ({ name: i.name, kind: i.kind, members: i.features.map((f) => features[f]) })),
    features: [...features],
  };
}
