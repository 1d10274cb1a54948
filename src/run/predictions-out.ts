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
 * chunks, so writing the file does not hold it in memory; the same records give the same bytes,
 * however the run was made (threads, shards and merge, a resumed journal).
 */
import { closeNames, UsageError } from '../errors.js';
import { csvField, csvRow, numberField } from '../io/csv-text.js';
import type { Table } from '../data/types.js';
import type { OutColumn } from '../io/write-columnar.js';
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

/**
 * The same file as `predictionsCsv` as typed columns, for `--predictions FILE.parquet` and
 * `FILE.arrow`: line, row, repeat, fold and train_rows as int32 (repeat and fold null for the
 * holdout part), role, learner, classes, pick and kept columns as dictionary-coded strings,
 * values and probabilities as doubles (null where a learner gives none).
 */
export function predictionsColumns(frame: ReportFrame, records: readonly TaskRecord[], keep: readonly string[] = []): { columns: OutColumn[]; length: number } {
  const task = frame.data.task;
  const classes = frame.data.classes ?? [];
  const picks = records.some((r) => r.pick !== undefined);
  const done = records.filter((r) => !r.failed);
  let n = 0;
  for (const r of done) {
    if (!r.rows || !r.lines) throw new Error(`task ${r.id} carries no row numbers`);
    n += r.rows.length;
  }
  const line = new Int32Array(n);
  const row = new Int32Array(n);
  const repeat = new Int32Array(n);
  const fold = new Int32Array(n);
  const noFold = new Uint8Array(n);
  const role = new Int32Array(n);
  const learner = new Int32Array(n);
  const train = new Int32Array(n);
  const actualCodes = new Int32Array(task === 'classification' ? n : 0);
  const predictedCodes = new Int32Array(task === 'classification' ? n : 0);
  const actualValues = new Float64Array(task === 'regression' ? n : 0);
  const predictedValues = new Float64Array(task === 'regression' ? n : 0);
  const probs = classes.map(() => new Float64Array(task === 'classification' ? n : 0));
  const pickLevels: string[] = [];
  const pickIndex = new Map<string, number>();
  const pick = new Int32Array(picks ? n : 0);
  const kept = keep.map(() => ({ codes: new Int32Array(n), levels: [] as string[], index: new Map<string, number>() }));
  const codeOf = (levels: string[], index: Map<string, number>, text: string): number => {
    let k = index.get(text);
    if (k === undefined) {
      k = levels.push(text) - 1;
      index.set(text, k);
    }
    return k;
  };
  let at = 0;
  for (const r of done) {
    const rows = r.rows!;
    const lines = r.lines!;
    const c = classes.length;
    const k = keep.length;
    const p = codeOf(pickLevels, pickIndex, r.pick ?? '');
    for (let i = 0; i < rows.length; i++, at++) {
      line[at] = lines[i];
      row[at] = rows[i];
      if (r.foldIndex < 0) noFold[at] = 1;
      else {
        repeat[at] = r.repeat + 1;
        fold[at] = r.fold + 1;
      }
      role[at] = r.foldIndex < 0 ? 1 : 0;
      learner[at] = r.candidateIndex;
      train[at] = r.trainRows;
      if (r.actual.task === 'classification') {
        actualCodes[at] = r.actual.codes[i];
        predictedCodes[at] = (r.predicted as Int32Array)[i];
        for (let j = 0; j < c; j++) probs[j][at] = r.probs ? r.probs[i * c + j] : NaN;
      } else {
        actualValues[at] = r.actual.values[i];
        predictedValues[at] = r.predicted[i];
      }
      if (picks) pick[at] = p;
      for (let j = 0; j < k; j++) kept[j].codes[at] = codeOf(kept[j].levels, kept[j].index, r.keep![i * k + j]);
    }
  }
  const predictedName = fixedColumns(task)[7];
  const columns: OutColumn[] = [
    { kind: 'int', name: 'line', values: line },
    { kind: 'int', name: 'row', values: row },
    { kind: 'int', name: 'repeat', values: repeat, nulls: noFold },
    { kind: 'int', name: 'fold', values: fold, nulls: noFold },
    { kind: 'text', name: 'role', codes: role, levels: ['test', 'holdout'] },
    { kind: 'text', name: 'learner', codes: learner, levels: frame.learners.map((l) => l.spec) },
    task === 'classification' ? { kind: 'text', name: 'actual', codes: actualCodes, levels: classes } : { kind: 'float', name: 'actual', values: actualValues },
    task === 'classification'
      ? { kind: 'text', name: predictedName, codes: predictedCodes, levels: classes }
      : { kind: 'float', name: predictedName, values: predictedValues },
    { kind: 'int', name: 'train_rows', values: train },
    ...(task === 'classification' ? classes.map((cls, j): OutColumn => ({ kind: 'float', name: `${PROB_PREFIX}${cls}`, values: probs[j] })) : []),
    ...(picks ? [{ kind: 'text', name: 'pick', codes: pick, levels: pickLevels } as OutColumn] : []),
    ...keep.map((name, j): OutColumn => ({ kind: 'text', name, codes: kept[j].codes, levels: kept[j].levels })),
  ];
  return { columns, length: n };
}
