/**
 * Writing CSV text (RFC 4180): fields joined by commas, lines ended by "\n", a field quoted
 * only when it holds a comma, a double quote, a line break or begins or ends with a space,
 * double quotes inside doubled. Numbers are written as JavaScript writes them (the shortest
 * text that reads back as the same double), a missing value as an empty field.
 */
import type { Matrix, Target } from '../learning.js';
import type { Problem } from '../data/problem.js';

/** One field, quoted when needed. */
export function csvField(text: string): string {
  return /[",\r\n]|^\s|\s$/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One line of fields, with its "\n". */
export function csvRow(fields: readonly string[]): string {
  return `${fields.map(csvField).join(',')}\n`;
}

/** A number as a field: the shortest round-trip text; NaN (missing) as an empty field. */
export function numberField(v: number): string {
  return Number.isNaN(v) ? '' : String(v);
}

/** The field of target entry i: its class name (quoted as needed) or its value. */
function targetField(y: Target): (i: number) => string {
  if (y.task === 'regression') return (i) => numberField(y.values[i]);
  const names = y.classes.map(csvField);
  return (i) => names[y.codes[i]];
}

/**
 * The used rows `idx` of a problem as foldwise read them, before preprocessing: a header of the
 * feature names (and the target name last, when `withTarget`), then one line per row. Numbers
 * as read (ISO dates as days since 1970-01-01), categories as their text, missing as empty.
 */
export function problemRowsCsv(problem: Problem, idx: Int32Array, withTarget: boolean): string {
  const names = problem.features.map((f) => f.name);
  const parts: string[] = [csvRow(withTarget ? [...names, problem.targetName] : names)];
  const levelFields = problem.features.map((f) => (f.kind === 'categorical' ? f.levels.map(csvField) : []));
  const target = targetField(problem.target);
  for (let i = 0; i < idx.length; i++) {
    const r = problem.rows[idx[i]];
    const fields: string[] = [];
    problem.features.forEach((f, j) => {
      if (f.kind === 'numeric') fields.push(numberField(f.values[r]));
      else fields.push(f.codes[r] < 0 ? '' : levelFields[j][f.codes[r]]);
    });
    if (withTarget) fields.push(target(idx[i]));
    parts.push(`${fields.join(',')}\n`);
  }
  return parts.join('');
}

/** A matrix as CSV text under a header of `columns`; `target` adds y as the last column. */
export function matrixCsv(X: Matrix, columns: readonly string[], target?: { readonly name: string; readonly y: Target }): string {
  const parts: string[] = [csvRow(target ? [...columns, target.name] : columns)];
  const field = target ? targetField(target.y) : undefined;
  const fields = new Array<string>(X.cols + (field ? 1 : 0));
  for (let i = 0; i < X.rows; i++) {
    for (let j = 0; j < X.cols; j++) fields[j] = numberField(X.data[i * X.cols + j]);
    if (field) fields[X.cols] = field(i);
    parts.push(`${fields.join(',')}\n`);
  }
  return parts.join('');
}
