import { Ajv } from 'ajv';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { TuneReport } from '../../src/model/tune.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const schema = JSON.parse(readFileSync(new URL('../../schema/tune.schema.json', import.meta.url), 'utf8'));
const validate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(schema);
function expectValid(report: unknown): void {
  const ok = validate(report);
  expect(validate.errors ?? []).toEqual([]);
  expect(ok).toBe(true);
}

// The Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014).
const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const ARGS = ['tune', penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--no-timing'];

describe('foldwise tune', () => {
  it('prints the candidate count up front and a schema-valid JSON report', async () => {
    const r = await cli([...ARGS, '--learner', 'knn:k=1|5|15,vote=equal|inverse', '--json', '-']);
    expect(r.code).toBe(0);
    expect(r.stderr.split('\n')[0]).toBe('foldwise: tune: 6 candidates in a grid of 6; outer kfold:5, inner kfold:3');
    const report = JSON.parse(r.stdout) as TuneReport;
    expectValid(report);
    expect(report.command).toBe('tune');
    expect(report.candidates.length).toBe(6);
    expect(report.timing).toBeUndefined();
  });

  it('writes Markdown with the outer estimate first and the grid sorted by inner mean, the pick marked', async () => {
    const md = join(tmp.dir, 'tune.md');
    const js = join(tmp.dir, 'tune.json');
    const r = await cli([...ARGS, '--learner', 'knn:k=1..21+4', '--pick', 'one-se', '--markdown', md, '--json', js, '--seed', '5']);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    const text = readFileSync(md, 'utf8');
    const report = JSON.parse(readFileSync(js, 'utf8')) as TuneReport;
    expectValid(report);
    const at = (s: string) => text.indexOf(s);
    expect(at('## Outer estimate (nested: quote this)')).toBeGreaterThan(0);
    expect(at('## Outer estimate')).toBeLessThan(at('## Recommendation (deploy this)'));
    expect(at('## Recommendation')).toBeLessThan(at('## Grid:'));
    const grid = text.slice(at('## Grid:')).split('\n').filter((l) => l.startsWith('| '));
    const body = grid.slice(2, 2 + report.candidates.length);
    expect(body.length).toBe(6);
    // sorted: inner means never increase down the table
    const means = body.map((l) => Number(l.split('|')[3]));
    for (let i = 1; i < means.length; i++) expect(means[i]).toBeLessThanOrEqual(means[i - 1]);
    // exactly one row carries the recommendation mark, and it is the recommended spec in bold
    const marked = body.filter((l) => l.startsWith('| → |'));
    expect(marked.length).toBe(1);
    expect(marked[0]).toContain(`**${report.recommendation.spec}**`);
  });

  it('gives the same report for the same seed (byte for byte without timings)', async () => {
    const a = await cli([...ARGS, '--learner', 'knn:k=3|9', '--json', '-', '--seed', '11']);
    const b = await cli([...ARGS, '--learner', 'knn:k=3|9', '--json', '-', '--seed', '11']);
    expect(a.code).toBe(0);
    expect(a.stdout).toBe(b.stdout);
  });

  it('runs a random search and a holdout from the command line', async () => {
    const r = await cli([...ARGS, '--learner', 'knn:k=1..80', '--sample', '5', '--holdout', '0.25', '--json', '-']);
    expect(r.code).toBe(0);
    expect(r.stderr.split('\n')[0]).toBe('foldwise: tune: 5 candidates sampled from a grid of 80; outer kfold:5, inner kfold:3');
    const report = JSON.parse(r.stdout) as TuneReport;
    expectValid(report);
    expect(report.search).toMatchObject({ gridSize: 80, tried: 5, sampled: true });
    expect(report.holdout?.testRows).toBe(86);
  });

  it('refuses a grid over the limit before reading data, unless --max-candidates raises it', async () => {
    const r = await cli([...ARGS, '--learner', 'knn:k=1..300']);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('foldwise: the grid has 300 candidates, more than the limit of 200; narrow it, use --sample N, or raise --max-candidates\n');
    const ok = await cli([...ARGS, '--learner', 'knn:k=1..300', '--max-candidates', '300', '--plan', 'holdout:0.5/0.5/0', '--inner', 'holdout:0.5/0.5/0', '--json', '-']);
    expect(ok.code).toBe(0);
    expect((JSON.parse(ok.stdout) as TuneReport).candidates.length).toBe(300);
  });

  // #25 item 12: a refused run prints its one error line only; the count comes once the data,
  // target, plans and metrics are known to be usable (the space is still counted before reading)
  it('prints the count once the input is known usable, and nothing but the error otherwise', async () => {
    const r = await cli(['tune', join(tmp.dir, 'missing.csv'), '--target', 'y', '--learner', 'knn:k=1|2']);
    expect(r.code).toBe(2);
    const lines = r.stderr.trim().split('\n');
    expect(lines.length).toBe(1);
    expect(lines[0].startsWith('foldwise: ')).toBe(true);
    const ok = await cli([...ARGS, '--learner', 'knn:k=1|2', '--plan', 'kfold:2', '--inner', 'kfold:2', '--no-audit', '--json', '-']);
    expect(ok.code).toBe(0);
    expect(ok.stderr.trim().split('\n')[0]).toBe('foldwise: tune: 2 candidates in a grid of 2; outer kfold:2, inner kfold:2');
  });

  const bad: [string, string[], RegExp][] = [
    ['an unknown option', ['--learner', 'knn:kk=1|2'], /^foldwise: --learner knn:kk=1\|2: unknown option "kk" for knn; did you mean "k"\?/],
    ['a bad range', ['--learner', 'knn:k=9..1'], /^foldwise: --learner knn:k=9..1: k=9..1: the range ends below its start$/],
    ['a bad --sample', ['--sample', 'ten'], /^foldwise: --sample ten: expected a whole number from 1 to 100000$/],
    ['a bad --max-candidates', ['--max-candidates', '0'], /^foldwise: --max-candidates 0: expected a whole number from 1 to 100000$/],
    ['a bad --holdout', ['--holdout', '1.5'], /^foldwise: --holdout 1.5: expected a fraction above 0 and below 1 \(such as 0.2\)$/],
    ['a bad --pick', ['--pick', 'worst'], /^foldwise: option '--pick <rule>' argument 'worst' is invalid/],
    ['an inner plan with a holdout part', ['--inner', 'holdout:0.6/0.2/0.2'], /^foldwise: --inner holdout:0.6\/0.2\/0.2: an inner plan has no use for a holdout part/],
    ['a bad inner plan', ['--inner', 'kfold:x'], /^foldwise: --inner /],
    ['both reports on standard output', ['--json', '-', '--markdown', '-'], /^foldwise: --json - and --markdown -: only one of them can go to standard output$/],
    ['JSON and HTML on standard output', ['--json', '-', '--html', '-'], /^foldwise: --json - and --html -: only one of them can go to standard output$/],
    ['the page over the data file', ['--html', penguins], /^foldwise: --html .*penguins\.csv: is the input file; give another name$/],
  ];
  for (const [what, extra, message] of bad) {
    it(`exits 2 with one line for ${what}`, async () => {
      const r = await cli([...ARGS, ...extra]);
      expect(r.code).toBe(2);
      const lines = r.stderr.trim().split('\n').filter((l) => !l.startsWith('foldwise: tune: '));
      expect(lines.length).toBe(1);
      expect(lines[0]).toMatch(message);
      expect(r.stdout).toBe('');
    });
  }

  it('does not write a report file when the run fails', async () => {
    const out = join(tmp.dir, 'never.json');
    const r = await cli([...ARGS, '--learner', 'knn:k=1..300', '--json', out]);
    expect(r.code).toBe(2);
    expect(existsSync(out)).toBe(false);
  });
});

describe('the quick audit before tune', () => {
  it('reports the id column of the bundled example in the report\'s audit (and as a warning line), and --no-audit turns it off', async () => {
    const args = ['tune', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--learner', 'knn:k=3|9', '--plan', 'kfold:3', '--json', '-', '--no-timing'];
    const on = await cli(args);
    expect(on.code).toBe(0);
    expect(on.stderr).toMatch(/foldwise: warning: audit: id-like: "lot_id"/);
    const report = JSON.parse(on.stdout) as TuneReport;
    expectValid(report);
    expect(report.audit?.ran).toBe(true);
    expect(report.audit!.suspects.join(' ')).toMatch(/id-like: "lot_id"/);
    expect(report.warnings.join(' ')).not.toMatch(/audit:|id-like/);
    const off = await cli([...args, '--no-audit']);
    expect(off.code).toBe(0);
    expect(off.stderr).not.toMatch(/audit:/);
    const offReport = JSON.parse(off.stdout) as TuneReport;
    expectValid(offReport);
    expect(offReport.audit).toEqual({ ran: false, suspects: [] });
    expect(offReport.warnings.join(' ')).not.toMatch(/audit:/);
  });
});

describe('tune with a module: learner', () => {
  it('loads the module before reading the search space (examples/external/centroid-learner.mjs)', async () => {
    const r = await cli(['tune', penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--learner', 'module:./examples/external/centroid-learner.mjs', '--plan', 'kfold:3', '--json', '-', '--no-timing', '--no-audit']);
    expect(r.stderr).toMatch(/1 candidate/);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as TuneReport;
    expect(JSON.stringify(report)).toMatch(/centroid-learner/);
  });
});

describe('tune compares the tuned estimate with the baseline', () => {
  it('pairs outer folds with the baseline fitted on them; its mean equals eval\'s baseline on the same plan and seed', async () => {
    const r = await cli([...ARGS, '--learner', 'knn:k=3|9', '--plan', 'kfold:5', '--json', '-', '--no-audit']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as TuneReport;
    expect(validate(report)).toBe(true);
    const c = report.comparisons!.pairs[0];
    expect(c).toMatchObject({ learner: 'tuned', reference: 'baseline', folds: 5 });
    expect(Math.abs(c.learnerMean - report.outer.summary.accuracy!.mean)).toBeLessThan(1e-12);
    // without a holdout, tune's outer folds are eval's folds for the same plan and seed
    const e = await cli(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--learner', 'knn', '--plan', 'kfold:5', '--json', '-', '--no-timing', '--no-audit', '--jobs', '1']);
    const evalBaseline = (JSON.parse(e.stdout) as Report).learners[0];
    expect(evalBaseline.spec).toBe('baseline');
    expect(Math.abs(c.referenceMean - evalBaseline.summary.accuracy!.mean)).toBeLessThan(1e-12);
    expect(c.direction).toBe('better');
    expect(r.stdout.length).toBeGreaterThan(0);
  });
});

describe('tune --html and render of a tune report', () => {
  it('writes the page with --html FILE (nothing on standard output), and render of the JSON writes the same page', async () => {
    const html = join(tmp.dir, 'tune.html');
    const js = join(tmp.dir, 'tune-for-html.json');
    const r = await cli([...ARGS, '--learner', 'knn:k=3|9,vote=equal|inverse', '--plan', 'kfold:3', '--html', html, '--json', js]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    const page = readFileSync(html, 'utf8');
    expect(page.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(page).toContain('<figure class="chart" id="option-1-1">');
    expect(page).toContain('<table class="heat"');
    const out = join(tmp.dir, 'tune-rendered.html');
    const rendered = await cli(['render', js, '--html', out]);
    expect(rendered.code).toBe(0);
    expect(rendered.stderr).toBe('');
    expect(readFileSync(out, 'utf8')).toBe(page);
    const toStdout = await cli(['render', js, '--html', '-']);
    expect(toStdout.code).toBe(0);
    expect(toStdout.stdout).toBe(page);
  });

  it('writes the page to standard output with --html -', async () => {
    const r = await cli([...ARGS, '--learner', 'knn:k=3|9', '--plan', 'kfold:3', '--html', '-']);
    expect(r.code).toBe(0);
    expect(r.stdout.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(r.stdout).not.toContain('# foldwise tune');
  });

  it('refuses a tune file that does not match schema/tune.schema.json, naming where', async () => {
    const js = join(tmp.dir, 'tune-valid.json');
    expect((await cli([...ARGS, '--learner', 'knn:k=3|9', '--plan', 'kfold:3', '--json', js])).code).toBe(0);
    const broken = JSON.parse(readFileSync(js, 'utf8')) as Record<string, unknown>;
    delete broken.recommendation;
    const bad = tmp.file('tune-broken.json', JSON.stringify(broken));
    const out = join(tmp.dir, 'never.html');
    const r = await cli(['render', bad, '--html', out]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^foldwise: render .*tune-broken\.json: not a valid foldwise-tune\/2 report \(at \/: must have required property 'recommendation'\)\n$/);
    expect(existsSync(out)).toBe(false);
  });
});

describe('foldwise tune: small defects of #19', () => {
  it('Markdown escapes | only inside tables', async () => {
    const space = 'knn:k=1|3,vote=equal|inverse';
    const r = await cli([...ARGS, '--learner', space, '--plan', 'kfold:3', '--inner', 'kfold:2', '--no-audit']);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    const prose = lines.filter((l) => !l.startsWith('|'));
    expect(prose.length).toBeGreaterThan(5);
    expect(prose.filter((l) => l.includes('\\|'))).toEqual([]);
    expect(r.stdout).toContain(`\`${space}\``);
    // inside a table cell the | is still escaped (GitHub Flavored Markdown, tables extension)
    expect(lines.some((l) => l.startsWith('|') && l.includes('k=1') && !l.includes('|3'))).toBe(true);
  });

  it('--quiet leaves out the notes on standard error, as in eval', async () => {
    const loud = await cli([...ARGS, '--learner', 'knn:k=1|3', '--plan', 'kfold:3', '--inner', 'kfold:2', '--no-audit']);
    expect(loud.stderr).toMatch(/^foldwise: tune: 2 candidates in a grid of 2/);
    const quiet = await cli([...ARGS, '--learner', 'knn:k=1|3', '--plan', 'kfold:3', '--inner', 'kfold:2', '--no-audit', '--quiet']);
    expect(quiet.code).toBe(0);
    // warnings still print; only the note goes
    const lines = (t: string) => t.split('\n').filter(Boolean);
    expect(lines(quiet.stderr).every((l) => l.startsWith('foldwise: warning: '))).toBe(true);
    expect(lines(quiet.stderr)).toEqual(lines(loud.stderr).slice(1));
    expect(quiet.stdout).toBe(loud.stdout);
  });
});
