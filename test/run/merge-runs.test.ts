/**
 * Issue 21: what `merge` accepts and refuses when parts come from retries or from other runs.
 * A shard rerun (a retried scheduler task) writes its part again over the first; that must not
 * change the merged report. Parts of another run (another seed, another data file, another
 * foldwise version) must be refused with the difference named. Data: the Palmer penguins file
 * shipped in vega-datasets (CC0; Gorman, Williams & Fraser 2014), whole and without its last
 * row (another data file).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { VERSION } from '../../src/version.js';

const tmp = tempFolder();
const csv = penguinsCsv();
const penguins = tmp.file('penguins.csv', csv);
const lines = csv.trimEnd().split('\n');
const shorter = tmp.file('penguins-343.csv', `${lines.slice(0, -1).join('\n')}\n`);
const args = (data: string, ...more: string[]): string[] =>
  ['eval', data, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:4', '--jobs', '1', '--quiet', ...more];

async function part(name: string, shard: string, ...more: string[]): Promise<string> {
  const out = join(tmp.dir, name);
  const r = await cli([...args(penguins, ...more), '--shard', shard, '--json', out]);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return out;
}

describe('merge and retried or foreign parts', () => {
  it('gives the single run\'s bytes when a shard\'s part was written twice (with and without a journal)', async () => {
    const whole = await cli([...args(penguins), '--no-timing', '--json', '-']);
    expect(whole.code).toBe(0);
    const p1 = await part('twice-1.json', '1/2');
    const journal = join(tmp.dir, 'twice-2.journal');
    const p2 = await part('twice-2.json', '2/2', '--journal', journal);
    const first = readFileSync(p2, 'utf8');
    // the retry: the same command again over the same part, resumed from its journal ...
    await part('twice-2.json', '2/2', '--journal', journal);
    expect(JSON.parse(readFileSync(p2, 'utf8')).records.map((r: { id: string }) => r.id)).toEqual(JSON.parse(first).records.map((r: { id: string }) => r.id));
    const merged = await cli(['merge', p1, p2, '--no-timing', '--json', '-']);
    expect(merged.stderr).toBe('');
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(whole.stdout);
    // ... and once more without the journal, recomputed from scratch
    await part('twice-2.json', '2/2');
    const again = await cli(['merge', p1, p2, '--no-timing', '--json', '-']);
    expect(again.code).toBe(0);
    expect(again.stdout).toBe(whole.stdout);
  });

  it('refuses a part of another seed, another data file or another foldwise version, naming the difference', async () => {
    const p1 = await part('mine-1.json', '1/2');
    const p2 = await part('mine-2.json', '2/2');
    expect((await cli(['merge', p1, p2, '--json', join(tmp.dir, 'ok.json')])).code).toBe(0);

    const seed = await part('seed-2.json', '2/2', '--seed', '7');
    const bySeed = await cli(['merge', p1, seed, '--json', join(tmp.dir, 'seed.json')]);
    expect(bySeed.code).toBe(2);
    expect(bySeed.stderr).toMatch(/seed-2\.json belongs to another run than .*mine-1\.json: it differs in seed \(.*seed-2\.json: 7, .*mine-1\.json: 1\)/);

    const dataPart = join(tmp.dir, 'data-2.json');
    expect((await cli([...args(shorter), '--shard', '2/2', '--json', dataPart])).code).toBe(0);
    const byData = await cli(['merge', p1, dataPart, '--json', join(tmp.dir, 'data.json')]);
    expect(byData.code).toBe(2);
    expect(byData.stderr).toMatch(/data-2\.json belongs to another run .* differs in sha256 \(.*\), rowsUsed \(.*data-2\.json: 343, .*mine-1\.json: 344\)/);

    // a part written by another foldwise version: the same run otherwise, so only the version differs
    const foreign = JSON.parse(readFileSync(p2, 'utf8'));
    expect(foreign.tool).toEqual({ name: 'foldwise', version: VERSION });
    foreign.tool.version = '0.0.9';
    const versionPart = join(tmp.dir, 'version-2.json');
    writeFileSync(versionPart, JSON.stringify(foreign));
    const byVersion = await cli(['merge', p1, versionPart, '--json', join(tmp.dir, 'version.json')]);
    expect(byVersion.code).toBe(2);
    expect(byVersion.stderr).toBe(`foldwise: merge: ${versionPart} belongs to another run than ${p1}: it differs in foldwise version (${versionPart}: "0.0.9", ${p1}: "${VERSION}")\n`);
  });
});
