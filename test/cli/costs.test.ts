/**
 * `--costs FILE` and the `cost` metric through the CLI: eval, tune, score, merge, journals,
 * compare and gate. Data: Palmer penguins from vega-datasets (CC0; Gorman, Williams & Fraser
 * 2014). Outside checks: with a 0/1 matrix the cost is 1 - accuracy (Elkan 2001, section 1: the
 * expected cost under unit costs is the error rate), and with any matrix the pooled cost is the
 * sum of the matrix times the pooled confusion matrix over the rows (its definition, computed
 * here from the report's confusion matrix, not by the metric's code).
 */
import { Ajv } from 'ajv';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Report } from '../../src/model/report.js';
import type { TuneReport } from '../../src/model/tune.js';
import { cli } from '../helpers/cli.js';
import Papa from 'papaparse';
import { PENGUINS_JSON, penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const data = tmp.file('penguins.csv', penguinsCsv());
const zeroOne = tmp.file('zero-one.csv', 'actual\\predicted,Adelie,Chinstrap,Gentoo\nAdelie,0,1,1\nChinstrap,1,0,1\nGentoo,1,1,0\n');
const WEIGHTED = [
  [0, 2, 5],
  [1, 0, 3],
  [4, 0.5, 0],
];
const weighted = tmp.file('weighted.csv', 'actual\\predicted,Adelie,Chinstrap,Gentoo\nAdelie,0,2,5\nChinstrap,1,0,3\nGentoo,4,0.5,0\n');
// the same matrix written with its rows and columns in another order
const reordered = tmp.file('reordered.csv', 'x,Gentoo,Adelie,Chinstrap\nGentoo,0,4,0.5\nChinstrap,3,1,0\nAdelie,5,0,2\n');
const other = tmp.file('other.csv', 'actual\\predicted,Adelie,Chinstrap,Gentoo\nAdelie,0,2,5\nChinstrap,1,0,3\nGentoo,4,9,0\n');
const evalArgs = ['eval', data, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:5', '--no-timing', '--no-audit', '--quiet'];

async function report(...extra: string[]): Promise<Report> {
  const r = await cli([...evalArgs, '--json', '-', '--jobs', '1', ...extra]);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return JSON.parse(r.stdout) as Report;
}

describe('eval --metric cost --costs FILE', () => {
  it('a 0/1 matrix gives 1 - accuracy in every fold, pooled and on average (penguins)', async () => {
    const r = await report('--metric', 'cost', '--metric', 'accuracy', '--costs', zeroOne);
    schemaCheck('report.schema.json')(r);
    expect(r.metrics).toEqual(['cost', 'accuracy']);
    expect(r.settings.costs?.classes).toEqual(r.data.classes);
    expect(r.settings.costs?.matrix).toEqual([
      [0, 1, 1],
      [1, 0, 1],
      [1, 1, 0],
    ]);
    expect(r.settings.costs?.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(r.learners.length).toBe(2);
    for (const l of r.learners) {
      expect(l.folds.length).toBe(5);
      for (const f of l.folds) expect(Math.abs(f.scores.cost! - (1 - f.scores.accuracy!))).toBeLessThan(1e-12);
      expect(Math.abs(l.pooled.cost! - (1 - l.pooled.accuracy!))).toBeLessThan(1e-12);
      expect(Math.abs(l.summary.cost!.mean - (1 - l.summary.accuracy!.mean))).toBeLessThan(1e-12);
    }
    // knn is far better than the majority class on penguins
    expect(r.learners[1].summary.cost!.mean).toBeLessThan(r.learners[0].summary.cost!.mean);
    // lower is better: the comparison says so
    expect(r.comparisons?.higherIsBetter).toBe(false);
  });

  it('any matrix: the pooled cost is sum(C * confusion) / rows; the file order does not matter', async () => {
    const r = await report('--metric', 'cost', '--costs', weighted);
    const again = await report('--metric', 'cost', '--costs', reordered);
    expect(again.settings.costs?.matrix).toEqual(WEIGHTED);
    expect(again.learners.map((l) => l.folds)).toEqual(r.learners.map((l) => l.folds));
    for (const l of r.learners) {
      const cm = l.confusion!;
      expect(cm.length).toBe(3);
      let sum = 0;
      let n = 0;
      cm.forEach((row, a) => row.forEach((count, p) => ((sum += count * WEIGHTED[a][p]), (n += count))));
      expect(n).toBe(344);
      expect(Math.abs(l.pooled.cost! - sum / n)).toBeLessThan(1e-12);
    }
  });

  it('the majority-class baseline: pooled cost and accuracy from the species counts of the raw data', async () => {
    // Outside reference: the species counts of the vega-datasets penguins file, counted here from
    // the raw JSON (not through foldwise's loader): 152 Adelie, 68 Chinstrap, 124 Gentoo, the
    // counts Gorman, Williams & Fraser (2014) give for the 344 birds (from memory; the file agrees).
    const raw = JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as { Species: string }[];
    const count = (s: string): number => raw.filter((r) => r.Species === s).length;
    expect([raw.length, count('Adelie'), count('Chinstrap'), count('Gentoo')]).toEqual([344, 152, 68, 124]);
    // Adelie is the majority of every stratified training fold, so the baseline calls every row
    // Adelie: its errors are the Chinstrap rows (cost C[Chinstrap][Adelie] = 1) and the Gentoo
    // rows (C[Gentoo][Adelie] = 4), and under the 0/1 matrix its cost is the non-Adelie share
    const w = await report('--metric', 'cost', '--metric', 'accuracy', '--costs', weighted);
    const z = await report('--metric', 'cost', '--metric', 'accuracy', '--costs', zeroOne);
    expect(w.learners[0].spec).toBe('baseline');
    expect(z.learners[0].spec).toBe('baseline');
    expect(Math.abs(w.learners[0].pooled.cost! - (68 * 1 + 124 * 4) / 344)).toBeLessThan(1e-12);
    expect(Math.abs(z.learners[0].pooled.cost! - (68 + 124) / 344)).toBeLessThan(1e-12);
    expect(Math.abs(z.learners[0].pooled.accuracy! - 152 / 344)).toBeLessThan(1e-12);
  });

  it('Markdown and HTML show the matrix', async () => {
    const md = await cli([...evalArgs, '--metric', 'cost', '--costs', weighted, '--markdown', '-', '--jobs', '1']);
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('## Cost matrix (--costs)\n\n| actual \\ predicted | Adelie | Chinstrap | Gentoo |\n| :-- | --: | --: | --: |\n| Adelie | 0 | 2 | 5 |\n| Chinstrap | 1 | 0 | 3 |\n| Gentoo | 4 | 0.5 | 0 |\n');
    const html = await cli([...evalArgs, '--metric', 'cost', '--costs', weighted, '--html', '-', '--jobs', '1']);
    expect(html.code).toBe(0);
    expect(html.stdout).toContain('actual by predicted (Adelie, Chinstrap, Gentoo): Adelie 0, 2, 5; Chinstrap 1, 0, 3; Gentoo 4, 0.5, 0');
  });

  it('the same bytes with --jobs 2 and from shards and merge; merge and a journal refuse another matrix', async () => {
    const cost = ['--metric', 'cost', '--costs', weighted];
    const one = await cli([...evalArgs, ...cost, '--json', '-', '--jobs', '1']);
    const two = await cli([...evalArgs, ...cost, '--json', '-', '--jobs', '2']);
    expect(one.code).toBe(0);
    expect(two.stdout).toBe(one.stdout);
    const parts = [1, 2].map((i) => join(tmp.dir, `part-${i}.json`));
    for (const [i, part] of parts.entries()) {
      const r = await cli([...evalArgs, ...cost, '--shard', `${i + 1}/2`, '--json', part, '--jobs', '1']);
      expect(r.code).toBe(0);
    }
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(one.stdout);
    const foreign = join(tmp.dir, 'part-other.json');
    expect((await cli([...evalArgs, '--metric', 'cost', '--costs', other, '--shard', '2/2', '--json', foreign, '--jobs', '1'])).code).toBe(0);
    const mixed = await cli(['merge', parts[0], foreign, '--json', '-', '--no-timing']);
    expect(mixed.code).toBe(2);
    expect(mixed.stderr).toMatch(/costs \(/);
    // a reordered file of the same matrix is the same run
    const same = join(tmp.dir, 'part-reordered.json');
    expect((await cli([...evalArgs, '--metric', 'cost', '--costs', reordered, '--shard', '2/2', '--json', same, '--jobs', '1'])).code).toBe(0);
    expect((await cli(['merge', parts[0], same, '--json', '-', '--no-timing'])).stdout).toBe(one.stdout);
    const journal = join(tmp.dir, 'cost.journal');
    expect((await cli([...evalArgs, ...cost, '--journal', journal, '--json', '-', '--jobs', '1'])).code).toBe(0);
    const resumed = await cli([...evalArgs, '--metric', 'cost', '--costs', other, '--journal', journal, '--json', '-', '--jobs', '1']);
    expect(resumed.code).toBe(2);
    expect(resumed.stderr).toMatch(/costs \(/);
  });

  it('compare and gate take reports of the same matrix and refuse another one', async () => {
    const write = async (name: string, file: string, learner = 'knn'): Promise<string> => {
      const out = join(tmp.dir, name);
      const r = await cli(['eval', data, '--target', 'Species', '--learner', learner, '--plan', 'kfold:5', '--no-timing', '--no-audit', '--quiet', '--jobs', '1', '--metric', 'cost', '--costs', file, '--json', out]);
      expect(r.code).toBe(0);
      return out;
    };
    const a = await write('a.json', weighted);
    const b = await write('b.json', reordered, 'knn:k=9');
    const c = await write('c.json', other, 'knn:k=9');
    const ok = await cli(['compare', a, b, '--learner', 'baseline']);
    expect(ok.code).toBe(0);
    const refused = await cli(['compare', a, c]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/settings\.costs \(matrix of file SHA-256 [0-9a-f]{12}… vs matrix of file SHA-256 [0-9a-f]{12}…\)/);
    const gateOk = await cli(['gate', '--previous', a, '--current', b, '--learner', 'knn', '--current-learner', 'knn:k=9', '--max-drop', '1']);
    expect(gateOk.code).not.toBe(2);
    expect(gateOk.stderr).not.toMatch(/not comparable/);
    const gateRefused = await cli(['gate', '--previous', a, '--current', c, '--learner', 'knn', '--current-learner', 'knn:k=9']);
    expect(gateRefused.code).toBe(2);
    expect(gateRefused.stderr).toMatch(/settings\.costs/);
  });

  it('score --costs gives the scores eval gave from its predictions file', async () => {
    const preds = join(tmp.dir, 'preds.csv');
    const r = await cli([...evalArgs, '--metric', 'cost', '--costs', weighted, '--json', '-', '--jobs', '1', '--predictions', preds]);
    expect(r.code).toBe(0);
    const evalReport = JSON.parse(r.stdout) as Report;
    const s = await cli(['score', preds, '--metric', 'cost', '--costs', reordered, '--json', '-']);
    expect(s.stderr).toBe('');
    expect(s.code).toBe(0);
    const scored = JSON.parse(s.stdout) as Report;
    expect(scored.settings.costs?.matrix).toEqual(WEIGHTED);
    expect(scored.learners.length).toBe(2);
    for (const [i, l] of scored.learners.entries()) expect(l.folds.map((f) => f.scores.cost)).toEqual(evalReport.learners[i].folds.map((f) => f.scores.cost));
    // each fold's cost recomputed from the predictions file's own columns (actual, predicted_class;
    // repeat and fold counted from 1 there, from 0 in the report),
    // with the matrix looked up by class name, not through the metric's code
    const lines = Papa.parse<Record<string, string>>(readFileSync(preds, 'utf8'), { header: true, skipEmptyLines: true }).data;
    expect(lines.length).toBe(2 * 344);
    const names = ['Adelie', 'Chinstrap', 'Gentoo'];
    for (const l of evalReport.learners) {
      expect(l.folds.length).toBe(5);
      for (const f of l.folds) {
        const rows = lines.filter((x) => x.learner === l.spec && Number(x.fold) === f.fold + 1 && Number(x.repeat) === f.repeat + 1);
        expect(rows.length).toBeGreaterThan(60);
        const sum = rows.reduce((acc, x) => acc + WEIGHTED[names.indexOf(x.actual)][names.indexOf(x.predicted_class)], 0);
        expect(Math.abs(f.scores.cost! - sum / rows.length)).toBeLessThan(1e-12);
      }
    }
  });

  it('refuses: cost without a matrix, a matrix without cost, a regression target, an unreadable or broken file', async () => {
    const noFile = await cli([...evalArgs, '--metric', 'cost']);
    expect(noFile.code).toBe(2);
    expect(noFile.stderr).toBe('foldwise: --metric cost: give the cost matrix with --costs FILE (a CSV, actual by predicted; see the README)\n');
    const unused = await cli([...evalArgs, '--costs', weighted]);
    expect(unused.code).toBe(2);
    expect(unused.stderr).toMatch(/--costs .*weighted\.csv: add --metric cost/);
    const regression = await cli(['eval', data, '--target', 'Body Mass (g)', '--metric', 'cost', '--costs', weighted, '--quiet', '--no-audit']);
    expect(regression.code).toBe(2);
    expect(regression.stderr).toMatch(/--costs .*weighted\.csv: a cost matrix is for classification/);
    const missing = await cli([...evalArgs, '--metric', 'cost', '--costs', join(tmp.dir, 'nope.csv')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/--costs .*nope\.csv: cannot be read \(ENOENT\)/);
    const broken = tmp.file('broken.csv', 'actual\\predicted,Adelie,Chinstrap,Gentoo\nAdelie,0,1,1\nChinstrap,1,0,one\nGentoo,1,1,0\n');
    const bad = await cli([...evalArgs, '--metric', 'cost', '--costs', broken]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--costs .*broken\.csv: line 3, column 4: "one" is not a cost/);
    const tuneBad = await cli(['tune', data, '--target', 'Species', '--metric', 'cost', '--costs', broken, '--quiet']);
    expect(tuneBad.code).toBe(2);
    expect(tuneBad.stderr).toMatch(/broken\.csv: line 3, column 4/);
    // an output may not overwrite the matrix
    const over = await cli([...evalArgs, '--metric', 'cost', '--costs', weighted, '--json', weighted]);
    expect(over.code).toBe(2);
    expect(readFileSync(weighted, 'utf8')).toContain('Gentoo,4,0.5,0');
  });
});

describe('tune --metric cost', () => {
  it('picks by the lowest inner mean cost and writes the matrix in its settings', async () => {
    const r = await cli(['tune', data, '--target', 'Species', '--learner', 'knn:k=1|41', '--plan', 'kfold:3', '--inner', 'kfold:3', '--metric', 'cost', '--costs', weighted, '--json', '-', '--no-timing', '--no-audit', '--quiet', '--jobs', '1']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const t = JSON.parse(r.stdout) as TuneReport;
    schemaCheck('tune.schema.json')(t);
    expect(t.selection.metric).toBe('cost');
    expect(t.selection.higherIsBetter).toBe(false);
    expect(t.settings.costs?.matrix).toEqual(WEIGHTED);
    expect(t.outer.folds.length).toBe(3);
    expect(t.candidates.length).toBe(2);
    for (const [i, f] of t.outer.folds.entries()) {
      const means = t.candidates.map((c) => c.inner[i].mean!);
      expect(f.innerMean).toBe(Math.min(...means));
      expect(f.scores.cost).toBeGreaterThanOrEqual(0);
    }
    const jobs2 = await cli(['tune', data, '--target', 'Species', '--learner', 'knn:k=1|41', '--plan', 'kfold:3', '--inner', 'kfold:3', '--metric', 'cost', '--costs', weighted, '--json', '-', '--no-timing', '--no-audit', '--quiet', '--jobs', '2']);
    expect(jobs2.stdout).toBe(r.stdout);
  });
});

describe('growth --metric cost --costs FILE', () => {
  const growthArgs = ['growth', data, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:3', '--sizes', '0.3,1', '--metric', 'cost', '--costs', weighted, '--quiet', '--jobs', '1'];
  it('shows the matrix like eval: settings.costs in JSON (schema-checked), the same table in Markdown, the same line in HTML; shards merged carry it', async () => {
    const r = await cli([...growthArgs, '--json', '-']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const g = JSON.parse(r.stdout) as { settings?: { costs: { classes: string[]; matrix: number[][]; sha256: string } }; metric: string };
    schemaCheck('growth.schema.json')(g);
    expect(g.metric).toBe('cost');
    expect(g.settings?.costs.classes).toEqual(['Adelie', 'Chinstrap', 'Gentoo']);
    expect(g.settings?.costs.matrix).toEqual(WEIGHTED);
    // the file's SHA-256, as eval reports it
    const e = await report('--metric', 'cost', '--costs', weighted);
    expect(g.settings?.costs.sha256).toBe(e.settings.costs?.sha256);
    // the table and the line eval's writers give (the same strings as the eval test above)
    const md = await cli([...growthArgs, '--markdown', '-']);
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('## Cost matrix (--costs)\n\n| actual \\ predicted | Adelie | Chinstrap | Gentoo |\n| :-- | --: | --: | --: |\n| Adelie | 0 | 2 | 5 |\n| Chinstrap | 1 | 0 | 3 |\n| Gentoo | 4 | 0.5 | 0 |\n');
    const html = await cli([...growthArgs, '--html', '-']);
    expect(html.code).toBe(0);
    expect(html.stdout).toContain('actual by predicted (Adelie, Chinstrap, Gentoo): Adelie 0, 2, 5; Chinstrap 1, 0, 3; Gentoo 4, 0.5, 0');
    // the matrix is in the frame a shard part carries, so merge shows it too
    const parts = [1, 2].map((i) => join(tmp.dir, `growth-part-${i}.json`));
    for (const [i, part] of parts.entries()) expect((await cli([...growthArgs, '--shard', `${i + 1}/2`, '--json', part])).code).toBe(0);
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(r.stdout);
    // without --costs there is no settings field and no matrix section
    const plain = await cli(['growth', data, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:3', '--sizes', '0.3,1', '--quiet', '--jobs', '1', '--markdown', '-']);
    expect(plain.code).toBe(0);
    expect(plain.stdout).not.toContain('Cost matrix');
  });
});

describe('schema: settings.costs', () => {
  it('report and tune schemas accept the matrix and refuse a negative cost, a bad SHA-256 or an unknown field', async () => {
    const r = await report('--metric', 'cost', '--costs', weighted);
    for (const name of ['report.schema.json', 'tune.schema.json']) {
      const schema = JSON.parse(readFileSync(new URL(`../../schema/${name}`, import.meta.url), 'utf8'));
      const settings = schema.properties.settings;
      const validate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile({ ...settings, definitions: schema.definitions });
      const costs = r.settings.costs!;
      expect(validate({ impute: 'median', costs })).toBe(true);
      expect(validate({ impute: 'median' })).toBe(true);
      expect(validate({ impute: 'median', costs: { ...costs, matrix: [[0, -1, 5], ...costs.matrix.slice(1)] } })).toBe(false);
      expect(validate({ impute: 'median', costs: { ...costs, sha256: 'abc' } })).toBe(false);
      expect(validate({ impute: 'median', costs: { ...costs, file: 'weighted.csv' } })).toBe(false);
      const { matrix: _m, ...noMatrix } = costs;
      expect(validate({ impute: 'median', costs: noMatrix })).toBe(false);
    }
  });
});
