/**
 * command: learners end to end: a small Node program of the foldwise-command/1 protocol
 * (test/learners/command/share-program.mjs) run per fold on the Palmer penguins file
 * (vega-datasets, CC0; Gorman, Williams & Fraser 2014).
 *
 * The outside check: the program predicts as foldwise's baseline does (the training class
 * shares, the training mean), but computes that in another process from the CSV files foldwise
 * wrote; its fold scores must equal the built-in baseline's on the same folds. So the files
 * carry every training row and target exactly, the test rows in order, and the predictions
 * come back row for row and class for class. The rest checks the protocol's promises (private
 * folder, absolute paths, working directory, environment, options) and every failure path.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { Readable } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/run.js';
import type { TuneReport } from '../../src/model/tune.js';
import type { Report } from '../../src/model/report.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const PROGRAM = join(ROOT, 'test/learners/command/share-program.mjs');
const expectValid = schemaCheck('report.schema.json');

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const work = tmp.dir;

interface Result {
  code: number;
  stdout: string;
  stderr: string;
}

/** The CLI in-process with a real environment: TMPDIR points into this test's folder. */
async function foldwise(argv: string[], tempRoot: string, extraEnv: Record<string, string> = {}): Promise<Result> {
  let stdout = '';
  let stderr = '';
  const code = await run(argv, {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    stdin: Readable.from([]),
    env: { PATH: process.env.PATH, TMPDIR: tempRoot, ...extraEnv },
    cwd: ROOT,
  });
  return { code, stdout, stderr };
}

let rootCount = 0;
/** A fresh folder for the folds' temporary folders of one run (TMPDIR of the programs). */
function tempRoot(): string {
  const dir = join(work, `root-${++rootCount}`);
  mkdirSync(dir);
  return dir;
}

const command = (name = 'shares'): string[] => ['--command', `${name}=${process.execPath} ./test/learners/command/share-program.mjs`];
const base = ['eval', penguins, '--plan', 'kfold:5', '--json', '-', '--no-timing', '--no-audit', '--quiet', '--jobs', '1'];

function report(r: Result): Report {
  expect(r.stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
  expect(r.code).toBe(0);
  const rep = JSON.parse(r.stdout) as Report;
  expectValid(rep);
  return rep;
}

describe('command: learners reproduce the built-in baseline through the file protocol', () => {
  it('classification: probability files give the baseline fold scores (accuracy exactly, log-loss to 1e-12)', async () => {
    const root = tempRoot();
    const r = await foldwise([...base, '--target', 'Species', '--learner', 'command:shares', '--metric', 'accuracy', '--metric', 'log-loss', ...command()], root);
    const rep = report(r);
    expect(rep.learners.map((l) => l.spec)).toEqual(['baseline', 'command:shares']);
    const [b, c] = rep.learners;
    expect(c.folds.length).toBe(5);
    expect(b.folds.length).toBe(5);
    for (let i = 0; i < 5; i++) {
      expect(c.folds[i].scores.accuracy).toBe(b.folds[i].scores.accuracy);
      expect(Math.abs(c.folds[i].scores["log-loss"]! - b.folds[i].scores["log-loss"]!)).toBeLessThan(1e-12);
    }
    expect(c.confusion).toEqual(b.confusion);
    // every fold's private folder is gone afterwards
    expect(readdirSync(root)).toEqual([]);
  });

  it('regression: a one-column file of training means gives the baseline rmse exactly', async () => {
    const r = await foldwise([...base, '--target', 'Body Mass (g)', '--learner', 'command:shares', '--metric', 'rmse', '--metric', 'mae', ...command()], tempRoot());
    const rep = report(r);
    const [b, c] = rep.learners;
    expect(c.folds.length).toBe(5);
    for (let i = 0; i < 5; i++) {
      expect(c.folds[i].scores.rmse).toBe(b.folds[i].scores.rmse);
      expect(c.folds[i].scores.mae).toBe(b.folds[i].scores.mae);
    }
  });

  it('a label file gives the baseline accuracy and says that probability metrics are not reported', async () => {
    const r = await foldwise([...base, '--target', 'Species', '--learner', 'command:shares;mode=labels', '--metric', 'accuracy', '--metric', 'log-loss', ...command()], tempRoot());
    const rep = report(r);
    const [b, c] = rep.learners;
    expect(c.spec).toBe('command:shares;mode=labels');
    for (let i = 0; i < 5; i++) expect(c.folds[i].scores.accuracy).toBe(b.folds[i].scores.accuracy);
    expect(c.summary["log-loss"]).toBeNull();
    expect(rep.warnings.some((w) => w.includes('command:shares;mode=labels gives no class probabilities'))).toBe(true);
  });
});

describe('command: learners on a holdout plan with --final', () => {
  it('score the holdout once, like the baseline, in a fold labelled final', async () => {
    const seen = join(work, 'inspect-final.jsonl');
    const r = await foldwise(
      ['eval', penguins, '--target', 'Species', '--plan', 'holdout:0.6/0.2/0.2', '--final', '--json', '-', '--no-timing', '--no-audit', '--quiet', '--jobs', '1', '--metric', 'accuracy', '--learner', `command:shares;inspect=${seen}`, ...command()],
      tempRoot(),
    );
    const rep = report(r);
    const [b, c] = rep.learners;
    expect(c.final).toBeDefined();
    expect(c.final!.scores.accuracy).toBe(b.final!.scores.accuracy);
    expect(c.final!.testRows).toBe(b.final!.testRows);
    const folds = readFileSync(seen, 'utf8').trim().split('\n').map((l) => JSON.parse(l).fold as string);
    expect(folds).toEqual(['r1.f1', 'final']);
  });
});

describe('the protocol as the program sees it', () => {
  it('private 0700 folder as working directory, absolute paths, environment, options, job file', async () => {
    const root = tempRoot();
    const seen = join(work, 'inspect-foldwise.jsonl');
    const r = await foldwise(
      [...base, '--target', 'Species', '--no-baseline', '--learner', `command:shares;inspect=${seen},extra-option=a b`, ...command()],
      root,
      // inherited as is, except FOLDWISE_* variables of the caller (a stray MODE would crash it)
      { SHARE_PROGRAM_INHERITED: 'yes', FOLDWISE_OPTION_MODE: 'crash' },
    );
    report(r);
    const lines = readFileSync(seen, 'utf8').trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.length).toBe(5);
    expect(lines.map((l) => l.fold)).toEqual(['r1.f1', 'r1.f2', 'r1.f3', 'r1.f4', 'r1.f5']);
    for (const s of lines) {
      expect(s.dirMode).toBe('700');
      expect(dirname(s.cwd)).toBe(root);
      expect(existsSync(s.cwd)).toBe(false);
      const [train, test, out] = s.argv.slice(-3);
      for (const p of [train, test, out]) expect(isAbsolute(p) && dirname(p) === s.cwd).toBe(true);
      expect([train, test, out].map((p: string) => p.slice(s.cwd.length + 1))).toEqual(['train.csv', 'test.csv', 'predictions.csv']);
      expect(s.protocol).toBe('1');
      expect(s.task).toBe('classification');
      expect(s.target).toBe('Species');
      expect(s.seed).toMatch(/^\d+$/);
      expect(s.extra).toBe('a b');
      expect(s.inherited).toBe('yes');
      expect(s.job).toMatchObject({ protocol: 'foldwise-command/1', learner: 'command:shares', task: 'classification', target: 'Species', classes: ['Adelie', 'Chinstrap', 'Gentoo'], prep: 'foldwise' });
      expect(s.job.options).toEqual({ 'extra-option': 'a b', inspect: seen });
      expect(s.trainRows + s.testRows).toBe(344);
      // prep=foldwise: numbers only, categories one-hot as column=level, target last in train only
      expect(s.trainHeader[s.trainHeader.length - 1]).toBe('Species');
      expect(s.testHeader).toEqual(s.trainHeader.slice(0, -1));
      expect(s.testHeader).toContain('Island=Biscoe');
      expect(s.trainFirst.slice(0, -1).every((v: string) => v !== '' && Number.isFinite(Number(v)))).toBe(true);
      expect(s.trainEmpty).toBe(0);
    }
    // the fold seeds are derived per fold
    expect(new Set(lines.map((l) => l.seed)).size).toBe(5);
  });

  it('prep=raw writes the columns as read: categories as text, missing values as empty fields', async () => {
    const seen = join(work, 'inspect-raw.jsonl');
    const r = await foldwise([...base, '--target', 'Species', '--no-baseline', '--learner', `command:shares;prep=raw,inspect=${seen}`, ...command()], tempRoot());
    report(r);
    const lines = readFileSync(seen, 'utf8').trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.length).toBe(5);
    expect(lines[0].job.prep).toBe('raw');
    expect(lines[0].testHeader).toEqual(['Island', 'Beak Length (mm)', 'Beak Depth (mm)', 'Flipper Length (mm)', 'Body Mass (g)', 'Sex']);
    expect(lines[0].trainHeader).toEqual([...lines[0].testHeader, 'Species']);
    const islands = new Set(lines.flatMap((l) => [l.trainFirst[0], l.testFirst[0]]));
    for (const v of islands) expect(['Biscoe', 'Dream', 'Torgersen']).toContain(v);
    // the penguins file has missing measurements and sexes (vega-datasets: nulls), written as empty fields
    expect(lines.reduce((t, l) => t + l.trainEmpty, 0)).toBeGreaterThan(0);
  });

  it('options are canonical: declared ones first, free ones sorted', async () => {
    const r = await foldwise([...base, '--target', 'Species', '--no-baseline', '--learner', 'command:shares;zeta=1,alpha=2,timeout=30', ...command()], tempRoot());
    expect(report(r).learners[0].spec).toBe('command:shares;timeout=30,alpha=2,zeta=1');
  });
});

describe('failures name the learner, fold, file and line', () => {
  const cases: [string, RegExp][] = [
    ['crash', /command:shares fold r1\.f1: the program exited with status 3; its stderr ends: loading the model \| fatal: the model exploded on purpose \(rerun with --keep-temp to keep its files\)/],
    ['short', /command:shares fold r1\.f1: \/.*predictions\.csv: has \d+ prediction lines for \d+ test rows/],
    ['badclass', /predictions\.csv line 4: "no such class" is not a class name \(classes: Adelie, Chinstrap, Gentoo\)/],
    ['badsum', /predictions\.csv line 2: the probabilities sum to 1\.5, not 1 \(tolerance 0\.0001\)/],
    ['nofile', /the program exited with status 0 but wrote no predictions\.csv; it wrote nothing to stderr/],
  ];
  for (const [mode, message] of cases) {
    it(`mode ${mode}: exit 2 with one line`, async () => {
      const root = tempRoot();
      const r = await foldwise([...base, '--target', 'Species', '--learner', `command:shares;mode=${mode}`, ...command()], root);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      const lines = r.stderr.trim().split('\n');
      expect(lines.length).toBe(1);
      expect(lines[0]).toMatch(/^foldwise: /);
      expect(lines[0]).toMatch(message);
      expect(readdirSync(root)).toEqual([]);
    });
  }

  it('a regression value that is not a number', async () => {
    const r = await foldwise([...base, '--target', 'Body Mass (g)', '--learner', 'command:shares;mode=badnumber', ...command()], tempRoot());
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/predictions\.csv line 3: "abc" is not a finite number/);
  });

  it('timeout= stops a program that runs too long', async () => {
    const r = await foldwise([...base, '--target', 'Species', '--learner', 'command:shares;mode=sleep,timeout=0.5', ...command()], tempRoot());
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/command:shares;timeout=0\.5,mode=sleep fold r1\.f1|command:shares fold r1\.f1/);
    expect(r.stderr).toMatch(/ran out of time \(timeout=0\.5 s\) and was stopped/);
  });

  it('--keep-temp keeps the folder and says where', async () => {
    const root = tempRoot();
    const r = await foldwise([...base, '--target', 'Species', '--learner', 'command:shares;mode=crash', '--keep-temp', ...command()], root);
    expect(r.code).toBe(2);
    const kept = readdirSync(root);
    expect(kept.length).toBe(1);
    expect(kept[0]).toMatch(/^foldwise-shares-r1\.f1-/);
    expect(r.stderr).toContain(`(files kept in ${join(root, kept[0])})`);
    expect(readdirSync(join(root, kept[0])).sort()).toEqual(['job.json', 'stderr.txt', 'stdout.txt', 'test.csv', 'train.csv']);
  });

  it('setup errors: unknown name, program not executable, not on PATH, JSON form', async () => {
    const root = tempRoot();
    let r = await foldwise([...base, '--target', 'Species', '--learner', 'command:other', ...command()], root);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--learner command:other: no program is given for "other"; add --command other=PROGRAM \(given: shares\)/);
    r = await foldwise([...base, '--target', 'Species', '--learner', 'command:x', '--command', 'x=./README.md'], root);
    expect(r.stderr).toMatch(/--command x=\.\/README\.md: \/.*README\.md is not an executable file/);
    r = await foldwise([...base, '--target', 'Species', '--learner', 'command:x', '--command', 'x=no-such-program-here'], root);
    expect(r.stderr).toMatch(/"no-such-program-here" is not found on PATH/);
    r = await foldwise([...base, '--target', 'Species', '--learner', 'command:x', '--command', 'x=["node"'], root);
    expect(r.stderr).toMatch(/not a JSON array of strings/);
    r = await foldwise([...base, '--target', 'Species', '--learner', 'command:x', '--command', 'X=node'], root);
    expect(r.stderr).toMatch(/expected NAME=PROGRAM with a lower-case NAME/);
    // the JSON form takes words with spaces; bare names are found on PATH
    r = await foldwise([...base, '--target', 'Species', '--no-baseline', '--learner', 'command:x', '--command', 'x=["node", "./test/learners/command/share-program.mjs"]'], root);
    expect(r.code).toBe(0);
  });
});

describe('--on-fold-error skip', () => {
  it('records the failed fold, scores the others, warns, and the gate refuses the report', async () => {
    const root = tempRoot();
    const spec = 'command:shares;mode=fail-on=r1.f2';
    const r = await foldwise([...base, '--target', 'Species', '--learner', spec, '--metric', 'accuracy', '--on-fold-error', 'skip', ...command()], root);
    const rep = report(r);
    const c = rep.learners[1];
    expect(c.folds.length).toBe(5);
    expect(c.folds[1].failed).toMatch(/fold r1\.f2: the program exited with status 3/);
    expect(c.folds[1].scores.accuracy).toBeNull();
    expect(c.folds.filter((f) => f.failed).length).toBe(1);
    expect(c.summary.accuracy!.n).toBe(4);
    const b = rep.learners[0];
    expect(c.summary.accuracy!.mean).toBeCloseTo((b.folds[0].scores.accuracy! + b.folds[2].scores.accuracy! + b.folds[3].scores.accuracy! + b.folds[4].scores.accuracy!) / 4, 12);
    expect(rep.warnings.some((w) => w.startsWith(`${spec} failed in 1 of 5 folds (r1.f2: `))).toBe(true);
    expect(r.stderr).toMatch(/foldwise: warning: command:shares;mode=fail-on=r1\.f2 failed in 1 of 5 folds/);
    // the paired comparison against the baseline uses the 4 folds both have
    const vs = rep.comparisons?.pairs.find((x) => x.learner === spec && x.against.includes('baseline'));
    expect(vs?.folds).toBe(4);
    expect(vs?.skippedFolds).toBe(1);

    const file = join(work, 'with-failed.json');
    writeFileSync(file, r.stdout);
    // the HTML page says so in its header, and draws the four scored folds
    const html = join(work, 'with-failed.html');
    const h = await foldwise(['render', file, '--html', html], root);
    expect(h.code).toBe(0);
    const page = readFileSync(html, 'utf8');
    const header = page.slice(0, page.indexOf('</header>'));
    expect(header).toContain(`Failed folds: ${spec.replace(/&/g, '&amp;')} failed in 1 of 5 folds (r1.f2)`);

    const g = await foldwise(['gate', '--previous', file, '--current', file, '--learner', spec], root);
    expect(g.code).toBe(2);
    expect(g.stderr).toMatch(/gate: .*with-failed\.json: command:shares;mode=fail-on=r1\.f2 failed in 1 of 5 folds \(repeat 1 fold 2\); fix the learner and rerun before gating; they are not comparable/);
  });
});

describe('command: learners in every way of running', () => {
  const seenFail = join(work, 'inspect-fail-on.jsonl');
  const seenLabels = join(work, 'inspect-labels.jsonl');
  const skipRun = (extra: string[], cmd = command()): string[] => [
    'eval', penguins, '--target', 'Species', '--plan', 'kfold:4', '--no-timing', '--no-audit', '--quiet',
    '--learner', `command:shares;mode=fail-on=r1.f3,inspect=${seenFail}`, '--learner', `command:shares;mode=labels,inspect=${seenLabels}`,
    '--on-fold-error', 'skip', ...cmd, ...extra,
  ];
  const calls = (file: string): string[] => (existsSync(file) ? readFileSync(file, 'utf8').trim().split('\n').map((l) => JSON.parse(l).fold as string) : []);
  const failSpec = `command:shares;inspect=${seenFail},mode=fail-on=r1.f3`;

  it('--jobs 2, shards + merge and a resumed journal give the single run byte for byte; failed tasks are retried, not journaled', async () => {
    const root = tempRoot();
    const single = await foldwise([...skipRun(['--jobs', '1', '--json', '-'])], root);
    expect(single.code).toBe(0);
    const md = await foldwise([...skipRun(['--jobs', '1', '--markdown', '-'])], root);
    expect(md.stdout).toContain(`- **Failed folds: ${failSpec} failed in 1 of 4 folds (r1.f3)**`);
    expect(md.stdout).toMatch(/\| 1 \| 3 \| \d+ \| \d+ \| [0-9.]+ \| failed \| [0-9.]+ \|/);

    // worker threads run the built copy in dist/ (npm test builds first)
    const jobs = await foldwise([...skipRun(['--jobs', '2', '--json', '-'])], root);
    expect(jobs.code).toBe(0);
    expect(jobs.stdout).toBe(single.stdout);

    const parts = [1, 2, 3].map((i) => join(work, `part-${i}.json`));
    for (const [i, p] of parts.entries()) {
      const r = await foldwise([...skipRun(['--jobs', '1', '--shard', `${i + 1}/3`, '--json', p])], root);
      expect(r.code).toBe(0);
    }
    const merged = await foldwise(['merge', ...parts, '--json', '-', '--no-timing'], root);
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(single.stdout);

    const journal = join(work, 'journal.jsonl');
    const first = await foldwise([...skipRun(['--jobs', '1', '--journal', journal, '--json', '-'])], root);
    expect(first.stdout).toBe(single.stdout);
    const ids = readFileSync(journal, 'utf8').trim().split('\n').slice(1).map((l) => JSON.parse(l).id as string);
    // 3 learners x 4 folds, minus the one failed task
    expect(ids.length).toBe(11);
    expect(ids).not.toContain(`r1.f3:${failSpec}`);
    const failBefore = calls(seenFail).length;
    const labelsBefore = calls(seenLabels).length;
    const again = await foldwise([...skipRun(['--jobs', '1', '--journal', journal, '--json', '-'])], root);
    expect(again.stdout).toBe(single.stdout);
    // the resumed run starts the program for the failed task only
    expect(calls(seenFail).slice(failBefore)).toEqual(['r1.f3']);
    expect(calls(seenLabels).length).toBe(labelsBefore);
    // another program under the same name is another run: the journal refuses it
    const other = await foldwise(skipRun(['--jobs', '1', '--journal', journal, '--json', '-'], ['--command', `shares=["${process.execPath}", "./test/learners/command/share-program.mjs", "--x"]`]), root);
    expect(other.code).toBe(2);
    expect(other.stderr).toMatch(/it belongs to another run, which differs in programs/);
  });
});

describe('command: learners in tune', () => {
  it('searches a free option as a list; the outer estimate of a learner that ignores it equals the baseline on the same outer folds', async () => {
    const r = await foldwise(
      ['tune', penguins, '--target', 'Species', '--plan', 'kfold:3', '--inner', 'kfold:2', '--metric', 'accuracy', '--learner', 'command:shares;mode=shares|labels', '--json', '-', '--no-timing', '--no-audit', ...command()],
      tempRoot(),
    );
    expect(r.code).toBe(0);
    const rep = JSON.parse(r.stdout) as TuneReport;
    expect(rep.candidates.map((c) => c.spec)).toEqual(['command:shares;mode=shares', 'command:shares;mode=labels']);
    expect(rep.outer.folds.length).toBe(3);
    // tune fits the built-in baseline on the same outer folds: every fold a tie, difference 0
    const pair = rep.comparisons?.pairs[0];
    expect(pair?.folds).toBe(3);
    expect(pair?.ties).toBe(3);
    expect(pair?.diff).toBe(0);
  });
});
