/**
 * `--predictions FILE`: every out-of-fold prediction of a run as CSV (RFC 4180), one line per
 * (test row, repeat, learner), in the run's task order (fold by fold, learners in order within
 * a fold, test rows ascending). Columns:
 *
 *   line, row          the row's 1-based line in the input file and its 0-based data row
 *   repeat, fold       the fold, both counted from 1 as in r1.f3 (empty for the holdout part)
 *   role               test (a fold's test rows) or holdout (the --final holdout part)
 *   learner            the learner spec as the report names it
 *   actual             the target (class name or value)
 *   predicted_class    the predicted class (classification), or
 *   predicted_value    the predicted value (regression)
 *   train_rows         the number of rows the model was fitted on
 *   prob:CLASS ...     classification: one probability column per class in the report's class
 *                      order, empty where the learner gives no probabilities
 *   pick               tune only: the candidate the outer fold picked
 *   then each --predictions-keep column under its own name.
 *
 * Numbers are the shortest text that reads back as the same double. The lines are produced in
 * chunks (CSV) or typed batches of at most PREDICTION_BATCH_ROWS lines (Parquet, Arrow), so
 * writing the file does not hold it in memory; the same records give the same bytes, however the
 * run was made (threads, shards and merge, a resumed journal).
 */
import { closeNames, UsageError } from '../errors.js';
import { csvField, csvRow, numberField } from '../io/csv-text.js';
import type { Table } from '../data/types.js';
import type { ColumnBatch, OutColumn } from '../io/write-columnar.js';
import type { ReportFrame, TaskRecord } from './evaluate.js';

/** The fixed columns, in order, before the probability and kept columns. */
export function fixedColumns(task: 'classification' | 'regression'): string[] {
  return ['line', 'row', 'repeat', 'fold', 'role', 'learner', 'actual', task === 'classification' ? 'predicted_class' : 'predicted_value', 'train_rows'];
}

/** Probability columns are named "prob:" and the class name. */
export const PROB_PREFIX = 'prob:';

/** Checks --predictions-keep names against the table and the file's own columns. */
export function checkKeep(table: Table, keep: readonly string[], task: 'classification' | 'regression', classes: readonly string[] = []): void {
  const taken = new Set([...fixedColumns(task), 'pick', ...classes.map((c) => `${PROB_PREFIX}${c}`)]);
  const seen = new Set<string>();
  for (const name of keep) {
    if (!table.byName.has(name)) {
      const hint = closeNames(name, table.columns.map((c) => c.name));
      throw new UsageError(`--predictions-keep ${JSON.stringify(name)}: no such column in ${table.source}${hint ? `; ${hint}` : ''}`);
    }
    if (taken.has(name)) throw new UsageError(`--predictions-keep ${JSON.stringify(name)}: the predictions file has a column of that name already; keep another column`);
    if (seen.has(name)) throw new UsageError(`--predictions-keep ${JSON.stringify(name)}: given twice`);
    seen.add(name);
  }
}

const isoDay = (days: number): string => {
  const d = new Date(days * 86_400_000);
  const text = d.toISOString();
  return text.endsWith('T00:00:00.000Z') ? text.slice(0, 10) : text.replace('.000Z', 'Z');
};

/** The kept columns' text for the table rows `rows`, row by row: a category's level, a number, a date as ISO text, missing as empty. */
export function keptText(table: Table, keep: readonly string[], rows: ArrayLike<number>): string[] {
  const cols = keep.map((k) => table.byName.get(k)!);
  const out: string[] = new Array(rows.length * cols.length);
  let at = 0;
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    for (const c of cols) {
      if (c.kind === 'categorical') out[at++] = c.codes[r] < 0 ? '' : c.levels[c.codes[r]];
      else {
        const v = c.values[r];
        out[at++] = Number.isNaN(v) ? '' : c.dates ? isoDay(v) : String(v);
      }
    }
  }
  return out;
}

/** The predictions file's text in chunks of about `chunkRows` lines. */
export function* predictionsCsv(frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[] = [], chunkRows = 8192): Generator<string> {
  const task = frame.data.task;
  const classes = frame.data.classes ?? [];
  const picks = records.some((r) => r.pick !== undefined);
  yield csvRow([...fixedColumns(task), ...(task === 'classification' ? classes.map((c) => `${PROB_PREFIX}${c}`) : []), ...(picks ? ['pick'] : []), ...keep]);
  const classFields = classes.map(csvField);
  const empties = ','.repeat(classes.length);
  for (const r of records) {
    if (r.failed) continue;
    const rows = r.rows;
    const lines = r.lines;
    if (!rows || !lines) throw new Error(`task ${r.id} carries no row numbers`);
    const learner = csvField(frame.learners[r.candidateIndex].spec);
    const place = r.foldIndex < 0 ? ',,holdout' : `${r.repeat + 1},${r.fold + 1},test`;
    const trainRows = String(r.trainRows);
    const pick = csvField(r.pick ?? '');
    const k = keep.length;
    let chunk: string[] = [];
    for (let i = 0; i < rows.length; i++) {
      let line = `${lines[i]},${rows[i]},${place},${learner},`;
      if (r.actual.task === 'classification') {
        line += `${classFields[r.actual.codes[i]]},${classFields[(r.predicted as Int32Array)[i]]},${trainRows}`;
        if (classes.length) {
          if (r.probs) {
            const c = classes.length;
            for (let j = 0; j < c; j++) line += `,${String(r.probs[i * c + j])}`;
          } else line += empties;
        }
      } else {
        line += `${numberField(r.actual.values[i])},${numberField(r.predicted[i])},${trainRows}`;
      }
      if (picks) line += `,${pick}`;
      for (let j = 0; j < k; j++) line += `,${csvField(r.keep![i * k + j])}`;
      chunk.push(line);
      if (chunk.length >= chunkRows) {
        yield `${chunk.join('\n')}\n`;
        chunk = [];
      }
    }
    if (chunk.length) yield `${chunk.join('\n')}\n`;
  }
}

/** Rows a batch (a Parquet row group, an Arrow record batch) of a typed predictions file holds at most. */
export const PREDICTION_BATCH_ROWS = 65_536;

/** A typed predictions file: its number of lines and its batches in order. */
export interface TypedPredictions {
  readonly length: number;
  readonly batches: Iterable<ColumnBatch>;
}

/**
 * The same file as `predictionsCsv` as typed columns, for `--predictions FILE.parquet` and
 * `FILE.arrow`: line, row, repeat, fold and train_rows as int32 (repeat and fold null for the
 * holdout part), role, learner, classes, pick and kept columns as dictionary-coded strings,
 * values and probabilities as doubles (null where a learner gives none), in batches of at most
 * `batchRows` rows (across tasks: the batches depend on the lines only). A first pass over the
 * records finds the pick and kept columns' levels (in order of first appearance, so every batch
 * shares them); then each batch is built when it is asked for, so only one batch of the file is
 * held at a time.
 */
export function predictionsBatches(frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[] = [], batchRows = PREDICTION_BATCH_ROWS): TypedPredictions {
  if (!(batchRows >= 1)) throw new Error(`predictionsBatches: batchRows ${batchRows}`);
  const task = frame.data.task;
  const classes = frame.data.classes ?? [];
  const c = classes.length;
  const k = keep.length;
  const picks = records.some((r) => r.pick !== undefined);
  const done = records.filter((r) => !r.failed);
  const pickLevels: string[] = [];
  const pickIndex = new Map<string, number>();
  const kept = keep.map(() => ({ levels: [] as string[], index: new Map<string, number>() }));
  const codeOf = (levels: string[], index: Map<string, number>, text: string): number => {
    let code = index.get(text);
    if (code === undefined) {
      code = levels.push(text) - 1;
      index.set(text, code);
    }
    return code;
  };
  let n = 0;
  for (const r of done) {
    if (!r.rows || !r.lines) throw new Error(`task ${r.id} carries no row numbers`);
    n += r.rows.length;
    codeOf(pickLevels, pickIndex, r.pick ?? '');
    for (let i = 0; i < r.rows.length; i++) for (let j = 0; j < k; j++) codeOf(kept[j].levels, kept[j].index, r.keep![i * k + j]);
  }
  const predictedName = fixedColumns(task)[7];
  const learnerLevels = frame.learners.map((l) => l.spec);
  const roleLevels = ['test', 'holdout'];

  function* batches(): Generator<ColumnBatch> {
    const arrays = (size: number) => ({
      size,
      line: new Int32Array(size),
      row: new Int32Array(size),
      repeat: new Int32Array(size),
      fold: new Int32Array(size),
      noFold: new Uint8Array(size),
      role: new Int32Array(size),
      learner: new Int32Array(size),
      train: new Int32Array(size),
      actualCodes: new Int32Array(task === 'classification' ? size : 0),
      predictedCodes: new Int32Array(task === 'classification' ? size : 0),
      actualValues: new Float64Array(task === 'regression' ? size : 0),
      predictedValues: new Float64Array(task === 'regression' ? size : 0),
      probs: classes.map(() => new Float64Array(task === 'classification' ? size : 0)),
      pick: new Int32Array(picks ? size : 0),
      kept: keep.map(() => new Int32Array(size)),
    });
    const batch = (b: ReturnType<typeof arrays>): ColumnBatch => ({
      length: b.size,
      columns: [
        { kind: 'int', name: 'line', values: b.line },
        { kind: 'int', name: 'row', values: b.row },
        { kind: 'int', name: 'repeat', values: b.repeat, nulls: b.noFold },
        { kind: 'int', name: 'fold', values: b.fold, nulls: b.noFold },
        { kind: 'text', name: 'role', codes: b.role, levels: roleLevels },
        { kind: 'text', name: 'learner', codes: b.learner, levels: learnerLevels },
        task === 'classification' ? { kind: 'text', name: 'actual', codes: b.actualCodes, levels: classes } : { kind: 'float', name: 'actual', values: b.actualValues },
        task === 'classification'
          ? { kind: 'text', name: predictedName, codes: b.predictedCodes, levels: classes }
          : { kind: 'float', name: predictedName, values: b.predictedValues },
        { kind: 'int', name: 'train_rows', values: b.train },
        ...(task === 'classification' ? classes.map((cls, j): OutColumn => ({ kind: 'float', name: `${PROB_PREFIX}${cls}`, values: b.probs[j] })) : []),
        ...(picks ? [{ kind: 'text', name: 'pick', codes: b.pick, levels: pickLevels } as OutColumn] : []),
        ...keep.map((name, j): OutColumn => ({ kind: 'text', name, codes: b.kept[j], levels: kept[j].levels })),
      ],
    });
    if (n === 0) {
      yield batch(arrays(0));
      return;
    }
    let left = n;
    let b = arrays(Math.min(batchRows, left));
    let at = 0;
    for (const r of done) {
      const rows = r.rows!;
      const lines = r.lines!;
      const p = pickIndex.get(r.pick ?? '')!;
      for (let i = 0; i < rows.length; i++) {
        b.line[at] = lines[i];
        b.row[at] = rows[i];
        if (r.foldIndex < 0) b.noFold[at] = 1;
        else {
          b.repeat[at] = r.repeat + 1;
          b.fold[at] = r.fold + 1;
        }
        b.role[at] = r.foldIndex < 0 ? 1 : 0;
        b.learner[at] = r.candidateIndex;
        b.train[at] = r.trainRows;
        if (r.actual.task === 'classification') {
          b.actualCodes[at] = r.actual.codes[i];
          b.predictedCodes[at] = (r.predicted as Int32Array)[i];
          for (let j = 0; j < c; j++) b.probs[j][at] = r.probs ? r.probs[i * c + j] : NaN;
        } else {
          b.actualValues[at] = r.actual.values[i];
          b.predictedValues[at] = r.predicted[i];
        }
        if (picks) b.pick[at] = p;
        for (let j = 0; j < k; j++) b.kept[j][at] = kept[j].index.get(r.keep![i * k + j])!;
        if (++at === b.size) {
          yield batch(b);
          left -= b.size;
          if (left === 0) return;
          b = arrays(Math.min(batchRows, left));
          at = 0;
        }
      }
    }
  }
  return { length: n, batches: { [Symbol.iterator]: batches } };
}
