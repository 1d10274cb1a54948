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
}

export interface SplitResult {
  readonly planText: string;
  /** file name -> CSV text, in a fixed order */
  readonly files: ReadonlyMap<string, string>;
  /** the assignment table as CSV text */
  readonly assignment: string;
}

const pad = (n: number): string => String(n).padStart(2, '0');

/** Computes the part files and assignment of a plan over `table`, whose text is `text`. */
export function splitTable(table: Table, text: string, options: SplitOptions): SplitResult {
  const seed = checkSeed(options.seed);
  const problem = defineProblem(table, options);
  const spec = parsePlan(options.plan);
  const { plan } = planFor(problem, spec, options.stratify, seed);
  if (options.parts && spec.kind === 'loo') throw new UsageError('--out with --plan loo would write one file per row; use --assign for leave-one-out');

  // which part files each used row goes to
  const partsOf = new Map<number, string[]>(); // table row -> file names
  const order: string[] = [];
  const add = (file: string, usedRows: Int32Array): void => {
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
  if (options.parts) {
    eachRecord(text, options.delimiter, (fields, row) => {
      const line = csvLine(fields, options.delimiter);
      if (row < 0) for (const c of chunks.values()) c.push(line);
      else for (const file of partsOf.get(row) ?? []) chunks.get(file)!.push(line);
    });
  }
  const files = new Map(options.parts ? order.map((f) => [f, chunks.get(f)!.join('')] as const) : []);
  const lines = ['row,line,repeat,fold,role'];
  for (const m of memberships(plan)) {
    const r = problem.rows[m.row];
    lines.push(`${r + 1},${table.lines[r]},${m.repeat + 1},${m.fold + 1},${m.role}`);
  }
  return { planText: formatPlan(spec), files, assignment: `${lines.join('\n')}\n` };
}
