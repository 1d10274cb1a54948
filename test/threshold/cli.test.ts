/**
 * `eval --threshold` through the CLI: the same bytes (JSON report and predictions file) with
 * --jobs 1 and 2 and from shards merged, and the cost at the chosen threshold with
 * `--metric cost --costs FILE` checked against the predictions file.
 *
 * Data: the Palmer penguins file of vega-datasets (CC0; Gorman, Williams & Fraser 2014),
 * restricted to Adelie and Gentoo (two classes; 152 + 124 = 276 birds, counted from the raw
 * JSON below), with the beak and flipper columns dropped so the two species overlap on body
 * mass and the threshold matters.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { PENGUINS_JSON } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();

/** Adelie and Gentoo rows of the raw JSON, as CSV (nulls become empty cells). */
function twoSpeciesCsv(): string {
  const rows = (JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, string | number | null>[]).filter((r) => r.Species !== 'Chinstrap');
  const header = Object.keys(rows[0]);
  return `${Papa.unparse([header, ...rows.map((r) => header.map((h) => (r[h] === null ? '' : String(r[h]))))], { newline: '\n' })}\n`;
}

const data = tmp.file('adelie-gentoo.csv', twoSpeciesCsv());
const base = ['eval', data, '--target', 'Species', '--drop', 'Beak Length (mm)', '--drop', 'Beak Depth (mm)', '--drop', 'Flipper Length (mm)', '--learner', 'logistic', '--learner', 'knn:k=15', '--plan', 'kfold:5', '--no-timing', '--no-audit', '--quiet'];

describe('eval --threshold: the same bytes however the run is made', () => {
  it('has 276 rows of two species (counted from the raw JSON)', () => {
    const raw = JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as { Species: string }[];
    expect(raw.filter((r) => r.Species === 'Adelie').length).toBe(152);
    expect(raw.filter((r) => r.Species === 'Gentoo').length).toBe(124);
  });

  for (const rule of ['max-f1', 'precision>=0.9']) {
    it(`${rule}: --jobs 1 and 2, and two shards merged, give the same report and predictions`, async () => {
      const args = [...base, '--threshold', rule];
      const files = (name: string): { json: string; csv: string } => ({ json: join(tmp.dir, `${name}.json`), csv: join(tmp.dir, `${name}.csv`) });
      // precision>=0.9 is out of the baseline's reach (its one probability gives the prevalence): it warns
      const warning = rule === 'max-f1' ? '' : 'foldwise: warning: baseline: --threshold: the rule was not met inside 5 of 5 folds; those folds use the threshold closest to meeting it\n';
      const run = async (name: string, jobs: string): Promise<{ json: string; csv: string }> => {
        const f = files(name);
        const r = await cli([...args, '--jobs', jobs, '--json', f.json, '--predictions', f.csv]);
        expect(r.stderr).toBe(warning);
        expect(r.code).toBe(0);
        return { json: readFileSync(f.json, 'utf8'), csv: readFileSync(f.csv, 'utf8') };
      };
      const tag = rule.replace(/\W/g, '_');
      const one = await run(`${tag}-one`, '1');
      const report = JSON.parse(one.json) as Report;
      expect(report.threshold?.rule).toBe(rule);
      expect(report.learners.length).toBe(3);
      for (const l of report.learners) {
        expect(l.threshold?.folds.length).toBe(5);
        for (const f of l.threshold!.folds) expect(f.threshold).not.toBeNull();
      }
      expect(one.csv.split('\n').length).toBe(3 * 276 + 2);
      const two = await run(`${tag}-two`, '2');
      expect(two.json).toBe(one.json);
      expect(two.csv).toBe(one.csv);
      const parts = [1, 2].map((i) => join(tmp.dir, `${tag}-part-${i}.json`));
      for (const [i, part] of parts.entries()) {
        const r = await cli([...args, '--jobs', '1', '--shard', `${i + 1}/2`, '--json', part]);
        expect(r.code).toBe(0);
      }
      const merged = files(`${tag}-merged`);
      const m = await cli(['merge', ...parts, '--json', merged.json, '--predictions', merged.csv, '--no-timing']);
      expect(m.stderr).toBe('');
      expect(m.code).toBe(0);
      expect(readFileSync(merged.json, 'utf8')).toBe(one.json);
      expect(readFileSync(merged.csv, 'utf8')).toBe(one.csv);
    });
  }
});

describe('eval --threshold with --metric cost --costs FILE', () => {
  // costs: a missed Gentoo (actual Gentoo, called Adelie) costs 5, a false Gentoo 1 (our choice)
  const costs = tmp.file('costs.csv', 'actual\\predicted,Adelie,Gentoo\nAdelie,0,1\nGentoo,5,0\n');
  const C = { Adelie: { Adelie: 0, Gentoo: 1 }, Gentoo: { Adelie: 5, Gentoo: 0 } } as const;

  it('reports each fold\'s threshold and the cost at it; both recomputed from the predictions file', async () => {
    const json = join(tmp.dir, 'cost.json');
    const csv = join(tmp.dir, 'cost.csv');
    const r = await cli([...base, '--threshold', 'cost:FP=1,FN=5', '--metric', 'cost', '--costs', costs, '--jobs', '1', '--json', json, '--predictions', csv]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const report = JSON.parse(readFileSync(json, 'utf8')) as Report;
    expect(report.threshold?.positive).toBe('Gentoo');
    const lines = Papa.parse<Record<string, string>>(readFileSync(csv, 'utf8'), { header: true, skipEmptyLines: true }).data;
    expect(lines.length).toBe(3 * 276);
    // hand computation from the predictions file: a test row is called Gentoo when its
    // prob:Gentoo is at least its fold's reported threshold; the cost is the mean of C[actual][call]
    const costAt = (rows: Record<string, string>[], t: number): number => rows.reduce((s, x) => s + C[x.actual as 'Adelie' | 'Gentoo'][Number(x['prob:Gentoo']) >= t ? 'Gentoo' : 'Adelie'], 0) / rows.length;
    const logistic = report.learners.find((l) => l.spec === 'logistic')!;
    let differs = 0;
    for (const l of report.learners) {
      const th = l.threshold!;
      expect(th.folds.length).toBe(5);
      const perFold: number[] = [];
      const atHalf: number[] = [];
      for (const f of th.folds) {
        const rows = lines.filter((x) => x.learner === l.spec && Number(x.fold) === f.fold + 1 && Number(x.repeat) === f.repeat + 1);
        expect(rows.length).toBeGreaterThan(50);
        expect(f.threshold).not.toBeNull();
        const hand = costAt(rows, f.threshold!);
        expect(Math.abs(f.scores.cost! - hand)).toBeLessThan(1e-12);
        perFold.push(hand);
        atHalf.push(costAt(rows, 0.5));
        if (Math.abs(hand - costAt(rows, 0.5)) > 1e-12) differs++;
      }
      const mean = (v: number[]): number => v.reduce((a, b) => a + b, 0) / v.length;
      expect(Math.abs(th.summary.cost!.mean - mean(perFold))).toBeLessThan(1e-12);
      expect(Math.abs(th.atDefault.cost!.mean - mean(atHalf))).toBeLessThan(1e-12);
    }
    // the threshold moves the calls on some fold (else this test would not tell the two apart)
    expect(differs).toBeGreaterThan(0);
    // Markdown shows the rule, the per-fold thresholds and the cost row beside 0.5
    const md = await cli([...base, '--threshold', 'cost:FP=1,FN=5', '--metric', 'cost', '--costs', costs, '--jobs', '1', '--markdown', '-']);
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('## Threshold chosen inside the training folds: cost:FP=1,FN=5');
    const per = logistic.threshold!.folds.map((f) => f.threshold!.toFixed(4)).join(', ');
    expect(md.stdout).toContain(`per fold: ${per}.`);
    const row = md.stdout.split('\n').find((x, i, all) => x.startsWith('| cost |') && all.slice(0, i).some((y) => y === '### logistic'));
    expect(row).toBeDefined();
    expect(row!.startsWith(`| cost | ${logistic.threshold!.summary.cost!.mean.toFixed(4)} |`)).toBe(true);
  });
});
