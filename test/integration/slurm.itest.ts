/**
 * Issue 21: the README's Slurm job-array recipe on a real, one-machine Slurm cluster (Debian's
 * slurm-wlm with munge; test/integration/helpers/slurm-cluster.ts starts and stops it). The
 * recipe's steps run as written, on the Palmer penguins data (vega-datasets, CC0; Gorman,
 * Williams & Fraser 2014): the array with one task killed mid-run, after which `merge` refuses
 * and lists the missing tasks; then the README's retry of that index, after which the merged
 * report equals a single run's (byte for byte without timings). Skipped, with one line saying
 * why, when the packages are missing or the daemons cannot start.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { readmeBlock } from './helpers/readme.js';
import { recipeFolder, runProgram, shardProcesses, sleep, withoutTiming } from './helpers/shell.js';
import { ClusterUnavailable, startCluster, type Cluster } from './helpers/slurm-cluster.js';

let cluster: Cluster | undefined;
let why = '';

beforeAll(async () => {
  try {
    cluster = await startCluster();
  } catch (e) {
    if (!(e instanceof ClusterUnavailable)) throw e;
    why = e.message;
    console.warn(`integration: Slurm test skipped: ${why}`);
  }
}, 120_000);
afterAll(() => cluster?.stop(), 90_000);

/** Kills shard `shard` (e.g. "7/16") of the foldwise runs in `work` once it starts: stopped first, so it cannot finish, then killed. */
async function killShard(work: string, shard: string, ms: number): Promise<{ partExisted: boolean }> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    const pid = shardProcesses(work).get(shard);
    if (pid !== undefined) {
      process.kill(pid, 'SIGSTOP');
      const partExisted = existsSync(join(work, `part-${shard.split('/')[0]}.json`));
      process.kill(pid, 'SIGKILL');
      return { partExisted };
    }
    await sleep(20);
  }
  throw new Error(`shard ${shard} did not start within ${ms / 1000} s`);
}

describe('Slurm job array (the README recipe)', () => {
  it('runs the array, refuses to merge with a killed task, and after its retry merges to the single run\'s report', async (ctx) => {
    if (!cluster) ctx.skip(why);
    const c = cluster!;
    const script = readmeBlock('#SBATCH --array=');
    const submit = readmeBlock('sbatch --wait shards.sh');
    const retry = readmeBlock('sbatch --wait --array=');
    const index = /--array=(\d+) shards\.sh/.exec(retry)?.[1];
    const count = /--shard \$\{SLURM_ARRAY_TASK_ID\}\/(\d+)/.exec(script)?.[1];
    expect(index).toBe('7');
    expect(count).toBe('16');
    expect(script).toMatch(/^#SBATCH --array=1-16$/m);
    const work = recipeFolder(c.work);
    writeFileSync(join(work, 'shards.sh'), script);
    writeFileSync(join(work, 'submit.sh'), submit);
    writeFileSync(join(work, 'retry.sh'), retry);

    // the README's submit-and-merge, while task 7 is killed as soon as it starts
    const first = runProgram('bash', ['submit.sh'], { cwd: work, env: c.env });
    const killed = await killShard(work, `${index}/${count}`, 400_000);
    const ran = await first;
    expect(killed.partExisted).toBe(false);
    const job = /Submitted batch job (\d+)/.exec(ran.stdout)?.[1];
    expect(job).toBeDefined();
    // Slurm recorded the killed task as failed and the other 15 as done
    const states = await c.run('scontrol', ['--oneliner', 'show', 'job', job!]);
    const byTask = new Map([...states.stdout.matchAll(/ArrayTaskId=(\d+) .*?JobState=(\w+)/g)].map((m) => [m[1], m[2]]));
    const expected = Object.fromEntries(Array.from({ length: 16 }, (_, i) => [String(i + 1), String(i + 1) === index ? 'FAILED' : 'COMPLETED']));
    expect(Object.fromEntries(byTask)).toEqual(expected);
    // merge refuses, naming the missing tasks, and writes nothing
    expect(ran.code).toBe(2);
    expect(ran.stderr).toMatch(/^foldwise: merge: \d+ tasks? (is|are) missing: r1\.f\d+:/m);
    expect(existsSync(join(work, 'report.json'))).toBe(false);
    const parts = readdirSync(work).filter((f) => /^part-\d+\.json$/.test(f));
    expect(parts).toHaveLength(15);
    expect(parts).not.toContain(`part-${index}.json`);

    // the README's retry of that index, then merge
    const again = await runProgram('bash', ['retry.sh'], { cwd: work, env: c.env });
    expect(again.stderr).toBe('');
    expect(again.code).toBe(0);
    expect(again.stdout).toMatch(/Submitted batch job \d+/);
    expect(readFileSync(join(work, `slurm-${/Submitted batch job (\d+)/.exec(again.stdout)![1]}_${index}.out`), 'utf8')).toBe('');

    const single = await runProgram('node', ['dist/src/cli/bin.js', 'eval', 'data.csv', '--target', 'y', '--seed', '1', '--jobs', '2', '--no-timing', '--json', '-'], { cwd: work });
    expect(single.code).toBe(0);
    expect(single.stdout.length).toBeGreaterThan(1000);
    expect(withoutTiming(readFileSync(join(work, 'report.json'), 'utf8'))).toEqual(JSON.parse(single.stdout));
    const merged = await runProgram('bash', ['-c', 'node dist/src/cli/bin.js merge part-*.json --no-timing --json -'], { cwd: work });
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(single.stdout);
  });
});
