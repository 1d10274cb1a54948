/**
 * The learner registry: every built-in learner by name, and the default list per task.
 */
import { closeNames, UsageError } from '../errors.js';
import { loadColumnarWriters } from '../io/write-columnar.js';
import { baseline } from './baseline.js';
import { bayes } from './bayes.js';
import { boost } from './boost/learner.js';
import { forest } from './forest.js';
import { forestRef } from './forest-ref.js';
import { knn } from './knn.js';
import { knnRef } from './knn-ref.js';
import { linear } from './linear.js';
import { logistic } from './logistic.js';
import { tree } from './tree.js';
import { commandLearner } from './command/learner.js';
import type { CommandSetup } from './command/program.js';
import { loadModuleLearner } from './module-learner.js';
import { externalKind, parseLearnerSpec } from './spec.js';
import type { Learner, Task } from '../learning.js';

export const LEARNERS: ReadonlyMap<string, Learner> = new Map(
  [baseline, forest, tree, knn, knnRef, forestRef, linear, logistic, bayes, boost].map((l) => [l.name, l] as const),
);

/** The learners evaluated when the user names none (the baseline is added separately). */
export function defaultLearnerSpecs(task: Task): string[] {
  void task;
  return ['forest', 'knn'];
}

/** Learners from outside (module: and command:), registered at run time by name. */
const EXTERNAL = new Map<string, Learner>();

/** Makes an external learner (from `loadExternalLearners`) known to `getLearner` under its name. */
export function registerExternalLearner(learner: Learner): void {
  if (!externalKind(learner.name)) throw new UsageError(`external learner "${learner.name}": name must start with module: or command:`);
  EXTERNAL.set(learner.name, learner);
}

/**
 * Loads the learners of the `module:` and `command:` specs among `specs` (imports are
 * asynchronous, so this runs before the synchronous run preparation) and registers them.
 * `baseDir` is the absolute folder relative module paths are resolved against (the CLI passes
 * the working directory); `commands` holds the programs of `command:` learners. Each worker
 * thread of a run must call it too before preparing the run.
 */
export async function loadExternalLearners(specs: readonly string[], baseDir: string, commands?: CommandSetup): Promise<void> {
  for (const text of specs) {
    const spec = parseLearnerSpec(text);
    const kind = externalKind(spec.name);
    if (kind === 'module' && !EXTERNAL.has(spec.name)) registerExternalLearner(await loadModuleLearner(spec.name, baseDir));
    if (kind === 'command') {
      const program = commands?.programs.find((p) => `command:${p.name}` === spec.name);
      if (!program) {
        const known = commands?.programs.map((p) => p.name) ?? [];
        throw new UsageError(
          `--learner ${text}: no program is given for "${spec.name.slice('command:'.length)}"; add --command ${spec.name.slice('command:'.length)}=PROGRAM${known.length ? ` (given: ${known.join(', ')})` : ''}`,
        );
      }
      // its format= may ask for Parquet or Arrow files, whose writers load on demand
      await loadColumnarWriters();
      // registered anew on every load: the program and the settings may differ between runs
      EXTERNAL.set(spec.name, commandLearner(program, commands!));
    }
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
        : `--learner ${name}: no program is given for it; add --command ${name.slice('command:'.length)}=PROGRAM`,
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

export { parseCommandPrograms, type CommandProgram, type CommandSetup } from './command/program.js';
export { defaultParams, formatSpec, parseLearnerSpec, resolveParams } from './spec.js';
export type { Learner, Matrix, Model, Params, ParamSpec, Target, Task } from '../learning.js';
