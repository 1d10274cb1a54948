/**
 * `split`: the parts of a resampling plan as CSV files with the rows' original text, and a
 * row-to-fold assignment table. Files are named by role:
 * - holdout plans: train.csv, validation.csv, holdout.csv;
 * - k-fold and leave-one-out: the test part of each fold, fold-01.csv; with several repeats
 *   every repeat is named the same way, r1-fold-01.csv, r2-fold-01.csv; the training part of a fold is every other fold of its repeat;
 * - random splits (resplit) and forward plans (training parts are not complements): split-01-train.csv
 *   and split-01-test.csv.
 * The assignment CSV has one line per (row, fold) membership: row (1-based data row), line
 * (line in the file), repeat, fold (1-based), role (train, test or holdout).
 */
import { defineProblem, type ProblemOptions } from '../data/problem.js';
import { csvLine, eachRecord } from '../data/records.js';
import type { Table } from '../data/types.js';
import { csvRow } from '../io/csv-text.js';
import type { DataFormat } from '../data/load-table.js';
import { arrowBytes, outColumn, parquetBytes } from '../io/write-columnar.js';
import { UsageError } from '../errors.js';
import { memberships } from '../plans/assign.js';
import { formatPlan, parsePlan } from '../plans/index.js';
import { checkSeed } from './evaluate.js';
import { planFor } from '../plans/plan-for.js';

export interface SplitOptions extends ProblemOptions {
  readonly plan: string;
  readonly stratify?: boolean;
  readonly seed: number;
  readonly delimiter: string;
  /** write part files */
  readonly parts: boolean;
  /** the part files' format (default csv); parquet and arrow are written from the typed columns */
  readonly format?: DataFormat;
}

export interface SplitResult {
  readonly planText: string;
  /** file name -> CSV text or Parquet/Arrow bytes, in a fixed order */
  readonly files: ReadonlyMap<string, string | Uint8Array>;
  /** the assignment table as CSV text */
  readonly assignment: string;
}

const pad = (n: number): string => String(n).padStart(2, '0');

/** Every name `splitTable` can give a part file, in any of its formats (the naming rules above). */
const PART_NAME = /^(?:train|validation|holdout|(?:r[0-9]+-)?fold-[0-9]+|split-[0-9]+-(?:train|test))\.(?:csv|parquet|arrow)$/;

/**
 * The names in `existing` (a folder's entries) that look like part files of some split but are
 * not among `written`: the leftovers of an earlier split into the same folder (another plan,
 * more folds, another format), sorted.
 */
export function leftoverParts(existing: readonly string[], written: Iterable<string>): string[] {
  const ours = new Set(written);
  return existing.filter((n) => PART_NAME.test(n) && !ours.has(n)).sort();
}

/**
 * Computes the part files and assignment of a plan over `table`. A CSV part holds the rows'
 * original text when `text` (the CSV's) is given, else the typed columns written as CSV (a
 * Parquet or Arrow input); a Parquet or Arrow part holds the typed columns.
 */
export function splitTable(table: Table, text: string | undefined, options: SplitOptions): SplitResult {
  const format = options.format ?? 'csv';
  const ext = format === 'csv' ? '.csv' : format === 'parquet' ? '.parquet' : '.arrow';
  const seed = checkSeed(options.seed);
  const problem = defineProblem(table, options);
  const spec = parsePlan(options.plan);
  const { plan } = planFor(problem, spec, options.stratify, seed);
  if (options.parts && spec.kind === 'loo') throw new UsageError('--out with --plan loo would write one file per row; use --assign for leave-one-out');

  // which part files each used row goes to
  const partsOf = new Map<number, string[]>(); // table row -> file names
  const order: string[] = [];
  const add = (name: string, usedRows: Int32Array): void => {
    const file = name.replace(/\.csv$/, ext);
    if (!order.includes(file)) order.push(file);
    for (const i of usedRows) {
      const r = problem.rows[i];
      const list = partsOf.get(r);
      if (list) list.push(file);
      else partsOf.set(r, [file]);
    }
  };
  const repeated = plan.folds.some((f) => f.repeat > 0);
  for (const f of plan.folds) {
    const prefix = repeated ? `r${f.repeat + 1}-` : '';
    if (spec.kind === 'holdout') {
      add('train.csv', f.train);
      add('validation.csv', f.test);
    } else if (spec.kind === 'kfold' || spec.kind === 'loo') {
      add(`${prefix}fold-${pad(f.fold + 1)}.csv`, f.test);
    } else {
      add(`split-${pad(f.fold + 1)}-train.csv`, f.train);
      add(`split-${pad(f.fold + 1)}-test.csv`, f.test);
    }
  }
  if (plan.holdout) add('holdout.csv', plan.holdout);

  const chunks = new Map<string, string[]>(order.map((f) => [f, []]));
  if (options.parts && (format !== 'csv' || text === undefined)) {
    const rowsOf = new Map<string, number[]>(order.map((f) => [f, []]));
    for (let r = 0; r < table.rows; r++) for (const file of partsOf.get(r) ?? []) rowsOf.get(file)!.push(r);
    const files = new Map<string, string | Uint8Array>();
    for (const f of order) {
      const rows = Int32Array.from(rowsOf.get(f)!);
      const columns = table.columns.map((c) => outColumn(c, rows));
      files.set(f, format === 'parquet' ? parquetBytes(columns, rows.length) : format === 'arrow' ? arrowBytes(columns, rows.length) : typedCsv(table, rows));
    }
    return { planText: formatPlan(spec), files, assignment: assignmentCsv(table, problem.rows, plan) };
  }
  if (options.parts && text !== undefined) {
    eachRecord(text, options.delimiter, (fields, row) => {
      const line = csvLine(fields, options.delimiter);
      if (row < 0) for (const c of chunks.values()) c.push(line);
      else for (const file of partsOf.get(row) ?? []) chunks.get(file)!.push(line);
    });
  }
  const files = new Map(options.parts ? order.map((f) => [f, chunks.get(f)!.join('')] as const) : []);
  return { planText: formatPlan(spec), files, assignment: assignmentCsv(table, problem.rows, plan) };
}

function assignmentCsv(table: Table, used: Int32Array, plan: Parameters<typeof memberships>[0]): string {
  const lines = ['row,line,repeat,fold,role'];
  for (const m of memberships(plan)) {
    const r = used[m.row];
    lines.push(`${r + 1},${table.lines[r]},${m.repeat + 1},${m.fold + 1},${m.role}`);
  }
  return `${lines.join('\n')}\n`;
}

const isoDay = (days: number): string => {
  const text = new Date(days * 86_400_000).toISOString();
  return text.endsWith('T00:00:00.000Z') ? text.slice(0, 10) : text;
};

/** Rows of a typed table as CSV: levels as they are, numbers as the shortest round-trip text, dates as ISO 8601, missing empty. */
function typedCsv(table: Table, rows: Int32Array): string {
  const out = [csvRow(table.columns.map((c) => c.name))];
  for (const r of rows) {
    out.push(
      csvRow(table.columns.map((c) => (c.kind === 'categorical' ? (c.codes[r] < 0 ? '' : c.levels[c.codes[r]]) : c.values[r] !== c.values[r] ? '' : c.dates ? isoDay(c.values[r]) : String(c.values[r])))),
    );
  }
  return out.join('');
}
