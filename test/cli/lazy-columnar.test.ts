/**
 * The Parquet and Arrow libraries load only when a run reads or writes such a file (issue 14:
 * about 16 MB of the main thread's memory and 7 MB of each worker's when loaded). Each run is a
 * child process of the built CLI with a resolve hook (fixtures/record-modules.mjs) that logs every
 * module resolved, workers included. Data: the bundled packhouse example (invented for the demo).
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { tempFolder } from '../helpers/tmp.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const bin = join(root, 'dist', 'src', 'cli', 'bin.js');
const hook = join(root, 'test', 'cli', 'fixtures', 'record-modules.mjs');
const data = join(root, 'examples', 'packhouse', 'fruit-grading.csv');
const tmp = tempFolder();
const HEAVY = /node_modules\/(apache-arrow|hyparquet|hyparquet-writer|hyparquet-compressors)\//;

function modulesOf(name: string, args: string[]): string[] {
  const log = join(tmp.dir, `${name}.log`);
  execFileSync(process.execPath, ['--import', hook, bin, ...args], { env: { ...process.env, FOLDWISE_TEST_MODULE_LOG: log }, stdio: 'pipe' });
  return readFileSync(log, 'utf8').split('\n').filter(Boolean);
}

describe('the columnar libraries load on demand', () => {
  const base = ['--target', 'grade', '--drop', 'lot_id', '--learner', 'forest:trees=5', '--no-baseline', '--plan', 'kfold:3', '--quiet'];

  it('an eval of a CSV on two worker threads resolves none of them', () => {
    const mods = modulesOf('csv', ['eval', data, ...base, '--jobs', '2', '--json', join(tmp.dir, 'r.json')]);
    expect(mods.some((u) => u.endsWith('/dist/src/run/worker.js'))).toBe(true);
    expect(mods.filter((u) => HEAVY.test(u))).toEqual([]);
  });

  it('a split to Arrow parts, and an eval of one of them with Arrow predictions, load the libraries they need', () => {
    const out = join(tmp.dir, 'parts');
    const split = modulesOf('split', ['split', data, '--target', 'grade', '--plan', 'holdout:0.6/0.2/0.2', '--out', out, '--format', 'arrow']);
    expect(split.some((u) => /node_modules\/apache-arrow\//.test(u))).toBe(true);
    const part = join(out, 'train.arrow');
    const mods = modulesOf('arrow', ['eval', part, ...base, '--predictions', join(tmp.dir, 'p.parquet'), '--json', join(tmp.dir, 'a.json')]);
    expect(mods.some((u) => /node_modules\/apache-arrow\//.test(u))).toBe(true);
    expect(mods.some((u) => /node_modules\/hyparquet-writer\//.test(u))).toBe(true);
  });
});
