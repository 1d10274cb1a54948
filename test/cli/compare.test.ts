import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { mean } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from '../compare/synthetic.js';

// Palmer penguins (vega-datasets; Gorman, Williams & Fraser 2014) and a seeded synthetic CSV
const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const synthetic = tmp.file('synthetic.csv', syntheticCsv('classification', 200, 5));
const BASE = [penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--learner', 'knn', '--no-timing'];

async function report(name: string, extra: string[] = [], args = BASE): Promise<string> {
  const path = join(tmp.dir, name);
  const r = await cli(['eval', ...args, ...extra, '--json', path]);
  expect(r.code).toBe(0);
  return path;
}

function oneLine(stderr: string): string {
  const lines = stderr.split('\n').filter(Boolean);
  expect(lines.length).toBe(1);
  return lines[0];
}

let paths: Promise<Record<string, string>> | undefined;
/** The reports the tests share, made once. */
const reports = (): Promise<Record<string, string>> =>
  (paths ??= (async () => ({
    a: await report('a.json'),
    again: await report('again.json'),
    noFlipper: await report('no-flipper.json', ['--drop', 'Flipper Length (mm)']),
    seed2: await report('seed2.json', ['--seed', '2']),
    fiveFold: await report('five.json', ['--plan', 'kfold:5']),
    kappa: await report('kappa.json', ['--metric', 'accuracy', '--metric', 'kappa']),
    synthetic: await report('synthetic.json', [], [synthetic, '--target', 'y', '--learner', 'knn', '--no-timing']),
  }))());

describe('foldwise compare A.json B.json', () => {
  it('compares identical runs: every difference 0, p = 1, all folds tied', async () => {
    const { a, again } = await reports();
    const r = await cli(['compare', a, again]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('# foldwise compare: accuracy');
    // issue 24 part 2: identical accuracies are not certainty; the interval keeps the binomial
    // floor's width (README, "The report") instead of the zero-width "0.0000 to 0.0000"
    expect(r.stdout).toMatch(/\| baseline \| 0\.4418 \| 0\.4418 \| 0\.0000 \| -(0\.0\d{3}) to \+\1 \| 0\.00 \| 9 \| 1\.0000 \| 1\.0000 \| 0\/10\/0 \|/);
    expect(r.stdout).toMatch(/\| knn \| (\d\.\d{4}) \| \1 \| 0\.0000 \| -(0\.0\d{3}) to \+\2 \| 0\.00 \| 9 \| 1\.0000 \| 1\.0000 \| 0\/10\/0 \|/);
    expect(r.stdout).not.toContain('0.0000 to 0.0000');
  });

  it('pairs folds by (repeat, fold) and reports second minus first', async () => {
    const { a, noFlipper } = await reports();
    const r = await cli(['compare', a, noFlipper, '--learner', 'knn']);
    expect(r.code).toBe(0);
    const first = JSON.parse(readFileSync(a, 'utf8')) as Report;
    const second = JSON.parse(readFileSync(noFlipper, 'utf8')) as Report;
    const k1 = first.learners.find((l) => l.spec === 'knn')!;
    const k2 = second.learners.find((l) => l.spec === 'knn')!;
    const diff = mean(k2.folds.map((f, i) => f.scores.accuracy! - k1.folds[i].scores.accuracy!));
    const row = r.stdout.split('\n').find((l) => l.startsWith('| knn |'))!;
    expect(row).toBeDefined();
    const cells = row.split('|').map((c) => c.trim());
    expect(cells[2]).toBe(k1.summary.accuracy!.mean.toFixed(4));
    expect(cells[3]).toBe(k2.summary.accuracy!.mean.toFixed(4));
    // four decimals shown: within half a unit of the last digit
    expect(Math.abs(Number(cells[4]) - diff)).toBeLessThanOrEqual(0.00005 + 1e-12);
    expect(r.stdout.split('\n').some((l) => l.startsWith('| baseline |'))).toBe(false);
  });

  it('refuses runs with another seed, naming exactly the field (exit 2)', async () => {
    const { a, seed2 } = await reports();
    const r = await cli(['compare', a, seed2]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(oneLine(r.stderr)).toBe('foldwise: compare: the runs differ in plan.seed (1 vs 2); they are not comparable');
  });

  it('names the plan and the metric set when they differ', async () => {
    const { a, fiveFold, kappa } = await reports();
    const p = await cli(['compare', a, fiveFold]);
    expect(p.code).toBe(2);
    expect(oneLine(p.stderr)).toBe('foldwise: compare: the runs differ in plan.text (kfold:10 vs kfold:5); they are not comparable');
    const m = await cli(['compare', a, kappa]);
    expect(m.code).toBe(2);
    expect(oneLine(m.stderr)).toBe(
      'foldwise: compare: the runs differ in metrics (accuracy,balanced-accuracy,log-loss,macro-f1 vs accuracy,kappa); they are not comparable',
    );
  });

  it('names every differing field for another data file', async () => {
    const { a, synthetic: s } = await reports();
    const r = await cli(['compare', a, s]);
    expect(r.code).toBe(2);
    const line = oneLine(r.stderr);
    const sa = (JSON.parse(readFileSync(a, 'utf8')) as Report).data.sha256;
    const sb = (JSON.parse(readFileSync(s, 'utf8')) as Report).data.sha256;
    expect(line).toBe(
      `foldwise: compare: the runs differ in data.sha256 (${sa.slice(0, 12)}… vs ${sb.slice(0, 12)}…), data.rowsUsed (344 vs 200) and data.target (Species vs y); they are not comparable`,
    );
  });

  it('refuses missing, non-JSON and non-report files with one line naming the file (exit 2)', async () => {
    const { a } = await reports();
    const missing = join(tmp.dir, 'missing.json');
    const notJson = tmp.file('not.json', 'this is not JSON\n');
    const other = tmp.file('other.json', '{"schema": "foldwise-audit/2"}\n');
    const report = JSON.parse(readFileSync(a, 'utf8')) as Record<string, Record<string, unknown>>;
    delete report.plan.seed;
    const broken = tmp.file('broken.json', JSON.stringify(report));
    const cases: [string, string][] = [
      [missing, `foldwise: compare ${missing}: cannot be read (ENOENT); give the path of a JSON report written by foldwise eval --json`],
      [notJson, `foldwise: compare ${notJson}: not JSON (`],
      [other, `foldwise: compare ${other}: not a foldwise eval report (its "schema" field is "foldwise-audit/2", expected "foldwise-report/2")`],
      [broken, `foldwise: compare ${broken}: not a valid foldwise-report/2 report (at /plan: must have required property 'seed')`],
      [tmp.dir, `foldwise: compare ${tmp.dir}: cannot be read (EISDIR)`],
    ];
    for (const [file, start] of cases) {
      const r = await cli(['compare', a, file]);
      expect(r.code).toBe(2);
      expect(oneLine(r.stderr).startsWith(start)).toBe(true);
    }
  });

  it('refuses an unknown learner or metric with a usage message (exit 2)', async () => {
    const { a, again } = await reports();
    const l = await cli(['compare', a, again, '--learner', 'knn:k=9']);
    expect(l.code).toBe(2);
    expect(oneLine(l.stderr)).toBe(`foldwise: --learner knn:k=9: the first report ${a} has no such learner; did you mean "knn"? (it has "baseline", "knn")`);
    const m = await cli(['compare', a, again, '--metric', 'rmse']);
    expect(m.code).toBe(2);
    expect(oneLine(m.stderr)).toContain('--metric rmse: the reports do not score it');
    // the canonical spelling of a default option finds the learner (knn's default k is 5)
    const c = await cli(['compare', a, again, '--learner', 'knn:k=5']);
    expect(c.code).toBe(0);
  });
});

it('keeps the reports it reads unchanged', async () => {
  const { a, again } = await reports();
  const before = readFileSync(a, 'utf8');
  await cli(['compare', a, again]);
  expect(readFileSync(a, 'utf8')).toBe(before);
});

describe('foldwise compare --json', () => {
  it('writes the comparison as JSON that validates against schema/compare.schema.json', async () => {
    const { Ajv } = await import('ajv');
    const schema = JSON.parse(readFileSync(new URL('../../schema/compare.schema.json', import.meta.url), 'utf8'));
    const validate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(schema);
    const { a, noFlipper } = await reports();
    const r = await cli(['compare', a, noFlipper, '--learner', 'knn', '--json', '-']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(validate.errors ?? []).toEqual([]);
    expect(validate(out)).toBe(true);
    expect(out.schema).toBe('foldwise-compare/2');
    expect(out.rows.length).toBe(1);
    // diff = mean over folds of (second minus first), recomputed with simple-statistics
    const first = (JSON.parse(readFileSync(a, 'utf8')) as Report).learners.find((l) => l.spec === 'knn')!;
    const second = (JSON.parse(readFileSync(noFlipper, 'utf8')) as Report).learners.find((l) => l.spec === 'knn')!;
    expect(first.folds.length).toBe(10);
    const diffs = first.folds.map((f, i) => second.folds[i].scores.accuracy! - f.scores.accuracy!);
    expect(Math.abs(out.rows[0].stats.diff - mean(diffs))).toBeLessThan(1e-12);
    const file = join(tmp.dir, 'cmp.json');
    const w = await cli(['compare', a, noFlipper, '--learner', 'knn', '--json', file]);
    expect(w.code).toBe(0);
    expect(w.stdout).toContain('# foldwise compare');
    expect(JSON.parse(readFileSync(file, 'utf8'))).toEqual(out);
  });
});
