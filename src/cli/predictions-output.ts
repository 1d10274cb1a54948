/** `--predictions FILE|-` and `--predictions-keep COL` for eval, merge and tune. */
import { UsageError } from '../errors.js';
import { formatOfName } from '../data/load-table.js';
import { arrowChunks, loadColumnarWriters, parquetChunks } from '../io/write-columnar.js';
import { stageChunks, writeChunks, type ChunkSink, type Staged } from '../report/atomic-stream.js';
import type { ReportFrame } from '../run/evaluate.js';
import type { TaskRecord } from '../model/record.js';
import { PREDICTION_BATCH_ROWS, predictionsBatches, predictionsCsv } from '../run/predictions-out.js';
import type { Io } from './io.js';

/** Refuses an empty name (the name decides the format). */
export function checkPredictionsPath(path: string | undefined): void {
  if (path === undefined) return;
  if (path === '') throw new UsageError('--predictions: give a file name, or - for standard output');
}

/** The format the name asks for: Parquet for .parquet/.pq, Arrow IPC for .arrow/.feather/.arrows/.ipc, CSV otherwise. */
export function predictionsFormat(path: string): 'csv' | 'parquet' | 'arrow' {
  const f = path === '-' ? undefined : formatOfName(path);
  return f === 'parquet' || f === 'arrow' ? f : 'csv';
}

/**
 * Writes the predictions file to a temporary file (to rename with the run's other outputs), or
 * streams it to standard output for "-" (nothing left to commit then). CSV goes in chunks of
 * lines, Parquet in row groups and Arrow in record batches of at most `batchRows` rows, each
 * written to the temporary file before the next is built.
 */
export async function stagePredictions(io: Io, path: string, frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[], batchRows = PREDICTION_BATCH_ROWS): Promise<Staged> {
  const format = predictionsFormat(path);
  if (format !== 'csv') {
    await loadColumnarWriters();
    const typed = predictionsBatches(frame, records, keep, batchRows);
    return stageChunks(path, format === 'parquet' ? parquetChunks(typed.batches) : arrowChunks(typed.batches), '--predictions');
  }
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
