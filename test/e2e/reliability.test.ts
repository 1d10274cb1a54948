/**
 * Reliability through the built executable (npm test builds dist/ first): pipes, full disks,
 * signals, process groups and temporary folders, as a shell or a scheduler meets them. The data
 * is the bundled invented packhouse example; the programs are small Node scripts written here.
 * The exit codes are the Unix conventions the README states: 128 + signal number for a stop.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { tempFolder } from '../helpers/tmp.js';

const BIN = join(process.cwd(), 'dist', 'src', 'cli', 'bin.js');
const DATA = join(process.cwd(), 'examples', 'packhouse', 'fruit-grading.csv');
const EVAL = ['eval', DATA, '--target', 'grade', '--drop', 'lot_id', '--no-timing', '--quiet', '--no-audit'];
const tmp = tempFolder();
const sh = (script: string, env: Record<string, string> = {}) =>
  spawnSync('bash', ['-c', script], { encoding: 'utf8', timeout: 120_000, env: { ...process.env, FW: `${process.execPath} ${BIN}`, ...env } });

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
async function waitFor(check: () => boolean, ms: number): Promise<boolean> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (check()) return true;
    await sleep(25);
  }
  return check();
}

/** A command: program that starts a grandchild (sleep) in the background, records its pid, and waits. */
/** The pids the hanging program wrote: its grandchild's and its own, for every fold started. */
function programPids(file: string): number[] {
  return readFileSync(file, 'utf8').trim().split('\n').flatMap((l) => l.split(' ').slice(0, 2).map(Number));
}

/** The fold folders foldwise made in `dir` (its TMPDIR in these tests). */
function foldFolders(dir: string): string[] {
  return readdirSync(dir).filter((n) => n.startsWith('foldwise-'));
}

function hangingProgram(dir: string): string {
  const p = join(dir, 'hang.mjs');
  writeFileSync(
    p,
    `import { spawn } from 'node:child_process';
import { appendFileSync } from 'node:fs';
const g = spawn('sleep', ['60'], { stdio: 'ignore' });
appendFileSync(process.env.FOLDWISE_OPTION_PIDS, g.pid + ' ' + process.pid + ' ' + process.cwd() + '\\n');
setTimeout(() => {}, 60000);
`,
  );
  return p;
}

describe('a closed standard output is a quiet end', () => {
  // `| true` closes the pipe before foldwise has started writing (as `| head -1` does once the
  // output outgrows the pipe's buffer), so every write meets a closed pipe
  it('foldwise learners | true, metrics | head -1: exit 0, nothing on stderr', () => {
    for (const reader of ['true', 'head -1 >/dev/null']) {
      const r = sh(`$FW learners | ${reader}; echo "status=\${PIPESTATUS[0]}"`);
      expect(r.stdout.trim()).toBe('status=0');
      expect(r.stderr).toBe('');
    }
    {
      const r = sh(`$FW metrics | true; echo "status=\${PIPESTATUS[0]}"`);
      expect(r.stdout.trim()).toBe('status=0');
      expect(r.stderr).toBe('');
    }
  });

  it('eval --json - | head -c10 and | true: exit 0, nothing on stderr', () => {
    const r = sh(`$FW ${EVAL.map((a) => `'${a}'`).join(' ')} --learner forest:trees=5 --plan kfold:3 --json - | true; echo "status=\${PIPESTATUS[0]}"`);
    expect(r.stdout.trim()).toBe('status=0');
    expect(r.stderr).toBe('');
  });

  it.skipIf(!existsSync('/dev/full'))('a full disk behind standard output is exit 2 with one line, never 1', () => {
    const report = join(tmp.dir, 'base.json');
    expect(spawnSync(process.execPath, [BIN, ...EVAL, '--learner', 'knn', '--plan', 'kfold:3', '--json', report]).status).toBe(0);
    const r = sh(`$FW gate --previous '${report}' --current '${report}' > /dev/full`);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('foldwise: standard output: cannot be written (ENOSPC); the disk is full\n');
  });
});

describe('signals', () => {
  it('SIGTERM during a long fit (--jobs 1): exit 143 within seconds, journal resumable', async () => {
    const journal = join(tmp.dir, 'term.journal');
    const args = [...EVAL, '--learner', 'forest:trees=400', '--plan', 'kfold:10', '--jobs', '1', '--journal', journal, '--json', join(tmp.dir, 'term.json')];
    const child = spawn(process.execPath, [BIN, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr!.on('data', (d) => (stderr += d));
    const exited = new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
    // wait until the first task is journaled, then stop in the middle of a 400-tree fit
    expect(await waitFor(() => existsSync(journal) && readFileSync(journal, 'utf8').split('\n').filter(Boolean).length >= 3, 60_000)).toBe(true);
    const sent = Date.now();
    child.kill('SIGTERM');
    const code = await exited;
    expect(Date.now() - sent).toBeLessThan(5000);
    expect(code).toBe(143);
    expect(stderr).toMatch(/interrupted; \d+ of 20 tasks are in the journal .*term\.journal: rerun the same command to resume \(SIGTERM\)/);
    expect(existsSync(join(tmp.dir, 'term.json'))).toBe(false);
  }, 120_000);

  // outside eval's task phase a signal keeps its default action (README, "Signals"): the process
  // ends by the signal itself (a shell shows 130 or 143) and no output is left, whole or half
  it.each([
    ['audit', 'SIGINT'],
    ['audit', 'SIGTERM'],
    ['split', 'SIGINT'],
  ] as const)('%s ended by %s while it reads standard input: ended by the signal, within seconds, no output', async (cmd, sig) => {
    const out = join(tmp.dir, `${cmd}-${sig}`);
    const args = cmd === 'audit' ? ['audit', '-', '--target', 'y', '--json', `${out}.json`] : ['split', '-', '--target', 'y', '--plan', 'kfold:3', '--out', out];
    const child = spawn(process.execPath, [BIN, ...args], { stdio: ['pipe', 'ignore', 'ignore'] });
    const ended = new Promise<[number | null, string | null]>((r) => child.on('exit', (c, s) => r([c, s])));
    child.stdin!.write('a,y\n1,p\n2,q\n');
    await new Promise((r) => setTimeout(r, 1500));
    const sent = Date.now();
    child.kill(sig);
    const [code, signal] = await ended;
    expect(Date.now() - sent).toBeLessThan(5000);
    expect([code, signal]).toEqual([null, sig]);
    expect(existsSync(`${out}.json`)).toBe(false);
    expect(existsSync(out)).toBe(false);
  }, 30_000);
});

describe('command: programs and their process groups', () => {
  it('a timeout ends the program and the grandchild it started', async () => {
    const dir = join(tmp.dir, 'timeout');
    mkdirSync(dir);
    const pids = join(dir, 'pids.txt');
    const r = spawnSync(process.execPath, [BIN, ...EVAL, '--plan', 'kfold:2', '--jobs', '1', '--learner', `command:hang;timeout=1,pids=${pids}`, '--command', `hang=${process.execPath} ${hangingProgram(dir)}`], {
      encoding: 'utf8',
      timeout: 60_000,
      env: { ...process.env, TMPDIR: dir },
    });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/command:hang fold r1\.f1: the program ran out of time \(timeout=1 s\)/);
    const lines = readFileSync(pids, 'utf8').trim().split('\n');
    expect(lines.length).toBe(1);
    const [grandchild, program] = lines[0].split(' ').map(Number);
    expect(await waitFor(() => !alive(grandchild) && !alive(program), 3000)).toBe(true);
    // no fold folder left
    expect(foldFolders(dir)).toEqual([]);
  }, 60_000);

  it('SIGTERM to foldwise while a fold runs: exit 143 within seconds, program group and folders gone', async () => {
    const dir = join(tmp.dir, 'term-command');
    mkdirSync(dir);
    const pids = join(dir, 'pids.txt');
    const child = spawn(process.execPath, [BIN, ...EVAL, '--plan', 'kfold:2', '--jobs', '2', '--learner', `command:hang;pids=${pids}`, '--command', `hang=${process.execPath} ${hangingProgram(dir)}`], {
      stdio: ['ignore', 'ignore', 'pipe'],
      env: { ...process.env, TMPDIR: dir },
    });
    const exited = new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
    expect(await waitFor(() => existsSync(pids) && readFileSync(pids, 'utf8').trim().split('\n').length >= 2, 30_000)).toBe(true);
    const sent = Date.now();
    child.kill('SIGTERM');
    expect(await exited).toBe(143);
    expect(Date.now() - sent).toBeLessThan(8000);
    const all = programPids(pids);
    expect(all.length).toBe(4);
    expect(await waitFor(() => all.every((p) => !alive(p)), 4000)).toBe(true);
    expect(await waitFor(() => foldFolders(dir).length === 0, 4000)).toBe(true);
  }, 60_000);

  // tune --jobs 1 keeps the default action of a signal (README, tune): foldwise ends at once, and
  // the supervisor, seeing foldwise gone, ends the program's group and removes the fold folder
  it('SIGINT to tune --jobs 1 while a command fold runs: ended by the signal, program group and folders gone', async () => {
    const dir = join(tmp.dir, 'int-tune');
    mkdirSync(dir);
    const pids = join(dir, 'pids.txt');
    const tune = ['tune', ...EVAL.slice(1)];
    const child = spawn(process.execPath, [BIN, ...tune, '--plan', 'kfold:2', '--inner', 'kfold:2', '--jobs', '1', '--learner', `command:hang;pids=${pids},k=1|2`, '--command', `hang=${process.execPath} ${hangingProgram(dir)}`], {
      stdio: ['ignore', 'ignore', 'pipe'],
      env: { ...process.env, TMPDIR: dir },
    });
    const ended = new Promise<[number | null, string | null]>((r) => child.on('exit', (c, s) => r([c, s])));
    expect(await waitFor(() => existsSync(pids) && readFileSync(pids, 'utf8').trim() !== '', 30_000)).toBe(true);
    const sent = Date.now();
    child.kill('SIGINT');
    expect(await ended).toEqual([null, 'SIGINT']);
    expect(Date.now() - sent).toBeLessThan(5000);
    const all = programPids(pids);
    expect(all.length).toBeGreaterThanOrEqual(2);
    expect(await waitFor(() => all.every((p) => !alive(p)), 6000)).toBe(true);
    expect(await waitFor(() => foldFolders(dir).length === 0, 6000)).toBe(true);
  }, 60_000);

  it('kill -9 of foldwise: the supervisor ends the program group and removes the fold folder', async () => {
    const dir = join(tmp.dir, 'kill9');
    mkdirSync(dir);
    const pids = join(dir, 'pids.txt');
    const child = spawn(process.execPath, [BIN, ...EVAL, '--plan', 'kfold:2', '--jobs', '1', '--learner', `command:hang;pids=${pids}`, '--command', `hang=${process.execPath} ${hangingProgram(dir)}`], {
      stdio: 'ignore',
      env: { ...process.env, TMPDIR: dir },
    });
    expect(await waitFor(() => existsSync(pids) && readFileSync(pids, 'utf8').trim() !== '', 30_000)).toBe(true);
    child.kill('SIGKILL');
    const [grandchild, program] = readFileSync(pids, 'utf8').trim().split(' ').map(Number);
    expect(await waitFor(() => !alive(grandchild) && !alive(program), 5000)).toBe(true);
    expect(await waitFor(() => foldFolders(dir).length === 0, 3000)).toBe(true);
  }, 60_000);

  it('the next run removes fold folders of a dead foldwise process; a predictions FIFO fails the fold at once', () => {
    const dir = join(tmp.dir, 'leftover');
    mkdirSync(dir);
    const dead = join(dir, 'foldwise-999999999-hang-r1.f1-AbC123');
    mkdirSync(dead);
    writeFileSync(join(dead, 'train.csv'), 'copy of user data\n');
    const fifo = join(dir, 'fifo.mjs');
    writeFileSync(fifo, `import { execFileSync } from 'node:child_process';\nexecFileSync('mkfifo', [process.argv[process.argv.length - 1]]);\n`);
    const r = spawnSync(process.execPath, [BIN, ...EVAL, '--plan', 'kfold:2', '--jobs', '1', '--learner', 'command:fifo', '--command', `fifo=${process.execPath} ${fifo}`], {
      encoding: 'utf8',
      timeout: 30_000,
      env: { ...process.env, TMPDIR: dir },
    });
    expect(existsSync(dead)).toBe(false);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/predictions\.csv is not a regular file/);
    expect(foldFolders(dir)).toEqual([]);
  });

  it('a bad TMPDIR is exit 2 naming it', () => {
    const r = spawnSync(process.execPath, [BIN, ...EVAL, '--learner', 'command:x', '--command', `x=${process.execPath} -e 0`], { encoding: 'utf8', env: { ...process.env, TMPDIR: '/no/such/folder' } });
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('foldwise: TMPDIR /no/such/folder: not a writable folder (ENOENT); set TMPDIR to a folder you can write\n');
  });
});
