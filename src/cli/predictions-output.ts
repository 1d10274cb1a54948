/** `--predictions FILE|-` and `--predictions-keep COL` for eval, merge and tune. */
import { extname } from 'node:path';
import { UsageError } from '../errors.js';
import { stageChunks, writeChunks, type ChunkSink, type Staged } from '../report/atomic-stream.js';
import type { ReportFrame, TaskRecord } from '../run/evaluate.js';
import { predictionsCsv } from '../run/predictions-out.js';
import type { Io } from './io.js';

/** Refuses file formats foldwise does not write yet (the name decides the format). */
export function checkPredictionsPath(path: string | undefined): void {
  if (path === undefined) return;
  if (path === '') throw new UsageError('--predictions: give a file name, or - for standard output');
  const ext = extname(path).toLowerCase();
  if (ext === '.parquet' || ext === '.arrow' || ext === '.feather') {
    throw new UsageError(`--predictions ${path}: foldwise writes predictions as CSV only so far; give a name ending in .csv (or -)`);
  }
}

/**
 * Writes the predictions file to a temporary file (to rename with the run's other outputs), or
 * streams it to standard output for "-" (nothing left to commit then).
 */
export async function stagePredictions(io: Io, path: string, frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[]): Promise<Staged> {
  const chunks = predictionsCsv(frame, records, keep);
  if (path !== '-') return stageChunks(path, chunks, '--predictions');
  await writeChunks(io.stdout as ChunkSink, chunks);
  return { commit: () => undefined, abort: () => undefined };
}

/** Runs `write` (the reports) between staging the predictions and putting them in place. */
export async function withPredictions(
  io: Io,
  path: string | undefined,
  made: () => { frame: ReportFrame; records: readonly TaskRecord[]; keep: readonly string[] },
  write: () => void,
): Promise<void> {
  if (!path) return write();
  const { frame, records, keep } = made();
  const staged = await stagePredictions(io, path, frame, records, keep);
  try {
    write();
  } catch (e) {
    staged.abort();
    throw e;
  }
  staged.commit();
}
