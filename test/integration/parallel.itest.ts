/**
 * Issue 21: the README's GNU parallel recipe, run as written (Debian's `parallel`), shards the
 * Palmer penguins data (vega-datasets, CC0; Gorman, Williams & Fraser 2014) four ways at once,
 * and `merge` gives the bytes of a single run. Skipped, with one line saying so, when `parallel`
 * is not installed (.ci/run installs it).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';
import { readmeBlock } from './helpers/readme.js';
import { recipeFolder, runProgram, shardProcesses, sleep, withoutTiming } from './helpers/shell.js';

const BIN = ['dist/src/cli/bin.js'];
const installed = spawnSync('sh', ['-c', 'command -v parallel'], { encoding: 'utf8' }).status === 0;
let root = '';

beforeAll(() => {
  if (!installed) console.warn('integration: GNU parallel test skipped: `parallel` is not installed (apt-get install parallel)');
  root = mkdtempSync(join(tmpdir(), 'foldwise-parallel-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('GNU parallel (the README recipe)', () => {
  it('runs four shards at once and merge gives the single run\'s report', async (ctx) => {
    if (!installed) ctx.skip('`parallel` is not installed');
    const recipe = readmeBlock('parallel --jobs 4 ');
    expect(recipe).toMatch(/^node dist\/src\/cli\/bin\.js merge part-\*\.json --json report\.json$/m);
    const work = recipeFolder(join(root, 'work'));
    writeFileSync(join(work, 'recipe.sh'), recipe);

    // watch the shard processes while the recipe runs: "in parallel" means several at once
    let running = true;
    let most = 0;
    const seen = new Set<string>();
    const watch = (async () => {
      while (running) {
        const now = shardProcesses(work);
        for (const s of now.keys()) seen.add(s);
        most = Math.max(most, now.size);
        await sleep(25);
      }
    })();
    const ran = await runProgram('bash', ['-e', 'recipe.sh'], { cwd: work });
    running = false;
    await watch;
    expect(ran.stderr).toBe('');
    expect(ran.code).toBe(0);
    expect([...seen].sort()).toEqual(['1/4', '2/4', '3/4', '4/4']);
    expect(most).toBeGreaterThanOrEqual(2);
    console.log(`GNU parallel: at most ${most} of the 4 shards ran at once`);

    const single = await runProgram('node', [...BIN, 'eval', 'data.csv', '--target', 'y', '--seed', '1', '--no-timing', '--json', '-'], { cwd: work });
    expect(single.code).toBe(0);
    expect(single.stdout.length).toBeGreaterThan(1000);
    // the recipe's report keeps timings; apart from them it is the single run's
    expect(existsSync(join(work, 'report.json'))).toBe(true);
    expect(withoutTiming(readFileSync(join(work, 'report.json'), 'utf8'))).toEqual(JSON.parse(single.stdout));
    // and without timings, byte for byte
    const merged = await runProgram('bash', ['-c', 'node dist/src/cli/bin.js merge part-*.json --no-timing --json -'], { cwd: work });
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(single.stdout);
  });
});
