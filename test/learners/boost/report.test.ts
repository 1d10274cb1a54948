/**
 * `boost` through the CLI: early stopping's chosen round per fold reaches the report (JSON,
 * valid against schema/report.schema.json, and Markdown), the report is byte-identical across
 * --jobs, and shards merged give the single run's report. Data: the Palmer penguins file
 * shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { resultFromJSON, resultToJSON } from '../../../src/run/result-json.js';
import { cli } from '../../helpers/cli.js';
import { penguinsCsv } from '../../helpers/penguins.js';
import { schemaCheck } from '../../helpers/schema.js';
import { tempFolder } from '../../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const base = ['eval', penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--learner', 'boost:rounds=60,stop=5', '--learner', 'boost:rounds=20', '--plan', 'kfold:4', '--no-timing', '--quiet', '--no-audit'];
const valid = schemaCheck('report.schema.json');

describe('task results keep the notes', () => {
  it('through the JSON of journals (resultToJSON / resultFromJSON), dropping malformed entries', () => {
    const r = { id: 'r1.f1:boost', predicted: Float64Array.of(1.5), fitMs: 1, predictMs: 2, notes: { 'stopped-at': 17 } };
    const back = resultFromJSON(JSON.parse(JSON.stringify(resultToJSON(r))), false, 'test');
    expect(back.notes).toEqual({ 'stopped-at': 17 });
    const odd = resultFromJSON({ ...resultToJSON(r), notes: { 'stopped-at': 'x', __proto__: 3, Fine: 1 } }, false, 'test');
    expect(odd.notes).toBeUndefined();
  });
});

describe('boost in eval', () => {
  it('reports the round each fold stopped at, the same for --jobs 1 and 2, and shards merged', async () => {
    const one = await cli([...base, '--jobs', '1', '--json', '-']);
    expect(one.stderr).toBe('');
    expect(one.code).toBe(0);
    const two = await cli([...base, '--jobs', '2', '--json', '-']);
    expect(two.stdout).toBe(one.stdout);
    const report = JSON.parse(one.stdout);
    valid(report);
    const bySpec = (spec: string) => report.learners.find((l: { spec: string }) => l.spec === spec);
    const stopped = bySpec('boost:rounds=60,stop=5');
    const plain = bySpec('boost:rounds=20');
    expect(stopped.folds.length).toBe(4);
    for (const f of stopped.folds) {
      expect(f.notes['stopped-at']).toBeGreaterThanOrEqual(0);
      expect(f.notes['stopped-at']).toBeLessThanOrEqual(60);
      expect(f.notes['rounds-run']).toBeGreaterThanOrEqual(f.notes['stopped-at']);
    }
    expect(plain.folds.every((f: { notes?: unknown }) => f.notes === undefined)).toBe(true);
    // penguin species are nearly separable on the bill and flipper measures (Gorman et al. 2014)
    expect(plain.summary.accuracy.mean).toBeGreaterThan(0.95);

    const parts: string[] = [];
    for (const i of [1, 2]) {
      const out = join(tmp.dir, `boost-part-${i}.json`);
      const r = await cli([...base, '--jobs', '1', '--shard', `${i}/2`, '--json', out]);
      expect(r.code).toBe(0);
      parts.push(out);
    }
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.stderr).toBe('');
    expect(merged.stdout).toBe(one.stdout);

    const md = join(tmp.dir, 'boost.md');
    const m = await cli([...base, '--jobs', '1', '--markdown', md]);
    expect(m.code).toBe(0);
    const text = readFileSync(md, 'utf8');
    const stops = stopped.folds.map((f: { notes: Record<string, number> }) => f.notes['stopped-at']).join(', ');
    expect(text).toContain(`- boost:rounds=60,stop=5: stopped-at per fold (in fold order): ${stops}`);
  });

  it('tune lists the round each outer refit stopped at', async () => {
    const r = await cli(['tune', penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--learner', 'boost:rounds=40,stop=3,leaves=4|8', '--plan', 'kfold:3', '--inner', 'kfold:2', '--json', '-', '--no-timing', '--no-audit']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    schemaCheck('tune.schema.json')(report);
    expect(report.outer.folds.length).toBe(3);
    for (const f of report.outer.folds) {
      expect(f.notes['stopped-at']).toBeGreaterThanOrEqual(0);
      expect(f.notes['stopped-at']).toBeLessThanOrEqual(40);
    }
  });

  it('refuses loss=huber for a class target before any fit, exit 2, one line', async () => {
    const r = await cli(['eval', penguins, '--target', 'Species', '--learner', 'boost:loss=huber', '--json', '-', '--quiet']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n').length).toBe(1);
    expect(r.stderr).toContain('option "loss" must be auto for classification');
  });
});
