/**
 * Scale-out guarantees (issue 8): the same report, byte for byte with --no-timing, whatever the
 * number of worker threads, whether run whole or as shards merged afterwards, and whether run in
 * one go or killed and resumed from a journal. Data: the Palmer penguins file (vega-datasets;
 * Gorman et al. 2014) and the bundled example.
 */
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { readFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const base = ['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:5x2', '--no-timing', '--quiet'];

describe('worker threads', () => {
  it('give byte-identical reports for --jobs 1, 2 and 3', async () => {
    const outs = [];
    for (const jobs of ['1', '2', '3']) {
      const r = await cli([...base, '--jobs', jobs, '--json', '-']);
      expect(r.code).toBe(0);
      outs.push(r.stdout);
    }
    expect(outs[0].length).toBeGreaterThan(1000);
    expect(outs[1]).toBe(outs[0]);
    expect(outs[2]).toBe(outs[0]);
  });
});

describe('shards and merge', () => {
  it('merge three shards into the report a single run writes, byte for byte', async () => {
    const whole = await cli([...base, '--jobs', '1', '--json', '-']);
    const parts = [];
    for (const i of [1, 2, 3]) {
      const out = join(tmp.dir, `part-${i}.json`);
      const r = await cli([...base, '--jobs', '1', '--shard', `${i}/3`, '--json', out]);
      expect(r.code).toBe(0);
      parts.push(out);
    }
    const sizes = parts.map((p) => JSON.parse(readFileSync(p, 'utf8')).records.length);
    // 10 folds x 3 learners = 30 tasks, balanced by cost
    expect(sizes.reduce((a, b) => a + b, 0)).toBe(30);
    expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.stderr).toBe('');
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(whole.stdout);
    // parts made with --no-timing carry that choice: merge alone writes no timing either (#19)
    const carried = await cli(['merge', ...parts, '--json', '-']);
    expect(carried.code).toBe(0);
    expect(carried.stdout).toBe(whole.stdout);

    const missing = await cli(['merge', parts[0], parts[2], '--json', '-']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/merge: \d+ tasks are missing: r\d\.f\d:/);
    const doubled = await cli(['merge', parts[0], parts[0], parts[1], parts[2], '--json', '-']);
    expect(doubled.code).toBe(2);
    expect(doubled.stderr).toMatch(/doubled/);
    const other = join(tmp.dir, 'other.json');
    await cli([...base, '--seed', '2', '--shard', '1/3', '--json', other]);
    const mixed = await cli(['merge', parts[0], other, parts[2], '--json', '-']);
    expect(mixed.code).toBe(2);
    // the part named first in the message (other.json, seed 2) comes first in the figures (#25 item 11)
    expect(mixed.stderr).toMatch(/other\.json belongs to another run .* differs in seed \(.*other\.json: 2, .*: 1\)/);
    expect(mixed.stderr.trim().split('\n').length).toBe(1);
  });

  it('refuses a malformed --shard and a shard without --json', async () => {
    expect((await cli([...base, '--shard', '4/3', '--json', join(tmp.dir, 'x.json')])).stderr).toMatch(/--shard "4\/3": expected I\/N/);
    expect((await cli([...base, '--shard', '1/3'])).stderr).toMatch(/--shard: write the part with --json FILE/);
  });
});

const BIN = join(process.cwd(), 'dist', 'src', 'cli', 'bin.js');

function lines(path: string): number {
  return existsSync(path) ? readFileSync(path, 'utf8').split('\n').filter(Boolean).length : 0;
}

describe('journal', () => {
  it('resumes after SIGKILL without recomputing finished tasks, and ends equal to an uninterrupted run', async () => {
    const journal = join(tmp.dir, 'run.journal');
    const args = ['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--learner', 'forest:trees=30', '--learner', 'knn', '--plan', 'kfold:10', '--jobs', '1', '--no-timing', '--quiet'];
    const whole = await cli([...args, '--json', '-']);
    expect(whole.code).toBe(0);

    // start, and kill with SIGKILL once the journal holds the header and at least 5 tasks
    const child = spawn(process.execPath, [BIN, ...args, '--journal', journal, '--json', join(tmp.dir, 'killed.json')], { stdio: 'ignore' });
    const killedAt = await new Promise<number>((resolve, reject) => {
      const timer = setInterval(() => {
        const n = lines(journal);
        if (n >= 6) {
          child.kill('SIGKILL');
          clearInterval(timer);
          resolve(n);
        }
      }, 5);
      child.on('exit', () => {
        clearInterval(timer);
        reject(new Error(`the run ended before it could be killed (journal had ${lines(journal)} lines)`));
      });
    });
    await new Promise((r) => child.on('exit', r));
    expect(existsSync(join(tmp.dir, 'killed.json'))).toBe(false); // no half report
    const afterKill = lines(journal);
    expect(afterKill).toBeGreaterThanOrEqual(killedAt);
    expect(afterKill).toBeLessThan(31); // 30 tasks + header: it was killed partway

    const resumed = await cli([...args, '--journal', journal, '--json', '-'].filter((a) => a !== '--quiet'));
    expect(resumed.code).toBe(0);
    expect(resumed.stderr).toMatch(new RegExp(`resumed ${afterKill - 1} of 30 tasks from the journal`));
    expect(resumed.stdout).toBe(whole.stdout);
    // every task is in the journal exactly once: nothing finished was computed again
    const ids = readFileSync(journal, 'utf8').split('\n').filter(Boolean).slice(1).map((l) => JSON.parse(l).id);
    expect(ids.length).toBe(30);
    expect(new Set(ids).size).toBe(30);
  });

  it('stops cleanly on SIGINT, keeps the journal, says how to resume (exit 130)', async () => {
    const journal = join(tmp.dir, 'int.journal');
    const args = ['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--learner', 'forest:trees=30', '--plan', 'kfold:10', '--jobs', '1', '--no-timing', '--quiet'];
    const child = spawn(process.execPath, [BIN, ...args, '--journal', journal, '--json', join(tmp.dir, 'int.json')], { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr!.on('data', (d) => (stderr += d));
    const timer = setInterval(() => {
      if (lines(journal) >= 3) {
        child.kill('SIGINT');
        clearInterval(timer);
      }
    }, 5);
    const code = await new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
    clearInterval(timer);
    expect(code).toBe(130);
    expect(stderr).toMatch(/foldwise: interrupted; \d+ of 20 tasks are in the journal .*int\.journal: rerun the same command to resume/);
    expect(existsSync(join(tmp.dir, 'int.json'))).toBe(false);
    const resumed = await cli([...args, '--journal', journal, '--json', '-']);
    expect(resumed.code).toBe(0);
    expect(resumed.stdout).toBe((await cli([...args, '--json', '-'])).stdout);
  });

  it('refuses the journal of another run with what differs', async () => {
    const journal = join(tmp.dir, 'other.journal');
    expect((await cli([...base, '--journal', journal, '--json', '-'])).code).toBe(0);
    const r = await cli([...base, '--seed', '9', '--journal', journal, '--json', '-']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--journal .*other\.journal: it belongs to another run, which differs in seed \(1 vs 9\); use a new journal file/);
  });
});
