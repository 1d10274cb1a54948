/**
 * Safety of the HTML report: column names, class labels and the file path are data, and data
 * must never become markup. A CSV whose headers and labels hold <script>, quotes, & and </svg>
 * (and attempts to open event-handler attributes) goes through eval and render in-process; the
 * page must contain no executable markup: no <script, no on...= attribute in any tag, no
 * javascript: anywhere, and exactly as many </svg> as <svg> openings. The hostile text itself
 * must still be on the page, escaped (HTML Living Standard 13.1.4; OWASP XSS Prevention Cheat
 * Sheet rules 1-2). The same holds for a hostile regression target in the scatter axes and a
 * hostile column name in a quick-audit suspect. The rows are seeded synthetic data for this
 * check only. The tune page gets the same data, plus option values holding markup (from the
 * module learner in test/report/hostile-learner.mjs), which reach candidate specs, chart labels
 * and heat table headers.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { esc } from '../../src/report/html/escape.js';
import type { TuneReport } from '../../src/model/tune.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { expectNoExecutableMarkup, HOSTILE_CLASSES, HOSTILE_FEATURES, HOSTILE_GROUP, HOSTILE_MODES, HOSTILE_TARGET, hostileCsv } from './html-fixtures.js';

describe('hostile column names, class labels and file name', async () => {
  const tmp = tempFolder();
  const data = tmp.file('data<b>&"x.csv', hostileCsv());
  const json = join(tmp.dir, 'r.json');
  const html = join(tmp.dir, 'r.html');
  const e = await cli(['eval', data, '--target', HOSTILE_TARGET, '--group', HOSTILE_GROUP, '--learner', 'knn', '--plan', 'kfold:4', '--no-timing', '--quiet', '--jobs', '1', '--json', json]);
  const r = await cli(['render', json, '--html', html]);
  const page = r.code === 0 ? readFileSync(html, 'utf8') : '';
  const report = e.code === 0 ? (JSON.parse(readFileSync(json, 'utf8')) as Report) : undefined;

  it('runs eval and render on such data', () => {
    expect(e.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(report!.data.features).toEqual(HOSTILE_FEATURES);
    expect(new Set(report!.data.classes)).toEqual(new Set(HOSTILE_CLASSES));
  });

  it('writes no executable markup', () => {
    expectNoExecutableMarkup(page);
  });

  it('still shows every hostile text, escaped', () => {
    for (const t of [...HOSTILE_CLASSES, HOSTILE_TARGET, HOSTILE_GROUP, 'data<b>&"x.csv']) expect(page).toContain(esc(t));
    for (const t of report!.data.features) expect(page).toContain(esc(t));
    expect(report!.data.features.length).toBe(4);
  });
});

describe('a hostile regression target in the scatter axes and a hostile column in an audit suspect', async () => {
  const tmp = tempFolder();
  // the hostile file with one more column, twice the (numeric) target: the quick audit names it as a leak
  const LEAK = 'leak</li><script>alert(8)</script>&"\'';
  const TARGET = HOSTILE_FEATURES[0];
  const parsed = Papa.parse<string[]>(hostileCsv().trim(), { header: false }).data;
  const at = parsed[0].indexOf(TARGET);
  const rows = parsed.map((r, i) => [...r, i === 0 ? LEAK : String(2 * Number(r[at]))]);
  const data = tmp.file('leaky<i>.csv', `${Papa.unparse(rows, { newline: '\n' })}\n`);
  const json = join(tmp.dir, 'r.json');
  const html = join(tmp.dir, 'r.html');
  const e = await cli(['eval', data, '--target', TARGET, '--learner', 'knn', '--plan', 'kfold:4', '--no-timing', '--quiet', '--jobs', '1', '--json', json]);
  const r = await cli(['render', json, '--html', html]);
  const page = r.code === 0 ? readFileSync(html, 'utf8') : '';
  const report = e.code === 0 ? (JSON.parse(readFileSync(json, 'utf8')) as Report) : undefined;

  it('runs a regression with a sample and a suspect naming the hostile column', () => {
    expect(e.code).toBe(0);
    expect(r.code).toBe(0);
    expect(report!.data.task).toBe('regression');
    expect(report!.learners.every((l) => l.pooledSample)).toBe(true);
    expect(report!.audit!.suspects.some((s) => s.includes('<script>alert(8)</script>'))).toBe(true);
    expect(e.stderr).toContain('foldwise: warning: audit: leakage: ');
  });

  it('writes no executable markup, and shows the target in the axes and the suspect in the footer, escaped', () => {
    expectNoExecutableMarkup(page);
    expect(page).toContain('id="scatter"');
    for (const label of [`actual ${TARGET}`, `predicted ${TARGET}`]) expect(page).toContain(`>${esc(label)}</text>`);
    const footer = page.slice(page.indexOf('<footer>'));
    for (const s of report!.audit!.suspects) expect(footer).toContain(`<li>${esc(s)}</li>`);
    expect(page).not.toContain('</li><script>');
  });
});

describe('hostile column names, class labels and option values on the tune page', async () => {
  const tmp = tempFolder();
  const data = tmp.file('data<b>&"x.csv', hostileCsv());
  const json = join(tmp.dir, 't.json');
  const html = join(tmp.dir, 't.html');
  const direct = join(tmp.dir, 'direct.html');
  // test/report/hostile-learner.mjs: a module learner whose option `mode` takes hostile values
  const learner = `module:${join(dirname(fileURLToPath(import.meta.url)), 'hostile-learner.mjs')};temperature=0.5|2,mode=${HOSTILE_MODES.join('|')}`;
  const t = await cli(['tune', data, '--target', HOSTILE_TARGET, '--group', HOSTILE_GROUP, '--learner', learner, '--plan', 'kfold:3', '--inner', 'kfold:2', '--no-timing', '--json', json, '--html', direct]);
  const r = await cli(['render', json, '--html', html]);
  const page = r.code === 0 ? readFileSync(html, 'utf8') : '';
  const report = t.code === 0 ? (JSON.parse(readFileSync(json, 'utf8')) as TuneReport) : undefined;

  it('runs tune and render on such data and options', () => {
    expect(t.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(report!.data.features).toEqual(HOSTILE_FEATURES);
    expect(new Set(report!.data.classes)).toEqual(new Set(HOSTILE_CLASSES));
    expect(new Set(report!.candidates.map((c) => c.params.mode))).toEqual(new Set(HOSTILE_MODES));
    expect(readFileSync(direct, 'utf8')).toBe(page);
  });

  it('writes no executable markup', () => {
    expectNoExecutableMarkup(page);
    // the heat table of temperature x mode, and a chart per option
    expect(page).toContain('<table class="heat"');
    expect(page.match(/<figure class="chart" id="option-/g)?.length).toBe(2);
  });

  it('still shows every hostile text, escaped', () => {
    for (const t of [...HOSTILE_CLASSES, ...HOSTILE_MODES, HOSTILE_TARGET, HOSTILE_GROUP, 'data<b>&"x.csv']) expect(page).toContain(esc(t));
    for (const t of report!.data.features) expect(page).toContain(esc(t));
    for (const c of report!.candidates) expect(page).toContain(esc(c.spec));
    expect(report!.candidates.length).toBe(8);
  });
});

describe('the audit page (render of an audit --json report, issue 25 item 19)', async () => {
  const tmp = tempFolder();
  const data = tmp.file('audit<b>&"x.csv', hostileCsv());
  const json = join(tmp.dir, 'audit.json');
  const html = join(tmp.dir, 'audit.html');
  const a = await cli(['audit', data, '--target', HOSTILE_TARGET, '--group', HOSTILE_GROUP, '--plan', 'kfold:4', '--json', json]);
  const r = await cli(['render', json, '--html', html]);
  const page = r.code === 0 ? readFileSync(html, 'utf8') : '';
  const report = a.code === 0 ? (JSON.parse(readFileSync(json, 'utf8')) as { schema: string; data: { features: string[] }; columns: { name: string }[] }) : undefined;

  it('renders the audit report to one page, like the other reports', () => {
    expect(a.code).toBe(0);
    expect(report!.schema).toMatch(/^foldwise-audit\//);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(page.startsWith('<!DOCTYPE html>')).toBe(true);
    for (const h of ['Suspects', 'Each feature alone', 'Columns', 'Duplicates', 'Run details']) expect(page).toContain(`<h2>${h}</h2>`);
  });

  it('writes no executable markup, and shows every hostile column name and the file name escaped', () => {
    expectNoExecutableMarkup(page);
    expect(report!.columns.length).toBeGreaterThan(4);
    for (const c of report!.columns) expect(page).toContain(esc(c.name));
    for (const t of [HOSTILE_TARGET, HOSTILE_GROUP, 'audit<b>&"x.csv']) expect(page).toContain(esc(t));
  });
});
