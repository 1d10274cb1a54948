/**
 * `foldwise audit` end to end through the in-process CLI: JSON validated against
 * schema/audit.schema.json, Markdown to a file, standard input, exit codes as for eval
 * (0 done, 2 bad input or usage). Data: the Palmer penguins file from vega-datasets (CC0;
 * Gorman, Williams & Fraser 2014) and the seeded clean process of synthetic.ts.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { AuditReport } from '../../src/audit/index.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { cleanColumns, toCsv } from './synthetic.js';
import { expectValidAudit } from './validate.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const leaky = (() => {
  const cols = cleanColumns(300, 31);
  cols.set('leak', [...cols.get('y')!]);
  return tmp.file('leaky.csv', toCsv(cols));
})();

describe('foldwise audit (CLI)', () => {
  it('writes a JSON report that validates, with the loader warnings on stderr only', async () => {
    const r = await cli(['audit', penguins, '--target', 'Species', '--json', '-']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const report = JSON.parse(r.stdout) as AuditReport;
    expectValidAudit(report);
    expect(report.command).toBe('audit');
    expect(report.plan).toMatchObject({ kind: 'kfold', text: 'kfold:10', folds: 10, stratified: true, seed: 1 });
    expect(report.settings.clusterThreshold).toBe(0.9);
  });

  it('prints Markdown by default and writes Markdown and JSON files on request', async () => {
    const r = await cli(['audit', penguins, '--target', 'Species']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^# foldwise audit: Species/);
    const md = join(tmp.dir, 'audit.md');
    const json = join(tmp.dir, 'audit.json');
    const w = await cli(['audit', penguins, '--target', 'Species', '--markdown', md, '--json', json, '--plan', 'kfold:5x2', '--seed', '7', '--cluster-threshold', '0.85']);
    expect(w.code).toBe(0);
    expect(w.stdout).toBe('');
    expect(readFileSync(md, 'utf8')).toContain('## Correlated clusters (threshold 0.85)');
    const report = JSON.parse(readFileSync(json, 'utf8')) as AuditReport;
    expectValidAudit(report);
    expect(report.plan).toMatchObject({ text: 'kfold:5x2', repeats: 2, seed: 7 });
    expect(report.clusters.length).toBe(1);
  });

  it('reads standard input, and gives a byte-identical report for the same seed', async () => {
    const a = await cli(['audit', '-', '--target', 'Species', '--json', '-'], penguinsCsv());
    const b = await cli(['audit', '-', '--target', 'Species', '--json', '-'], penguinsCsv());
    expect(a.code).toBe(0);
    expect(a.stdout).toBe(b.stdout);
    expect((JSON.parse(a.stdout) as AuditReport).data.path).toBe('stdin');
  });

  it('reports leakage in Markdown and still exits 0 (audit findings are not failures)', async () => {
    const r = await cli(['audit', leaky, '--target', 'y']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('| high | leakage | "leak": alone it scores balanced accuracy 1.000');
    expect(r.stdout).toContain('--drop "leak"');
  });

  it('exits 2 with one line for bad options and bad data', async () => {
    const cases: [string[], RegExp][] = [
      [['audit', penguins, '--target', 'Species', '--cluster-threshold', '1.5'], /^foldwise: --cluster-threshold 1.5: expected a number above 0 and at most 1/],
      [['audit', penguins, '--target', 'Species', '--cluster-threshold', 'abc'], /--cluster-threshold abc/],
      [['audit', penguins, '--target', 'Specie'], /^foldwise: --target "Specie": no such column .*did you mean "Species"/],
      [['audit', penguins, '--target', 'Species', '--seed', '-1'], /--seed -1/],
      [['audit', penguins, '--target', 'Species', '--plan', 'kfold:1'], /--plan/],
      [['audit', penguins, '--target', 'Species', '--json', '-', '--markdown', '-'], /only one of them can go to standard output/],
      [['audit', join(tmp.dir, 'nope.csv'), '--target', 'Species'], /no such file/],
      [['audit', penguins, '--target', 'Species', '--json', join(tmp.dir, 'missing-folder', 'x.json')], /does not exist/],
    ];
    for (const [argv, message] of cases) {
      const r = await cli(argv);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stderr.trim().split('\n').length, argv.join(' ')).toBe(1);
      expect(r.stderr, argv.join(' ')).toMatch(message);
    }
    expect(existsSync(join(tmp.dir, 'missing-folder'))).toBe(false);
  });

  it('lists audit in the help', async () => {
    const r = await cli(['--help']);
    expect(r.stdout).toMatch(/audit \[options\] <data>/);
  });
});
