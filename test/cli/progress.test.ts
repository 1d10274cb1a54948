/**
 * The progress display: on a terminal (a fake TTY stream here) it shows the tasks bar; under CI,
 * with --quiet, or when standard error is not a terminal it shows nothing.
 */
import { describe, expect, it } from 'vitest';
import { Readable } from 'node:stream';
import { run } from '../../src/cli/run.js';

function fakeTty() {
  let text = '';
  const stream = {
    isTTY: true,
    columns: 100,
    write: (s: string) => ((text += s), true),
    cursorTo: () => true,
    clearLine: () => true,
    clearScreenDown: () => true,
    moveCursor: () => true,
    on: () => stream,
    removeListener: () => stream,
  };
  return { stream, text: () => text };
}

const ARGS = ['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--learner', 'knn', '--plan', 'kfold:3', '--jobs', '1', '--json', '-', '--no-timing'];

async function runWith(env: Record<string, string>, extra: string[] = []) {
  const tty = fakeTty();
  let stdout = '';
  const code = await run([...ARGS, ...extra], {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: tty.stream,
    stdin: Readable.from([]),
    env,
  });
  return { code, stderr: tty.text(), stdout };
}

describe('progress on standard error', () => {
  it('shows the tasks bar and the audit phase on a terminal', async () => {
    const r = await runWith({});
    expect(r.code).toBe(0);
    // 3 folds x 2 learners (baseline and knn) = 6 tasks
    expect(r.stderr).toMatch(/foldwise \[[#.]*\] \d\/6 tasks \| /);
    expect(r.stderr).toMatch(/foldwise: checking the data \(quick audit/);
  });

  it('shows nothing under CI or with --quiet, and the report is the same', async () => {
    const bar = await runWith({});
    const ci = await runWith({ CI: 'true' });
    const quiet = await runWith({}, ['--quiet']);
    expect(ci.stderr).not.toMatch(/tasks \|/);
    expect(quiet.stderr).not.toMatch(/tasks \|/);
    expect(ci.stdout).toBe(bar.stdout);
    expect(quiet.stdout).toBe(bar.stdout);
  });
});
