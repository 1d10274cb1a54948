/**
 * The fast subset of the audit's calibration corpus (bench/audit-corpus.ts; the whole corpus
 * and its table are `npm run bench -- audit`): seeded clean processes of several shapes and
 * open data sets shipped in the npm package vega-datasets (Palmer penguins, CC0, Gorman et al.
 * 2014; the car-model, Seattle weather and Burtin antibiotic files), and one planted problem per
 * data set. Goals of issue #20: nothing printed before eval on clean data, every planted leak
 * found "high", duplicates, ignored groups and informative missingness found at "warn" or above.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { auditCorpus, runEntry, tabulate, type EntryResult } from '../../bench/audit-corpus.js';

let results: EntryResult[] = [];

beforeAll(async () => {
  for (const e of auditCorpus('fast')) results.push(await runEntry(e));
}, 120_000);

describe('calibration corpus, fast subset', () => {
  it('holds clean sets of every shape and the open data sets', () => {
    const clean = results.filter((r) => r.entry.clean).map((r) => r.entry.name.split('/')[0]);
    expect(clean.length).toBeGreaterThanOrEqual(16);
    for (const shape of ['dominant', 'weak', 'blocks', 'categorical', 'imbalanced', 'time', 'grouped', 'site-no-effect', 'penguins', 'cars', 'seattle-weather', 'burtin']) {
      expect(clean).toContain(shape);
    }
  });

  it('prints nothing before eval on any clean set', () => {
    const clean = results.filter((r) => r.entry.clean);
    expect(clean.length).toBeGreaterThan(0);
    expect(clean.filter((r) => r.printed.length > 0).map((r) => `${r.entry.name}: ${r.printed.join(' | ')}`)).toEqual([]);
  });

  it('finds every planted problem: leaks as "high", the others at "warn" or above, all printed', () => {
    const planted = results.filter((r) => !r.entry.clean);
    expect(planted.length).toBe(12);
    const t = tabulate(results);
    expect(t.misses).toEqual([]);
    for (const r of planted) expect(r.printed.some((l) => l.startsWith(`${r.entry.planted!.kind}:`))).toBe(true);
    expect(new Set(planted.map((r) => r.entry.planted!.what)).size).toBe(7);
  });
});
