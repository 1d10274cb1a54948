/**
 * The output guard (src/cli/guard.ts) and all-or-nothing writes (src/report/atomic.ts): no
 * command's output may replace one of its inputs, through links too; a run that cannot write
 * every output writes none; rewrites keep the file's mode; read-only files are refused; temporary
 * files of a writer that died are removed by the next write. Data: seeded synthetic rows
 * (test/compare/synthetic.ts), since only the files matter here.
 */
import { chmodSync, existsSync, linkSync, readdirSync, readFileSync, statSync, symlinkSync, writeFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { removeStaleTemps, writeFileAtomic } from '../../src/report/atomic.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from '../compare/synthetic.js';

const tmp = tempFolder();
const CSV = syntheticCsv('classification', 120, 5);
const EVAL = ['--target', 'y', '--learner', 'knn', '--plan', 'kfold:3', '--no-timing', '--no-audit', '--jobs', '1'];

function fresh(name: string): string {
  const dir = join(tmp.dir, name);
  mkdirSync(dir);
  writeFileSync(join(dir, 'data.csv'), CSV);
  return dir;
}

/** Exit 2, exactly one stderr line matching `re`, and the files of `dir` unchanged. */
async function refused(dir: string, argv: string[], re: RegExp): Promise<void> {
  const before = new Map(readdirSync(dir).map((f) => [f, readFileSync(join(dir, f), 'utf8')]));
  const r = await cli(argv);
  expect(r.code).toBe(2);
  expect(r.stderr.split('\n').filter(Boolean)).toHaveLength(1);
  expect(r.stderr).toMatch(re);
  const after = new Map(readdirSync(dir).map((f) => [f, readFileSync(join(dir, f), 'utf8')]));
  expect(after).toEqual(before);
}

describe('no output replaces an input', () => {
  it('audit --json DATA is refused and the data file is kept', async () => {
    const d = fresh('audit');
    await refused(d, ['audit', join(d, 'data.csv'), '--target', 'y', '--json', join(d, 'data.csv')], /--json .*data\.csv: is the input file/);
  });

  it('through a symbolic link and a hard link', async () => {
    const d = fresh('links');
    symlinkSync('data.csv', join(d, 'soft.csv'));
    linkSync(join(d, 'data.csv'), join(d, 'hard.csv'));
    await refused(d, ['eval', join(d, 'data.csv'), ...EVAL, '--json', join(d, 'soft.csv')], /is the input file/);
    await refused(d, ['eval', join(d, 'data.csv'), ...EVAL, '--markdown', join(d, 'hard.csv')], /is the input file/);
  });

  it('gate --json BASELINE, compare/render/merge --json INPUT are refused', async () => {
    const d = fresh('reports');
    const rep = join(d, 'r.json');
    expect((await cli(['eval', join(d, 'data.csv'), ...EVAL, '--json', rep])).code).toBe(0);
    const part = join(d, 'p.json');
    expect((await cli(['eval', join(d, 'data.csv'), ...EVAL, '--shard', '1/1', '--json', part])).code).toBe(0);
    await refused(d, ['gate', '--previous', rep, '--current', rep, '--json', rep], /--json .*r\.json: is the file read by --previous/);
    await refused(d, ['compare', rep, rep, '--json', rep], /is the file read by compare/);
    await refused(d, ['render', rep, '--html', rep], /is the file read by render/);
    await refused(d, ['merge', part, '--json', part], /is the file read by merge/);
    await refused(d, ['eval', join(d, 'data.csv'), ...EVAL, '--journal', join(d, 'data.csv')], /--journal .*is the input file/);
  });

  it('split --out into the data folder refuses a part named like the data file', async () => {
    const d = join(tmp.dir, 'split');
    mkdirSync(d);
    writeFileSync(join(d, 'train.csv'), CSV);
    await refused(d, ['split', join(d, 'train.csv'), '--target', 'y', '--plan', 'holdout:0.6/0.2/0.2', '--out', d], /--out .*train\.csv: is the input file/);
  });

  it("--json '' is refused", async () => {
    const d = fresh('empty');
    await refused(d, ['eval', join(d, 'data.csv'), ...EVAL, '--json', ''], /--json '': an empty file name/);
  });
});

describe('a run writes all its outputs or none', () => {
  it.skipIf(!existsSync('/dev/full'))('eval --json ok.json --markdown /dev/full keeps ok.json as it was', async () => {
    const d = fresh('full');
    writeFileSync(join(d, 'ok.json'), 'old\n');
    const r = await cli(['eval', join(d, 'data.csv'), ...EVAL, '--json', join(d, 'ok.json'), '--markdown', '/dev/full']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--markdown \/dev\/full: cannot be written \(ENOSPC\); the disk is full/);
    expect(readFileSync(join(d, 'ok.json'), 'utf8')).toBe('old\n');
    expect(readdirSync(d).sort()).toEqual(['data.csv', 'ok.json']);
  });
});

describe('rewrites', () => {
  it('keep the mode of the file they replace', () => {
    const d = fresh('mode');
    const p = join(d, 'r.md');
    writeFileSync(p, 'old');
    chmodSync(p, 0o600);
    writeFileAtomic(p, 'new', '--markdown');
    expect(readFileSync(p, 'utf8')).toBe('new');
    expect(statSync(p).mode & 0o777).toBe(0o600);
  });

  it('refuse a read-only file', async () => {
    const d = fresh('readonly');
    const p = join(d, 'r.json');
    writeFileSync(p, 'kept');
    chmodSync(p, 0o444);
    await refused(d, ['eval', join(d, 'data.csv'), ...EVAL, '--json', p], /--json .*r\.json: the file is read-only/);
  });

  it('remove the temporary files of a writer that died, and keep those of a live one', () => {
    const d = fresh('stale');
    const dead = join(d, '.r.json.999999999-0123456789ab.tmp');
    const live = join(d, `.r.json.${process.pid}-0123456789ab.tmp`);
    writeFileSync(dead, 'half');
    writeFileSync(live, 'half');
    writeFileAtomic(join(d, 'r.json'), 'whole', '--json');
    expect(existsSync(dead)).toBe(false);
    expect(existsSync(live)).toBe(true);
    expect(removeStaleTemps(join(d, 'r.json'))).toBe(0);
  });
});

describe('--jobs', () => {
  it('is capped at the cores unless --over-cores, with one warning line; the report is the same', async () => {
    const { availableParallelism } = await import('node:os');
    const d = fresh('jobs');
    const one = await cli(['eval', join(d, 'data.csv'), ...EVAL, '--json', '-']);
    const many = await cli(['eval', join(d, 'data.csv'), ...EVAL.filter((a, i, all) => a !== '--jobs' && all[i - 1] !== '--jobs'), '--jobs', '256', '--json', '-']);
    expect(many.code).toBe(0);
    expect(many.stderr).toBe(`foldwise: warning: --jobs 256: capped at the ${availableParallelism()} cores of this machine (add --over-cores to run 256 workers anyway)\n`);
    expect(many.stdout).toBe(one.stdout);
  });
});
