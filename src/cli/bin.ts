#!/usr/bin/env node
/**
 * The executable: the only file that touches `process`.
 *
 * Standard output: a closed pipe (EPIPE: `foldwise learners | head -1`) is the reader's choice,
 * not an error: nothing more is written and the exit status is the command's own (0, or the
 * gate's verdict). Any other write failure (a full disk behind `> verdict.md`) is one line on
 * standard error and exit 2.
 *
 * Signals: while eval runs its tasks (and while tune --jobs N > 1 runs its search, without a
 * journal) SIGINT, SIGTERM and
 * SIGHUP stop the run within moments: workers are terminated, the programs of command: learners
 * and their process groups are ended, finished tasks stay in the journal, and the exit code is
 * 128 + the signal's number (130, 143, 129). A second signal exits at once. Outside that phase
 * the signals keep their default action: the process ends at once with the signal (the shell
 * shows 130 or 143); outputs are only ever renamed into place, so none is left half written.
 */
import { runCleanups } from './cleanup.js';
import { run } from './run.js';

const SIGNAL_CODES = { SIGINT: 130, SIGTERM: 143, SIGHUP: 129 } as const;
type StopSignal = keyof typeof SIGNAL_CODES;

let stdoutClosed = false;
let writeFailure: string | undefined;
const onStdoutError = (e: NodeJS.ErrnoException): void => {
  if (e.code === 'EPIPE' || stdoutClosed) {
    stdoutClosed = true;
    return;
  }
  if (writeFailure) return;
  writeFailure = e.code ?? e.message;
  const hint = e.code === 'ENOSPC' ? 'the disk is full' : 'check where it goes';
  process.stderr.write(`foldwise: standard output: cannot be written (${writeFailure}); ${hint}\n`);
};
process.stdout.on('error', onStdoutError);
process.stderr.on('error', () => undefined);

const stdout = {
  write(text: string): boolean {
    if (stdoutClosed || writeFailure) return true;
    try {
      return process.stdout.write(text);
    } catch (e) {
      onStdoutError(e as NodeJS.ErrnoException);
      return true;
    }
  },
};

const controller = new AbortController();
let caught: StopSignal | undefined;
const onSignal = (sig: StopSignal): void => {
  if (caught) {
    runCleanups();
    process.exit(SIGNAL_CODES[sig]);
  }
  caught = sig;
  process.stderr.write(`\nfoldwise: ${sig}: stopping; finished tasks are kept (send it again to quit at once)\n`);
  controller.abort(sig);
};
const armStops = (): (() => void) => {
  for (const sig of Object.keys(SIGNAL_CODES) as StopSignal[]) process.on(sig, onSignal);
  return () => {
    for (const sig of Object.keys(SIGNAL_CODES) as StopSignal[]) process.off(sig, onSignal);
  };
};
process.on('exit', runCleanups);

let code = await run(process.argv.slice(2), {
  stdout,
  stderr: process.stderr,
  stdin: process.stdin,
  env: process.env,
  cwd: process.cwd(),
  interrupted: () => caught !== undefined,
  stop: controller.signal,
  armStops,
});
// let a write error of the last output arrive before the exit code is settled
await new Promise((resolve) => setImmediate(resolve));
if (writeFailure) code = 2;
process.exitCode = code;
