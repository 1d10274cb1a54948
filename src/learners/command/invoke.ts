/**
 * Running a command learner's program on one fold: a fresh private folder, the protocol files,
 * the program started without a shell with a time limit, its output files read back, the
 * folder removed (unless kept for debugging). Synchronous: the runner's tasks are synchronous,
 * and parallel runs use worker threads.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, closeSync, existsSync, mkdtempSync, openSync, readFileSync, readSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { CommandFoldError } from './errors.js';
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
    const lines = buf.toString('utf8').split(/\r?\n/).map((l) => l.trim()).filter((l) => l !== '');
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
  const dir = mkdtempSync(join(run.tempRoot, `foldwise-${safeLabel(run.learner.slice('command:'.length))}-${safeLabel(run.job.fold)}-`));
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
    const out = openSync(join(dir, STDOUT_FILE), 'w', 0o600);
    const err = openSync(join(dir, STDERR_FILE), 'w', 0o600);
    let r: ReturnType<typeof spawnSync>;
    try {
      r = spawnSync(run.argv[0], [...run.argv.slice(1), train, test, predictions], {
        cwd: dir,
        env,
        stdio: ['ignore', out, err],
        shell: false,
        timeout: run.timeoutMs,
        killSignal: 'SIGKILL',
        windowsHide: true,
      });
    } finally {
      closeSync(out);
      closeSync(err);
    }
    const tail = tailOf(join(dir, STDERR_FILE));
    const said = tail ? `; its stderr ends: ${tail}` : '; it wrote nothing to stderr';
    const code = (r.error as NodeJS.ErrnoException | undefined)?.code;
    if (code === 'ETIMEDOUT') throw new CommandFoldError(`${where}: the program ran out of time (timeout=${run.timeoutMs / 1000} s) and was stopped${said}${kept}`);
    if (r.error) throw new CommandFoldError(`${where}: the program ${run.argv[0]} could not start (${code ?? r.error.message})${kept}`);
    if (r.signal) throw new CommandFoldError(`${where}: the program was ended by signal ${r.signal}${said}${kept}`);
    if (r.status !== 0) throw new CommandFoldError(`${where}: the program exited with status ${r.status}${said}${kept}`);
    if (!existsSync(predictions)) throw new CommandFoldError(`${where}: the program exited with status 0 but wrote no ${PREDICTIONS_FILE}${said}${kept}`);
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
