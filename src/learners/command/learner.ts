/**
 * `command:NAME` learners: a program outside foldwise, run once per fold through the file
 * protocol of protocol.ts. The program fits on train.csv and predicts test.csv in one run, so
 * this learner's `fit` runs it (it needs the fold, `ctx.fold`, which the runner gives) and
 * returns a model that hands out those predictions. Such a model is its predictions: it
 * predicts the fold's test rows only, and its JSON form (and `load`) keep exactly them.
 *
 * Options: `timeout` (seconds per fold), `prep` (foldwise: the fold-local preprocessing of
 * foldwise is applied before writing, so every feature is a number: imputed, categories
 * one-hot; raw: the columns as read, categories as text and missing values as empty fields),
 * and any other key=value, passed to the program as text (environment and job.json).
 */
import { InputError, UsageError } from '../../errors.js';
import { matrixCsv } from '../../io/csv-text.js';
import { formatBytes, matrixColumns, targetColumn } from '../../io/write-columnar.js';
import type { Learner, Matrix, Model, Params, ParamSpec, Target } from '../../learning.js';
import { runFold } from './invoke.js';
import { readPredictions } from './predictions.js';
import type { CommandProgram, CommandSetup } from './program.js';
import { DEFAULT_TIMEOUT_S } from './protocol.js';

export const PREP_CHOICES = ['foldwise', 'raw'] as const;
export const FORMAT_CHOICES = ['csv', 'parquet', 'arrow'] as const;

const PARAMS: readonly ParamSpec[] = [
  { name: 'timeout', kind: 'number', min: 0, minExclusive: true, max: 604800, default: DEFAULT_TIMEOUT_S, doc: 'seconds the program may take per fold before it is stopped' },
  { name: 'prep', kind: 'choice', choices: PREP_CHOICES, default: 'foldwise', doc: 'foldwise: numeric, imputed and one-hot encoded per fold; raw: the columns as read' },
  { name: 'format', kind: 'choice', choices: FORMAT_CHOICES, default: 'csv', doc: 'the format of the train and test files handed to the program: csv, parquet or arrow (Arrow IPC file)' },
];

interface Saved {
  readonly learner: string;
  readonly fold: string;
  readonly task: Target['task'];
  readonly classes: number;
  readonly predicted: number[];
  readonly probs?: number[];
}

function replayModel(saved: Saved): Model {
  const predicted = saved.task === 'classification' ? Int32Array.from(saved.predicted) : Float64Array.from(saved.predicted);
  const probs = saved.probs ? Float64Array.from(saved.probs) : undefined;
  const check = (X: Matrix): void => {
    if (X.rows !== predicted.length) {
      throw new InputError(`${saved.learner}: a command model holds the predictions for the ${predicted.length} test rows of fold ${saved.fold} only; it cannot predict ${X.rows} other rows`);
    }
  };
  const model: Model = {
    predict(X) {
      check(X);
      return predicted.slice();
    },
    toJSON: () => saved,
  };
  if (probs) model.probabilities = (X) => (check(X), probs.slice());
  return model;
}

/** The learner of one `--command NAME=PROGRAM`. */
export function commandLearner(program: CommandProgram, setup: CommandSetup): Learner {
  const name = `command:${program.name}`;
  const declared = new Set(PARAMS.map((p) => p.name));
  return {
    name,
    tasks: ['classification', 'regression'],
    params: PARAMS,
    needsScaling: false,
    openOptions: true,
    origin: program.written,
    doc: `external program ${program.argv.join(' ')}`,
    fit(X, y, params: Params, ctx) {
      const fold = ctx.fold;
      if (!fold) throw new UsageError(`${name}: command learners run inside foldwise's folds only (the caller gave no fold)`);
      const prep = String(params.prep) as (typeof PREP_CHOICES)[number];
      const options: Record<string, string> = Object.create(null);
      for (const key of Object.keys(params).sort()) if (!declared.has(key)) options[key] = String(params[key]);
      const classes = y.task === 'classification' ? y.classes : undefined;
      const format = String(params.format) as (typeof FORMAT_CHOICES)[number];
      const typed = (part: 'train' | 'test'): Uint8Array => {
        if (format === 'csv') throw new Error('typed files for csv');
        if (prep === 'raw') {
          if (!fold.rawBytes) throw new UsageError(`${name}: format=${format} with prep=raw needs foldwise's own runner`);
          return fold.rawBytes(part, format);
        }
        const M = part === 'train' ? X : fold.test;
        const cols = matrixColumns(M, fold.columns);
        if (part === 'train') cols.push(targetColumn(fold.target, y));
        return formatBytes(format, cols, M.rows);
      };
      const read = runFold(
        {
          learner: name,
          argv: program.argv,
          env: setup.env,
          tempRoot: setup.tempRoot,
          keepTemp: setup.keepTemp,
          timeoutMs: Math.round(Number(params.timeout) * 1000),
          job: {
            learner: name,
            fold: fold.label,
            task: y.task,
            target: fold.target,
            ...(classes ? { classes } : {}),
            prep,
            format,
            seed: ctx.seed,
            trainRows: X.rows,
            testRows: fold.test.rows,
            options,
          },
          format,
          trainCsv: format !== 'csv' ? typed('train') : prep === 'raw' ? fold.rawCsv('train') : matrixCsv(X, fold.columns, { name: fold.target, y }),
          testCsv: format !== 'csv' ? typed('test') : prep === 'raw' ? fold.rawCsv('test') : matrixCsv(fold.test, fold.columns),
        },
        (text, path) => readPredictions(text, path, fold.test.rows, classes),
      );
      return replayModel({
        learner: name,
        fold: fold.label,
        task: y.task,
        classes: classes?.length ?? 0,
        predicted: Array.from(read.predicted),
        ...(read.task === 'classification' && read.probs ? { probs: Array.from(read.probs) } : {}),
      });
    },
    load(json) {
      const j = json as Partial<Saved> | null;
      if (!j || j.learner !== name || !Array.isArray(j.predicted) || (j.task !== 'classification' && j.task !== 'regression')) {
        throw new InputError(`${name}: not a saved model of this command learner`);
      }
      return replayModel(j as Saved);
    },
  };
}
