/**
 * The quick audit's record in eval and tune reports (`audit: { ran, suspects }`): its findings
 * are there and no longer among the warnings, `--no-audit` gives ran false, standard error
 * shows each finding exactly as the warning line `quickAudit` has always made, Markdown and
 * HTML list them in their own block, and shards and merge carry them (byte-identical to a
 * single run). Reports of older versions, without the field, still validate and are read by
 * compare and gate. Data: the seeded clean process of test/audit/synthetic.ts with a column
 * that copies the target (a structural check of our own output), and the Palmer penguins file
 * from vega-datasets (CC0; Gorman, Williams & Fraser 2014).
 */
import { Ajv } from 'ajv';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { quickAudit } from '../../src/audit/index.js';
import { readReport } from '../../src/compare/read-report.js';
import { esc } from '../../src/report/html/escape.js';
import type { TuneReport } from '../../src/model/tune.js';
import type { Report } from '../../src/model/report.js';
import { cleanColumns, tableOf, toCsv } from '../audit/synthetic.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';

const compile = (name: string) =>
  new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(JSON.parse(readFileSync(new URL(`../../schema/${name}`, import.meta.url), 'utf8')));
const validateReport = compile('report.schema.json');
const validateTune = compile('tune.schema.json');
function expectValid(validate: ReturnType<typeof compile>, report: unknown): void {
  const ok = validate(report);
  expect(validate.errors ?? []).toEqual([]);
  expect(ok).toBe(true);
}

const tmp = tempFolder();
const cols = cleanColumns(300, 31);
cols.set('leak', [...cols.get('y')!]);
const leaky = tmp.file('leaky.csv', toCsv(cols));
const EVAL = ['eval', leaky, '--target', 'y', '--learner', 'knn', '--plan', 'kfold:5', '--no-timing', '--quiet'];
const auditLines = (stderr: string): string[] => stderr.split('\n').filter((l) => l.startsWith('foldwise: warning: audit: '));

describe('eval on a CSV with a column that copies the target', async () => {
  const on = await cli([...EVAL, '--jobs', '1', '--json', '-']);
  const report = JSON.parse(on.stdout) as Report;
  const expectedLines = quickAudit(await tableOf(cols, leaky), { target: 'y', plan: 'kfold:5', seed: 1 });

  it('records the suspects in report.audit and not among the warnings', () => {
    expect(on.code).toBe(0);
    expectValid(validateReport, report);
    expect(report.audit?.ran).toBe(true);
    expect(report.audit!.suspects.length).toBeGreaterThan(0);
    expect(report.audit!.suspects[0]).toMatch(/^leakage: "leak": alone it scores balanced accuracy 1\.000/);
    for (const s of report.audit!.suspects) expect(report.warnings).not.toContain(s);
    expect(report.warnings.join('\n')).not.toMatch(/audit:|leakage/);
  });

  it('prints each suspect on standard error as the warning line quickAudit makes', () => {
    expect(expectedLines.length).toBe(report.audit!.suspects.length);
    expect(expectedLines).toEqual(report.audit!.suspects.map((s) => `audit: ${s}`));
    expect(auditLines(on.stderr)).toEqual(expectedLines.map((l) => `foldwise: warning: ${l}`));
  });

  it('gives ran false and prints no audit line under --no-audit', async () => {
    const off = await cli([...EVAL, '--jobs', '1', '--json', '-', '--no-audit']);
    expect(off.code).toBe(0);
    const r = JSON.parse(off.stdout) as Report;
    expectValid(validateReport, r);
    expect(r.audit).toEqual({ ran: false, suspects: [] });
    expect(auditLines(off.stderr)).toEqual([]);
    expect(off.stderr).not.toMatch(/audit/);
  });

  it('lists the suspects in their own Markdown section, not under Warnings', async () => {
    const md = await cli([...EVAL, '--jobs', '1', '--markdown', '-']);
    expect(md.code).toBe(0);
    const section = md.stdout.split('## Data audit\n')[1];
    expect(section).toBeDefined();
    const own = section.split('\n## ')[0];
    for (const s of report.audit!.suspects) expect(own).toContain(`- ${s.replace(/\|/g, '\\|').replace(/</g, '&lt;').replace(/>/g, '&gt;')}`);
    const warnings = md.stdout.split('## Warnings\n')[1] ?? '';
    expect(warnings).not.toMatch(/leakage/);
    const quiet = await cli([...EVAL, '--jobs', '1', '--markdown', '-', '--no-audit']);
    expect(quiet.stdout).not.toContain('## Data audit');
  });

  it('lists them in the footer\'s Data audit block of the HTML page and counts them in its header', async () => {
    const page = await cli([...EVAL, '--jobs', '1', '--html', '-']);
    expect(page.code).toBe(0);
    const footer = page.stdout.slice(page.stdout.indexOf('<footer>'));
    expect(footer).toContain('<h3>Data audit</h3>');
    const n = report.audit!.suspects.length;
    for (const s of report.audit!.suspects) expect(footer).toContain(`<li>${esc(s)}</li>`);
    expect(page.stdout.slice(0, page.stdout.indexOf('</header>'))).toContain(`${n} data-audit suspect${n === 1 ? '' : 's'}`);
    const off = await cli([...EVAL, '--jobs', '1', '--html', '-', '--no-audit']);
    expect(off.stdout).toContain('The quick audit did not run (--no-audit).');
    expect(off.stdout).not.toContain('data-audit suspect');
  });

  it('carries them through shards and merge, byte-identical to a single run', async () => {
    const parts: string[] = [];
    for (const i of [1, 2]) {
      const out = join(tmp.dir, `leaky-part-${i}.json`);
      const r = await cli([...EVAL, '--jobs', '1', '--shard', `${i}/2`, '--json', out]);
      expect(r.code).toBe(0);
      parts.push(out);
    }
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(on.stdout);
    expect((JSON.parse(merged.stdout) as Report).audit).toEqual(report.audit);
  });
});

describe('tune records the quick audit the same way', () => {
  it('has the suspects in audit, not in warnings, and ran false under --no-audit', async () => {
    const args = ['tune', leaky, '--target', 'y', '--learner', 'knn:k=3|5', '--plan', 'kfold:3', '--inner', 'kfold:3', '--no-timing', '--json', '-'];
    const on = await cli(args);
    expect(on.code).toBe(0);
    const r = JSON.parse(on.stdout) as TuneReport;
    expectValid(validateTune, r);
    expect(r.audit?.ran).toBe(true);
    expect(r.audit!.suspects[0]).toMatch(/^leakage: "leak"/);
    expect(r.warnings.join('\n')).not.toMatch(/audit:|leakage/);
    const expected = quickAudit(await tableOf(cols, leaky), { target: 'y', plan: 'kfold:3', seed: 1 });
    expect(auditLines(on.stderr)).toEqual(expected.map((l) => `foldwise: warning: ${l}`));
    const md = await cli([...args.filter((a) => a !== '--json' && a !== '-'), '--markdown', '-']);
    expect(md.stdout).toContain(`## Data audit\n\n- ${r.audit!.suspects[0].replace(/\|/g, '\\|')}`);
    const off = JSON.parse((await cli([...args, '--no-audit'])).stdout) as TuneReport;
    expectValid(validateTune, off);
    expect(off.audit).toEqual({ ran: false, suspects: [] });
  });
});

describe('reports of older versions, without audit and pooledSample', () => {
  const penguins = tmp.file('penguins.csv', penguinsCsv());
  it('still validate, and compare and gate read them beside new reports', async () => {
    const args = ['eval', penguins, '--target', 'Body Mass (g)', '--learner', 'knn', '--plan', 'kfold:5', '--no-timing', '--quiet', '--jobs', '1'];
    const fresh = join(tmp.dir, 'new.json');
    expect((await cli([...args, '--json', fresh])).code).toBe(0);
    const now = JSON.parse(readFileSync(fresh, 'utf8')) as Report;
    expect(now.audit?.ran).toBe(true);
    expect(now.learners.every((l) => l.pooledSample)).toBe(true);
    expectValid(validateReport, now);
    const { audit: _audit, ...rest } = now;
    const old = { ...rest, learners: now.learners.map(({ pooledSample: _s, ...l }) => l) };
    expect(JSON.stringify(old)).not.toMatch(/"audit"|"pooledSample"/);
    expectValid(validateReport, old);
    const oldPath = tmp.file('old.json', `${JSON.stringify(old, null, 2)}\n`);
    expect(readReport(oldPath, 'gate').report.learners.length).toBe(2);
    expect(readReport(fresh, 'gate').report.learners.length).toBe(2);
    const cmp = await cli(['compare', oldPath, fresh]);
    expect(cmp.stderr).toBe('');
    expect(cmp.code).toBe(0);
    for (const [b, c] of [[oldPath, fresh], [fresh, oldPath]]) {
      const g = await cli(['gate', '--previous', b, '--current', c]);
      expect(g.stderr).toBe('');
      expect(g.code).toBe(0); // the same run on both sides: no drop
    }
    // render draws an older report without the regression charts
    const html = join(tmp.dir, 'old.html');
    expect((await cli(['render', oldPath, '--html', html])).code).toBe(0);
    const page = readFileSync(html, 'utf8');
    expect(page).not.toContain('id="scatter"');
    expect(page).not.toContain('<h3>Data audit</h3>');
  });
});
