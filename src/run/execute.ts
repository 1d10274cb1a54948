/**
 * Running a whole evaluation the ways the CLI offers: in this thread or on a pool of worker
 * threads (`jobs`), only one shard of the tasks (`shard`, giving a partial report), resuming
 * from and appending to a journal (`journal`), with progress callbacks and a stop signal.
 * Every way gives the same report for the same inputs and seed (timings aside).
 */
import { performance } from 'node:perf_hooks';
import type { Table } from '../data/types.js';
import { FoldwiseError } from '../errors.js';
import { loadExternalLearners, type CommandSetup } from '../learners/index.js';
import type { Report } from '../model/report.js';
import { assembleReport, frameOf, recordsOf, type ReportFrame, type TaskRecord } from './evaluate.js';
import { checkKeep, keptText } from './predictions-out.js';
import { identityOf, withReadSettings, type ReadSettings, type RunIdentity } from './identity.js';
import { openJournal, type Journal, type ResultCodec } from './journal.js';
import { makePartial, type PartialReport } from './partial.js';
import { runPool } from './pool.js';
import { prepareRun, withAudit, type EvaluateOptions } from './prepare.js';
import { shardTasks, type ShardSpec } from './shard.js';
import { runTasks, taskList, type TaskResult, type TaskSpec } from './tasks.js';
import { shareRunInPlace, type SharedRun } from './share-run.js';

/**
 * A run stopped on request: exit code 128 + the signal's number, as shells report a process
 * ended by that signal (130 for SIGINT, 143 for SIGTERM, 129 for SIGHUP).
 */
export class InterruptedError extends FoldwiseError {
  constructor(message: string, signal: unknown = 'SIGINT') {
    super(message, signal === 'SIGTERM' ? 143 : signal === 'SIGHUP' ? 129 : 130);
  }
}

export interface ExecOptions {
  /** worker threads; 1 runs in this thread (default 1) */
  readonly jobs?: number;
  readonly shard?: ShardSpec;
  /** path of the journal to resume from and append to */
  readonly journal?: string;
  /** called once before work with the counts, then after every finished task */
  readonly progress?: (done: number, total: number, resumed: number) => void;
  /** when it returns true, no new task is started and the run stops with InterruptedError */
  readonly stopRequested?: () => boolean;
  /** absolute folder that relative `module:` learner paths are resolved against */
  readonly baseDir?: string;
  /** the programs of `command:` learners, their environment and temporary folder */
  readonly commands?: CommandSetup;
  /** --predictions-keep: input columns whose text the records carry (for the predictions file) */
  readonly keep?: readonly string[];
  /**
   * aborted to stop the run at once (its reason, such as "SIGTERM", picks the exit code): the
   * tasks under way are abandoned (workers terminated), the finished ones are in the journal
   */
  readonly stop?: AbortSignal;
  /** run the tasks in a worker thread even with jobs 1, so this thread stays free for signals */
  readonly isolate?: boolean;
  /** called once the tasks are about to run (after the data checks), for example to arm signal handlers */
  readonly onTasks?: () => void;
  /** notes for the user (a journal's broken tail cut off) */
  readonly notice?: (text: string) => void;
  /** what the loader was told (missing tokens, forced categorical columns, delimiter): part of the run's identity */
  readonly read?: ReadSettings;
}

export type ExecResult =
  | { readonly kind: 'report'; readonly report: Report; readonly frame: ReportFrame; readonly records: readonly TaskRecord[] }
  | { readonly kind: 'partial'; readonly partial: PartialReport };

export async function execute(table: Table, options: EvaluateOptions, exec: ExecOptions = {}): Promise<ExecResult> {
  const started = performance.now();
  await loadExternalLearners(options.learners ?? [], exec.baseDir ?? '/', exec.commands);
  const prepared = withAudit(prepareRun(table, options), options);
  const keep = exec.keep ?? [];
  checkKeep(table, keep, prepared.problem.task, prepared.problem.target.task === 'classification' ? prepared.problem.target.classes : []);
  const all = taskList(prepared);
  const identity = identityOf(prepared, exec.read);
  const { mine, ordered } = await runTaskSet<TaskResult>(table, options, {
    all,
    identity,
    classification: prepared.problem.target.task === 'classification',
    runHere: (tasks, done, stop) => runTasks(prepared, tasks, done, stop),
    share: () => shareRunInPlace(prepared.problem, { plan: prepared.plan, stratified: prepared.stratified }),
  }, exec);
  const frame = withReadSettings(frameOf(prepared), exec.read);
  const withKeep = (records: TaskRecord[]): TaskRecord[] => (keep.length ? records.map((r) => ({ ...r, keep: keptText(table, keep, r.rows!) })) : records);
  if (exec.shard) {
    const records = withKeep(recordsOf(prepared, ordered, new Set(mine.map((t) => t.id))));
    return { kind: 'partial', partial: makePartial(identity, frame, exec.shard, all.map((t) => t.id), records, options.timing !== false, keep) };
  }
  const totalMs = options.timing === false ? undefined : performance.now() - started;
  const records = withKeep(recordsOf(prepared, ordered));
  return { kind: 'report', report: assembleReport(frame, records, totalMs), frame, records };
}

/** A run's tasks and how to run them, for `runTaskSet`. */
export interface TaskSet<R extends { readonly id: string; readonly failed?: string }> {
  /** every task of the whole run, in the order a single run performs them */
  readonly all: readonly TaskSpec[];
  readonly identity: RunIdentity;
  readonly classification: boolean;
  /** runs tasks in this thread in the given order, calling `done` after each */
  runHere(tasks: readonly TaskSpec[], done: (r: R) => void, stopRequested?: () => boolean): void;
  /** journal lines of the results (default: eval's task results) */
  readonly codec?: ResultCodec<R>;
  /** the worker module for --jobs (default: the runner's, which runs eval's tasks) */
  readonly worker?: URL;
  /** moves the run's problem and plan into shared memory for the workers (eval's; absent: each worker builds its own) */
  share?(): SharedRun;
}

/**
 * The part of a run every command built on the runner shares: this shard's tasks (`exec.shard`),
 * the ones the journal already holds, the rest run in this thread or on worker threads, each
 * result journaled as it comes, with progress and stops. Returns this shard's tasks and their
 * results in the run's order; throws InterruptedError when the run was stopped before the end.
 */
export async function runTaskSet<R extends { readonly id: string; readonly failed?: string }>(
  table: Table,
  options: EvaluateOptions,
  set: TaskSet<R>,
  exec: ExecOptions,
): Promise<{ mine: TaskSpec[]; ordered: R[] }> {
  const { all, identity } = set;
  const mine = exec.shard ? shardTasks(all, exec.shard) : [...all];
  const journal = exec.journal
    ? set.codec
      ? openJournal(exec.journal, identity, set.classification, set.codec)
      : (openJournal(exec.journal, identity, set.classification) as unknown as Journal<R>)
    : undefined;
  if (journal?.cutAt) exec.notice?.(`--journal ${journal.path}: from line ${journal.cutAt} on, the lines fail their checksum (a write cut short); cut off there, those tasks run again`);
  const results = new Map<string, R>();
  try {
    for (const t of mine) {
      const r = journal?.done.get(t.id);
      if (r) results.set(t.id, r);
    }
    const resumed = results.size;
    const todo = mine.filter((t) => !results.has(t.id));
    exec.progress?.(results.size, mine.length, resumed);
    const done = (r: R): void => {
      journal?.append(r);
      results.set(r.id, r);
      exec.progress?.(results.size, mine.length, resumed);
    };
    const jobs = Math.max(1, Math.floor(exec.jobs ?? 1));
    exec.onTasks?.();
    const where = (reason?: unknown): string =>
      `${journal ? `; ${results.size} of ${mine.length} tasks are in the journal ${journal.path}: rerun the same command to resume` : ''}${reason ? ` (${String(reason)})` : ''}`;
    if ((jobs > 1 || exec.isolate) && todo.length > 0) {
      const stopped = (reason: unknown): Error => new InterruptedError(`interrupted${where(reason)}`, reason);
      await runPool<R>(table, options, todo, jobs, done, exec.stopRequested, exec.baseDir ?? '/', exec.commands, exec.stop, stopped, set.worker, set.share?.());
    } else {
      // one split at a time, yielding to the event loop in between so that a SIGINT handler
      // (which only runs when the loop gets control) can ask the run to stop
      for (let i = 0; i < todo.length; ) {
        let j = i;
        while (j < todo.length && todo[j].foldIndex === todo[i].foldIndex) j++;
        if (exec.stopRequested?.() || exec.stop?.aborted) break;
        set.runHere(todo.slice(i, j), done, exec.stopRequested);
        await new Promise<void>((resolve) => setImmediate(resolve));
        i = j;
      }
    }
    if (results.size < mine.length) throw new InterruptedError(`interrupted${where(exec.stop?.reason)}`, exec.stop?.reason);
  } finally {
    journal?.close();
  }
  return { mine, ordered: mine.map((t) => results.get(t.id)!) };
}
