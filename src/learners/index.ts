/**
 * The learner registry: every built-in learner by name, and the default list per task.
 */
import { closeNames, UsageError } from '../errors.js';
import { baseline } from './baseline.js';
import { forest } from './forest.js';
import { forestRef } from './forest-ref.js';
import { knn } from './knn.js';
import { knnRef } from './knn-ref.js';
import { tree } from './tree.js';
import type { Learner, Task } from './types.js';

export const LEARNERS: ReadonlyMap<string, Learner> = new Map(
  [baseline, forest, tree, knn, knnRef, forestRef].map((l) => [l.name, l] as const),
);

/** The learners evaluated when the user names none (the baseline is added separately). */
export function defaultLearnerSpecs(task: Task): string[] {
  void task;
  return ['forest', 'knn'];
}

export function getLearner(name: string): Learner {
  const l = LEARNERS.get(name);
  if (!l) {
    const known = [...LEARNERS.keys()];
    const hint = closeNames(name, known);
    throw new UsageError(`--learner "${name}": unknown learner${hint ? `; ${hint}` : ''} (known: ${known.join(', ')})`);
  }
  return l;
}

export { defaultParams, formatSpec, parseLearnerSpec, resolveParams } from './spec.js';
export type { Learner, Matrix, Model, Params, ParamSpec, Target, Task } from './types.js';
