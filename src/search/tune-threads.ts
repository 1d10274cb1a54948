/**
 * `tune --jobs N`: the nested search on N worker threads. The grain is one outer fold (its whole
 * inner search, the pick, the refit and the baseline) or the recommendation's inner search on
 * all search rows, so the shared work of each split (preprocessing, kNN neighbour lists, forest
 * and boost prefixes, fold-work.ts) stays inside one thread. The recommendation's search, the
 * largest piece, is sent first. Every piece's seeds depend on the piece only, and the main thread
 * assembles the report from the pieces in plan order (finishTune), so the report is the same
 * for every N, byte for byte without timings.
 */
import { performance } from 'node:perf_hooks';
import type { Table } from '../data/types.js';
import { FoldwiseError } from '../errors.js';
import type { CommandSetup } from '../learners/index.js';
import type { TuneReport } from '../model/tune.js';
import type { StopError } from '../run/pool.js';
import { shareTable } from '../run/share.js';
import { runThreads } from '../run/thread-pool.js';
import { type AllWork, finishTune, type OuterWork, setupTune, type TuneOptions } from './tune.js';
import type { TunePredictions } from './tune-predictions.js';

/**
 * The worker script next to this module. Under the test runner this module is TypeScript
 * source; the worker then runs from the built copy in dist/ (npm test builds first).
 */
function workerUrl(): URL {
  const here = new URL('./tune-worker.js', import.meta.url);
  if (import.meta.url.endsWith('.ts')) return new URL(here.href.replace(/\/src\/search\/tune-worker\.js$/, '/dist/src/search/tune-worker.js'));
  return here;
}

interface Refused {
  readonly message: string;
  readonly exitCode: number;
}

export interface TuneThreads {
  /** worker threads (at most one per piece of work) */
  readonly jobs: number;
  /** absolute folder that relative `module:` learner paths are resolved against */
  readonly baseDir?: string;
  /** the programs of `command:` learners, their environment and temporary folder */
  readonly commands?: CommandSetup;
  /** aborted to stop at once: the workers are terminated and the run rejects with stopError */
  readonly stop?: AbortSignal;
  readonly stopError?: StopError;
}

/** The search on worker threads; `workers` counts the threads that did at least one piece. */
export async function tuneOnThreads(table: Table, options: TuneOptions, t: TuneThreads): Promise<{ report: TuneReport; predictions: TunePredictions; workers: number }> {
  const started = performance.now();
  // checks the options and plans here first, so a refused run fails before any thread starts
  const setup = setupTune(table, options, started);
  const folds = setup.outer.plan.folds.length;
  const outerWork = new Array<OuterWork>(folds);
  let all: AllWork | undefined;
  const refused = new Map<number, Refused>();
  const used = new Set<number>();
  await runThreads<number, OuterWork | AllWork | { refused: Refused }>({
    url: workerUrl(),
    workerData: { table: shareTable(table), options, baseDir: t.baseDir ?? '/', commands: t.commands },
    pieces: [-1, ...Array.from({ length: folds }, (_, i) => i)],
    jobs: t.jobs,
    onResult: (r, piece, worker) => {
      used.add(worker);
      if ('refused' in r) refused.set(piece, r.refused);
      else if (piece < 0) all = r as AllWork;
      else outerWork[piece] = r as OuterWork;
    },
    stop: t.stop,
    stopError: t.stopError,
  });
  // the refusal one thread would meet first: outer folds in plan order, then all search rows
  for (const piece of [...Array.from({ length: folds }, (_, i) => i), -1]) {
    const r = refused.get(piece);
    if (r) throw new FoldwiseError(r.message, r.exitCode);
  }
  return { ...finishTune(setup, outerWork, all!), workers: used.size };
}
