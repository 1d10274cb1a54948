/**
 * Reading the `--costs FILE` cost matrix (a CSV, comma-separated, UTF-8):
 *
 *   actual\predicted,Adelie,Chinstrap,Gentoo
 *   Adelie,0,1,4
 *   Chinstrap,2,0,1
 *   Gentoo,3,1,0
 *
 * Line 1: any first cell (a label for the corner, ignored), then the predicted classes. Every
 * next line: an actual class, then one cost per predicted class, in the header's column order.
 * Rules, each refused with a UsageError naming the file and the line:
 * - every class of the target exactly once in the header and exactly once in the first column,
 *   spelled exactly as the target's values (no class the target lacks);
 * - every line has as many cells as the header;
 * - a cost is a plain decimal number (digits, an optional point and fraction, an optional
 *   exponent: `2`, `0.5`, `1e3`), finite and not negative; not every cost is 0;
 * - no empty line before the last row (empty lines at the end are allowed); no line break
 *   inside a quoted cell.
 * A cell may be quoted with double quotes (a class name with a comma), `""` inside standing for
 * one quote; spaces around a cell are part of it, as in the data file. A byte-order mark at the
 * start is skipped. The rows and columns may come in any order: the matrix is rearranged into
 * the target's class order.
 */
import { createHash } from 'node:crypto';
import { closeNames, UsageError } from '../errors.js';
import type { CostMatrix } from './cost.js';

/** A plain decimal number: what a cost cell may hold. */
const NUMBER = /^[+]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** The cells of one line, or a message. */
function cellsOf(line: string): string[] | string {
  const out: string[] = [];
  let i = 0;
  for (;;) {
    if (line[i] === '"') {
      let cell = '';
      i++;
      for (;;) {
        if (i >= line.length) return 'a quoted cell is not closed (a line break inside quotes is not allowed)';
        if (line[i] === '"') {
          if (line[i + 1] === '"') {
            cell += '"';
            i += 2;
            continue;
          }
          i++;
          break;
        }
        cell += line[i++];
      }
      if (i < line.length && line[i] !== ',') return `text after the closing quote of cell ${out.length + 1}`;
      out.push(cell);
    } else {
      const end = line.indexOf(',', i);
      const cell = end < 0 ? line.slice(i) : line.slice(i, end);
      if (cell.includes('"')) return `cell ${out.length + 1} has a quote inside; quote the whole cell ("...") and double the quotes inside it`;
      out.push(cell);
      i = end < 0 ? line.length : end;
    }
    if (i >= line.length) return out;
    i++; // the comma
    if (i === line.length) {
      out.push('');
      return out;
    }
  }
}

/**
 * The cost matrix of `text` (the file `file`) for a target with `classes` (in class code
 * order). Throws UsageError for any break of the rules above.
 */
export function parseCostMatrix(text: string, file: string, classes: readonly string[]): CostMatrix {
  const where = `--costs ${file}`;
  const list = classes.map((c) => JSON.stringify(c)).join(', ');
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r\n|\n|\r/);
  while (lines.length && lines[lines.length - 1] === '') lines.pop();
  if (!lines.length) throw new UsageError(`${where}: the file is empty; line 1 names the predicted classes (${list}), then one line per actual class`);
  const rows: string[][] = [];
  for (let l = 0; l < lines.length; l++) {
    if (lines[l] === '') throw new UsageError(`${where}: line ${l + 1}: empty line inside the matrix`);
    const cells = cellsOf(lines[l]);
    if (typeof cells === 'string') throw new UsageError(`${where}: line ${l + 1}: ${cells}`);
    rows.push(cells);
  }
  const k = classes.length;
  const code = new Map(classes.map((c, i) => [c, i]));
  const classOf = (name: string, line: number, axis: string): number => {
    const c = code.get(name);
    if (c === undefined) {
      const hint = closeNames(name, classes);
      throw new UsageError(`${where}: line ${line}: ${JSON.stringify(name)} is not a class of the target (${axis}); the classes are ${list}${hint ? `; ${hint}` : ''}`);
    }
    return c;
  };
  // line 1: the corner cell, then the predicted classes
  const header = rows[0];
  const column = new Int32Array(header.length).fill(-1);
  const seenColumn = new Int32Array(k).fill(-1);
  for (let j = 1; j < header.length; j++) {
    const c = classOf(header[j], 1, 'predicted, in the header');
    if (seenColumn[c] >= 0) throw new UsageError(`${where}: line 1: the predicted class ${JSON.stringify(header[j])} is named twice (columns ${seenColumn[c] + 1} and ${j + 1})`);
    seenColumn[c] = j;
    column[j] = c;
  }
  const lacking = classes.filter((_, c) => seenColumn[c] < 0);
  if (lacking.length) throw new UsageError(`${where}: line 1: the header lacks the predicted class${lacking.length > 1 ? 'es' : ''} ${lacking.map((c) => JSON.stringify(c)).join(', ')}; it needs every class of the target once (${list})`);
  const values = new Float64Array(k * k);
  const seenRow = new Int32Array(k).fill(-1);
  for (let l = 1; l < rows.length; l++) {
    const cells = rows[l];
    if (cells.length !== header.length) throw new UsageError(`${where}: line ${l + 1}: ${cells.length} cells, but the header has ${header.length} (the actual class and one cost per predicted class)`);
    const a = classOf(cells[0], l + 1, 'actual, in the first column');
    if (seenRow[a] >= 0) throw new UsageError(`${where}: line ${l + 1}: the actual class ${JSON.stringify(cells[0])} has a line already (line ${seenRow[a] + 1})`);
    seenRow[a] = l;
    for (let j = 1; j < cells.length; j++) {
      const t = cells[j];
      const v = NUMBER.test(t) ? Number(t) : NaN;
      if (/^-\s*(\d|\.\d)/.test(t)) throw new UsageError(`${where}: line ${l + 1}, column ${j + 1}: ${JSON.stringify(t)} is below 0; a cost is 0 or more`);
      if (!Number.isFinite(v)) {
        throw new UsageError(`${where}: line ${l + 1}, column ${j + 1}: ${JSON.stringify(t)} is not a cost; a cost is a finite number of 0 or more, such as 0, 2 or 0.5`);
      }
      values[a * k + column[j]] = v;
    }
  }
  const noLine = classes.filter((_, c) => seenRow[c] < 0);
  if (noLine.length) throw new UsageError(`${where}: line ${rows.length}: no line for the actual class${noLine.length > 1 ? 'es' : ''} ${noLine.map((c) => JSON.stringify(c)).join(', ')}; the matrix needs one line per class of the target (${list})`);
  if (values.every((v) => v === 0)) throw new UsageError(`${where}: every cost is 0, so every prediction would score the same; give the cost of each mistake`);
  return { classes: [...classes], values, sha256: createHash('sha256').update(text, 'utf8').digest('hex') };
}
