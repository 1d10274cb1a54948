/**
 * Writing CSV text (RFC 4180): fields joined by commas, lines ended by "\n", a field quoted
 * only when it holds a comma, a double quote, a line break or begins or ends with a space,
 * double quotes inside doubled. Numbers are written as JavaScript writes them (the shortest
 * text that reads back as the same double), a missing value as an empty field.
 */
import type { Problem } from './problem.js';

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

/**
 * The used rows `idx` of a problem as foldwise read them, before preprocessing: a header of the
 * feature names (and the target name last, when `withTarget`), then one line per row. Numbers
 * as read (ISO dates as days since 1970-01-01), categories as their text, missing as empty.
 */
export function problemRowsCsv(problem: Problem, idx: Int32Array, withTarget: boolean): string {
  const names = problem.features.map((f) => f.name);
  const parts: string[] = [csvRow(withTarget ? [...names, problem.targetName] : names)];
  const levelFields = problem.features.map((f) => (f.kind === 'categorical' ? f.levels.map(csvField) : []));
  const y = problem.target;
  const classFields = y.task === 'classification' ? y.classes.map(csvField) : [];
  for (let i = 0; i < idx.length; i++) {
    const r = problem.rows[idx[i]];
    const fields: string[] = [];
    problem.features.forEach((f, j) => {
      if (f.kind === 'numeric') fields.push(numberField(f.values[r]));
      else fields.push(f.codes[r] < 0 ? '' : levelFields[j][f.codes[r]]);
    });
    if (withTarget) fields.push(y.task === 'classification' ? classFields[y.codes[idx[i]]] : numberField(y.values[idx[i]]));
    parts.push(`${fields.join(',')}\n`);
  }
  return parts.join('');
}
