/**
 * Reading a predictions file for `foldwise score`: one written by `eval --predictions`
 * (recognised by its header), or any CSV with named columns. Every line is checked: a missing
 * column, a class the file does not know, a probability row that does not sum to 1, text where a
 * number belongs, a fold column with a single fold. Each refusal is an InputError of one line
 * naming the file and its line.
 *
 * The result is the file's predictions grouped as foldwise groups a run's tasks: one group per
 * (learner, repeat, fold, role), folds in (repeat, fold) order, learners in order of first
 * appearance, lines in file order within a group.
 */
import Papa from 'papaparse';
import { InputError, UsageError, closeNames } from '../errors.js';
import type { Task } from '../learning.js';
import { MAX_INFERRED_CLASSES } from '../data/problem.js';
import { PROB_PREFIX } from '../run/predictions-out.js';
import type { Table } from '../data/types.js';

export interface ScoreColumns {
  readonly actual?: string;
  readonly predicted?: string;
  readonly fold?: string;
  readonly repeat?: string;
  readonly learner?: string;
  readonly row?: string;
  /** probability columns: those whose names start with this prefix (the rest is the class) */
  readonly probPrefix?: string;
  /** probability columns named one by one; each name is its class */
  readonly probColumns?: readonly string[];
  readonly task?: Task;
  readonly delimiter?: string;
  /** --slice: columns whose text per line the groups keep (sliceTexts) */
  readonly slice?: readonly string[];
}

export interface PredictionGroup {
  readonly learner: number;
  /** 0-based repeat and fold; -1, -1 for the holdout part */
  readonly repeat: number;
  readonly fold: number;
  readonly holdout: boolean;
  /** 1-based line numbers in the predictions file */
  readonly fileLines: number[];
  readonly actual: number[];
  readonly predicted: number[];
  /** rows x classes, or undefined when the learner gives no probabilities here */
  probs?: number[];
  /** 0-based data rows of the original input, when the file has them */
  readonly rows: number[];
  /** the train_rows column's value, when the file has one */
  trainRows?: number;
  /** --slice: per slice column, the text of each line of the group */
  readonly sliceTexts: string[][];
}

export interface ReadPredictions {
  readonly foldwise: boolean;
  readonly task: Task;
  readonly classes?: readonly string[];
  readonly actualName: string;
  readonly learners: readonly string[];
  readonly groups: readonly PredictionGroup[];
  readonly hasRows: boolean;
  readonly hasTrainRows: boolean;
  readonly lines: number;
  readonly columns: number;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const isNumber = (t: string): boolean => NUMBER.test(t.trim());

/** Class names in foldwise's order: numerically when all are numbers, else by code point. */
export function classOrder(names: Iterable<string>): string[] {
  const list = [...new Set(names)];
  if (list.every(isNumber)) return list.sort((a, b) => Number(a) - Number(b));
  return list.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
}

/** Parses CSV text into a header and records with their 1-based starting lines. */
function parseCsv(text: string, name: string, delimiter: string): { header: string[]; records: { fields: string[]; line: number }[] } {
  const records: { fields: string[]; line: number }[] = [];
  let header: string[] | undefined;
  let line = 1;
  let error: string | undefined;
  Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), {
    delimiter,
    header: false,
    skipEmptyLines: false,
    step: (res) => {
      if (error) return;
      const fields = res.data;
      const start = line;
      if (res.errors.length) error = `${name} line ${start}: ${res.errors[0].message}`;
      const blank = fields.length === 1 && fields[0] === '';
      if (!header) {
        if (!blank) header = fields;
      } else if (!blank) records.push({ fields, line: start });
      // the next record starts after this one's line end and any line breaks inside its fields
      line = start + 1 + fields.reduce((s, f) => s + (f.match(/\n/g)?.length ?? 0), 0);
    },
  });
  if (error) throw new InputError(error);
  if (!header) throw new InputError(`${name}: empty; expected a header line and one line per prediction`);
  return { header, records };
}

/** A predictions file already split into fields (a Parquet or Arrow file read as text fields). */
export interface PredictionFields {
  readonly header: string[];
  readonly records: { fields: string[]; line: number }[];
  /** SHA-256 of the file's bytes */
  readonly sha256: string;
}

/**
 * The fields of a typed table, row by row: numbers as the shortest text that reads back as the
 * same double, levels as they are, missing as empty; a row's line is its 1-based row number.
 */
export function fieldsOfTable(table: Table): PredictionFields {
  const header = table.columns.map((c) => c.name);
  const records: { fields: string[]; line: number }[] = new Array(table.rows);
  for (let r = 0; r < table.rows; r++) {
    records[r] = {
      line: table.lines[r],
      fields: table.columns.map((c) => (c.kind === 'categorical' ? (c.codes[r] < 0 ? '' : c.levels[c.codes[r]]) : c.values[r] !== c.values[r] ? '' : String(c.values[r]))),
    };
  }
  return { header, records, sha256: table.fingerprint.sha256 };
}

export function readPredictions(input: string | PredictionFields, name: string, opts: ScoreColumns = {}): ReadPredictions {
  const { header, records } = typeof input === 'string' ? parseCsv(input, name, opts.delimiter ?? ',') : input;
  const index = new Map<string, number>();
  header.forEach((h, i) => {
    if (index.has(h)) throw new InputError(`${name} line 1: the column ${JSON.stringify(h)} appears twice`);
    index.set(h, i);
  });
  const has = (c: string): boolean => index.has(c);
  const ownHeader = ['line', 'row', 'repeat', 'fold', 'role', 'learner', 'actual'].every(has) && has('train_rows') && (has('predicted_class') || has('predicted_value'));
  const foldwise = ownHeader && !opts.actual && !opts.predicted;
  const column = (c: string | undefined, option: string, required: boolean): number | undefined => {
    if (c === undefined) {
      if (required) throw new UsageError(`${name}: not a predictions file written by foldwise eval; give ${option} COL to say which column holds it`);
      return undefined;
    }
    const i = index.get(c);
    if (i === undefined) {
      const hint = closeNames(c, header);
      throw new InputError(`${name} line 1: no column ${JSON.stringify(c)} (${option})${hint ? `; ${hint}` : ''}`);
    }
    return i;
  };
  const predictedName = foldwise ? (has('predicted_class') ? 'predicted_class' : 'predicted_value') : opts.predicted;
  const actualI = column(foldwise ? 'actual' : opts.actual, '--actual', true)!;
  const predictedI = column(predictedName, '--predicted', true)!;
  const foldI = column(foldwise ? 'fold' : opts.fold, '--fold', true)!;
  const repeatI = column(foldwise ? 'repeat' : opts.repeat, '--repeat', false);
  const learnerI = column(foldwise ? 'learner' : opts.learner, '--learner', false);
  const rowI = column(foldwise ? 'row' : opts.row, '--row', false);
  const roleI = foldwise ? index.get('role') : undefined;
  const trainI = foldwise ? index.get('train_rows') : undefined;
  const sliceI = (opts.slice ?? []).map((c) => column(c, '--slice', true)!);

  // probability columns and their classes
  let probs: { col: number; cls: string }[] = [];
  const prefix = foldwise ? PROB_PREFIX : opts.probPrefix;
  if (opts.probColumns?.length) probs = opts.probColumns.map((c) => ({ col: column(c, '--prob-columns', true)!, cls: c }));
  else if (prefix) probs = header.flatMap((h, i) => (h.startsWith(prefix) && h.length > prefix.length ? [{ col: i, cls: h.slice(prefix.length) }] : []));
  if (!foldwise && prefix && !probs.length) throw new InputError(`${name} line 1: no column starts with ${JSON.stringify(prefix)} (--prob)`);

  // the task
  let task: Task | undefined = opts.task;
  if (foldwise) task = predictedName === 'predicted_class' ? 'classification' : 'regression';
  if (!task) {
    if (probs.length) task = 'classification';
    else {
      const values = records.map((r) => r.fields[actualI] ?? '');
      const numeric = values.every(isNumber);
      const distinct = new Set(values);
      task = numeric && (distinct.size > MAX_INFERRED_CLASSES || values.some((v) => !Number.isInteger(Number(v)))) ? 'regression' : 'classification';
    }
  }
  if (task === 'regression' && probs.length) throw new UsageError(`${name}: probability columns given for a regression task; drop --prob or set --task classification`);

  // classes
  let classes: string[] | undefined;
  if (task === 'classification') {
    classes = probs.length
      ? classOrder(probs.map((p) => p.cls))
      : classOrder(records.flatMap((r) => [r.fields[actualI] ?? '', r.fields[predictedI] ?? '']));
    if (probs.length) probs = classes.map((c) => probs.find((p) => p.cls === c)!);
  }
  const classIndex = new Map((classes ?? []).map((c, i) => [c, i]));

  // grouping
  const learners: string[] = [];
  const learnerIndex = new Map<string, number>();
  const groups = new Map<string, PredictionGroup>();
  const repeatValues = new Map<string, Set<string>>();
  const defaultLearner = predictedName ?? 'predicted';
  const need = (r: { fields: string[]; line: number }, i: number, what: string): string => {
    const v = r.fields[i];
    if (v === undefined) throw new InputError(`${name} line ${r.line}: ${r.fields.length} fields, expected ${header.length} (no ${what})`);
    return v;
  };
  const numberAt = (r: { fields: string[]; line: number }, i: number, what: string): number => {
    const t = need(r, i, what);
    if (!isNumber(t)) throw new InputError(`${name} line ${r.line}: ${what} ${JSON.stringify(t.slice(0, 40))} is not a number`);
    const v = Number(t);
    if (!Number.isFinite(v)) throw new InputError(`${name} line ${r.line}: ${what} ${JSON.stringify(t.slice(0, 40))} is not a finite number`);
    return v;
  };
  const rawGroups: { key: string; repeat: string; fold: string; holdout: boolean; g: PredictionGroup }[] = [];
  for (const r of records) {
    if (r.fields.length !== header.length) throw new InputError(`${name} line ${r.line}: ${r.fields.length} fields, expected ${header.length} as in the header`);
    const role = roleI === undefined ? 'test' : r.fields[roleI];
    if (role !== 'test' && role !== 'holdout') throw new InputError(`${name} line ${r.line}: role ${JSON.stringify(role)}, expected test or holdout`);
    const holdout = role === 'holdout';
    const learner = learnerI === undefined ? defaultLearner : r.fields[learnerI];
    let li = learnerIndex.get(learner);
    if (li === undefined) {
      li = learners.length;
      learners.push(learner);
      learnerIndex.set(learner, li);
    }
    const repeat = holdout ? '' : repeatI === undefined ? '1' : r.fields[repeatI];
    const fold = holdout ? '' : r.fields[foldI];
    if (!holdout && fold === '') throw new InputError(`${name} line ${r.line}: the fold is empty`);
    if (!holdout) {
      let set = repeatValues.get(repeat);
      if (!set) repeatValues.set(repeat, (set = new Set()));
      set.add(fold);
    }
    const key = `${li}\u0000${repeat}\u0000${fold}\u0000${role}`;
    let g = groups.get(key);
    if (!g) {
      g = { learner: li, repeat: -1, fold: -1, holdout, fileLines: [], actual: [], predicted: [], rows: [], sliceTexts: sliceI.map(() => []) };
      groups.set(key, g);
      rawGroups.push({ key, repeat, fold, holdout, g });
    }
    g.fileLines.push(r.line);
    sliceI.forEach((c, k) => g!.sliceTexts[k].push(r.fields[c]));
    if (task === 'classification') {
      const a = classIndex.get(need(r, actualI, 'actual'));
      const p = classIndex.get(need(r, predictedI, 'predicted'));
      if (a === undefined) throw new InputError(`${name} line ${r.line}: actual class ${JSON.stringify(r.fields[actualI])} is not among the classes ${classes!.join(', ')}`);
      if (p === undefined) throw new InputError(`${name} line ${r.line}: predicted class ${JSON.stringify(r.fields[predictedI])} is not among the classes ${classes!.join(', ')}`);
      g.actual.push(a);
      g.predicted.push(p);
      if (probs.length) {
        const texts = probs.map((c) => r.fields[c.col]);
        const empty = texts.every((t) => t === '');
        const first = g.fileLines.length === 1;
        if (first && !empty) g.probs = [];
        if (empty !== (g.probs === undefined)) {
          throw new InputError(`${name} line ${r.line}: probabilities ${empty ? 'missing' : 'given'} here but ${empty ? 'given' : 'missing'} on line ${g.fileLines[0]} of the same learner and fold`);
        }
        if (!empty) {
          const values = probs.map((c) => numberAt(r, c.col, `probability ${JSON.stringify(header[c.col])}`));
          if (values.some((v) => v < 0 || v > 1)) throw new InputError(`${name} line ${r.line}: a probability outside [0, 1]`);
          const sum = values.reduce((s, v) => s + v, 0);
          if (Math.abs(sum - 1) > 1e-4) throw new InputError(`${name} line ${r.line}: the probabilities sum to ${sum}, not 1 (within 0.0001)`);
          for (const v of values) g.probs!.push(Math.abs(sum - 1) > 1e-12 ? v / sum : v);
        }
      }
    } else {
      g.actual.push(numberAt(r, actualI, 'actual'));
      g.predicted.push(numberAt(r, predictedI, 'predicted'));
    }
    if (rowI !== undefined) {
      const row = numberAt(r, rowI, 'row');
      if (!Number.isInteger(row) || row < 0) throw new InputError(`${name} line ${r.line}: row ${JSON.stringify(r.fields[rowI])} is not a whole number from 0`);
      g.rows.push(row);
    }
    if (trainI !== undefined) {
      const t = numberAt(r, trainI, 'train_rows');
      if (g.trainRows === undefined) g.trainRows = t;
      else if (g.trainRows !== t) throw new InputError(`${name} line ${r.line}: train_rows ${t} differs from ${g.trainRows} on line ${g.fileLines[0]} of the same learner and fold`);
    }
  }
  if (records.length === 0) throw new InputError(`${name}: no predictions after the header`);

  // 0-based repeats and folds: distinct values in order (numerically when they are numbers)
  const repeats = classOrder(repeatValues.keys());
  const foldsOf = new Map(repeats.map((r) => [r, classOrder(repeatValues.get(r)!)]));
  const totalFolds = [...foldsOf.values()].reduce((s, f) => s + f.length, 0);
  // a foldwise file of a holdout plan has one fold, as its eval report does; elsewhere one fold is a mistake
  if (totalFolds === 1 && !foldwise) {
    throw new InputError(`${name}: every prediction is in one fold (${JSON.stringify([...foldsOf.values()][0][0])}); fold scores need at least two folds`);
  }
  if (totalFolds === 0) throw new InputError(`${name}: no test predictions (only holdout lines)`);
  const placed = rawGroups.map(({ repeat, fold, holdout, g }) =>
    holdout ? g : { ...g, repeat: repeats.indexOf(repeat), fold: foldsOf.get(repeat)!.indexOf(fold) },
  );
  placed.sort((a, b) => Number(a.holdout) - Number(b.holdout) || a.repeat - b.repeat || a.fold - b.fold || a.learner - b.learner);
  return {
    foldwise,
    task,
    ...(classes ? { classes } : {}),
    actualName: header[actualI],
    learners,
    groups: placed,
    hasRows: rowI !== undefined,
    hasTrainRows: trainI !== undefined,
    lines: records.length,
    columns: header.length,
  };
}
