/**
 * Runs tasks on a pool of worker threads. Tasks are sent in batches of one split each (so a
 * split's preprocessing is fitted once per batch), to whichever worker is free next; a worker
 * posts each task's result as soon as it is done (so a journal holds it at once). The results
 * are the same whatever the number of workers: every task carries its own seed.
 *
 * The pool ends on every path: when a task fails, when `done` throws (a journal on a full
 * disk), when a worker crashes, and when `stop` is aborted (SIGINT, SIGTERM), the workers are
 * terminated at once (a long fit is interrupted; its task runs again on resume) and the pool
 * rejects with the cause.
 */
import { Worker } from 'node:worker_threads';
import type { Table } from '../data/types.js';
import { FoldwiseError } from '../errors.js';
import type { CommandSetup } from '../learners/index.js';
import type { EvaluateOptions } from './prepare.js';
import { shareTable } from './share.js';
import type { SharedRun } from './share-run.js';
import type { TaskResult, TaskSpec } from './tasks.js';

/**
 * The worker script: the runner's own (worker.js next to this module) or the one a command built
 * on the runner gives (growth's). Under the test runner the modules are TypeScript source; the
 * worker then runs from the built copy in dist/ (npm test builds first).
 */
function workerUrl(script: URL = new URL('./worker.js', import.meta.url)): URL {
  if (import.meta.url.endsWith('.ts')) return new URL(script.href.replace(/\/src\/(.+)\.js$/, '/dist/src/$1.js'));
  return script;
}

/**
 * A worker's young generation (V8's nursery of new objects) is capped at 16 MB. Left to itself
 * V8 lets each isolate's grow to 32 MB under the allocation churn of a fit, which every worker
 * then holds in resident memory; the old generation, where the long-lived objects live, is not
 * limited. Measured on the 10^6 x 20 bench file, `eval --learner forest:trees=4 --plan kfold:3
 * --jobs 2 --no-audit`, peak RSS in alternating runs: 609, 613 and 609 MB without the cap, 563,
 * 587 and 585 MB with it, at about the same CPU time (issue 14).
 */
export const WORKER_LIMITS = { maxYoungGenerationSizeMb: 16 } as const;

/** Groups tasks into batches by split, keeping the given order within and across batches. */
function batches(tasks: readonly TaskSpec[]): string[][] {
  const out: string[][] = [];
  let last = NaN;
  for (const t of tasks) {
    if (t.foldIndex !== last) out.push([]);
    out[out.length - 1].push(t.id);
    last = t.foldIndex;
  }
  return out;
}

/** A stop request (the abort reason, such as "SIGINT") as the error the pool rejects with. */
export type StopError = (reason: unknown) => Error;

type WorkerMessage<R> = { result?: R; batchDone?: true; error?: string; exitCode?: number };

export async function runPool<R = TaskResult>(
  table: Table,
  options: EvaluateOptions,
  tasks: readonly TaskSpec[],
  jobs: number,
  done?: (r: R) => void,
  stopRequested?: () => boolean,
  baseDir = '/',
  commands?: CommandSetup,
  stop?: AbortSignal,
  stopError: StopError = (reason) => new FoldwiseError(`stopped (${String(reason)})`, 130),
  /** the worker module (default: the runner's worker.js, which runs eval's tasks) */
  script?: URL,
  /** the problem and plan already built here, in shared memory, for the workers to reuse */
  run?: SharedRun,
): Promise<R[]> {
  const queue = batches(tasks);
  const results: R[] = [];
  if (queue.length === 0) return results;
  const shared = shareTable(table);
  const count = Math.max(1, Math.min(jobs, queue.length));
  const workers: Worker[] = [];
  let onAbort: (() => void) | undefined;
  try {
    await new Promise<void>((resolve, reject) => {
      let running = 0;
      let ended = false;
      const fail = (e: unknown): void => {
        if (ended) return;
        ended = true;
        reject(e);
      };
      if (stop?.aborted) return fail(stopError(stop.reason));
      onAbort = () => fail(stopError(stop!.reason));
      stop?.addEventListener('abort', onAbort, { once: true });
      const next = (w: Worker): void => {
        const batch = stopRequested?.() ? undefined : queue.shift();
        if (!batch) {
          w.postMessage(null);
          if (--running === 0 && !ended) {
            ended = true;
            resolve();
          }
          return;
        }
        w.postMessage(batch);
      };
      for (let i = 0; i < count; i++) {
        const w = new Worker(workerUrl(script), { resourceLimits: WORKER_LIMITS, workerData: { table: shared, options, baseDir, commands, ...(run ? { run } : {}) } });
        workers.push(w);
        running++;
        w.on('message', (msg: WorkerMessage<R>) => {
          if (ended) return;
          if (msg.error !== undefined) return fail(msg.exitCode === undefined ? new Error(msg.error) : new FoldwiseError(msg.error, msg.exitCode));
          if (msg.result) {
            results.push(msg.result);
            try {
              done?.(msg.result);
            } catch (e) {
              fail(e);
            }
            return;
          }
          if (msg.batchDone) next(w);
        });
        w.on('error', fail);
        w.on('exit', (code) => {
          if (!ended && code !== 0) fail(new Error(`a worker thread ended with code ${code}`));
        });
        next(w);
      }
    });
  } finally {
    if (onAbort) stop?.removeEventListener('abort', onAbort);
    // a worker blocked in a command: fold ends when its program's supervisor does; do not wait
    // for it longer than a moment, and do not let it hold the process open
    for (const w of workers) w.unref();
    await Promise.race([Promise.all(workers.map((w) => w.terminate())), new Promise((r) => setTimeout(r, 3000).unref())]);
  }
  return results;
}
