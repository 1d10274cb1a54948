/**
 * The supervisor of one command: fold, a small Node program that `invoke.ts` runs (and waits
 * for) in place of the user's program. It starts the program in a process group of its own,
 * so that the program's children (the learner behind a wrapper script, a grandchild left in
 * the background) can be ended with it. The whole group gets SIGTERM, then SIGKILL after a
 * grace period, when:
 *   - the fold's time is up (reported as a timeout);
 *   - the supervisor gets SIGINT, SIGTERM or SIGHUP (a Ctrl-C reaches it with foldwise);
 *   - foldwise is gone (its process id is no longer the parent) or has removed the fold's
 *     folder (as it does when it stops): then the fold's folder is removed too;
 *   - the program has exited but left members of its group running.
 * Its one line of standard output is the outcome as JSON (SupervisedOutcome).
 */
import { spawn } from 'node:child_process';
import { closeSync, existsSync, openSync, readFileSync, rmSync } from 'node:fs';

export interface SuperviseJob {
  readonly argv: readonly string[];
  readonly cwd: string;
  readonly env: Readonly<Record<string, string>>;
  readonly stdout: string;
  readonly stderr: string;
  readonly timeoutMs: number;
  /** milliseconds between SIGTERM and SIGKILL of the group */
  readonly graceMs: number;
  /** the foldwise process; when the supervisor's parent changes, foldwise is gone */
  readonly parentPid: number;
  /** a folder that exists while the run goes on (the fold's folder) */
  readonly watch: string;
  /** the fold's folder, removed when foldwise is gone (unless kept) */
  readonly foldDir: string;
  readonly keep: boolean;
}

export interface SupervisedOutcome {
  readonly status: number | null;
  readonly signal: string | null;
  readonly timedOut: boolean;
  /** the signal that stopped the supervisor (SIGINT, SIGTERM, SIGHUP) */
  readonly stopped?: string;
  /** the program could not start: its error code */
  readonly error?: string;
}

const job = JSON.parse(readFileSync(process.argv[2], 'utf8')) as SuperviseJob;
const out = openSync(job.stdout, 'a');
const err = openSync(job.stderr, 'a');
let reason: 'timeout' | 'signal' | 'orphan' | undefined;
let stopped: string | undefined;

const child = spawn(job.argv[0], job.argv.slice(1), { cwd: job.cwd, env: job.env, stdio: ['ignore', out, err], detached: true, shell: false, windowsHide: true });
closeSync(out);
closeSync(err);

const groupAlive = (): boolean => {
  if (child.pid === undefined) return false;
  try {
    process.kill(-child.pid, 0);
    return true;
  } catch {
    return false;
  }
};
const signalGroup = (sig: NodeJS.Signals): void => {
  if (child.pid === undefined) return;
  try {
    process.kill(-child.pid, sig);
  } catch {
    // the group is gone
  }
};

/** SIGTERM to the group, SIGKILL after the grace period, then `then()` once the group is gone. */
function endGroup(then: () => void): void {
  signalGroup('SIGTERM');
  const started = Date.now();
  const poll = setInterval(() => {
    if (groupAlive() && Date.now() - started < job.graceMs) return;
    if (groupAlive()) signalGroup('SIGKILL');
    clearInterval(poll);
    then();
  }, 25);
}

let childExit: { status: number | null; signal: string | null } | undefined;
let reported = false;
let groupDone = false;
function report(outcome: SupervisedOutcome): void {
  if (reported) return;
  reported = true;
  process.stdout.write(`${JSON.stringify(outcome)}\n`, () => process.exit(0));
}

function finish(): void {
  if (reason === 'orphan') {
    if (!job.keep) rmSync(job.foldDir, { recursive: true, force: true });
    process.exit(0);
  }
  report({ status: childExit?.status ?? null, signal: childExit?.signal ?? null, timedOut: reason === 'timeout', ...(stopped ? { stopped } : {}) });
}

function stop(why: 'timeout' | 'signal' | 'orphan'): void {
  if (reason) return;
  reason = why;
  endGroup(() => {
    groupDone = true;
    if (childExit) finish();
  });
}

child.on('error', (e: NodeJS.ErrnoException) => report({ status: null, signal: null, timedOut: false, error: e.code ?? e.message }));
child.on('exit', (status, signal) => {
  childExit = { status, signal };
  if (reason) {
    if (groupDone) finish(); // else endGroup's callback finishes once the group is gone
    return;
  }
  // the program is done; members of its group left running are ended
  if (groupAlive()) endGroup(finish);
  else finish();
});

const timer = setTimeout(() => stop('timeout'), job.timeoutMs);
timer.unref();
for (const sig of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
  process.on(sig, () => {
    stopped ??= sig;
    stop('signal');
  });
}
const watcher = setInterval(() => {
  if (process.ppid !== job.parentPid || !existsSync(job.watch)) stop('orphan');
}, 200);
watcher.unref();
