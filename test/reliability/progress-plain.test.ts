/**
 * Progress off a terminal (#25 item 5): plain lines on standard error at a modest interval,
 * none with --quiet, and the report unchanged. The clock is the test's own (a fake `now`).
 */
import { describe, expect, it } from 'vitest';
import { duration, progressFor } from '../../src/cli/progress.js';
import { cli } from '../helpers/cli.js';

describe('plain progress lines off a terminal', () => {
  it('one line per interval with done/total, elapsed and an estimate; none with --quiet', () => {
    let text = '';
    let t = 0;
    const io = { stdout: { write: () => true }, stderr: { write: (s: string) => (text += s) }, env: {} };
    const p = progressFor(io, false, () => t)!;
    p.tasks(0, 40);
    for (let done = 1; done <= 40; done++) {
      t += 5000; // 5 s per task
      p.tasks(done, 40);
    }
    const lines = text.trim().split('\n');
    // 200 s of work, one line per 30 s (at 30, 60, ... 180 s); none at the end
    expect(lines.length).toBe(6);
    expect(lines[0]).toBe('foldwise: progress: 6/40 tasks done, 30s elapsed, about 2m50s left');
    expect(progressFor(io, true, () => t)).toBeUndefined();
    expect(duration(3725)).toBe('1h02m05s');
  });

  it('eval under a log (not a terminal) prints them, and the report is the same', async () => {
    const args = ['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--learner', 'knn', '--plan', 'kfold:3', '--jobs', '1', '--json', '-', '--no-timing', '--no-audit'];
    const quiet = await cli([...args, '--quiet']);
    const { run } = await import('../../src/cli/run.js');
    let stderr = '';
    let stdout = '';
    const code = await run(args, { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) }, env: { FOLDWISE_PROGRESS_SECONDS: '0' } });
    expect(code).toBe(0);
    expect(stderr).toMatch(/^foldwise: progress: 1\/6 tasks done, \d+s elapsed/m);
    expect(quiet.stderr).not.toMatch(/progress/);
    expect(stdout).toBe(quiet.stdout);
  });
});
