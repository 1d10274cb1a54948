/**
 * The learner registry: every built-in learner by name, and the default list per task.
 */
import { closeNames, UsageError } from '../errors.js';
import { baseline } from './baseline.js';
import { bayes } from './bayes.js';
import { forest } from './forest.js';
import { forestRef } from './forest-ref.js';
import { knn } from './knn.js';
import { knnRef } from './knn-ref.js';
import { linear } from './linear.js';
import { logistic } from './logistic.js';
import { tree } from './tree.js';
import { loadModuleLearner } from './module-learner.js';
import { externalKind, parseLearnerSpec } from './spec.js';
import type { Learner, Task } from './types.js';

export const LEARNERS: ReadonlyMap<string, Learner> = new Map(
  [baseline, forest, tree, knn, knnRef, forestRef, linear, logistic, bayes].map((l) => [l.name, l] as const),
);

/** The learners evaluated when the user names none (the baseline is added separately). */
export function defaultLearnerSpecs(task: Task): string[] {
  void task;
  return ['forest', 'knn'];
}

/** Learners from outside (module: only so far), registered at run time by name. */
const EXTERNAL = new Map<string, Learner>();

/** Makes an external learner (from `loadExternalLearners`) known to `getLearner` under its name. */
export function registerExternalLearner(learner: Learner): void {
  if (externalKind(learner.name) !== 'module') throw new UsageError(`external learner "${learner.name}": name must start with module:`);
  EXTERNAL.set(learner.name, learner);
}

/**
 * Loads the learners of the `module:` specs among `specs` (imports are asynchronous, so this
 * runs before the synchronous run preparation) and registers them. `baseDir` is the absolute
 * folder relative module paths are resolved against (the CLI passes the working directory).
 * Each worker thread of a run must call it too before preparing the run.
 */
export async function loadExternalLearners(specs: readonly string[], baseDir: string): Promise<void> {
  for (const text of specs) {
    const spec = parseLearnerSpec(text);
    if (externalKind(spec.name) === 'module' && !EXTERNAL.has(spec.name)) registerExternalLearner(await loadModuleLearner(spec.name, baseDir));
  }
}

export function getLearner(name: string): Learner {
  const kind = externalKind(name);
  if (kind) {
    const ext = EXTERNAL.get(name);
    if (ext) return ext;
    throw new UsageError(
      kind === 'module'
        ? `--learner ${name}: the module is not loaded (loadExternalLearners must run before the run is prepared)`
        : `--learner ${name}: command: learners (external programs) are not available in this version`,
    );
  }
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
