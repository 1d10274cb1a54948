/**
 * The pieces of command: learners: the CSV text foldwise writes (RFC 4180, Shafranovich 2005,
 * section 2: fields with commas, double quotes or line breaks are enclosed in double quotes, a
 * double quote inside is doubled), the strict predictions reader, the program parser, and the
 * learner interface (JSON round trip, like every learner).
 */
import { chmodSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvField, csvRow, numberField } from '../../../src/io/csv-text.js';
import { commandLearner } from '../../../src/learners/command/learner.js';
import { readPredictions } from '../../../src/learners/command/predictions.js';
import { parseCommandProgram, parseCommandPrograms } from '../../../src/learners/command/program.js';
import { CommandFoldError } from '../../../src/learners/command/errors.js';
import { formatSpec, parseLearnerSpec, resolveParams } from '../../../src/learners/index.js';
import type { FoldView, Matrix } from '../../../src/learning.js';
import { createRng } from '../../../src/rng.js';
import { tempFolder } from '../../helpers/tmp.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
const tmp = tempFolder();

describe('CSV text (RFC 4180 section 2)', () => {
  it('quotes only where needed, doubles inner quotes, and papaparse reads every field back', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\nlines')).toBe('"two\nlines"');
    expect(csvField(' padded ')).toBe('" padded "');
    expect(numberField(NaN)).toBe('');
    expect(numberField(0.1 + 0.2)).toBe('0.30000000000000004');
    const fields = ['__proto__', 'a,b', 'x"y', 'line\r\nbreak', '', ' s', '<script>'];
    const back = Papa.parse<string[]>(csvRow(fields), { header: false }).data[0];
    expect(back).toEqual(fields);
  });
});

describe('readPredictions', () => {
  const classes = ['Adelie', 'Chinstrap', 'Gentoo'];
  const P = '/tmp/x/predictions.csv';
  const fails = (text: string, rows: number, cls: string[] | undefined, message: RegExp): void => {
    expect(() => readPredictions(text, P, rows, cls)).toThrow(CommandFoldError);
    expect(() => readPredictions(text, P, rows, cls)).toThrow(message);
  };

  it('labels, values, probability columns by name (missing classes are 0), BOM and final line break', () => {
    const l = readPredictions('\uFEFFlabel\nGentoo\nAdelie\n', P, 2, classes);
    expect(l.task === 'classification' && Array.from(l.predicted)).toEqual([2, 0]);
    expect(l.task === 'classification' && l.probs).toBeUndefined();
    const v = readPredictions('y\n1.5\n-2e3', P, 2, undefined);
    expect(Array.from(v.predicted)).toEqual([1.5, -2000]);
    const p = readPredictions('Gentoo,Adelie\n0.25,0.75\n1,0\n', P, 2, classes);
    expect(p.task).toBe('classification');
    if (p.task !== 'classification') throw new Error('expected classification predictions');
    expect(Array.from(p.probs!)).toEqual([0.75, 0, 0.25, 0, 0, 1]);
    expect(Array.from(p.predicted)).toEqual([0, 2]);
    // a sum within the tolerance is rescaled to 1
    const q = readPredictions('Adelie,Chinstrap,Gentoo\n0.33333,0.33333,0.33333\n', P, 1, classes);
    expect(q.task).toBe('classification');
    if (q.task !== 'classification') throw new Error('expected classification predictions');
    expect(Math.abs(q.probs!.reduce((s, x) => s + x, 0) - 1)).toBeLessThan(1e-15);
    // ties go to the lower class code, as everywhere in foldwise
    expect(Array.from(q.predicted)).toEqual([0]);
  });

  it('refuses, naming the file and line', () => {
    fails('', 1, classes, /predictions\.csv: is empty/);
    fails('label\nAdelie\n', 2, classes, /has 1 prediction line for 2 test rows/);
    fails('label\nAdelie\n\nGentoo\n', 3, classes, /line 3: has 1 field, the header has|line 3: "" is not a class name/);
    fails('label\nadelie\n', 1, classes, /line 2: "adelie" is not a class name \(classes: Adelie, Chinstrap, Gentoo\)/);
    fails('a,b\n1,2\n', 1, undefined, /line 1: regression predictions are one column of numbers; the header has 2 columns/);
    fails('y\n12abc\n', 1, undefined, /line 2: "12abc" is not a finite number/);
    fails('y\nInfinity\n', 1, undefined, /line 2: "Infinity" is not a finite number/);
    fails('Adelie,Other\n0.5,0.5\n', 1, classes, /line 1: column "Other" is not a class name/);
    fails('Adelie,Adelie\n0.5,0.5\n', 1, classes, /line 1: class "Adelie" has two columns/);
    fails('Adelie,Gentoo\n0.5,0.5,0\n', 1, classes, /line 2: has 3 fields, the header has 2/);
    fails('Adelie,Gentoo\n1.5,-0.5\n', 1, classes, /line 2: column "Adelie": "1.5" is not a probability from 0 to 1/);
    fails('Adelie,Gentoo\n0.5,0.4\n', 1, classes, /line 2: the probabilities sum to 0.9, not 1/);
    fails('label\n"Adelie\n', 1, classes, /broken quoting/);
  });
});

describe('--command NAME=PROGRAM', () => {
  const env = { PATH: process.env.PATH };
  it('splits words, resolves ./ and ../ words against the base folder, reads the JSON form', () => {
    const p = parseCommandProgram('fit=node ./test/learners/command/share-program.mjs --flag ../x', ROOT, env);
    expect(p.name).toBe('fit');
    expect(p.argv).toEqual(['node', join(ROOT, 'test/learners/command/share-program.mjs'), '--flag', resolve(ROOT, '../x')]);
    expect(p.written).toBe('node ./test/learners/command/share-program.mjs --flag ../x');
    const j = parseCommandProgram('fit=["node", "./a b.mjs", "$HOME; rm -rf /"]', ROOT, env);
    // no shell: a shell word stays one plain argument
    expect(j.argv).toEqual(['node', join(ROOT, 'a b.mjs'), '$HOME; rm -rf /']);
    const exe = tmp.file('run.sh', '#!/bin/sh\n');
    chmodSync(exe, 0o755);
    expect(parseCommandProgram(`sh=${exe}`, ROOT, {}).argv).toEqual([exe]);
  });
  it('refuses bad names, missing programs, relative programs without ./ and doubled names', () => {
    expect(() => parseCommandProgram('fit', ROOT, env)).toThrow(/expected NAME=PROGRAM/);
    expect(() => parseCommandProgram('fit=', ROOT, env)).toThrow(/no program after "="/);
    expect(() => parseCommandProgram('fit=[]', ROOT, env)).toThrow(/non-empty JSON array/);
    expect(() => parseCommandProgram('fit=bin/tool', ROOT, env)).toThrow(/explicit path \(\.\/bin\/tool\)/);
    expect(() => parseCommandProgram('fit=node', ROOT, {})).toThrow(/"node" is not found on PATH/);
    expect(() => parseCommandProgram('fit=./README.md', ROOT, env)).toThrow(/is not an executable file/);
    expect(() => parseCommandProgram('fit=node', 'relative', env)).toThrow(/not absolute/);
    expect(() => parseCommandPrograms(['a=node', 'a=node'], ROOT, env)).toThrow(/"a" is defined twice/);
  });
});

describe('the command learner as a learner', () => {
  const program = parseCommandProgram(`shares=${process.execPath} ./test/learners/command/share-program.mjs`, ROOT, {});
  const learner = commandLearner(program, { programs: [program], env: {}, tempRoot: tmp.dir, keepTemp: false });
  const X: Matrix = { rows: 4, cols: 1, data: Float64Array.from([1, 2, 3, 4]) };
  const Xtest: Matrix = { rows: 2, cols: 1, data: Float64Array.from([5, 6]) };
  const fold: FoldView = { label: 'r1.f1', test: Xtest, columns: ['x'], target: 'y', rawCsv: () => 'x\n' };

  it('validates options: declared ones by kind, free ones as text with checked names', () => {
    const params = resolveParams(learner, parseLearnerSpec('command:shares;timeout=5,prep=raw,depth=3'), 'classification');
    expect(params).toMatchObject({ timeout: 5, prep: 'raw', depth: '3' });
    expect(formatSpec(learner, params)).toBe('command:shares;timeout=5,prep=raw,depth=3');
    expect(() => resolveParams(learner, parseLearnerSpec('command:shares;timeout=0'), 'regression')).toThrow(/must be greater than 0/);
    expect(() => resolveParams(learner, parseLearnerSpec('command:shares;prep=cooked'), 'regression')).toThrow(/expected one of foldwise, raw/);
    expect(() => resolveParams(learner, parseLearnerSpec('command:shares;Depth=3'), 'regression')).toThrow(/lower-case letters, digits and -/);
  });

  it('fits through the program, and the model round-trips through JSON (predictions of its fold only)', () => {
    const y = { task: 'classification' as const, codes: Int32Array.from([0, 1, 1, 1]), classes: ['a', 'b'] };
    const params = resolveParams(learner, parseLearnerSpec('command:shares'), 'classification');
    const model = learner.fit(X, y, params, { rng: createRng(1), seed: 7, fold });
    expect(Array.from(model.predict(Xtest))).toEqual([1, 1]);
    // the training shares 1/4 and 3/4, as foldwise's baseline would give
    expect(Array.from(model.probabilities!(Xtest))).toEqual([0.25, 0.75, 0.25, 0.75]);
    const back = learner.load(JSON.parse(JSON.stringify(model.toJSON())));
    expect(Array.from(back.predict(Xtest))).toEqual([1, 1]);
    expect(Array.from(back.probabilities!(Xtest))).toEqual([0.25, 0.75, 0.25, 0.75]);
    expect(() => back.predict(X)).toThrow(/holds the predictions for the 2 test rows of fold r1\.f1 only/);
    expect(() => learner.load({ learner: 'baseline' })).toThrow(/not a saved model of this command learner/);
  });

  it('needs the fold (the runner always gives it)', () => {
    const y = { task: 'regression' as const, values: Float64Array.from([1, 2, 3, 4]) };
    expect(() => learner.fit(X, y, resolveParams(learner, parseLearnerSpec('command:shares'), 'regression'), { rng: createRng(1), seed: 1 })).toThrow(/run inside foldwise's folds only/);
  });
});
