/**
 * `tune --jobs N` (issue 19): the nested search on worker threads gives the report one thread
 * gives, byte for byte with --no-timing, for learners with shared fold work (kNN neighbour
 * lists, forest tree prefixes, boost round prefixes) and without (logistic), on a class target
 * and a numeric one, with a holdout, and for command: learners; jobs > 1 really runs on several
 * workers; a stop signal ends the run with 130 and writes nothing.
 *
 * Data: the Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014,
 * PLoS ONE 9(3):e90081). The check is against the single-thread run of the same code (the
 * property promised is equality across --jobs, not a value).
 *
 * Worker threads run the built copy in dist/: run `npm run build` before this file alone.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { availableParallelism } from 'node:os';
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/run.js';
import { loadTable } from '../../src/data/load-table.js';
import { tuneOnThreads } from '../../src/search/tune-threads.js';
import { tune } from '../../src/search/tune.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const SMALL = ['--plan', 'kfold:3', '--inner', 'kfold:2', '--no-timing', '--quiet'];
const CLASS = ['tune', penguins, '--target', 'Species', '--drop', 'Island', ...SMALL];
const NUMERIC = ['tune', penguins, '--target', 'Body Mass (g)', '--drop', 'Island', ...SMALL];

/** The JSON report, the Markdown, the HTML page and the predictions file of one run with --jobs `jobs`. */
async function outputs(args: readonly string[], jobs: string, tag: string): Promise<string[]> {
  const dir = join(tmp.dir, `${tag}-j${jobs}`);
  mkdirSync(dir, { recursive: true });
  const files = ['tune.json', 'tune.md', 'tune.html', 'preds.csv'].map((f) => join(dir, f));
  const r = await cli([...args, '--jobs', jobs, '--json', files[0], '--markdown', files[1], '--html', files[2], '--predictions', files[3]]);
  expect(r.stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
  expect(r.code).toBe(0);
  return files.map((f) => readFileSync(f, 'utf8'));
}

async function expectSameAcrossJobs(args: readonly string[], tag: string): Promise<void> {
  const one = await outputs(args, '1', tag);
  const two = await outputs(args, '2', tag);
  expect(one[0].length).toBeGreaterThan(1000);
  expect(two[0]).toBe(one[0]);
  expect(two[1]).toBe(one[1]);
  expect(two[2]).toBe(one[2]);
  expect(two[3]).toBe(one[3]);
}

describe('tune --jobs gives the report of --jobs 1, byte for byte', () => {
  it('kNN (shared neighbour lists) on the species', async () => {
    await expectSameAcrossJobs([...CLASS, '--learner', 'knn:k=1|5|15,vote=equal|inverse'], 'knn');
  });
  it('forest (shared tree prefixes) on the species, with a holdout', async () => {
    await expectSameAcrossJobs([...CLASS, '--learner', 'forest:trees=4|8|16', '--holdout', '0.2'], 'forest');
  });
  it('boost (shared round prefixes) on the species', async () => {
    await expectSameAcrossJobs([...CLASS, '--learner', 'boost:rounds=5|15,depth=2|3'], 'boost');
  });
  it('logistic (one fit per candidate) and kNN together on the species, one-se pick', async () => {
    await expectSameAcrossJobs([...CLASS, '--learner', 'logistic:l2=0.01|1|100', '--learner', 'knn:k=3|9', '--pick', 'one-se'], 'logistic');
  });
  it('kNN, forest and boost on a numeric target (body mass)', async () => {
    await expectSameAcrossJobs([...NUMERIC, '--learner', 'knn:k=3|9', '--learner', 'forest:trees=4|8', '--learner', 'boost:rounds=5|10'], 'numeric');
  });
  it('a repeated outer plan', async () => {
    await expectSameAcrossJobs(['tune', penguins, '--target', 'Species', '--drop', 'Island', '--plan', 'kfold:3x2', '--inner', 'kfold:2', '--no-timing', '--quiet', '--learner', 'knn:k=1|7'], 'repeated');
  });
});

describe('tune --jobs runs on worker threads', () => {
  it('uses two workers for --jobs 2 and gives the single-thread report', async () => {
    const table = await loadTable({ path: penguins });
    const options = { target: 'Species', drop: ['Island'], plan: 'kfold:3', inner: 'kfold:2', learners: ['knn:k=1|5|15'], timing: false, audit: false };
    const threaded = await tuneOnThreads(table, options, { jobs: 2 });
    // 4 pieces (3 outer folds and the recommendation's search) for 2 workers: both take some
    expect(threaded.workers).toBe(2);
    expect(JSON.stringify(threaded.report)).toBe(JSON.stringify(tune(table, options)));
  });

  it('gives a refusal as one thread does (the first outer fold whose pick fails)', async () => {
    // roc-auc needs both classes in a test fold: with leave-one-out inner folds it is undefined everywhere
    const args = ['tune', penguins, '--target', 'Sex', '--drop', 'Island', '--missing', '.', '--plan', 'kfold:3', '--inner', 'loo', '--metric', 'roc-auc', '--learner', 'knn:k=1|3', '--no-timing', '--quiet', '--json', '-'];
    const one = await cli([...args, '--jobs', '1']);
    const two = await cli([...args, '--jobs', '2']);
    expect(one.code).toBe(2);
    expect(one.stderr).toMatch(/undefined in every inner fold of outer fold 1/);
    expect(two.code).toBe(one.code);
    expect(two.stderr).toBe(one.stderr);
  });
});

describe('tune --jobs is read as eval reads it', () => {
  it('caps N at the cores unless --over-cores, with one warning line, and refuses 0', async () => {
    const args = [...CLASS, '--learner', 'knn:k=1|5', '--json', '-'];
    const many = await cli([...args, '--jobs', '256']);
    expect(many.code).toBe(0);
    expect(many.stderr.split('\n')[0]).toBe(`foldwise: warning: --jobs 256: capped at the ${availableParallelism()} cores of this machine (add --over-cores to run 256 workers anyway)`);
    expect(many.stderr.match(/capped at/g)?.length).toBe(1);
    expect(many.stdout).toBe((await cli([...args, '--jobs', '1'])).stdout);
    const zero = await cli([...args, '--jobs', '0']);
    expect(zero.code).toBe(2);
    expect(zero.stderr).toMatch(/--jobs 0: expected a whole number from 1 to 256/);
  });
});

describe('tune --jobs with command: learners', () => {
  it('runs the program in the workers and gives the report of --jobs 1', async () => {
    // the foldwise-command/1 test program (test/learners/command/share-program.mjs) predicts the training class shares
    const cwd = process.cwd();
    const go = async (jobs: string): Promise<string> => {
      const root = join(tmp.dir, `cmd-root-${jobs}`);
      mkdirSync(root, { recursive: true });
      let stdout = '';
      let stderr = '';
      const code = await run(
        ['tune', penguins, '--target', 'Species', '--plan', 'kfold:3', '--inner', 'kfold:2', '--metric', 'accuracy', '--learner', 'command:shares;mode=shares|labels', '--learner', 'knn:k=1|5',
          '--json', '-', '--no-timing', '--no-audit', '--quiet', '--jobs', jobs, '--command', `shares=${process.execPath} ./test/learners/command/share-program.mjs`],
        { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) }, stdin: Readable.from([]), env: { PATH: process.env.PATH, TMPDIR: root }, cwd },
      );
      expect(stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
      expect(code).toBe(0);
      return stdout;
    };
    const one = await go('1');
    expect(JSON.parse(one).candidates.length).toBe(4);
    expect(await go('2')).toBe(one);
  });
});

describe('tune --jobs and stop signals', () => {
  it('ends on SIGINT with exit 130 and writes no report', async () => {
    const bin = join(process.cwd(), 'dist', 'src', 'cli', 'bin.js');
    const out = join(tmp.dir, 'stopped.json');
    // a search of several seconds (6.7 s wall here on an idle machine with kfold:10x5): with kfold:10
    // the whole search took 2.1 to 2.3 s, so a signal 1.5 s after its start could come after the end
    const args = ['tune', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'forest:trees=100|200,min-leaf=1|2|3|4', '--plan', 'kfold:10x5', '--inner', 'kfold:5', '--jobs', '2', '--no-timing', '--json', out];
    const child = spawn(process.execPath, [bin, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    let sent = false;
    child.stderr!.on('data', (d) => {
      stderr += d;
      // the count note comes just before the search starts; give the workers a moment to start
      if (!sent && stderr.includes('foldwise: tune:')) {
        sent = true;
        setTimeout(() => child.kill('SIGINT'), 1500);
      }
    });
    const code = await new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
    expect(sent).toBe(true);
    expect(code).toBe(130);
    expect(stderr).toMatch(/foldwise: SIGINT: stopping/);
    expect(stderr).toMatch(/tune: stopped \(SIGINT\); nothing was written/);
    expect(existsSync(out)).toBe(false);
  }, 60_000);
});
