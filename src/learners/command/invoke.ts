/**
 * Running a command learner's program on one fold: a fresh private folder, the protocol files,
 * the program started without a shell with a time limit, its output files read back, the
 * folder removed (unless kept for debugging). Synchronous: the runner's tasks are synchronous,
 * and parallel runs use worker threads.
 *
 * The program is started by a supervisor (supervise.ts) in a process group of its own; on a
 * timeout, a stop, or when foldwise is gone, the whole group is ended (SIGTERM, then SIGKILL
 * after GRACE_MS). The predictions file is read only when it is a regular file of at most
 * `predictionsLimit` bytes.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, closeSync, existsSync, mkdtempSync, openSync, readFileSync, readSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { FoldwiseError, InputError } from '../../errors.js';
import { CommandFoldError } from './errors.js';
import type { SupervisedOutcome, SuperviseJob } from './supervise.js';
import { COMMAND_PROTOCOL, dataFiles, JOB_FILE, optionVariable, PREDICTIONS_FILE, STDERR_FILE, STDOUT_FILE, type CommandJob } from './protocol.js';

export interface FoldRun {
  /** learner name, command:NAME */
  readonly learner: string;
  readonly argv: readonly string[];
  readonly env: Readonly<Record<string, string | undefined>>;
  readonly tempRoot: string;
  readonly keepTemp: boolean;
  readonly timeoutMs: number;
  readonly job: Omit<CommandJob, 'protocol' | 'train' | 'test' | 'predictions'>;
  /** the format of the two data files (their names follow it) */
  readonly format?: 'csv' | 'parquet' | 'arrow';
  readonly trainCsv: string | Uint8Array;
  readonly testCsv: string | Uint8Array;
}

/** Milliseconds between SIGTERM and SIGKILL when a program's process group is ended. */
export const GRACE_MS = 2000;

/** A fold stopped because foldwise was asked to stop (a signal reached the supervisor). */
export class FoldStoppedError extends FoldwiseError {
  constructor(message: string, signal: string) {
    super(message, signal === 'SIGTERM' ? 143 : signal === 'SIGHUP' ? 129 : 130);
  }
}

/**
 * The most bytes a predictions file may have: a generous 64 bytes per value (a probability
 * printed with 17 significant digits and a comma takes about 20) plus 1 MiB for the header.
 */
export function predictionsLimit(rows: number, classes: number): number {
  return 1024 * 1024 + rows * (classes + 1) * 64;
}

/** The supervisor script next to this module (the built copy under the test runner). */
function supervisorPath(): string {
  const here = new URL('./supervise.js', import.meta.url);
  if (import.meta.url.endsWith('.ts')) return fileURLToPath(here.href.replace(/\/src\/learners\/command\/supervise\.js$/, '/dist/src/learners/command/supervise.js'));
  return fileURLToPath(here);
}

/** A program's text made safe for one error line: escape sequences and control characters removed. */
export function plainText(s: string): string {
  return s
    .replace(/\u001b\[[0-?]*[ -/]*[@-~]/g, '')
    .replace(/\u001b\][^\u0007\u001b]*(?:\u0007|\u001b\\)?/g, '')
    .replace(/[\u0000-\u001f\u007f-\u009f]/g, '');
}

/** How many bytes and lines of the program's stderr a failure message quotes. */
const TAIL_BYTES = 4096;
const TAIL_LINES = 5;

/** The last lines of a file, on one line (joined by " | "), or "" when empty or unreadable. */
export function tailOf(path: string): string {
  try {
    const size = statSync(path).size;
    if (size === 0) return '';
    const fd = openSync(path, 'r');
    const n = Math.min(size, TAIL_BYTES);
    const buf = Buffer.alloc(n);
    readSync(fd, buf, 0, n, size - n);
    closeSync(fd);
    const lines = buf.toString('utf8').split(/\r?\n/).map((l) => plainText(l).trim()).filter((l) => l !== '');
    const t = lines.slice(-TAIL_LINES).join(' | ');
    return t.length > 600 ? `…${t.slice(-600)}` : t;
  } catch {
    return '';
  }
}

const safeLabel = (s: string): string => s.replace(/[^a-z0-9.-]+/gi, '-').slice(0, 40);

/**
 * Runs the program on one fold and returns what `read` makes of the predictions file (text
 * and absolute path), read before the folder is removed. Every failure is a CommandFoldError
 * naming the learner and fold.
 */
export function runFold<T>(run: FoldRun, read: (text: string, path: string) => T): T {
  let dir: string;
  try {
    // named by this process's id (unless kept), so a later run can remove it when this one was killed
    const owner = run.keepTemp ? '' : `${process.pid}-`;
    dir = mkdtempSync(join(run.tempRoot, `foldwise-${owner}${safeLabel(run.learner.slice('command:'.length))}-${safeLabel(run.job.fold)}-`));
  } catch (e) {
    throw new InputError(`${run.learner}: cannot make a temporary folder in ${run.tempRoot} (${(e as NodeJS.ErrnoException).code ?? 'error'}); set TMPDIR to a writable folder`);
  }
  const where = `${run.learner} fold ${run.job.fold}`;
  const kept = run.keepTemp ? ` (files kept in ${dir})` : ' (rerun with --keep-temp to keep its files)';
  try {
    chmodSync(dir, 0o700);
    const names = dataFiles(run.format ?? 'csv');
    const train = join(dir, names.train);
    const test = join(dir, names.test);
    const predictions = join(dir, PREDICTIONS_FILE);
    const jobPath = join(dir, JOB_FILE);
    const job: CommandJob = { protocol: COMMAND_PROTOCOL, ...run.job, train, test, predictions };
    writeFileSync(train, run.trainCsv, { mode: 0o600 });
    writeFileSync(test, run.testCsv, { mode: 0o600 });
    writeFileSync(jobPath, `${JSON.stringify(job, null, 2)}\n`, { mode: 0o600 });
    const env: Record<string, string> = {};
    for (const [k, v] of Object.entries(run.env)) if (v !== undefined && !k.startsWith('FOLDWISE_')) env[k] = v;
    Object.assign(env, {
      FOLDWISE_PROTOCOL: '1',
      FOLDWISE_JOB: jobPath,
      FOLDWISE_TASK: job.task,
      FOLDWISE_TARGET: job.target,
      FOLDWISE_SEED: String(job.seed),
      FOLDWISE_FOLD: job.fold,
    });
    for (const [k, v] of Object.entries(job.options)) env[optionVariable(k)] = v;
    closeSync(openSync(join(dir, STDOUT_FILE), 'w', 0o600));
    closeSync(openSync(join(dir, STDERR_FILE), 'w', 0o600));
    const supervise: SuperviseJob = {
      argv: [...run.argv, train, test, predictions],
      cwd: dir,
      env,
      stdout: join(dir, STDOUT_FILE),
      stderr: join(dir, STDERR_FILE),
      timeoutMs: run.timeoutMs,
      graceMs: GRACE_MS,
      parentPid: process.pid,
      watch: dir,
      foldDir: dir,
      keep: run.keepTemp,
    };
    const jobFile = join(dir, '.foldwise-supervise.json');
    writeFileSync(jobFile, JSON.stringify(supervise), { mode: 0o600 });
    const s = spawnSync(process.execPath, [supervisorPath(), jobFile], {
      cwd: dir,
      stdio: ['ignore', 'pipe', 'pipe'],
      encoding: 'utf8',
      // a backstop only: the supervisor keeps the time itself and ends the program's group
      timeout: run.timeoutMs + 4 * GRACE_MS + 30_000,
      killSignal: 'SIGTERM',
      windowsHide: true,
    });
    rmSync(jobFile, { force: true });
    let r: SupervisedOutcome;
    try {
      r = JSON.parse(s.stdout.trim().split('\n').pop() ?? '') as SupervisedOutcome;
    } catch {
      const why = s.error ? (s.error as NodeJS.ErrnoException).code : s.signal ? `signal ${s.signal}` : `status ${s.status}`;
      if (s.signal === 'SIGINT' || s.signal === 'SIGTERM') throw new FoldStoppedError(`${where}: stopped (${s.signal})`, s.signal);
      throw new CommandFoldError(`${where}: the supervisor of the program ended without an outcome (${why}; ${plainText(s.stderr ?? '').slice(0, 200)})${kept}`);
    }
    if (r.stopped) throw new FoldStoppedError(`${where}: stopped (${r.stopped}); the program and its children were ended`, r.stopped);
    const tail = tailOf(join(dir, STDERR_FILE));
    const said = tail ? `; its stderr ends: ${tail}` : '; it wrote nothing to stderr';
    if (r.timedOut) throw new CommandFoldError(`${where}: the program ran out of time (timeout=${run.timeoutMs / 1000} s) and was stopped with its children${said}${kept}`);
    if (r.error) throw new CommandFoldError(`${where}: the program ${run.argv[0]} could not start (${r.error})${kept}`);
    if (r.signal) throw new CommandFoldError(`${where}: the program was ended by signal ${r.signal}${said}${kept}`);
    if (r.status !== 0) throw new CommandFoldError(`${where}: the program exited with status ${r.status}${said}${kept}`);
    if (!existsSync(predictions)) throw new CommandFoldError(`${where}: the program exited with status 0 but wrote no ${PREDICTIONS_FILE}${said}${kept}`);
    const st = statSync(predictions);
    if (!st.isFile()) throw new CommandFoldError(`${where}: ${predictions} is not a regular file (a pipe, device or folder); write the predictions as a plain file${kept}`);
    const limit = predictionsLimit(run.job.testRows, run.job.classes?.length ?? 0);
    if (st.size > limit) throw new CommandFoldError(`${where}: ${predictions} has ${st.size} bytes, more than the ${limit} that ${run.job.testRows} rows of predictions can need${kept}`);
    let text: string;
    try {
      text = readFileSync(predictions, 'utf8');
    } catch (e) {
      throw new CommandFoldError(`${where}: ${predictions} cannot be read (${(e as NodeJS.ErrnoException).code ?? 'error'})${kept}`);
    }
    try {
      return read(text, predictions);
    } catch (e) {
      if (e instanceof CommandFoldError) throw new CommandFoldError(`${where}: ${e.message}${kept}`);
      throw e;
    }
  } finally {
    if (!run.keepTemp) rmSync(dir, { recursive: true, force: true });
  }
}
