/**
 * `--predictions FILE.parquet|FILE.arrow` written as they come (issue 15): the typed file is
 * made of batches of a bounded number of rows (Parquet row groups, Arrow record batches), each
 * written out before the next is built, so the writer holds one batch and memory does not grow
 * with the file. Checked on invented records (a packhouse grading crates A, B, C; a regression
 * of crate weights) with a small batch size, so that one file holds many batches:
 * - the batches hold at most the batch size and all lines in order;
 * - the writers yield each batch's bytes before asking for the next batch;
 * - the files read back with the format's own libraries (apache-arrow's tableFromIPC, hyparquet)
 *   hold the same schema and values as the whole-file writer's, doubles bit for bit;
 * - foldwise's loader and `foldwise score` read them as the CSV file of the same records.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Dictionary, tableFromIPC } from 'apache-arrow';
import { parquetMetadata, parquetReadObjects } from 'hyparquet';
import { stagePredictions } from '../../src/cli/predictions-output.js';
import type { Io } from '../../src/cli/io.js';
import { loadTable } from '../../src/data/load-table.js';
import { arrowBytes, arrowChunks, parquetBytes, parquetChunks, type ColumnBatch, loadColumnarWriters } from '../../src/io/write-columnar.js';
import type { Report } from '../../src/model/report.js';
import { createRng } from '../../src/rng.js';
import type { ReportFrame, TaskRecord } from '../../src/run/evaluate.js';
import { predictionsBatches } from '../../src/run/predictions-out.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';

// the Parquet and Arrow writers load on demand (src/io/write-columnar.ts)
beforeAll(loadColumnarWriters);

const tmp = tempFolder();
const BATCH = 7;
const KEEP = ['plot'];
// exact doubles that a writer rounding through text or float32 would change
const EDGES = [0.1 + 0.2, 1 / 3, Math.PI * 1e10, 5e-324, 1.7976931348623157e308, -2.5e-8];

/**
 * Invented records: 45 rows in 3 folds x 2 repeats and a holdout part of 9 rows, two learners
 * (the first gives no probabilities), and one failed task, which has no lines.
 */
function made(task: 'classification' | 'regression'): { frame: ReportFrame; records: TaskRecord[]; lines: number } {
  const rng = createRng(task === 'classification' ? 11 : 12);
  const classes = ['A', 'B', 'C'];
  const learners = [{ name: 'baseline', spec: 'baseline', params: {} }, { name: 'knn', spec: 'knn', params: {} }];
  const frame = { data: { task, ...(task === 'classification' ? { classes } : {}) }, learners } as unknown as ReportFrame;
  const records: TaskRecord[] = [];
  let edge = 0;
  const add = (repeat: number, fold: number, foldIndex: number, rows: number[], trainRows: number): void => {
    for (let l = 0; l < learners.length; l++) {
      const n = rows.length;
      const base = {
        id: foldIndex < 0 ? `final.${l}` : `r${repeat + 1}.f${fold + 1}.${l}`,
        candidateIndex: l,
        foldIndex,
        repeat: foldIndex < 0 ? -1 : repeat,
        fold: foldIndex < 0 ? -1 : fold,
        trainRows,
        fitMs: 0,
        predictMs: 0,
        rows: Int32Array.from(rows),
        lines: Int32Array.from(rows, (r) => r + 2),
        keep: rows.map((r) => `plot-${r % 5}`),
        ...(task === 'regression' ? { pick: `knn:k=${3 + 2 * (fold % 2)}` } : {}),
      };
      if (task === 'classification') {
        const actual = Int32Array.from(rows, () => rng.int(3));
        const probs = new Float64Array(n * 3);
        const predicted = new Int32Array(n);
        for (let i = 0; i < n; i++) {
          const w = [rng.next() + 0.01, rng.next() + 0.01, rng.next() + 0.01];
          const s = w[0] + w[1] + w[2];
          for (let j = 0; j < 3; j++) probs[i * 3 + j] = w[j] / s;
          predicted[i] = l === 0 ? 0 : w.indexOf(Math.max(...w));
        }
        records.push({ ...base, actual: { task, codes: actual, classes }, predicted, ...(l === 1 ? { probs } : {}) });
      } else {
        const actual = Float64Array.from(rows, () => 40 + 20 * rng.next());
        const predicted = Float64Array.from(rows, () => (edge < EDGES.length && rng.next() < 0.2 ? EDGES[edge++] : 40 + 20 * rng.next()));
        records.push({ ...base, actual: { task, values: actual }, predicted });
      }
    }
  };
  const all = Array.from({ length: 45 }, (_, i) => i);
  for (let repeat = 0; repeat < 2; repeat++) {
    for (let fold = 0; fold < 3; fold++) {
      const test = all.filter((r) => (r + repeat) % 3 === fold);
      add(repeat, fold, repeat * 3 + fold, test, 45 - test.length);
    }
  }
  add(0, 0, -1, Array.from({ length: 9 }, (_, i) => 45 + i), 45);
  records.push({ ...records[0], id: 'r1.f1.failed', failed: 'invented failure', predicted: new Int32Array(0) });
  if (task === 'regression') expect(edge).toBe(EDGES.length);
  return { frame, records, lines: 2 * 45 * 2 + 2 * 9 };
}

/** Wraps batches to record, at each batch asked for, how many chunks the writer had yielded by then. */
function watched(batches: Iterable<ColumnBatch>, yielded: () => number): { batches: Iterable<ColumnBatch>; chunksAtPull: number[] } {
  const chunksAtPull: number[] = [];
  return {
    chunksAtPull,
    batches: {
      *[Symbol.iterator]() {
        for (const b of batches) {
          chunksAtPull.push(yielded());
          yield b;
        }
      },
    },
  };
}

const concat = (chunks: Iterable<Uint8Array>): Uint8Array => Buffer.concat([...chunks]);

describe('typed predictions in batches', () => {
  it.each(['classification', 'regression'] as const)('hold at most the batch size each, and every line in order across tasks (%s)', (task) => {
    const { frame, records, lines } = made(task);
    const typed = predictionsBatches(frame, records, KEEP, BATCH);
    const batches = [...typed.batches];
    expect(typed.length).toBe(lines);
    expect(batches.length).toBe(Math.ceil(lines / BATCH));
    for (const b of batches.slice(0, -1)) expect(b.length).toBe(BATCH);
    expect(batches.at(-1)!.length).toBe(lines - BATCH * (batches.length - 1));
    const line = batches.flatMap((b) => Array.from((b.columns[0] as { values: Int32Array }).values));
    const expected = records.filter((r) => !r.failed).flatMap((r) => Array.from(r.lines!));
    expect(line.length).toBe(lines);
    expect(line).toEqual(expected);
  });

  it.each(['parquet', 'arrow'] as const)('are written out one at a time: the %s writer yields a batch\'s bytes before it asks for the next batch', (format) => {
    const { frame, records, lines } = made('classification');
    const typed = predictionsBatches(frame, records, KEEP, BATCH);
    let chunks = 0;
    const w = watched(typed.batches, () => chunks);
    const out: Uint8Array[] = [];
    for (const c of format === 'parquet' ? parquetChunks(w.batches) : arrowChunks(w.batches)) {
      chunks++;
      out.push(c);
    }
    expect(w.chunksAtPull.length).toBe(Math.ceil(lines / BATCH));
    // batch i + 1 is built only after bytes of batch i went out: the writer holds one batch
    for (let i = 1; i < w.chunksAtPull.length; i++) expect(w.chunksAtPull[i]).toBeGreaterThan(w.chunksAtPull[i - 1]);
    expect(chunks).toBeGreaterThan(w.chunksAtPull.at(-1)!);
    const rows = format === 'parquet' ? Number(parquetMetadata(concat(out)).num_rows) : tableFromIPC(concat(out)).numRows;
    expect(rows).toBe(lines);
  });
});

describe('streamed typed predictions read back with the format\'s own library', () => {
  it.each(['classification', 'regression'] as const)('Arrow (%s): the whole-file writer\'s schema and values, one record batch per batch, doubles exact', (task) => {
    const { frame, records, lines } = made(task);
    const typed = predictionsBatches(frame, records, KEEP, BATCH);
    const streamed = tableFromIPC(concat(arrowChunks(typed.batches)));
    const [whole] = [...predictionsBatches(frame, records, KEEP, Infinity).batches];
    expect(whole.length).toBe(lines);
    const reference = tableFromIPC(arrowBytes(whole.columns, whole.length));
    expect(streamed.batches.length).toBe(Math.ceil(lines / BATCH));
    expect(streamed.numRows).toBe(lines);
    const shape = (t: typeof streamed): string[] => t.schema.fields.map((f) => `${f.name} ${String(f.type)} ${f.nullable}`);
    expect(shape(streamed)).toEqual(shape(reference));
    // dictionary ids fixed by column order (the library's own ids count up through the process)
    const ids = streamed.schema.fields.filter((f) => f.type instanceof Dictionary).map((f) => (f.type as Dictionary).id);
    expect(ids).toEqual(task === 'classification' ? [0, 1, 2, 3, 4] : [0, 1, 2, 3]);
    for (const f of reference.schema.fields) {
      const a = streamed.getChild(f.name)!.toArray();
      const b = reference.getChild(f.name)!.toArray();
      expect(a.length).toBe(lines);
      for (let i = 0; i < lines; i++) expect(Object.is(a[i], b[i]), `${f.name} line ${i}`).toBe(true);
    }
    if (task === 'regression') {
      const predicted = Array.from(streamed.getChild('predicted_value')!.toArray() as Float64Array);
      for (const x of EDGES) expect(predicted).toContain(x);
      const source = records.filter((r) => !r.failed).flatMap((r) => Array.from(r.predicted));
      expect(predicted).toEqual(source);
    } else {
      const knnProbs = Float64Array.from(records.filter((r) => !r.failed && r.probs).flatMap((r) => Array.from(r.probs!).filter((_, i) => i % 3 === 1)));
      const col = streamed.getChild('prob:B')!;
      const got = Float64Array.from({ length: lines }, (_, i) => col.get(i) as number).filter((_, i) => streamed.getChild('learner')!.get(i) === 'knn');
      expect(got.length).toBe(knnProbs.length);
      expect(got).toEqual(knnProbs);
    }
  });

  it.each(['classification', 'regression'] as const)('Parquet (%s): one row group per batch with the whole-file writer\'s values; one batch gives its very bytes', async (task) => {
    const { frame, records, lines } = made(task);
    const typed = predictionsBatches(frame, records, KEEP, BATCH);
    const streamed = concat(parquetChunks(typed.batches));
    const [whole] = [...predictionsBatches(frame, records, KEEP, Infinity).batches];
    const reference = parquetBytes(whole.columns, whole.length);
    expect(Buffer.from(concat(parquetChunks([whole]))).equals(Buffer.from(reference))).toBe(true);
    const meta = parquetMetadata(streamed);
    expect(meta.row_groups.length).toBe(Math.ceil(lines / BATCH));
    expect(meta.schema).toEqual(parquetMetadata(reference).schema);
    const a = await parquetReadObjects({ file: new Uint8Array(streamed).buffer });
    const b = await parquetReadObjects({ file: new Uint8Array(reference).buffer });
    expect(a.length).toBe(lines);
    expect(a).toEqual(b);
    if (task === 'regression') {
      const predicted = a.map((o) => o.predicted_value as number);
      for (const x of EDGES) expect(predicted).toContain(x);
      expect(predicted).toEqual(records.filter((r) => !r.failed).flatMap((r) => Array.from(r.predicted)));
    }
  });

  it('an empty file (every task failed) still has its columns', async () => {
    const { frame, records } = made('classification');
    const failed = records.map((r) => ({ ...r, failed: 'invented failure' }));
    const typed = predictionsBatches(frame, failed, KEEP, BATCH);
    const arrow = tableFromIPC(concat(arrowChunks(typed.batches)));
    expect(arrow.numRows).toBe(0);
    expect(arrow.schema.fields.map((f) => f.name)).toContain('prob:C');
    const parquet = parquetMetadata(concat(parquetChunks(typed.batches)));
    expect(Number(parquet.num_rows)).toBe(0);
    expect(parquet.schema.map((s) => s.name)).toContain('prob:C');
  });
});

describe('streamed typed predictions through foldwise', () => {
  const io = {} as Io;
  async function staged(task: 'classification' | 'regression', ext: string): Promise<string> {
    const { frame, records } = made(task);
    const file = join(tmp.dir, `${task}.${ext}`);
    const s = await stagePredictions(io, file, frame, records, KEEP, BATCH);
    s.commit();
    return file;
  }

  it.each(['classification', 'regression'] as const)('the loader reads the Parquet and Arrow files (many batches) as the CSV file of the same records (%s)', async (task) => {
    const csv = await loadTable({ path: await staged(task, 'csv') });
    for (const ext of ['parquet', 'arrow']) {
      const typed = await loadTable({ path: await staged(task, ext) });
      expect(typed.rows).toBe(csv.rows);
      expect(typed.columns.map((c) => c.name)).toEqual(csv.columns.map((c) => c.name));
      for (const c of csv.columns) {
        const t = typed.byName.get(c.name)!;
        const text = (col: typeof c, i: number): string => (col.kind === 'categorical' ? (col.codes[i] < 0 ? '' : col.levels[col.codes[i]]) : Number.isNaN(col.values[i]) ? '' : String(col.values[i]));
        for (let i = 0; i < csv.rows; i++) expect(text(t, i), `${ext} ${c.name} line ${i}`).toBe(text(c, i));
      }
    }
  });

  it.each(['classification', 'regression'] as const)('score gives the same report from the Parquet, Arrow and CSV files (%s)', async (task) => {
    const reports: Report[] = [];
    const warnings: string[] = [];
    for (const ext of ['csv', 'parquet', 'arrow']) {
      const s = await cli(['score', await staged(task, ext), '--json', '-']);
      expect(s.stderr.split('\n').filter((l) => l && !l.startsWith('foldwise: warning: '))).toEqual([]);
      expect(s.code).toBe(0);
      reports.push(JSON.parse(s.stdout) as Report);
      warnings.push(s.stderr);
    }
    expect(new Set(warnings).size).toBe(1);
    const [csv, ...typed] = reports;
    expect(csv.learners.length).toBe(2);
    expect(csv.learners[1].folds.length).toBe(6);
    for (const r of typed) {
      expect(r.learners).toEqual(csv.learners);
      expect(r.comparisons).toEqual(csv.comparisons);
    }
  });
});
