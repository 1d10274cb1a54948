/**
 * Turns a loaded table into a learning problem: which column is the target, which task,
 * which rows are usable (target present), which columns are features, and the optional
 * group and order columns used only for splitting.
 */
import { closeNames, InputError, UsageError } from '../errors.js';
import type { Target, Task } from '../learning.js';
import { quoted } from './load-csv.js';
import { delimiterHint } from './delimiter-hint.js';
import { numericTargetBreak, orderBreak } from './type-breaks.js';
import type { DataSection } from './types.js';
import type { Column, Table } from './types.js';

/** An integer target with at most this many distinct values is taken as classification. */
export const MAX_INFERRED_CLASSES = 10;

export interface ProblemOptions {
  readonly target: string;
  readonly drop?: readonly string[];
  readonly task?: Task;
  readonly group?: string;
  readonly order?: string;
}

export interface Problem {
  readonly table: Table;
  readonly task: Task;
  readonly targetName: string;
  /** table row index of each used row; the rest of the problem is indexed by used row */
  readonly rows: Int32Array;
  /** rows left out because their target is missing */
  readonly excludedRows: number;
  readonly target: Target;
  readonly features: readonly Column[];
  readonly dropped: readonly string[];
  readonly groupName?: string;
  /** group code per used row, 0..groups-1 */
  readonly groups?: Int32Array;
  readonly groupLevels?: readonly string[];
  readonly orderName?: string;
  /** order value per used row (numbers; ISO dates are read as days since 1970) */
  readonly order?: Float64Array;
}

function columnOf(table: Table, name: string, option: string): Column {
  const col = table.byName.get(name);
  if (!col) {
    const names = table.columns.map((c) => c.name);
    const hint = delimiterHint(names, name, table.delimiter ?? ',') ?? closeNames(name, names);
    throw new UsageError(`${option} ${quoted(name)}: no such column in ${table.source}${hint ? `; ${hint}` : ''}`);
  }
  return col;
}

function present(col: Column, i: number): boolean {
  return col.kind === 'numeric' ? !Number.isNaN(col.values[i]) : col.codes[i] >= 0;
}

function inferTask(col: Column): Task {
  if (col.kind === 'categorical') return 'classification';
  const distinct = new Set<number>();
  for (const v of col.values) {
    if (Number.isNaN(v)) continue;
    if (!Number.isInteger(v)) return 'regression';
    distinct.add(v);
    if (distinct.size > MAX_INFERRED_CLASSES) return 'regression';
  }
  return 'classification';
}

function classificationTarget(table: Table, col: Column, rows: Int32Array): Target {
  // class names in a stable order: numerically for a numeric column, by code point otherwise;
  // typed loops with no per-row array or text (at 10^6 rows those were tens of MB of garbage in
  // every thread that defines the problem: the main thread and each worker)
  let names: string[];
  const codes = new Int32Array(rows.length);
  if (col.kind === 'numeric') {
    const v = col.values;
    const seen = new Set<number>();
    for (let i = 0; i < rows.length; i++) seen.add(v[rows[i]]);
    const values = [...seen].sort((a, b) => a - b);
    names = values.map((x) => String(x));
    // keyed by number: a Map treats -0 and 0 as one key, as their text ("0") does
    const byValue = new Map(values.map((x, k) => [x, k]));
    for (let i = 0; i < rows.length; i++) codes[i] = byValue.get(v[rows[i]])!;
  } else {
    const used = new Set<number>();
    for (let i = 0; i < rows.length; i++) used.add(col.codes[rows[i]]);
    const sorted = [...used].sort((a, b) => (col.levels[a] < col.levels[b] ? -1 : col.levels[a] > col.levels[b] ? 1 : 0));
    names = sorted.map((k) => col.levels[k]);
    const byCode = new Int32Array(col.levels.length);
    sorted.forEach((k, c) => (byCode[k] = c));
    for (let i = 0; i < rows.length; i++) codes[i] = byCode[col.codes[rows[i]]];
  }
  if (names.length < 2) {
    throw new InputError(
      `${table.source}: target ${quoted(col.name)} has only one class (${quoted(names[0])}) in the usable rows; classification needs at least two`,
    );
  }
  return { task: 'classification', codes, classes: names };
}

function regressionTarget(table: Table, col: Column, rows: Int32Array): Target {
  if (col.kind !== 'numeric') {
    const r = rows.find((row) => col.codes[row] >= 0 && !Number.isFinite(Number(col.levels[col.codes[row]])));
    const at = r === undefined ? '' : ` (line ${table.lines[r]}: ${quoted(col.levels[col.codes[r]])})`;
    throw new InputError(
      `${table.source}: target ${quoted(col.name)} is not numeric${at}; regression needs numbers (use --task classification for labels)`,
    );
  }
  return { task: 'regression', values: Float64Array.from(rows, (r) => col.values[r]) };
}

function orderValues(table: Table, col: Column, rows: Int32Array): Float64Array {
  if (col.kind !== 'numeric') {
    const broken = orderBreak(table, col);
    if (broken) throw new InputError(broken);
    const r = rows.find((row) => col.codes[row] >= 0) ?? rows[0];
    const text = col.codes[r] < 0 ? 'missing' : quoted(col.levels[col.codes[r]]);
    throw new InputError(
      `${table.source}: line ${table.lines[r]}: --order column ${quoted(col.name)} is ${text}; order values must be numbers or ISO dates (YYYY-MM-DD)`,
    );
  }
  const out = Float64Array.from(rows, (r) => col.values[r]);
  const bad = out.findIndex((v) => Number.isNaN(v));
  if (bad >= 0) throw new InputError(`${table.source}: line ${table.lines[rows[bad]]}: --order column ${quoted(col.name)} is missing; every row needs an order value`);
  return out;
}

/** Builds the problem; throws UsageError for unknown columns and InputError for unusable data. */
export function defineProblem(table: Table, options: ProblemOptions): Problem {
  const targetCol = columnOf(table, options.target, '--target');
  const drop = options.drop ?? [];
  for (const d of drop) {
    columnOf(table, d, '--drop');
    if (d === options.target) throw new UsageError(`--drop ${quoted(d)}: that is the target column; drop other columns`);
  }
  const groupCol = options.group === undefined ? undefined : columnOf(table, options.group, '--group');
  const orderCol = options.order === undefined ? undefined : columnOf(table, options.order, '--order');
  for (const [opt, col] of [['--group', groupCol], ['--order', orderCol]] as const) {
    if (col === targetCol) throw new UsageError(`${opt} ${quoted(col.name)}: that is the target column; choose another column`);
  }

  let usedCount = 0;
  for (let r = 0; r < table.rows; r++) if (present(targetCol, r)) usedCount++;
  const rows = new Int32Array(usedCount);
  for (let r = 0, i = 0; r < table.rows; r++) if (present(targetCol, r)) rows[i++] = r;
  if (rows.length === 0) throw new InputError(`${table.source}: target ${quoted(targetCol.name)} is missing in every row`);
  if (options.task === undefined) {
    const broken = numericTargetBreak(table, targetCol);
    if (broken) throw new InputError(broken);
  }
  const task = options.task ?? inferTask(targetCol);
  const target = task === 'classification' ? classificationTarget(table, targetCol, rows) : regressionTarget(table, targetCol, rows);

  let groups: Int32Array | undefined;
  let groupLevels: string[] | undefined;
  if (groupCol) {
    const key = (r: number): string =>
      groupCol.kind === 'numeric' ? (Number.isNaN(groupCol.values[r]) ? '' : String(groupCol.values[r])) : groupCol.codes[r] < 0 ? '' : groupCol.levels[groupCol.codes[r]];
    const index = new Map<string, number>();
    groups = new Int32Array(rows.length);
    rows.forEach((r, i) => {
      const k = key(r);
      let g = index.get(k);
      if (g === undefined) index.set(k, (g = index.size));
      groups![i] = g;
    });
    // a missing group value is its own group (""), so such rows stay together
    groupLevels = [...index.keys()];
  }
  const order = orderCol ? orderValues(table, orderCol, rows) : undefined;

  const skip = new Set<string>([targetCol.name, ...drop]);
  if (groupCol) skip.add(groupCol.name);
  if (orderCol) skip.add(orderCol.name);
  const features = table.columns.filter((c) => !skip.has(c.name));
  if (features.length === 0) throw new UsageError(`${table.source}: no feature columns are left after the target, --drop, --group and --order`);

  return {
    table,
    task,
    targetName: targetCol.name,
    rows,
    excludedRows: table.rows - rows.length,
    target,
    features,
    dropped: [...drop],
    ...(groupCol ? { groupName: groupCol.name, groups, groupLevels } : {}),
    ...(orderCol ? { orderName: orderCol.name, order } : {}),
  };
}

/** The data section every report carries (eval, tune, audit): file, fingerprint, problem. */
export function dataSection(problem: Problem): DataSection {
  const { table, target: y } = problem;
  return {
    path: table.source,
    sha256: table.fingerprint.sha256,
    rows: table.rows,
    columns: table.columns.length,
    rowsUsed: problem.rows.length,
    excludedRows: problem.excludedRows,
    target: problem.targetName,
    task: problem.task,
    ...(y.task === 'classification' ? { classes: y.classes } : {}),
    features: problem.features.map((f) => f.name),
    dropped: problem.dropped,
    ...datesOf(problem),
  };
}

/** How each date column the problem uses (features, --order) was read, for the report. */
function datesOf(problem: Problem): { dates?: { column: string; read: string }[] } {
  const used = [...problem.features];
  if (problem.orderName !== undefined) used.push(problem.table.byName.get(problem.orderName)!);
  const dates = used.flatMap((c) => (c.kind === 'numeric' && c.dates ? [{ column: c.name, read: c.dateReading ?? 'ISO 8601 (year-month-day)' }] : []));
  return dates.length ? { dates } : {};
}
