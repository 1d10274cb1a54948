/**
 * The run as a list of independent tasks. A task fits one learner on the training rows of one
 * fold (or, for `--final`, on train + validation) and predicts that fold's test rows. Its id is
 * stable, derived from the plan position and the learner spec only, and so is its seed, so a task
 * gives the same predictions wherever and whenever it runs: in this thread, in a worker, in
 * another shard on another machine, or after a resume from a journal.
 */
import { performance } from 'node:perf_hooks';
import type { Problem } from '../data/problem.js';
import { problemRowsCsv } from '../io/csv-text.js';
import { FoldwiseError } from '../errors.js';
import { formatBytes, problemColumns } from '../io/write-columnar.js';
import { CommandFoldError } from '../learners/command/errors.js';
import { foldLabel } from '../model/fold-label.js';
import type { FoldView, Learner, Matrix, Params, Target } from '../learning.js';
import type { BuiltPlan } from '../plans/types.js';
import { fitPrep, lazyPrep, type FittedPrep, type Impute } from '../prep/fold-prep.js';
import { notesOf } from './notes.js';
import { createRng, deriveSeed } from '../rng.js';
import { innerThreshold, type InnerThreshold, type ThresholdPlan } from './threshold-inner.js';
import { importanceSeeds, ownImportance, permutationDrops, type ImportancePlan } from './importance.js';

export interface Candidate {
  readonly learner: Learner;
  readonly spec: string;
  readonly params: Params;
}

export interface TaskSpec {
  /** stable id: r{repeat}.f{fold}:{spec}, or final:{spec} */
  readonly id: string;
  /** index into plan.folds, or -1 for the final (holdout) task */
  readonly foldIndex: number;
  readonly candidateIndex: number;
  /** rough relative cost, for balancing shards: training rows */
  readonly cost: number;
}

export interface TaskResult {
  readonly id: string;
  /** empty when the task failed */
  readonly predicted: Int32Array | Float64Array;
  readonly probs?: Float64Array;
  readonly fitMs: number;
  readonly predictMs: number;
  /** why the task failed (a command: learner's fold under --on-fold-error skip) */
  readonly failed?: string;
  /** the model's notes about this fit (Model.notes), when it gave any */
  readonly notes?: Readonly<Record<string, number>>;
  /** --importance: the mean drop of the headline metric per input (NaN where undefined), fold tasks only */
  readonly drops?: Float64Array;
  /** --importance: the model's own importance per feature (forest, boost), when it has one */
  readonly own?: Float64Array;
  /** --threshold: the threshold chosen on this fold's inner split (fold tasks of learners with probabilities only) */
  readonly threshold?: InnerThreshold;
}

/** What to do when a fold of a learner from outside fails: stop the run, or record it and go on. */
export const ON_FOLD_ERROR_CHOICES = ['fail', 'skip'] as const;
export type OnFoldError = (typeof ON_FOLD_ERROR_CHOICES)[number];

/** What a task needs: the problem, the built plan, the learners and the settings. */
export interface TaskContext {
  readonly problem: Problem;
  readonly plan: BuiltPlan;
  readonly candidates: readonly Candidate[];
  readonly impute: Impute;
  readonly seed: number;
  /** also run the final tasks (holdout scored once) */
  readonly final: boolean;
  /** a failed fold of a command: learner stops the run (fail, the default) or is recorded (skip) */
  readonly onFoldError?: OnFoldError;
  /** --importance: the inputs to shuffle and how often (absent: no importance) */
  readonly importance?: ImportancePlan;
  /** --threshold: the rule and the inner folds (absent: no threshold is chosen) */
  readonly threshold?: ThresholdPlan;
}

export function taskId(ctx: TaskContext, foldIndex: number, candidateIndex: number): string {
  const spec = ctx.candidates[candidateIndex].spec;
  if (foldIndex < 0) return `final:${spec}`;
  const f = ctx.plan.folds[foldIndex];
  return `${foldLabel(f)}:${spec}`;
}

/** Every task of a run, in the order a single run performs them (fold by fold). */
export function taskList(ctx: TaskContext): TaskSpec[] {
  const out: TaskSpec[] = [];
  ctx.plan.folds.forEach((f, fi) => {
    ctx.candidates.forEach((_, ci) => out.push({ id: taskId(ctx, fi, ci), foldIndex: fi, candidateIndex: ci, cost: f.train.length }));
  });
  if (ctx.final && ctx.plan.holdout) {
    const rows = ctx.plan.folds[0].train.length + ctx.plan.folds[0].test.length;
    ctx.candidates.forEach((_, ci) => out.push({ id: taskId(ctx, -1, ci), foldIndex: -1, candidateIndex: ci, cost: rows }));
  }
  return out;
}

export function subsetTarget(y: Target, idx: Int32Array): Target {
  return y.task === 'classification'
    ? { task: 'classification', codes: Int32Array.from(idx, (i) => y.codes[i]), classes: y.classes }
    : { task: 'regression', values: Float64Array.from(idx, (i) => y.values[i]) };
}

/** The training and test rows of a task's split. */
export function splitRows(ctx: TaskContext, foldIndex: number): { train: Int32Array; test: Int32Array } {
  if (foldIndex >= 0) return ctx.plan.folds[foldIndex];
  const f = ctx.plan.folds[0];
  return { train: Int32Array.from([...f.train, ...f.test]).sort(), test: ctx.plan.holdout! };
}

/** Preprocessed matrices of one split, made lazily and shared by the tasks of that split. */
export class SplitData {
  private readonly cache = new Map<string, Matrix>();
  readonly prep: FittedPrep;
  constructor(
    private readonly problem: Problem,
    readonly train: Int32Array,
    readonly test: Int32Array,
    impute: Impute,
  ) {
    this.prep = fitPrep(problem, train, impute);
  }
  /** The split as a fold seen by a learner (`ctx.fold`), its test matrix scaled or not. */
  view(label: string, scale: boolean): FoldView {
    return {
      label,
      test: this.matrix('test', scale),
      columns: this.prep.names,
      target: this.problem.targetName,
      rawCsv: (part) => problemRowsCsv(this.problem, part === 'train' ? this.train : this.test, part === 'train'),
      rawBytes: (part, format) => {
        const idx = part === 'train' ? this.train : this.test;
        return formatBytes(format, problemColumns(this.problem, idx, part === 'train'), idx.length);
      },
    };
  }
  matrix(part: 'train' | 'test', scale: boolean): Matrix {
    const key = `${part}:${scale}`;
    let m = this.cache.get(key);
    if (!m) {
      m = lazyPrep(this.problem, this.prep, part === 'train' ? this.train : this.test, scale);
      this.cache.set(key, m);
    }
    return m;
  }
}

/**
 * Runs tasks in the given order, fitting each split's preprocessing once for consecutive tasks
 * of the same split. `done` is called after each task (for journals and progress); when
 * `stopRequested` returns true, no further task starts.
 */
export function runTasks(
  ctx: TaskContext,
  tasks: readonly TaskSpec[],
  done?: (r: TaskResult) => void,
  stopRequested?: () => boolean,
): TaskResult[] {
  const out: TaskResult[] = [];
  let split: SplitData | undefined;
  let splitOf = NaN;
  for (const t of tasks) {
    if (stopRequested?.()) break;
    if (t.foldIndex !== splitOf) {
      const { train, test } = splitRows(ctx, t.foldIndex);
      split = new SplitData(ctx.problem, train, test, ctx.impute);
      splitOf = t.foldIndex;
    }
    const r = runTask(ctx, t, split!);
    out.push(r);
    done?.(r);
  }
  return out;
}

function runTask(ctx: TaskContext, t: TaskSpec, split: SplitData): TaskResult {
  const c = ctx.candidates[t.candidateIndex];
  const f = t.foldIndex >= 0 ? ctx.plan.folds[t.foldIndex] : undefined;
  const seed = f ? deriveSeed(ctx.seed, 'fit', c.spec, f.repeat, f.fold) : deriveSeed(ctx.seed, 'final', c.spec);
  const Xtrain = split.matrix('train', c.learner.needsScaling);
  const Xtest = split.matrix('test', c.learner.needsScaling);
  const fold = split.view(f ? foldLabel(f) : 'final', c.learner.needsScaling);
  const t0 = performance.now();
  try {
    // without --importance the model only predicts this split's test rows: a learner may do that as it fits (forest)
    const predictOnly = !(ctx.importance && f);
    const model = c.learner.fit(Xtrain, subsetTarget(ctx.problem.target, split.train), c.params, { rng: createRng(seed), seed, fold, predictOnly });
    const t1 = performance.now();
    const predicted = model.predict(Xtest);
    const probs = model.probabilities?.(Xtest);
    const t2 = performance.now();
    const notes = notesOf(model.notes?.());
    let extra: { drops?: Float64Array; own?: Float64Array } = {};
    if (ctx.importance && f) {
      const drops = permutationDrops(model, Xtest, split.prep, subsetTarget(ctx.problem.target, split.test), ctx.importance, importanceSeeds(ctx.seed, f.repeat, f.fold));
      const own = ownImportance(model, split.prep, ctx.problem.features.length);
      extra = { drops, ...(own ? { own } : {}) };
    }
    let cut: { threshold?: InnerThreshold } = {};
    if (ctx.threshold && f && probs) {
      const chosen = innerThreshold(ctx.problem, ctx.seed, c, f, split.train, ctx.threshold, (train, test) => new SplitData(ctx.problem, train, test, ctx.impute));
      if (chosen) cut = { threshold: chosen };
    }
    return { id: t.id, predicted, ...(probs ? { probs } : {}), fitMs: t1 - t0, predictMs: t2 - t1, ...(notes ? { notes } : {}), ...extra, ...cut };
  } catch (caught) {
    // a module: learner's own error is the user's code failing on this fold, not a bug of foldwise
    const e = c.learner.name.startsWith('module:') && !(caught instanceof FoldwiseError) ? moduleFoldError(c.learner.name, fold.label, caught) : caught;
    if (!(e instanceof CommandFoldError) || ctx.onFoldError !== 'skip') throw e;
    const empty = ctx.problem.task === 'classification' ? new Int32Array(0) : new Float64Array(0);
    return { id: t.id, predicted: empty, fitMs: performance.now() - t0, predictMs: 0, failed: e.message };
  }
}

/** The error of a module: learner's fit or predict on one fold, naming the module and the fold. */
export function moduleFoldError(learner: string, fold: string, e: unknown): CommandFoldError {
  const message = e instanceof Error ? e.message : String(e);
  return new CommandFoldError(`${learner} fold ${fold}: the learner threw: ${message.replace(/\s+/g, ' ').slice(0, 300)} (--on-fold-error skip records the fold as failed and goes on)`);
}
