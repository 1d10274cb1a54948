/** `--predictions FILE|-` and `--predictions-keep COL` for eval, merge and tune. */
import { extname } from 'node:path';
import { UsageError } from '../errors.js';
import { writeChunks, writeChunksAtomic, type ChunkSink } from '../report/atomic-stream.js';
import type { ReportFrame, TaskRecord } from '../run/evaluate.js';
import { predictionsCsv } from '../run/predictions-out.js';
import type { Io } from './run.js';

/** Refuses file formats foldwise does not write yet (the name decides the format). */
export function checkPredictionsPath(path: string | undefined): void {
  if (path === undefined) return;
  if (path === '') throw new UsageError('--predictions: give a file name, or - for standard output');
  const ext = extname(path).toLowerCase();
  if (ext === '.parquet' || ext === '.arrow' || ext === '.feather') {
    throw new UsageError(`--predictions ${path}: foldwise writes predictions as CSV only so far; give a name ending in .csv (or -)`);
  }
}

/** Writes the predictions file (atomically), or streams it to standard output for "-". */
export async function writePredictions(io: Io, path: string, frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[]): Promise<void> {
  const chunks = predictionsCsv(frame, records, keep);
  if (path === '-') await writeChunks(io.stdout as ChunkSink, chunks);
  else writeChunksAtomic(path, chunks, '--predictions');
}
