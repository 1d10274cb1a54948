/**
 * foldwise growth run the ways eval runs (issue 22): its (fold, size, learner) tasks go through
 * the runner's worker threads, shards and journals, and every way gives the same report byte for
 * byte (growth reports carry no timings). Mismatched journals and parts are refused with what
 * differs; a command: learner (the Node program of test/learners/command/share-program.mjs)
 * runs in growth under the eval protocol. Data: the Palmer penguins file (vega-datasets, CC0;
 * Gorman, Williams & Fraser 2014) and the bundled example; these are mechanics tests.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { Readable } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/run.js';
import type { GrowthReport } from '../../src/growth/growth.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const BIN = join(ROOT, 'dist', 'src', 'cli', 'bin.js');
const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const expectGrowth = schemaCheck('growth.schema.json');
const base = ['growth', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:4', '--sizes', '0.25,0.5,1', '--quiet'];
// 4 folds x 3 sizes x 3 learners (baseline, knn, forest)
const TASKS = 36;

const lines = (path: string): string[] => (existsSync(path) ? readFileSync(path, 'utf8').split('\n').filter(Boolean) : []);

describe('growth with --jobs, shards and journals', () => {
  it('gives the same report byte for byte from --jobs 1, --jobs 2, and three shards merged', async () => {
    const one = await cli([...base, '--jobs', '1', '--json', '-']);
    expect(one.code).toBe(0);
    expect(one.stdout.length).toBeGreaterThan(1000);
    expectGrowth(JSON.parse(one.stdout));
    const two = await cli([...base, '--jobs', '2', '--json', '-']);
    expect(two.code).toBe(0);
    expect(two.stdout).toBe(one.stdout);

    const parts: string[] = [];
    for (const i of [1, 2, 3]) {
      const out = join(tmp.dir, `gpart-${i}.json`);
      const r = await cli([...base, '--jobs', '1', '--shard', `${i}/3`, '--json', out]);
      expect(r.code).toBe(0);
      parts.push(out);
    }
    const counts = parts.map((p) => JSON.parse(readFileSync(p, 'utf8')).records.length as number);
    expect(counts.reduce((a, b) => a + b, 0)).toBe(TASKS);
    expect(counts.every((n) => n > 0)).toBe(true);
    // merged in another order than the shards: the report follows the run's task order, not the files'
    const merged = await cli(['merge', parts[2], parts[0], parts[1], '--json', '-']);
    expect(merged.stderr).toBe('');
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(one.stdout);
    // Markdown and HTML of a merged growth run are the single run's too
    const md = await cli([...base, '--jobs', '1']);
    const mergedMd = await cli(['merge', ...parts]);
    expect(mergedMd.stdout).toContain('## knn');
    expect(mergedMd.stdout).toBe(md.stdout);
    const html = await cli([...base, '--jobs', '1', '--html', '-']);
    expect((await cli(['merge', ...parts, '--html', '-'])).stdout).toBe(html.stdout);

    // a missing shard, a doubled one, and a part of another run (other sizes) are refused
    const missing = await cli(['merge', parts[0], parts[2], '--json', '-']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/merge: \d+ tasks are missing: r\d\.f\d@[\d.]+:/);
    const doubled = await cli(['merge', parts[0], parts[0], parts[1], parts[2], '--json', '-']);
    expect(doubled.code).toBe(2);
    expect(doubled.stderr).toMatch(/doubled/);
    const other = join(tmp.dir, 'gother.json');
    expect((await cli([...base.map((a) => (a === '0.25,0.5,1' ? '0.3,0.5,1' : a)), '--shard', '2/3', '--json', other])).code).toBe(0);
    const mixed = await cli(['merge', parts[0], other, parts[2], '--json', '-']);
    expect(mixed.code).toBe(2);
    expect(mixed.stderr).toMatch(/gother\.json belongs to another run than .*gpart-1\.json: it differs in growth \(.*gother\.json: "0\.3,0\.5,1", .*gpart-1\.json: "0\.25,0\.5,1"\)/);
    const seeded = join(tmp.dir, 'gseed.json');
    expect((await cli([...base, '--seed', '5', '--shard', '2/3', '--json', seeded])).code).toBe(0);
    expect((await cli(['merge', parts[0], seeded, parts[2], '--json', '-'])).stderr).toMatch(/differs in seed/);
    // a part of eval and one of growth are not one run
    const evalPart = join(tmp.dir, 'eval-part.json');
    expect((await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:4', '--no-timing', '--quiet', '--no-audit', '--shard', '1/3', '--json', evalPart])).code).toBe(0);
    const kinds = await cli(['merge', parts[0], evalPart, '--json', '-']);
    expect(kinds.code).toBe(2);
    expect(kinds.stderr).toMatch(/eval-part\.json is a part of foldwise eval and .*gpart-1\.json of foldwise growth/);
    // a shard writes its part to a file only
    expect((await cli([...base, '--shard', '1/3', '--json', '-'])).stderr).toMatch(/--shard: write the part with --json FILE/);
  });

  it('resumes from a journal cut short (a torn last line too) to the uninterrupted report, and refuses the journal of another run', async () => {
    const journal = join(tmp.dir, 'growth.journal');
    const whole = await cli([...base, '--jobs', '1', '--journal', journal, '--json', '-']);
    expect(whole.code).toBe(0);
    const all = lines(journal);
    expect(all.length).toBe(TASKS + 1);
    // the run stopped after 10 tasks, while writing the 11th
    const cut = join(tmp.dir, 'growth-cut.journal');
    writeFileSync(cut, `${all.slice(0, 11).join('\n')}\n${all[11].slice(0, 40)}`);
    const resumed = await cli([...base.filter((a) => a !== '--quiet'), '--jobs', '2', '--journal', cut, '--json', '-']);
    expect(resumed.code).toBe(0);
    expect(resumed.stderr).toMatch(new RegExp(`resumed 10 of ${TASKS} tasks from the journal`));
    expect(resumed.stdout).toBe(whole.stdout);
    const ids = lines(cut).slice(1).map((l) => JSON.parse(l).id as string);
    expect(ids.length).toBe(TASKS);
    expect(new Set(ids).size).toBe(TASKS);

    const seed = await cli([...base, '--seed', '9', '--journal', journal, '--json', '-']);
    expect(seed.code).toBe(2);
    expect(seed.stderr).toMatch(/--journal .*growth\.journal: it belongs to another run, which differs in seed \(1 vs 9\); use a new journal file/);
    const sizes = await cli([...base.map((a) => (a === '0.25,0.5,1' ? '0.25,1' : a)), '--journal', journal, '--json', '-']);
    expect(sizes.code).toBe(2);
    expect(sizes.stderr).toMatch(/differs in growth \("0\.25,0\.5,1" vs "0\.25,1"\)/);
    // the journal of an eval run with the same data, plan and learners is not a growth journal
    const evalJournal = join(tmp.dir, 'eval.journal');
    const evalArgs = ['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:4', '--no-timing', '--quiet', '--no-audit', '--json', join(tmp.dir, 'e.json')];
    expect((await cli([...evalArgs, '--journal', evalJournal])).code).toBe(0);
    const crossed = await cli([...base, '--journal', evalJournal, '--json', '-']);
    expect(crossed.code).toBe(2);
    expect(crossed.stderr).toMatch(/differs in .*growth \(none vs "0\.25,0\.5,1"\)/);
  });

  it('resumes after SIGKILL to the report of an uninterrupted run', async () => {
    const journal = join(tmp.dir, 'killed.journal');
    const args = ['growth', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--learner', 'forest:trees=30', '--plan', 'kfold:5', '--sizes', '0.25,0.5,1', '--jobs', '1', '--quiet'];
    const whole = await cli([...args, '--json', '-']);
    expect(whole.code).toBe(0);
    const child = spawn(process.execPath, [BIN, ...args, '--journal', journal, '--json', join(tmp.dir, 'killed.json')], { stdio: 'ignore', cwd: ROOT });
    await new Promise<void>((done, fail) => {
      const timer = setInterval(() => {
        if (lines(journal).length >= 6) {
          child.kill('SIGKILL');
          clearInterval(timer);
          done();
        }
      }, 5);
      child.on('exit', () => {
        clearInterval(timer);
        fail(new Error(`the run ended before it could be killed (journal had ${lines(journal).length} lines)`));
      });
    });
    await new Promise((r) => child.on('exit', r));
    expect(existsSync(join(tmp.dir, 'killed.json'))).toBe(false);
    const afterKill = lines(journal).length;
    // 5 folds x 3 sizes x 2 learners = 30 tasks + header: it was killed partway
    expect(afterKill).toBeLessThan(31);
    const resumed = await cli([...args.filter((a) => a !== '--quiet'), '--journal', journal, '--json', '-']);
    expect(resumed.code).toBe(0);
    expect(resumed.stderr).toMatch(/resumed \d+ of 30 tasks from the journal/);
    expect(resumed.stdout).toBe(whole.stdout);
  });
});

const PROGRAM = join(ROOT, 'test/learners/command/share-program.mjs');
const command = ['--command', `shares=${process.execPath} ./test/learners/command/share-program.mjs`];

/** The CLI in-process with a real environment: TMPDIR points into this test's folder (as test/cli/command.test.ts does). */
async function foldwise(argv: string[], tempRoot: string): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const code = await run(argv, {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    stdin: Readable.from([]),
    env: { PATH: process.env.PATH, TMPDIR: tempRoot },
    cwd: ROOT,
  });
  return { code, stdout, stderr };
}

describe('command: learners in growth', () => {
  it('run per fold and size through the file protocol and score as the built-in baseline does, with no training score', async () => {
    expect(existsSync(PROGRAM)).toBe(true);
    const root = join(tmp.dir, 'cmd-root');
    mkdirSync(root);
    const seen = join(tmp.dir, 'seen.jsonl');
    const args = ['growth', penguins, '--target', 'Species', '--drop', 'Island', '--plan', 'kfold:3', '--sizes', '0.2,0.6,1', '--metric', 'accuracy', '--quiet', '--json', '-', '--learner', `command:shares;inspect=${seen}`, ...command];
    const r = await foldwise([...args, '--jobs', '1'], root);
    expect(r.stderr.split('\n').filter((l) => l && !l.includes('warning'))).toEqual([]);
    expect(r.code).toBe(0);
    const rep = JSON.parse(r.stdout) as GrowthReport;
    expectGrowth(rep);
    expect(rep.learners.map((l) => l.spec)).toEqual(['baseline', `command:shares;inspect=${seen}`]);
    const [baseline, shares] = rep.learners;
    expect(shares.points.length).toBe(3);
    // the outside check: the program predicts the training class shares, as the baseline does,
    // from the files foldwise wrote for each subset; its test scores equal the baseline's fold by fold
    for (let si = 0; si < 3; si++) {
      expect(shares.points[si].folds.length).toBe(3);
      expect(shares.points[si].folds.map((f) => f.test)).toEqual(baseline.points[si].folds.map((f) => f.test));
      expect(shares.points[si].folds.map((f) => f.rows)).toEqual(baseline.points[si].folds.map((f) => f.rows));
      // its model holds the test rows' predictions only: no training score
      expect(shares.points[si].train).toBeNull();
      expect(shares.points[si].folds.every((f) => f.train === null)).toBe(true);
      expect(baseline.points[si].train).not.toBeNull();
    }
    expect(rep.warnings.some((w) => w.includes('no training scores (its program predicts the test rows only)'))).toBe(true);
    // the program saw each subset: 3 folds x 3 sizes, its training rows the size's rows, labelled fold@size
    const runs = lines(seen).map((l) => JSON.parse(l) as { fold: string; trainRows: number; job: { trainRows: number } });
    expect(runs.length).toBe(9);
    const byLabel = new Map(runs.map((s) => [s.fold, s.trainRows]));
    expect(byLabel.get('r1.f1@0.2')).toBe(shares.points[0].folds[0].rows);
    expect(byLabel.get('r1.f3@1')).toBe(shares.points[2].folds[2].rows);
    expect(runs.every((s) => s.job.trainRows === s.trainRows)).toBe(true);
    // every fold folder is gone afterwards
    expect(readdirSync(root)).toEqual([]);
    // on worker threads the same report, byte for byte (the program is not run for the seen file again)
    const two = await foldwise([...args.map((a) => (a.includes('inspect=') ? 'command:shares' : a)), '--jobs', '2'], root);
    const one = await foldwise([...args.map((a) => (a.includes('inspect=') ? 'command:shares' : a)), '--jobs', '1'], root);
    expect(two.code).toBe(0);
    expect(two.stdout).toBe(one.stdout);
    // the program is part of the run: a journal of another program for the same name is refused
    const journal = join(tmp.dir, 'cmd.journal');
    const plain = args.map((a) => (a.includes('inspect=') ? 'command:shares' : a));
    expect((await foldwise([...plain, '--jobs', '1', '--journal', journal], root)).code).toBe(0);
    const changed = await foldwise([...plain.slice(0, -2), '--command', `shares=${process.execPath} ./test/learners/command/typed-share-program.mjs`, '--jobs', '1', '--journal', journal], root);
    expect(changed.code).toBe(2);
    expect(changed.stderr).toMatch(/differs in programs/);
  });

  it('a program that fails a fold stops the run, or with --on-fold-error skip leaves that point out and says so', async () => {
    const root = join(tmp.dir, 'cmd-fail');
    mkdirSync(root);
    const args = ['growth', penguins, '--target', 'Species', '--drop', 'Island', '--plan', 'kfold:3', '--sizes', '0.5,1', '--metric', 'accuracy', '--quiet', '--json', '-', '--jobs', '1', '--learner', 'command:shares;mode=crash', ...command];
    const failed = await foldwise(args, root);
    expect(failed.code).not.toBe(0);
    expect(failed.stderr).toMatch(/^foldwise: command:shares fold r1\.f1@0\.5: the program exited with status 3/);
    const skipped = await foldwise([...args, '--on-fold-error', 'skip'], root);
    expect(skipped.code).toBe(0);
    const rep = JSON.parse(skipped.stdout) as GrowthReport;
    expect(rep.learners[1].points.every((p) => p.test === null)).toBe(true);
    expect(rep.warnings.some((w) => /^6 tasks failed and are left out of the curves: /.test(w))).toBe(true);
  });
});

describe('probability metrics in growth', () => {
  it('score models that give probabilities (log-loss is defined on every fold)', async () => {
    const r = await cli(['growth', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:3', '--sizes', '0.5,1', '--metric', 'log-loss', '--quiet', '--json', '-', '--jobs', '1']);
    expect(r.code).toBe(0);
    const rep = JSON.parse(r.stdout) as GrowthReport;
    expect(rep.higherIsBetter).toBe(false);
    const knn = rep.learners.find((l) => l.name === 'knn')!;
    expect(knn.points.length).toBe(2);
    for (const p of knn.points) {
      expect(p.folds.length).toBe(3);
      expect(p.folds.every((f) => typeof f.test === 'number' && f.test > 0)).toBe(true);
    }
  });
});
