/**
 * readReport and schemaPath (src/compare/read-report.ts) on files written by the test: every
 * refusal is one InputError line naming the file; a valid report (schema/report.schema.json,
 * checked again here with the test helper's own ajv) comes back with its text byte for byte.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readReport, schemaPath } from '../../src/compare/read-report.js';
import { InputError } from '../../src/errors.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';
import { fold, foldsOf, learner, makeReport, tweak } from './report-samples.js';

const tmp = tempFolder();
const good = () => makeReport([learner('baseline', foldsOf('accuracy', [0.5, 0.6])), learner('knn', foldsOf('accuracy', [0.8, 0.7]))]);
const read = (name: string, content: string) => () => readReport(tmp.file(name, content), '--previous');

describe('schemaPath', () => {
  it('finds a schema file of the package above this module and names the folder when there is none', () => {
    const p = schemaPath('report.schema.json');
    expect(p.endsWith(join('schema', 'report.schema.json'))).toBe(true);
    expect(() => schemaPath('no-such.schema.json')).toThrow(/^schema\/no-such\.schema\.json not found above .*src[/\\]compare$/);
  });
});

describe('readReport', () => {
  it('returns a valid report with its path and its text as read, a byte-order mark included', () => {
    const r = good();
    schemaCheck('report.schema.json')(r);
    const text = `\uFEFF${JSON.stringify(r, null, 2)}\n`;
    const path = tmp.file('good.json', text);
    const loaded = readReport(path, '--previous');
    expect(loaded.path).toBe(path);
    expect(loaded.text).toBe(text);
    expect(loaded.report).toEqual(r);
  });

  it('strips only a leading byte-order mark: one inside a string value stays', () => {
    const r = tweak(good(), (x) => (x.data.path = 'a\uFEFFb.csv'));
    const loaded = readReport(tmp.file('inner-bom.json', JSON.stringify(r)), '--previous');
    expect(loaded.report.data.path).toBe('a\uFEFFb.csv');
  });

  it('refuses a missing file and a folder, naming the label, the path and the error code', () => {
    const missing = join(tmp.dir, 'missing.json');
    expect(() => readReport(missing, '--previous')).toThrow(InputError);
    expect(() => readReport(missing, '--previous')).toThrow(
      `--previous ${missing}: cannot be read (ENOENT); give the path of a JSON report written by foldwise eval --json`,
    );
    const folder = join(tmp.dir, 'a-folder');
    mkdirSync(folder);
    expect(() => readReport(folder, 'current')).toThrow(`current ${folder}: cannot be read (EISDIR)`);
  });

  it('refuses text that is not JSON with the parser\'s message on one line', () => {
    // V8 (Node 20) quotes the bad text, newlines and runs of blanks included: 'Unexpected token 'x', "[1,\n\n\n   x" is not valid JSON'
    const f = tmp.file('broken.json', '[1,\n\n\n \t x');
    let message = '';
    try {
      readReport(f, '--previous');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      message = (e as Error).message;
    }
    expect(message.startsWith(`--previous ${f}: not JSON (`)).toBe(true);
    expect(message.endsWith('); give a report written by foldwise eval --json')).toBe(true);
    expect(message).toContain(`not JSON (Unexpected token 'x', "[1, x" is not valid JSON)`);
    expect(message).not.toMatch(/\n|\t|  /);
  });

  it('refuses JSON that is not an object', () => {
    for (const [name, text] of [['null.json', 'null'], ['array.json', '[1]'], ['number.json', '5'], ['string.json', '"foldwise-report/2"']]) {
      expect(read(name, text)).toThrow(`--previous ${join(tmp.dir, name)}: not a foldwise eval report (the JSON is not an object)`);
    }
  });

  it('refuses another or a missing schema field, and names an old format of the family', () => {
    const r = good();
    expect(read('other.json', JSON.stringify({ ...r, schema: 'foldwise-gate/2' }))).toThrow(
      `--previous ${join(tmp.dir, 'other.json')}: not a foldwise eval report (its "schema" field is "foldwise-gate/2", expected "foldwise-report/2")`,
    );
    const { schema: _drop, ...noSchema } = r;
    expect(read('none.json', JSON.stringify(noSchema))).toThrow('(its "schema" field is missing, expected "foldwise-report/2")');
    const long = 'x'.repeat(100);
    expect(read('long-schema.json', JSON.stringify({ ...r, schema: long }))).toThrow(`(its "schema" field is "${'x'.repeat(59)}…, expected`);
    // 58 letters and two quotes: 60 characters, the most that is shown whole
    expect(read('sixty.json', JSON.stringify({ ...r, schema: 'y'.repeat(58) }))).toThrow(`(its "schema" field is "${'y'.repeat(58)}", expected`);
    expect(read('old.json', JSON.stringify({ ...r, schema: 'foldwise-report/1' }))).toThrow(
      `--previous ${join(tmp.dir, 'old.json')}: format foldwise-report/1 is from foldwise 0.1, before metrics, learner options and plan kinds were renamed; this foldwise reads foldwise-report/2: rerun foldwise eval with --json to write one`,
    );
  });

  it('refuses a report that breaks the schema, naming where and what, "/" at the top level', () => {
    const { tool: _t, ...noTool } = good();
    expect(read('no-tool.json', JSON.stringify(noTool))).toThrow(
      `--previous ${join(tmp.dir, 'no-tool.json')}: not a valid foldwise-report/2 report (at /: must have required property 'tool')`,
    );
    const badFold = tweak(good(), (x) => (x.learners[1].folds[0].testRows = 0));
    expect(read('bad-fold.json', JSON.stringify(badFold))).toThrow('not a valid foldwise-report/2 report (at /learners/1/folds/0/testRows: must be >= 1)');
    // a score named "x " (trailing blank): the place is shown trimmed
    const blank = tweak(good(), (x) => (x.learners[0].folds[0].scores['x '] = 'high'));
    expect(read('blank.json', JSON.stringify(blank))).toThrow('not a valid foldwise-report/2 report (at /learners/0/folds/0/scores/x: must be number,null)');
  });

  it('refuses scores outside their metric\'s range after the schema check', () => {
    const r = tweak(good(), (x) => (x.learners[1].folds = [fold(0, { accuracy: 1.25 })]));
    expect(read('range.json', JSON.stringify(r))).toThrow(
      `--previous ${join(tmp.dir, 'range.json')}: knn fold r1.f1 has accuracy = 1.25, outside the range [0, 1]`,
    );
  });
});
