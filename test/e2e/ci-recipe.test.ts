/**
 * Issue 25, item 19: the README's "CI recipe: a generic shell CI", run as written on a fresh
 * clone. The two fenced blocks are taken from README.md by a line they contain
 * (test/integration/helpers/readme.ts), so a change to the recipe runs here as changed. The
 * clone is a new git repository holding only the bundled example file (no `ci` folder, as in a
 * fresh clone of a project that has not committed a previous report yet); `npx` is a shim on
 * PATH that runs this checkout's build (npm test builds dist/ first), so `npx foldwise ...` runs
 * the foldwise under test, never a registry download.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, copyFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readmeBlock } from '../integration/helpers/readme.js';
import { tempFolder } from '../helpers/tmp.js';

const BIN = join(process.cwd(), 'dist', 'src', 'cli', 'bin.js');
const HAVE_GIT = spawnSync('git', ['--version']).status === 0;

describe.skipIf(!HAVE_GIT)('the README CI recipe on a fresh clone', () => {
  it('commits the previous report, then gates a later run against it: exit 0 and a pass verdict', () => {
    const tmp = tempFolder();
    const clone = join(tmp.dir, 'clone');
    mkdirSync(join(clone, 'examples', 'packhouse'), { recursive: true });
    copyFileSync('examples/packhouse/fruit-grading.csv', join(clone, 'examples', 'packhouse', 'fruit-grading.csv'));
    const shims = join(tmp.dir, 'bin');
    mkdirSync(shims);
    writeFileSync(join(shims, 'npx'), `#!/bin/sh\n[ "$1" = foldwise ] || { echo "npx shim: only foldwise" >&2; exit 127; }\nshift\nexec ${JSON.stringify(process.execPath)} ${JSON.stringify(BIN)} "$@"\n`);
    chmodSync(join(shims, 'npx'), 0o755);
    const env = {
      ...process.env,
      PATH: `${shims}:${process.env.PATH ?? '/usr/bin:/bin'}`,
      GIT_AUTHOR_NAME: 'ci recipe test',
      GIT_AUTHOR_EMAIL: 'ci@example.invalid',
      GIT_COMMITTER_NAME: 'ci recipe test',
      GIT_COMMITTER_EMAIL: 'ci@example.invalid',
      GIT_CONFIG_NOSYSTEM: '1',
      HOME: tmp.dir,
    };
    const sh = (script: string) => spawnSync('sh', ['-e', '-c', script], { cwd: clone, env, encoding: 'utf8', timeout: 300_000 });
    expect(spawnSync('git', ['init', '-q'], { cwd: clone, env }).status).toBe(0);
    expect(existsSync(join(clone, 'ci'))).toBe(false);

    // the first block: write the previous report and commit it
    const once = readmeBlock('git add ci/previous.json');
    const first = sh(once);
    expect(first.stderr.split('\n').filter((l) => l.startsWith('foldwise: ') && !l.startsWith('foldwise: warning: '))).toEqual([]);
    expect(first.status).toBe(0);
    expect(JSON.parse(readFileSync(join(clone, 'ci', 'previous.json'), 'utf8')).schema).toBe('foldwise-report/2');
    const tracked = spawnSync('git', ['ls-files'], { cwd: clone, env, encoding: 'utf8' }).stdout.split('\n');
    expect(tracked).toContain('ci/previous.json');

    // the second block: every CI run evaluates the same way and gates against it
    const every = readmeBlock('#!/bin/sh');
    writeFileSync(join(clone, 'gate.sh'), every);
    const second = spawnSync('sh', ['gate.sh'], { cwd: clone, env, encoding: 'utf8', timeout: 300_000 });
    expect(second.status).toBe(0);
    const verdict = readFileSync(join(clone, 'verdict.md'), 'utf8');
    expect(verdict.split("\n")[0]).toBe("### foldwise gate: PASS");
  });
});
