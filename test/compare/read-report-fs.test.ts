/**
 * readReport and schemaPath (src/compare/read-report.ts) with node:fs watched: the schema is read
 * and compiled once, however many reports are read; the walk up to schema/ looks at most six
 * folders, nearest first; a read error without an error code still gives one line. The module's
 * own node:fs functions are the real ones, wrapped in vi.fn so a test can count or replace a call.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, parse } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { readReport, schemaPath } from '../../src/compare/read-report.js';
import { tempFolder } from '../helpers/tmp.js';
import { foldsOf, learner, makeReport } from './report-samples.js';

vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  return { ...fs, readFileSync: vi.fn(fs.readFileSync), existsSync: vi.fn(fs.existsSync) };
});

const tmp = tempFolder();
const report = () => makeReport([learner('knn', foldsOf('accuracy', [0.8, 0.7]))]);

afterEach(() => {
  vi.mocked(readFileSync).mockClear();
  vi.mocked(existsSync).mockClear();
});

describe('readReport with node:fs watched', () => {
  it('reads and compiles the schema at most once for any number of reports, and Ajv logs no strict-mode warning', () => {
    const warn = vi.spyOn(console, 'warn');
    const a = tmp.file('a.json', JSON.stringify(report()));
    const b = tmp.file('b.json', JSON.stringify(report()));
    readReport(a, 'first');
    readReport(b, 'second');
    readReport(a, 'third');
    const schemaReads = vi.mocked(readFileSync).mock.calls.filter(([p]) => String(p).endsWith('report.schema.json'));
    // once if this module compiled it here, none if an earlier test of the file already had
    expect(schemaReads.length).toBeLessThanOrEqual(1);
    expect(warn.mock.calls.filter((c) => String(c[0]).includes('strict mode'))).toEqual([]);
    warn.mockRestore();
  });

  it('names a read error that has no error code "error"', () => {
    const path = tmp.file('c.json', JSON.stringify(report()));
    vi.mocked(readFileSync).mockImplementationOnce(() => {
      throw new Error('disk on fire');
    });
    expect(() => readReport(path, 'current')).toThrow(`current ${path}: cannot be read (error); give the path of a JSON report written by foldwise eval --json`);
  });
});

describe('schemaPath with node:fs watched', () => {
  it('looks in schema/ of this module\'s folder and then of each folder above, six at most, stopping at the root', () => {
    let message = '';
    try {
      schemaPath('no-such.schema.json');
    } catch (e) {
      message = (e as Error).message;
    }
    const from = message.replace(/^schema\/no-such\.schema\.json not found above /, '');
    expect(from).not.toBe(message);
    const folders: string[] = [from];
    while (folders.length < 6 && folders[folders.length - 1] !== parse(from).root) folders.push(dirname(folders[folders.length - 1]));
    const looked = vi.mocked(existsSync).mock.calls.map(([p]) => String(p));
    expect(looked).toEqual(folders.map((f) => join(f, 'schema', 'no-such.schema.json')));
  });
});
