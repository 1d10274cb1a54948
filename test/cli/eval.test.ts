import { describe, expect, it } from 'vitest';
import { readFileSync, existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { penguinsCsv } from '../helpers/penguins.js';
import type { Report } from '../../src/model/report.js';
import { schemaCheck } from '../helpers/schema.js';

const expectValid = schemaCheck('report.schema.json');

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const FEATURES = ['--drop', 'Island', '--drop', 'Sex'];

describe('foldwise eval on the Palmer penguins file (vega-datasets; Gorman, Williams & Fraser 2014)', () => {
  it('reports 10-fold stratified scores that validate against the schema, with knn far above baseline', async () => {
    const r = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--json', '-', '--no-timing', '--no-audit']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expectValid(report);
    expect(report.data.rows).toBe(344);
    expect(report.data.rowsUsed).toBe(344);
    expect(report.data.classes).toEqual(['Adelie', 'Chinstrap', 'Gentoo']);
    expect(report.plan).toMatchObject({ kind: 'kfold', folds: 10, repeats: 1, stratified: true, seed: 1 });
    const [baseline, knn] = report.learners;
    expect(baseline.spec).toBe('baseline');
    // baseline accuracy: the majority class Adelie, 152 of 344 = 0.442 (a computed fact)
    expect(Math.abs(baseline.pooled.accuracy! - 152 / 344)).toBeLessThan(1e-12);
    // kNN on the four measurements separates the species well: far above the baseline
    expect(knn.summary.accuracy!.mean).toBeGreaterThan(0.9);
    expect(knn.folds.length).toBe(10);
    // pooled confusion matrix counts every row once, and its row sums are the class counts
    const rowSums = knn.confusion!.map((row) => row.reduce((a, b) => a + b, 0));
    expect(rowSums).toEqual([152, 68, 124]);
  });

  it('makes every fold stratified: each class within one of its proportional share', async () => {
    const r = await cli(['split', penguins, '--target', 'Species', '--assign', join(tmp.dir, 'assign.csv')]);
    expect(r.code).toBe(0);
    const lines = readFileSync(join(tmp.dir, 'assign.csv'), 'utf8').trim().split('\n');
    expect(lines[0]).toBe('row,line,repeat,fold,role');
    const species = penguinsCsv().trim().split('\n').slice(1).map((l) => l.split(',')[0]);
    const counts = new Map<string, number>();
    let tests = 0;
    for (const l of lines.slice(1)) {
      const [row, , , fold, role] = l.split(',');
      if (role !== 'test') continue;
      tests++;
      const key = `${fold}:${species[Number(row) - 1]}`;
      counts.set(key, (counts.get(key) ?? 0) + 1);
    }
    expect(tests).toBe(344);
    const total: Record<string, number> = { Adelie: 152, Gentoo: 124, Chinstrap: 68 };
    for (let f = 1; f <= 10; f++) {
      for (const [name, n] of Object.entries(total)) {
        const c = counts.get(`${f}:${name}`) ?? 0;
        expect(Math.abs(c - n / 10)).toBeLessThan(1);
      }
    }
  });

  it('gives a byte-identical report for the same seed with --no-timing, and a different one for another seed', async () => {
    const args = ['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--learner', 'forest-ref:trees=5', '--json', '-', '--no-timing'];
    const a = await cli(args);
    const b = await cli(args);
    expect(a.code).toBe(0);
    expect(a.stdout).toBe(b.stdout);
    const c = await cli([...args, '--seed', '2']);
    expect(c.stdout).not.toBe(a.stdout);
  });

  it('writes JSON and Markdown files atomically, and timings unless --no-timing', async () => {
    const json = join(tmp.dir, 'r.json');
    const md = join(tmp.dir, 'r.md');
    const r = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--json', json, '--markdown', md, '--plan', 'kfold:5x2']);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    const report = JSON.parse(readFileSync(json, 'utf8')) as Report;
    expectValid(report);
    expect(report.timing!.learners.map((l) => l.spec)).toEqual(['baseline', 'knn']);
    expect(report.learners[1].folds.length).toBe(10);
    expect(report.plan).toMatchObject({ folds: 5, repeats: 2 });
    const text = readFileSync(md, 'utf8');
    expect(text).toMatch(/\| knn \| 0\.9\d{3} \|/);
    expect(readdirSync(tmp.dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('scores pooled out-of-fold predictions for leave-one-out and says the per-fold spread is degenerate', async () => {
    const r = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', 'loo', '--metric', 'accuracy', '--json', '-', '--no-timing']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expectValid(report);
    expect(report.learners[1].folds.length).toBe(344);
    expect(report.warnings.join(' ')).toMatch(/per-fold spread is degenerate/);
    expect(Math.abs(report.learners[1].pooled.accuracy! - report.learners[1].summary.accuracy!.mean)).toBeLessThan(1e-12);
  });

  it('regression: predicts body mass with RMSE well below the baseline', async () => {
    const r = await cli(['eval', penguins, '--target', 'Body Mass (g)', '--learner', 'knn', '--json', '-', '--no-timing']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expectValid(report);
    expect(report.data.task).toBe('regression');
    expect(report.data.excludedRows).toBe(2); // the two rows with no body mass
    expect(report.metrics).toEqual(['rmse', 'mae', 'r2']);
    expect(report.learners[1].summary.rmse!.mean).toBeLessThan(0.6 * report.learners[0].summary.rmse!.mean);
    expect(report.warnings.join(' ')).toMatch(/2 rows with a missing target/);
  });

  it('holdout: scores validation, and the holdout part only with --final', async () => {
    const base = ['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', 'holdout:0.6/0.2/0.2', '--json', '-', '--no-timing'];
    const plain = JSON.parse((await cli(base)).stdout) as Report;
    expectValid(plain);
    expect(plain.plan.finalScored).toBe(false);
    expect(plain.learners[1].final).toBeUndefined();
    const fin = JSON.parse((await cli([...base, '--final'])).stdout) as Report;
    expectValid(fin);
    expect(fin.plan.finalScored).toBe(true);
    expect(fin.learners[1].final!.testRows).toBe(fin.plan.holdoutRows);
    expect(fin.learners[1].final!.trainRows + fin.plan.holdoutRows!).toBe(344);
  });

  it('holdout:A/B is train/test: byte for byte the report of holdout:A/B/0 (issue 25, item 19)', async () => {
    const run = async (plan: string) => cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', plan, '--json', '-', '--markdown', join(tmp.dir, `${plan.replace(/[:/]/g, '-')}.md`), '--no-timing']);
    const two = await run('holdout:0.8/0.2');
    const three = await run('holdout:0.8/0.2/0');
    expect(two.stderr).toBe(three.stderr);
    expect(two.code).toBe(0);
    expect(three.code).toBe(0);
    expect(two.stdout).toBe(three.stdout);
    expect(readFileSync(join(tmp.dir, 'holdout-0.8-0.2.md'), 'utf8')).toBe(readFileSync(join(tmp.dir, 'holdout-0.8-0.2-0.md'), 'utf8'));
    const report = JSON.parse(two.stdout) as Report;
    expectValid(report);
    expect(report.plan.text).toBe('holdout:0.8/0.2/0');
    // 344 rows: 20% scored (rounded per stratum), no holdout part
    expect(report.learners[1].folds.length).toBe(1);
    expect(report.plan.holdoutRows ?? 0).toBe(0);
    expect(report.learners[1].folds[0].trainRows + report.learners[1].folds[0].testRows).toBe(344);
    expect(Math.abs(report.learners[1].folds[0].testRows - 0.2 * 344)).toBeLessThan(3);
  });

  it('groups and forward plans run end to end', async () => {
    const g = await cli(['eval', penguins, '--target', 'Species', '--drop', 'Sex', '--group', 'Island', '--plan', 'kfold:3', '--learner', 'knn', '--json', '-', '--no-timing']);
    expect(g.code).toBe(0);
    const gr = JSON.parse(g.stdout) as Report;
    expectValid(gr);
    expect(gr.plan.group).toBe('Island');
    expect(gr.data.features).not.toContain('Island');
    const f = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--drop', 'Beak Depth (mm)', '--order', 'Body Mass (g)', '--plan', 'forward:4', '--learner', 'knn', '--json', '-', '--no-timing']);
    // two rows have no body mass: forward plans need an order value in every row
    expect(f.code).toBe(2);
    expect(f.stderr).toMatch(/--order column "Body Mass \(g\)" is missing/);
  });
});

describe('eval --html', () => {
  it('writes the same page that foldwise render makes from the JSON report', async () => {
    const json = join(tmp.dir, 'h.json');
    const html = join(tmp.dir, 'h.html');
    const r = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--json', json, '--html', html, '--no-timing', '--jobs', '1']);
    expect(r.code).toBe(0);
    const page = readFileSync(html, 'utf8');
    expect(page).toMatch(/^<!DOCTYPE html>/i);
    expect(page).toMatch(/<svg/);
    const again = join(tmp.dir, 'h2.html');
    expect((await cli(['render', json, '--html', again])).code).toBe(0);
    expect(readFileSync(again, 'utf8')).toBe(page);
  });
});

describe('the quick audit before eval', () => {
  it('warns about the id column of the bundled example, records it in the report\'s audit (not its warnings), and --no-audit turns it off', async () => {
    const args = ['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--learner', 'knn', '--plan', 'kfold:3', '--json', '-', '--no-timing', '--jobs', '1'];
    const on = await cli(args);
    expect(on.code).toBe(0);
    expect(on.stderr).toMatch(/warning: audit: id-like: "lot_id"/);
    const report = JSON.parse(on.stdout) as Report;
    expectValid(report);
    expect(report.audit?.ran).toBe(true);
    expect(report.audit!.suspects.join(' ')).toMatch(/id-like: "lot_id"/);
    expect(report.warnings.join(' ')).not.toMatch(/id-like/);
    const off = await cli([...args, '--no-audit']);
    expect(off.stderr).not.toMatch(/audit:/);
    expect((JSON.parse(off.stdout) as Report).audit).toEqual({ ran: false, suspects: [] });
  });
});

describe('foldwise eval on the bundled example', () => {
  it('runs the demo scenario with a group column and writes Markdown to stdout', async () => {
    const r = await cli(['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--group', 'orchard', '--learner', 'knn', '--plan', 'kfold:4', '--no-timing']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^# foldwise eval: grade/);
    expect(r.stdout).toMatch(/grouped by orchard/);
    expect(existsSync('examples/packhouse/fruit-grading.csv')).toBe(true);
  });
});

describe('usage errors exit 2 with one line', () => {
  it.each([
    [['eval', penguins], /required option '--target <column>' not specified/],
    [['eval', penguins, '--target', 'Specis'], /--target "Specis": no such column in .*penguins\.csv; did you mean "Species"\?/],
    [['eval', penguins, '--target', 'Species', '--drop', 'nope'], /--drop "nope": no such column/],
    [['eval', penguins, '--target', 'Species', '--learner', 'nope'], /--learner "nope": unknown learner/],
    [['eval', penguins, '--target', 'Species', '--metric', 'rmse'], /--metric rmse: a regression metric, but the task is classification/],
    [['eval', penguins, '--target', 'Species', '--metric', 'acuracy'], /--metric "acuracy": unknown metric; known: /],
    [['eval', penguins, '--target', 'Species', '--plan', 'kfold:1'], /--plan/],
    [['eval', penguins, '--target', 'Species', '--plan', 'kfold:400'], /400/],
    [['eval', penguins, '--target', 'Species', '--seed', '-1'], /--seed/],
    [['eval', penguins, '--target', 'Species', '--seed', '1.5'], /--seed 1.5: expected a whole number/],
    [['eval', penguins, '--target', 'Species', '--final'], /--final: only a holdout plan/],
    [['eval', penguins, '--target', 'Species', '--json', join(tmp.dir, 'no', 'such', 'r.json')], /--json .*: the folder .* does not exist/],
    [['eval', penguins, '--target', 'Species', '--json', tmp.dir], /is a folder; give a file name/],
    [['eval', penguins, '--target', 'Species', '--task', 'regression'], /target "Species" is not numeric \(line 2: "Adelie"\)/],
    [['frobnicate'], /unknown command/],
  ])('%j', async (argv, message) => {
    const r = await cli(argv as string[]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr.trim().split('\n').length).toBe(1);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('prints a stack trace only with --verbose', async () => {
    const r = await cli(['eval', penguins, '--target', 'nope', '--verbose']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/\n\s+at /);
  });

  it('reads standard input with -', async () => {
    const r = await cli(['eval', '-', '--target', 'y', '--learner', 'knn:k=1', '--plan', 'kfold:2', '--json', '-', '--no-timing'], 'x,y\n1,a\n2,a\n3,b\n4,b\n10,a\n11,b\n');
    expect(r.code).toBe(0);
    expect((JSON.parse(r.stdout) as Report).data.path).toBe('stdin');
  });
});

describe('the plan line counts folds in words (#19)', () => {
  it('a holdout plan with --final says one validation split, not "(1 folds)"', async () => {
    const r = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', 'holdout:0.6/0.2/0.2', '--final', '--no-timing', '--no-audit']);
    expect(r.code).toBe(0);
    expect(r.stdout).not.toMatch(/\b1 (paired )?folds\b/);
    expect(r.stdout).toContain('- Plan: holdout:0.6/0.2/0.2 (1 validation split), stratified; seed 1');
    const html = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', 'holdout:0.6/0.2/0.2', '--final', '--no-timing', '--no-audit', '--html', '-']);
    expect(html.stdout).not.toMatch(/\b1 folds\b/);
    const k = await cli(['eval', penguins, '--target', 'Species', ...FEATURES, '--learner', 'knn', '--plan', 'kfold:5x2', '--no-timing', '--no-audit']);
    expect(k.stdout).toContain('- Plan: kfold:5x2 (5 folds x 2 repeats)');
  });
});
