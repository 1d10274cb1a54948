/**
 * The audit's recalibration (issue #20) and its advice (issue #25 items 8-10), on seeded
 * synthetic processes stated beside each case (synthetic.ts) and on the Burtin antibiotic data
 * shipped in the npm package vega-datasets (16 bacteria, 7 Gram-positive and 9 Gram-negative;
 * W. Burtin 1951, as distributed with vega-datasets). The fast subset of the calibration corpus
 * is in corpus.test.ts.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { audit, quickAudit, type AuditReport, type Suspect } from '../../src/audit/index.js';
import { loadCsv } from '../../src/data/load-csv.js';
import { prepareRun } from '../../src/run/prepare.js';
import { createRng } from '../../src/rng.js';
import { PENGUINS_JSON } from '../helpers/penguins.js';
import { cleanColumns, gauss, tableOf, type Cell } from './synthetic.js';

const of = (r: AuditReport, kind: Suspect['kind']): Suspect[] => r.suspects.filter((s) => s.kind === kind);

/** As in the issue: two Gaussian classes 2 sd apart on x1 (balanced accuracy about 0.84 alone), four noise columns. */
function lone(n: number, seed: number, task: 'classification' | 'regression'): Map<string, Cell[]> {
  const rng = createRng(seed);
  const cols = new Map<string, Cell[]>([['x1', []], ['x2', []], ['x3', []], ['x4', []], ['x5', []], ['y', []]]);
  for (let i = 0; i < n; i++) {
    const cls = rng.next() < 0.5 ? 1 : 0;
    const x1 = task === 'classification' ? gauss(rng) + 2 * cls : gauss(rng);
    cols.get('x1')!.push(x1);
    for (const c of ['x2', 'x3', 'x4', 'x5']) cols.get(c)!.push(gauss(rng));
    cols.get('y')!.push(task === 'classification' ? (cls ? 'yes' : 'no') : 2 * x1 + 1.2 * gauss(rng));
  }
  return cols;
}

describe('a lone strong feature is a note, not printed before eval', () => {
  it('classification: classes 2 sd apart on x1', async () => {
    const table = await tableOf(lone(1000, 1, 'classification'));
    const r = audit(table, { target: 'y' });
    const leak = of(r, 'leakage');
    expect(leak.length).toBe(1);
    expect(leak[0]).toMatchObject({ severity: 'note', columns: ['x1'], reasons: ['far-above'] });
    expect(quickAudit(table, { target: 'y', plan: 'kfold:10', seed: 1 })).toEqual([]);
  });

  it('regression: y = 2 x1 + 1.2 e (R^2 alone about 0.7)', async () => {
    const table = await tableOf(lone(1000, 2, 'regression'));
    const r = audit(table, { target: 'y' });
    expect(of(r, 'leakage').map((s) => s.severity)).toEqual(['note']);
    expect(quickAudit(table, { target: 'y', plan: 'kfold:10', seed: 1 })).toEqual([]);
  });
});

describe('target encoding computed on all rows', () => {
  it('is leakage "high" with the reason target-mean, for a class and a numeric target', async () => {
    for (const task of ['classification', 'regression'] as const) {
      const cols = cleanColumns(600, 31);
      const rng = createRng(32);
      const y = cols.get('y')!;
      const target = task === 'classification' ? y : (cols.get('x1')! as number[]).map((v) => Number((v + gauss(rng)).toFixed(6)));
      cols.set('y', target);
      // 60 zones with no effect, each written as the mean target of its rows (all rows)
      const zone = target.map(() => rng.int(60));
      const sum = new Float64Array(60);
      const cnt = new Float64Array(60);
      const val = (v: Cell): number => (task === 'classification' ? (v === 'yes' ? 1 : 0) : (v as number));
      zone.forEach((z, i) => ((sum[z] += val(target[i])), cnt[z]++));
      cols.set('zone_rate', zone.map((z) => Number((sum[z] / cnt[z]).toFixed(6))));
      const r = audit(await tableOf(cols), { target: 'y' });
      const leak = of(r, 'leakage').find((s) => s.columns[0] === 'zone_rate');
      expect(leak?.severity).toBe('high');
      expect(leak?.reasons).toContain('target-mean');
      // an honest feature with 50 whole-number values is not mistaken for one
      expect(of(r, 'leakage').filter((s) => s.columns[0] === 'k')).toEqual([]);
    }
  });
});

describe('duplicates', () => {
  it('regression: rows with equal features and other targets are not conflicting duplicates', async () => {
    const rng = createRng(41);
    const n = 300;
    // a coarse feature (whole numbers 0-9) and a numeric target: equal features, other targets
    const x = Array.from({ length: n }, () => rng.int(10));
    const cols = new Map<string, Cell[]>([['x', x], ['y', x.map((v) => Number((v + gauss(rng)).toFixed(3)))]]);
    const r = audit(await tableOf(cols), { target: 'y' });
    expect(r.duplicates.conflictingRows).toBeGreaterThan(0);
    expect(of(r, 'conflicting-duplicates')).toEqual([]);
    expect(r.recommendations.map((x) => x.kind)).not.toContain('labels');
  });

  it('coincident rows of coarse data are a note; copied records are printed', async () => {
    const rng = createRng(42);
    const n = 1500;
    // coarse daily measurements: two features of 12 and 8 values, a class from them
    const a = Array.from({ length: n }, () => rng.int(12));
    const b = Array.from({ length: n }, () => rng.int(8));
    const yy = a.map((v, i) => (v + b[i] + 3 * gauss(rng) > 9 ? 'wet' : 'dry'));
    const coarse = new Map<string, Cell[]>([['a', a], ['b', b], ['y', yy]]);
    const r = audit(await tableOf(coarse), { target: 'y' });
    const dup = of(r, 'duplicate-rows');
    expect(dup.length).toBe(1);
    expect(dup[0].severity).toBe('note');
    expect(dup[0].figures.scoreShift).toBeLessThan(dup[0].figures.foldNoise);
    // measured numbers with 5% of the records copied: printed
    const cols = cleanColumns(600, 43);
    const names = [...cols.keys()];
    for (let k = 0; k < 30; k++) {
      const src = rng.int(600);
      for (const c of names) cols.get(c)!.push(cols.get(c)![src]);
    }
    const copied = audit(await tableOf(cols), { target: 'y' });
    expect(of(copied, 'duplicate-rows').map((s) => s.severity)).toEqual(['warn']);
  });
});

describe('rare-class (issue #25 item 10)', () => {
  const burtin = async (plan: string) => {
    const rows = JSON.parse(readFileSync(join(PENGUINS_JSON, '..', 'burtin.json'), 'utf8')) as Record<string, string | number>[];
    const header = ['Penicillin', 'Streptomycin', 'Neomycin', 'Gram_Staining'];
    const text = `${[header.join(','), ...rows.map((r) => header.map((h) => String(r[h])).join(','))].join('\n')}\n`;
    const table = await loadCsv({ text, name: 'burtin.csv' });
    return { table, report: audit(table, { target: 'Gram_Staining', plan }) };
  };

  it('on 16 rows (7 and 9) under kfold:10 it says the folds are small and calls no class rare', async () => {
    const { report } = await burtin('kfold:10');
    const t = report.target;
    expect(t.task === 'classification' && t.classes.map((c) => c.count).sort()).toEqual([7, 9]);
    const rare = of(report, 'rare-class');
    expect(rare.length).toBe(1);
    expect(rare[0].reasons).toEqual(['small-folds']);
    expect(rare[0].evidence).not.toMatch(/class "(positive|negative)" has/);
    // the advice: the largest K with 2 rows of the smallest class per test fold, floor(7 / 2)
    expect(rare[0].action).toMatch(/^use kfold:3 /);
  });

  it('under kfold:2 it never advises more folds', async () => {
    const cols = cleanColumns(40, 44);
    cols.set('y', cols.get('y')!.map((v, i) => (i < 3 ? 'rare' : v)));
    const r = audit(await tableOf(cols), { target: 'y', plan: 'kfold:2' });
    const rare = of(r, 'rare-class');
    expect(rare.length).toBe(1);
    expect(rare[0].action).not.toMatch(/kfold:[3-9]/);
    expect(rare[0].action).toContain('kfold:2x10');
    expect(r.recommendations.find((x) => x.kind === 'folds')?.text).not.toMatch(/kfold:[3-9]/);
  });
});

describe('advice (issue #25 items 8 and 9)', () => {
  it('on group-leaking data the first recommendation is --group, and the column is not recommended for dropping', async () => {
    const rng = createRng(45);
    const n = 400;
    const effect = Array.from({ length: 20 }, () => 3 * gauss(rng));
    const site = Array.from({ length: n }, (_, i) => i % 20);
    const x = Array.from({ length: n }, () => gauss(rng));
    const cols = new Map<string, Cell[]>([
      ['site', site.map((s) => `s${s}`)],
      ['x', x],
      ['y', x.map((v, i) => (0.3 * v + effect[site[i]] + 0.3 * gauss(rng) > 0 ? 'hi' : 'lo'))],
    ]);
    const r = audit(await tableOf(cols), { target: 'y' });
    expect(of(r, 'group-like').map((s) => s.severity)).toEqual(['warn']);
    expect(r.recommendations[0].kind).toBe('group');
    expect(r.recommendations[0].text).toContain('--group "site"');
    expect(r.recommendations.filter((x) => x.kind === 'drop').flatMap((x) => x.columns)).not.toContain('site');
  });

  it('leave-one-group-out does not say each fold scores one row', async () => {
    const cols = cleanColumns(200, 46);
    cols.set('site', cols.get('y')!.map((_, i) => `s${i % 5}`));
    const table = await tableOf(cols);
    const grouped = prepareRun(table, { target: 'y', plan: 'loo', group: 'site', learners: ['baseline'] });
    expect(grouped.warnings.some((w) => w.includes('one row'))).toBe(false);
    expect(grouped.warnings.some((w) => w.startsWith('leave-one-group-out: each fold scores one group of "site" (5 folds, 40.0 rows a fold on average)'))).toBe(true);
    const plain = prepareRun(await tableOf(cleanColumns(30, 47)), { target: 'y', plan: 'loo', learners: ['baseline'] });
    expect(plain.warnings.some((w) => w.includes('each fold scores one row'))).toBe(true);
  });

  it('a year column running with the rows is date-like, not id-like', async () => {
    const cols = cleanColumns(60, 48);
    cols.set('year', cols.get('y')!.map((_, i) => 1950 + i));
    const r = audit(await tableOf(cols), { target: 'y' });
    expect(of(r, 'id-like')).toEqual([]);
    expect(of(r, 'date-like').map((s) => s.columns[0])).toEqual(['year']);
  });
});
