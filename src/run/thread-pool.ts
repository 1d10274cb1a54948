/**
 * A small pool of worker threads for commands whose work is a list of independent pieces (tune's
 * outer folds): each worker is sent one piece at a time, posts its result, and is sent the next
 * piece. Results come back in the order they finish, with the piece they belong to; the caller
 * puts them in order. The pool ends on every path, as `runPool` does: when a piece fails, when
 * `onResult` throws, when a worker crashes and when `stop` is aborted (SIGINT, SIGTERM), every
 * worker is terminated at once and the pool rejects with the cause.
 *
 * The worker script answers each message (a piece, or null to end) with `{ result }` or
 * `{ error, exitCode? }`.
 */
import { Worker } from 'node:worker_threads';
import { FoldwiseError } from '../errors.js';
import { type StopError, WORKER_LIMITS } from './pool.js';

type Reply<R> = { result?: R; error?: string; exitCode?: number };

export interface ThreadPoolOptions<T, R> {
  /** the worker script */
  readonly url: URL;
  readonly workerData: unknown;
  /** the pieces of work, sent in this order */
  readonly pieces: readonly T[];
  readonly jobs: number;
  /** called on the main thread with each result, the piece it answers and the index of the worker (0-based) that did it */
  readonly onResult: (result: R, piece: T, worker: number) => void;
  readonly stop?: AbortSignal;
  readonly stopError?: StopError;
}

export async function runThreads<T, R>(o: ThreadPoolOptions<T, R>): Promise<void> {
  const queue = [...o.pieces];
  if (queue.length === 0) return;
  const stopError = o.stopError ?? ((reason: unknown) => new FoldwiseError(`stopped (${String(reason)})`, 130));
  const count = Math.max(1, Math.min(o.jobs, queue.length));
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
      if (o.stop?.aborted) return fail(stopError(o.stop.reason));
      onAbort = () => fail(stopError(o.stop!.reason));
      o.stop?.addEventListener('abort', onAbort, { once: true });
      for (let i = 0; i < count; i++) {
        const w = new Worker(o.url, { resourceLimits: WORKER_LIMITS, workerData: o.workerData });
        workers.push(w);
        running++;
        let current: T | undefined;
        const next = (): void => {
          current = queue.shift();
          if (current === undefined) {
            w.postMessage(null);
            if (--running === 0 && !ended) {
              ended = true;
              resolve();
            }
            return;
          }
          w.postMessage(current);
        };
        w.on('message', (msg: Reply<R>) => {
          if (ended) return;
          if (msg.error !== undefined) return fail(msg.exitCode === undefined ? new Error(msg.error) : new FoldwiseError(msg.error, msg.exitCode));
          try {
            o.onResult(msg.result as R, current as T, i);
          } catch (e) {
            return fail(e);
          }
          next();
        });
        w.on('error', fail);
        w.on('exit', (code) => {
          if (!ended && code !== 0) fail(new Error(`a worker thread ended with code ${code}`));
        });
        next();
      }
    });
  } finally {
    if (onAbort) o.stop?.removeEventListener('abort', onAbort);
    // a worker blocked in a command: fold ends when its program's supervisor does; do not wait long
    for (const w of workers) w.unref();
    await Promise.race([Promise.all(workers.map((w) => w.terminate())), new Promise((r) => setTimeout(r, 3000).unref())]);
  }
}
