/** `--predictions FILE|-` and `--predictions-keep COL` for eval, merge and tune. */
import { UsageError } from '../errors.js';
import { writeChunks, writeChunksAtomic, type ChunkSink } from '../report/atomic-stream.js';
import type { ReportFrame, TaskRecord } from '../run/evaluate.js';
import { predictionsColumns, predictionsCsv } from '../run/predictions-out.js';
import { formatOfName } from '../data/load-table.js';
import { arrowBytes, parquetBytes } from '../data/write-columnar.js';
import { writeFileAtomic } from '../report/atomic.js';
import type { Io } from './run.js';

/** Refuses file formats foldwise does not write yet (the name decides the format). */
export function checkPredictionsPath(path: string | undefined): void {
  if (path === undefined) return;
  if (path === '') throw new UsageError('--predictions: give a file name, or - for standard output');
}

/** The format the name asks for: Parquet for .parquet/.pq, Arrow IPC for .arrow/.feather/.arrows/.ipc, CSV otherwise. */
export function predictionsFormat(path: string): 'csv' | 'parquet' | 'arrow' {
  const f = path === '-' ? undefined : formatOfName(path);
  return f === 'parquet' || f === 'arrow' ? f : 'csv';
}

/** Writes the predictions file (atomically), or streams it to standard output for "-". */
export async function writePredictions(io: Io, path: string, frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[]): Promise<void> {
  const format = predictionsFormat(path);
  if (format !== 'csv') {
    // typed files are written whole (not streamed), atomically like the reports
    const { columns, length } = predictionsColumns(frame, records, keep);
    writeFileAtomic(path, format === 'parquet' ? parquetBytes(columns, length) : arrowBytes(columns, length), '--predictions');
    return;
  }
  const chunks = predictionsCsv(frame, records, keep);
  if (path === '-') await writeChunks(io.stdout as ChunkSink, chunks);
  else writeChunksAtomic(path, chunks, '--predictions');
}
