/**
 * A worker thread of `tune --jobs`: it sets up the same search as the main thread from the
 * shared table and the options (deterministic, so the plans and candidates are the same), then
 * does the pieces it is sent: an outer fold's index, or -1 for the inner search on all search
 * rows (the recommendation's).
 */
import { parentPort, workerData } from 'node:worker_threads';
import { FoldwiseError } from '../errors.js';
import { loadExternalLearners, type CommandSetup } from '../learners/index.js';
import { tableFromShared, type SharedTable } from '../run/share.js';
import { allSearchWork, outerFoldWork, setupTune, type TuneOptions } from './tune.js';

const { table, options, baseDir, commands } = workerData as { table: SharedTable; options: TuneOptions; baseDir: string; commands?: CommandSetup };
// module: and command: learners are registered per thread; messages wait in the port until the handler is set
await loadExternalLearners((options.learners ?? []).map((s) => s.split(';')[0]), baseDir, commands);
const setup = setupTune(tableFromShared(table), options);

parentPort!.on('message', (piece: number | null) => {
  if (piece === null) {
    parentPort!.close();
    return;
  }
  try {
    parentPort!.postMessage({ result: piece < 0 ? allSearchWork(setup) : outerFoldWork(setup, piece) });
  } catch (e) {
    // a refusal (a FoldwiseError) is this piece's answer: the main thread throws the one a single
    // thread would have met first; anything else is a bug and ends the pool at once
    if (e instanceof FoldwiseError) parentPort!.postMessage({ result: { refused: { message: e.message, exitCode: e.exitCode } } });
    else parentPort!.postMessage({ error: e instanceof Error ? e.message : String(e) });
  }
});
