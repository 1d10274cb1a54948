/**
 * Runs tasks on a pool of worker threads. Tasks are sent in batches of one split each (so a
 * split's preprocessing is fitted once per batch), to whichever worker is free next. The results
 * are the same whatever the number of workers: every task carries its own seed.
 */
import { Worker } from 'node:worker_threads';
import type { Table } from '../data/types.js';
import { FoldwiseError } from '../errors.js';
import type { CommandSetup } from '../learners/index.js';
import type { EvaluateOptions } from './prepare.js';
import { shareTable } from './share.js';
import type { TaskResult, TaskSpec } from './tasks.js';

/**
 * The worker script next to this module. Under the test runner this module is TypeScript
 * source; the worker then runs from the built copy in dist/ (npm test builds first).
 */
function workerUrl(): URL {
  const here = new URL('./worker.js', import.meta.url);
  if (import.meta.url.endsWith('.ts')) {
    return new URL(here.href.replace(/\/src\/run\/worker\.js$/, '/dist/src/run/worker.js'));
  }
  return here;
}

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


export async function runPool(
  table: Table,
  options: EvaluateOptions,
  tasks: readonly TaskSpec[],
  jobs: number,
  done?: (r: TaskResult) => void,
  stopRequested?: () => boolean,
  baseDir = '/',
  commands?: CommandSetup,
): Promise<TaskResult[]> {
  const queue = batches(tasks);
  const results: TaskResult[] = [];
  if (queue.length === 0) return results;
  const shared = shareTable(table);
  const count = Math.max(1, Math.min(jobs, queue.length));
  const workers: Worker[] = [];
  try {
    await new Promise<void>((resolve, reject) => {
      let running = 0;
      let failed = false;
      const next = (w: Worker): void => {
        const batch = stopRequested?.() ? undefined : queue.shift();
        if (!batch) {
          w.postMessage(null);
          if (--running === 0) resolve();
          return;
        }
        w.postMessage(batch);
      };
      for (let i = 0; i < count; i++) {
        const w = new Worker(workerUrl(), { workerData: { table: shared, options, baseDir, commands } });
        workers.push(w);
        running++;
        w.on('message', (msg: { results?: TaskResult[]; error?: string; exitCode?: number }) => {
          if (failed) return;
          if (msg.error !== undefined) {
            failed = true;
            reject(msg.exitCode === undefined ? new Error(msg.error) : new FoldwiseError(msg.error, msg.exitCode));
            return;
          }
          for (const r of msg.results!) {
            results.push(r);
            done?.(r);
          }
          next(w);
        });
        w.on('error', (e) => {
          failed = true;
          reject(e);
        });
        next(w);
      }
    });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return results;
}
