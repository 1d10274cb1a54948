/**
 * The audit at scale (issue #14): the radix argsort against JavaScript's own comparison sort
 * (Array.prototype.sort, stable since ES2019), and the seeded stratified sample above the row
 * limit (its size, strata shares and what the report says about it).
 */
import { describe, expect, it } from 'vitest';
import { audit, AUDIT_LIMITS } from '../../src/audit/index.js';
import { argsortPresent } from '../../src/audit/feature-data.js';
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
