/**
 * A worker thread of the pool. It prepares the same run as the main thread from the shared
 * table and the options (deterministic, so its task list is the same), reusing the problem and
 * plan the main thread shared when it sent them (eval; growth's workers build their own), then
 * runs the batches of
 * task ids it is sent, posting each task's result as soon as it is done and a `batchDone` after
 * the batch.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { FoldwiseError } from '../errors.js';
import { loadExternalLearners, type CommandSetup } from '../learners/index.js';
import { prepareRun, type EvaluateOptions } from './prepare.js';
import { tableFromShared, type SharedTable } from './share.js';
import type { SharedRun } from './share-run.js';
import { runTasks, taskList } from './tasks.js';

const { table, options, baseDir, commands, run } = workerData as { table: SharedTable; options: EvaluateOptions; baseDir: string; commands?: CommandSetup; run?: SharedRun };
// module: learners are registered per thread; messages wait in the port until the handler is set
await loadExternalLearners(options.learners ?? [], baseDir, commands);
// the problem and plan come from the main thread in shared memory (share-run.ts), when it sent them
const prepared = prepareRun(tableFromShared(table), options, run);
const byId = new Map(taskList(prepared).map((t) => [t.id, t]));

parentPort!.on('message', (ids: string[] | null) => {
  if (ids === null) {
    parentPort!.close();
    return;
  }
  try {
    runTasks(prepared, ids.map((id) => byId.get(id)!), (result) => parentPort!.postMessage({ result }));
    parentPort!.postMessage({ batchDone: true });
  } catch (e) {
    const exitCode = e instanceof FoldwiseError ? e.exitCode : undefined;
    parentPort!.postMessage({ error: e instanceof Error ? e.message : String(e), ...(exitCode === undefined ? {} : { exitCode }) });
  }
});
