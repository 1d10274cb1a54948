/**
 * The audit at scale (issue #14): the radix argsort and the value runs of one hashing pass
 * against JavaScript's own comparison sort (Array.prototype.sort, stable since ES2019), the
 * column profile from those runs against simple-statistics, and the seeded stratified sample
 * above the row limit (its size, strata shares and what the report says about it).
 */
import { describe, expect, it } from 'vitest';
import { audit, AUDIT_LIMITS } from '../../src/audit/index.js';
import { mean, quantile, sampleStandardDeviation } from 'simple-statistics';
import { profileColumns } from '../../src/audit/column-profile.js';
import { argsortPresent, featuresOf, sortedFromRuns, valueRuns } from '../../src/audit/feature-data.js';
import { numericProfile } from '../../src/audit/numeric-summary.js';
import { defineProblem } from '../../src/data/problem.js';
import { sampleRows } from '../../src/audit/sample.js';
import type { Column, Table } from '../../src/data/types.js';
import { createRng } from '../../src/rng.js';
import { expectValidAudit } from './validate.js';

describe('argsortPresent', () => {
  it('orders present values ascending, ties by row, at sizes of both methods (reference: Array.prototype.sort)', () => {
    const rng = createRng(3);
    for (const n of [50, 5000, 30_000]) {
      const v = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const r = rng.next();
        v[i] = r < 0.05 ? NaN : r < 0.1 ? -0 : r < 0.15 ? 0 : r < 0.4 ? rng.int(11) - 5 : (rng.next() - 0.5) * 1e6;
      }
      const ref = [...Array(n).keys()].filter((i) => !Number.isNaN(v[i])).sort((a, b) => v[a] - v[b] || a - b);
      const got = Array.from(argsortPresent(v));
      expect(ref.length).toBeGreaterThan(0.9 * n);
      expect(got).toEqual(ref);
    }
  });
});

function bigTable(n: number): Table {
  const rng = createRng(5);
  const x = new Float64Array(n);
  const codes = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = Math.round(1000 * rng.next()) / 1000;
    codes[i] = rng.next() < 0.1 ? 1 : 0;
  }
  const columns: Column[] = [
    { kind: 'numeric', name: 'x', position: 0, values: x, missing: 0 },
    { kind: 'categorical', name: 'y', position: 1, codes, levels: ['no', 'yes'], missing: 0 },
  ];
  const lines = Int32Array.from({ length: n }, (_, i) => i + 2);
  return { source: 'big.csv', rows: n, columns, byName: new Map(columns.map((c) => [c.name, c])), fingerprint: { sha256: '0'.repeat(64), rows: n, columns: 2, schema: [['x', 'numeric'], ['y', 'categorical']] }, lines, warnings: [] };
}

describe('sample above the row limit', () => {
  it('draws exactly the stated size, each class in its share (largest remainder), seeded', () => {
    const codes = new Int32Array(30_000);
    for (let i = 0; i < codes.length; i++) codes[i] = i % 10 === 0 ? 1 : i % 10 === 1 ? 2 : 0;
    const y = { task: 'classification' as const, codes, classes: ['a', 'b', 'c'] };
    const s = sampleRows(y, 20_000, 1);
    expect(s.length).toBe(20_000);
    const per = [0, 0, 0];
    for (const i of s) per[codes[i]]++;
    // shares 80/10/10 of 20,000: 16,000 / 2,000 / 2,000 exactly (quotas are whole here)
    expect(per).toEqual([16_000, 2_000, 2_000]);
    expect(Array.from(s)).toEqual(Array.from(s).sort((a, b) => a - b));
    expect(new Set(s).size).toBe(20_000);
    expect(Array.from(sampleRows(y, 20_000, 1))).toEqual(Array.from(s));
    expect(Array.from(sampleRows(y, 20_000, 2))).not.toEqual(Array.from(s));
  });

  it('the report states the sample and the exact checks still read every row', () => {
    const n = AUDIT_LIMITS.sampleRows + 5_000;
    const t = bigTable(n);
    const r = audit(t, { target: 'y' });
    expectValidAudit(r);
    expect(r.sample).toEqual({ rows: AUDIT_LIMITS.sampleRows, of: n, seed: 1, how: 'stratified by class' });
    expect(r.warnings.some((w) => w.includes(`ran on a sample of ${AUDIT_LIMITS.sampleRows} rows drawn stratified by class (seed 1)`))).toBe(true);
    // x has 1001 values in 25,000 rows: the exact duplicate count is over every row
    expect(r.duplicates.exactRows).toBeGreaterThan(AUDIT_LIMITS.sampleRows);
    const small = audit(bigTable(1000), { target: 'y' });
    expect(small.sample).toBeUndefined();
  });
});

/** Runs of equal values of the present values sorted by JavaScript's own comparison sort, -0 read as 0. */
function referenceRuns(v: Float64Array): { uniques: number[]; runs: number[] } {
  const present = Array.from(v).filter((x) => !Number.isNaN(x)).sort((a, b) => a - b);
  const uniques: number[] = [];
  const runs: number[] = [];
  for (let j = 0; j < present.length; j++) {
    if (j > 0 && present[j] === present[j - 1]) runs[runs.length - 1]++;
    else {
      uniques.push(present[j] === 0 ? 0 : present[j]);
      runs.push(1);
    }
  }
  return { uniques, runs };
}

describe('value runs: one hashing pass per column (issue 14)', () => {
  it('gives the runs of the sorted column, NaN left out, -0 counted as 0, at sizes that grow the table (reference: Array.prototype.sort)', () => {
    const rng = createRng(11);
    for (const [n, spread] of [[0, 1], [1, 1], [60, 5], [5000, 7], [5000, 1e6], [100_000, 300], [100_000, 1e7]] as const) {
      const v = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const r = rng.next();
        v[i] = r < 0.05 ? NaN : r < 0.08 ? -0 : r < 0.11 ? 0 : r < 0.12 ? (rng.next() < 0.5 ? Infinity : -Infinity) : Math.round((rng.next() - 0.5) * spread) / 4;
      }
      const ref = referenceRuns(v);
      const got = valueRuns(v);
      if (n >= 5000) expect(ref.uniques.length).toBeGreaterThan(n > 5000 && spread > 1000 ? 1024 : 4);
      expect(Array.from(got.uniques)).toEqual(ref.uniques);
      expect(Array.from(got.runs)).toEqual(ref.runs);
      expect(got.present).toBe(ref.runs.reduce((s, c) => s + c, 0));
      // the sorted column written out from the runs is the sorted column
      const sorted = Array.from(sortedPresent(v), (x) => (x === 0 ? 0 : x));
      expect(Array.from(sortedFromRuns(got))).toEqual(sorted);
    }
  });

  it('profiles a numeric column from its runs as from a sort of the column, and runs lent by the features change nothing (reference: simple-statistics)', () => {
    const rng = createRng(12);
    const n = 30_000;
    const a = new Float64Array(n);
    const b = new Float64Array(n);
    const codes = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      a[i] = rng.next() < 0.1 ? NaN : Math.round(100 * (rng.next() - 0.3)) / 10;
      b[i] = rng.next() < 0.05 ? -0 : Math.exp(3 * rng.next());
      codes[i] = rng.int(2);
    }
    const columns: Column[] = [
      { kind: 'numeric', name: 'a', position: 0, values: a, missing: a.filter((x) => Number.isNaN(x)).length },
      { kind: 'numeric', name: 'b', position: 1, values: b, missing: 0 },
      { kind: 'categorical', name: 'y', position: 2, codes, levels: ['p', 'q'], missing: 0 },
    ];
    const lines = Int32Array.from({ length: n }, (_, i) => i + 2);
    const table: Table = { source: 'runs.csv', rows: n, columns, byName: new Map(columns.map((c) => [c.name, c])), fingerprint: { sha256: '0'.repeat(64), rows: n, columns: 3, schema: [['a', 'numeric'], ['b', 'numeric'], ['y', 'categorical']] }, lines, warnings: [] };
    const problem = defineProblem(table, { target: 'y' });
    const lent = profileColumns(table, problem, featuresOf(problem));
    expect(lent).toEqual(profileColumns(table, problem));
    expect(lent.length).toBe(3);
    for (const [j, values] of [a, b].entries()) {
      const sorted = sortedPresent(values);
      const p = lent[j];
      expect(p.distinct).toBe(distinctSorted(sorted));
      // the same figures, bit for bit, as from the sorted column (-0 read as 0; JSON writes both as 0)
      expect(p.numeric).toEqual(numericProfile(sorted.map((x) => (x === 0 ? 0 : x))));
      const xs = Array.from(sorted);
      const [q1, med, q3] = quantile(xs, [0.25, 0.5, 0.75]);
      const rel = (x: number, y: number): number => Math.abs(x - y) / Math.max(1, Math.abs(y));
      expect(rel(p.numeric!.q1, q1)).toBeLessThan(1e-12);
      expect(rel(p.numeric!.median, med)).toBeLessThan(1e-12);
      expect(rel(p.numeric!.q3, q3)).toBeLessThan(1e-12);
      expect(rel(p.numeric!.mean, mean(xs))).toBeLessThan(1e-12);
      expect(rel(p.numeric!.sd!, sampleStandardDeviation(xs))).toBeLessThan(1e-12);
    }
  });
});

// The reference path: the sort of every present value that the audit read before value runs.
/** The present (non-NaN) values of `values`, at `rows` if given, sorted ascending. */
function sortedPresent(values: Float64Array, rows?: Int32Array): Float64Array {
  const n = rows ? rows.length : values.length;
  const out = new Float64Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) {
    const v = values[rows ? rows[i] : i];
    if (!Number.isNaN(v)) out[m++] = v;
  }
  return out.subarray(0, m).sort();
}

/** Number of distinct values in sorted values. */
function distinctSorted(sorted: ArrayLike<number>): number {
  let d = sorted.length > 0 ? 1 : 0;
  for (let i = 1; i < sorted.length; i++) if (sorted[i] !== sorted[i - 1]) d++;
  return d;
}
