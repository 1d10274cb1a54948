/**
 * A worker thread of growth's tasks, as src/run/worker.ts is for eval's: it prepares the same
 * growth run from the shared table and the options (deterministic, so its task list is the
 * same), then runs the batches of task ids it is sent, posting each result as soon as it is done
 * and a `batchDone` after the batch.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { FoldwiseError } from '../errors.js';
import { loadExternalLearners, type CommandSetup } from '../learners/index.js';
import { tableFromShared, type SharedTable } from '../run/share.js';
import { prepareGrowth, runGrowthTasks, type GrowthOptions } from './growth.js';

const { table, options, baseDir, commands } = workerData as { table: SharedTable; options: GrowthOptions; baseDir: string; commands?: CommandSetup };
await loadExternalLearners(options.learners ?? [], baseDir, commands);
const g = prepareGrowth(tableFromShared(table), options);
const byId = new Map(g.tasks.map((t) => [t.id, t]));

parentPort!.on('message', (ids: string[] | null) => {
  if (ids === null) {
    parentPort!.close();
    return;
  }
  try {
    runGrowthTasks(g, ids.map((id) => byId.get(id)!), (result) => parentPort!.postMessage({ result }));
    parentPort!.postMessage({ batchDone: true });
  } catch (e) {
    const exitCode = e instanceof FoldwiseError ? e.exitCode : undefined;
    parentPort!.postMessage({ error: e instanceof Error ? e.message : String(e), ...(exitCode === undefined ? {} : { exitCode }) });
  }
});
