/**
 * Reading a command learner's predictions file strictly (protocol in protocol.ts). Every
 * problem is a CommandFoldError naming the file, the line and what is wrong.
 */
import Papa from 'papaparse';
import { argmaxRows } from '../argmax.js';
import { CommandFoldError } from './errors.js';
import { PROBABILITY_SUM_TOLERANCE } from './protocol.js';

export type ReadPredictions =
  | { readonly task: 'classification'; readonly predicted: Int32Array; readonly probs?: Float64Array }
  | { readonly task: 'regression'; readonly predicted: Float64Array };

const NUMBER = /^\s*[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/;

/**
 * Parses `text` (the file at `path`) as the predictions for `rows` test rows; `classes` are the
 * class names for classification, undefined for regression.
 */
export function readPredictions(text: string, path: string, rows: number, classes: readonly string[] | undefined): ReadPredictions {
  const fail = (line: number | undefined, what: string): never => {
    throw new CommandFoldError(`${path}${line === undefined ? '' : ` line ${line}`}: ${what}`);
  };
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { header: false, skipEmptyLines: false, delimiter: ',' });
  const bad = parsed.errors.find((e) => e.type === 'Quotes');
  if (bad) fail((bad.row ?? 0) + 1, `broken quoting (${bad.message})`);
  const lines = parsed.data;
  // one empty last line (the file's final line break) is fine; other empty lines are not
  while (lines.length > 0 && lines[lines.length - 1].length === 1 && lines[lines.length - 1][0] === '') lines.pop();
  if (lines.length === 0) fail(undefined, 'is empty; expected a header line and one line per test row');
  const header = lines[0];
  const body = lines.length - 1;
  if (body !== rows) fail(undefined, `has ${body} prediction line${body === 1 ? '' : 's'} for ${rows} test row${rows === 1 ? '' : 's'}`);
  const width = header.length;
  for (let i = 1; i < lines.length; i++) {
    if (lines[i].length !== width) fail(i + 1, `has ${lines[i].length} field${lines[i].length === 1 ? '' : 's'}, the header has ${width}`);
  }

  if (!classes) {
    if (width !== 1) fail(1, `regression predictions are one column of numbers; the header has ${width} columns`);
    const predicted = new Float64Array(rows);
    for (let i = 0; i < rows; i++) {
      const t = lines[i + 1][0];
      const v = NUMBER.test(t) ? Number(t) : NaN;
      if (!Number.isFinite(v)) fail(i + 2, `"${t.slice(0, 40)}" is not a finite number`);
      predicted[i] = v;
    }
    return { task: 'regression', predicted };
  }

  const codeOf = new Map(classes.map((c, k) => [c, k] as const));
  if (width === 1) {
    const predicted = new Int32Array(rows);
    for (let i = 0; i < rows; i++) {
      const t = lines[i + 1][0];
      const k = codeOf.get(t);
      if (k === undefined) fail(i + 2, `"${t.slice(0, 40)}" is not a class name (classes: ${classes.join(', ')})`);
      predicted[i] = k as number;
    }
    return { task: 'classification', predicted };
  }

  const slot = new Int32Array(width);
  const seen = new Set<string>();
  header.forEach((h, j) => {
    const k = codeOf.get(h);
    if (k === undefined) fail(1, `column "${h.slice(0, 40)}" is not a class name (a probability file has one column per class: ${classes.join(', ')})`);
    if (seen.has(h)) fail(1, `class "${h.slice(0, 40)}" has two columns`);
    seen.add(h);
    slot[j] = k as number;
  });
  const C = classes.length;
  const probs = new Float64Array(rows * C);
  for (let i = 0; i < rows; i++) {
    const line = lines[i + 1];
    let sum = 0;
    for (let j = 0; j < width; j++) {
      const t = line[j];
      const v = NUMBER.test(t) ? Number(t) : NaN;
      if (!(v >= 0 && v <= 1)) fail(i + 2, `column "${header[j].slice(0, 40)}": "${t.slice(0, 40)}" is not a probability from 0 to 1`);
      probs[i * C + slot[j]] = v;
      sum += v;
    }
    if (Math.abs(sum - 1) > PROBABILITY_SUM_TOLERANCE) fail(i + 2, `the probabilities sum to ${sum}, not 1 (tolerance ${PROBABILITY_SUM_TOLERANCE})`);
    for (let c = 0; c < C; c++) probs[i * C + c] /= sum;
  }
  return { task: 'classification', predicted: argmaxRows(probs, C), probs };
}
