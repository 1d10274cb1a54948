/**
 * command: learners with format=arrow and format=parquet (issue 14): the train and test files
 * are handed over as Arrow IPC or Parquet and read by another process with the formats' own
 * readers (apache-arrow, hyparquet; test/learners/command/typed-share-program.mjs). The outside
 * check is as in command.test.ts: the program predicts as the built-in baseline does, from the
 * files foldwise wrote, so its fold scores must equal the baseline's on the Palmer penguins
 * file (vega-datasets, CC0; Gorman, Williams & Fraser 2014).
 */
import { mkdtempSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { Readable } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/run.js';
import type { Report } from '../../src/model/report.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());

async function foldwise(argv: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const code = await run(argv, {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    stdin: Readable.from([]),
    env: { PATH: process.env.PATH, TMPDIR: mkdtempSync(join(tmp.dir, 'root-')) },
    cwd: ROOT,
  });
  return { code, stdout, stderr };
}

const command = ['--command', `typed=${process.execPath} ./test/learners/command/typed-share-program.mjs`];
const base = ['eval', penguins, '--plan', 'kfold:5', '--json', '-', '--no-timing', '--no-audit', '--quiet', '--jobs', '1'];

describe.each(['arrow', 'parquet'])('command: format=%s', (format) => {
  it.each(['foldwise', 'raw'])('classification with prep=%s: the baseline fold scores from the typed files', async (prep) => {
    const r = await foldwise([...base, '--target', 'Species', '--learner', `command:typed;format=${format},prep=${prep}`, '--metric', 'accuracy', '--metric', 'log-loss', ...command]);
    expect(r.stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
    expect(r.code).toBe(0);
    const rep = JSON.parse(r.stdout) as Report;
    const [b, c] = rep.learners;
    expect(c.spec).toBe(`command:typed;${prep === 'raw' ? 'prep=raw,' : ''}format=${format}`);
    expect(c.folds.length).toBe(5);
    for (let i = 0; i < 5; i++) {
      expect(c.folds[i].scores.accuracy).toBe(b.folds[i].scores.accuracy);
      expect(Math.abs(c.folds[i].scores['log-loss']! - b.folds[i].scores['log-loss']!)).toBeLessThan(1e-12);
    }
  });
  it('regression: the baseline rmse exactly', async () => {
    const r = await foldwise([...base, '--target', 'Body Mass (g)', '--learner', `command:typed;format=${format}`, '--metric', 'rmse', ...command]);
    expect(r.code).toBe(0);
    const [b, c] = (JSON.parse(r.stdout) as Report).learners;
    expect(c.folds.length).toBe(5);
    for (let i = 0; i < 5; i++) expect(c.folds[i].scores.rmse).toBe(b.folds[i].scores.rmse);
  });
});
