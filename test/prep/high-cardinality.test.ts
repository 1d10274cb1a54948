/**
 * High-cardinality categorical columns (issue #25 item 16): above ONE_HOT_LIMIT levels seen in
 * training, a column is frequency coded from the training rows only; at or below it, one-hot
 * as before. Reference: the shares are recounted by brute force over the training rows.
 */
import { describe, expect, it } from 'vitest';
import { audit } from '../../src/audit/index.js';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem } from '../../src/data/problem.js';
import { applyPrep, fitPrep, ONE_HOT_LIMIT } from '../../src/prep/fold-prep.js';
import { createRng } from '../../src/rng.js';

async function problemWith(levels: number, n: number) {
  const rng = createRng(7);
  const lines = ['x,code,y'];
  const codes: string[] = [];
  for (let i = 0; i < n; i++) {
    const c = `L${rng.int(levels)}`;
    codes.push(c);
    lines.push(`${rng.next().toFixed(4)},${c},${rng.next() < 0.5 ? 'a' : 'b'}`);
  }
  const table = await loadCsv({ text: `${lines.join('\n')}\n`, name: 'levels.csv' });
  return { problem: defineProblem(table, { target: 'y' }), codes, table };
}

describe('frequency coding above the one-hot limit', () => {
  it('codes an 80-level column as one column of training shares; test rows add nothing', async () => {
    expect(ONE_HOT_LIMIT).toBe(50);
    const { problem, codes } = await problemWith(80, 600);
    const train = Int32Array.from({ length: 400 }, (_, i) => i);
    const test = Int32Array.from({ length: 200 }, (_, i) => 400 + i);
    const prep = fitPrep(problem, train);
    expect(prep.names).toEqual(['x', 'code(frequency)']);
    const m = applyPrep(problem, prep, test, false);
    expect(m.cols).toBe(2);
    const trainCodes = codes.slice(0, 400);
    expect(test.length).toBe(200);
    for (let r = 0; r < test.length; r++) {
      const level = codes[400 + r];
      const share = trainCodes.filter((c) => c === level).length / 400;
      expect(Math.abs(m.data[r * 2 + 1] - share)).toBeLessThan(1e-12);
    }
    // standardised for distance-based learners: training column mean 0, sd 1
    const t = applyPrep(problem, prep, train, true);
    let s = 0;
    let ss = 0;
    for (let r = 0; r < 400; r++) s += t.data[r * 2 + 1];
    for (let r = 0; r < 400; r++) ss += (t.data[r * 2 + 1] - s / 400) ** 2;
    expect(Math.abs(s / 400)).toBeLessThan(1e-9);
    expect(Math.abs(Math.sqrt(ss / 400) - 1)).toBeLessThan(1e-9);
  });

  it('keeps one-hot for a column with 50 levels in training', async () => {
    const { problem } = await problemWith(50, 600);
    const prep = fitPrep(problem, Int32Array.from({ length: 600 }, (_, i) => i));
    expect(prep.names.length).toBe(51);
    expect(prep.names.filter((n) => n.startsWith('code=')).length).toBe(50);
  });

  it('the audit flags the column: a note at 80 levels in 600 rows, a warn at a level per row or two', async () => {
    const many = await problemWith(80, 600);
    const r = audit(many.table, { target: 'y' });
    expect(r.suspects.filter((s) => s.kind === 'high-cardinality').map((s) => [s.columns[0], s.severity])).toEqual([['code', 'note']]);
    const sparse = await problemWith(400, 600);
    const r2 = audit(sparse.table, { target: 'y' });
    expect(r2.suspects.filter((s) => s.kind === 'high-cardinality').map((s) => [s.columns[0], s.severity])).toEqual([['code', 'warn']]);
    expect(r2.recommendations.find((x) => x.kind === 'drop')?.columns).toContain('code');
  });
});
