/**
 * End-to-end tests through the built executable (npm test builds dist/ first), as a shell
 * pipeline would run it: real process, real exit codes, real standard streams.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { tempFolder } from '../helpers/tmp.js';

const BIN = join(process.cwd(), 'dist', 'src', 'cli', 'bin.js');
const run = (args: string[], input?: string) => spawnSync(process.execPath, [BIN, ...args], { input, encoding: 'utf8', timeout: 120_000 });

describe('the foldwise executable', () => {
  it('is built', () => {
    expect(existsSync(BIN)).toBe(true);
  });

  it('evaluates the bundled example and exits 0', () => {
    const tmp = tempFolder();
    const out = join(tmp.dir, 'r.json');
    const r = run(['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--learner', 'knn', '--plan', 'kfold:3', '--json', out, '--no-timing']);
    // only warnings (the quick audit notes the orchard column, for example), no error lines
    expect(r.stderr.split('\n').filter(Boolean).every((l) => l.startsWith('foldwise: warning: '))).toBe(true);
    expect(r.status).toBe(0);
    const report = JSON.parse(readFileSync(out, 'utf8'));
    expect(report.learners.map((l: { spec: string }) => l.spec)).toEqual(['baseline', 'knn']);
  });

  it('reads CSV from a pipe and writes JSON to standard output', () => {
    const csv = 'x,y\n1,a\n2,a\n3,a\n4,b\n5,b\n6,b\n';
    const r = run(['eval', '-', '--target', 'y', '--learner', 'knn:k=1', '--plan', 'kfold:3', '--json', '-', '--no-timing'], csv);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).data.rows).toBe(6);
  });

  it('exits 2 with one line on stderr and no stack trace for bad input', () => {
    const r = run(['eval', 'no-such-file.csv', '--target', 'y']);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('foldwise: no-such-file.csv: no such file; check the path\n');
    expect(r.stdout).toBe('');
  });

  it('prints its version and help with exit 0', () => {
    const v = run(['--version']);
    expect(v.status).toBe(0);
    expect(v.stdout.trim()).toBe(JSON.parse(readFileSync('package.json', 'utf8')).version);
    const h = run(['eval', '--help']);
    expect(h.status).toBe(0);
    expect(h.stdout).toMatch(/--plan <plan>/);
  });
});
