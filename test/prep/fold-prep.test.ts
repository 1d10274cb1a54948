import { describe, expect, it } from 'vitest';
import { median, mean, standardDeviation } from 'simple-statistics';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem } from '../../src/data/problem.js';
import { applyPrep, fitPrep, lazyPrep } from '../../src/prep/fold-prep.js';
import { matrixBlock, matrixColumn } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';

const csv = (rows: string[]) => ({ text: `x,c,y\n${rows.join('\n')}\n`, name: 'mem.csv' });
const base = ['1,a,p', '2,b,q', ',a,p', '10,a,q', '4,,p', '5,c,q', '6,b,p', '7,d,q'];

describe('fold-local preprocessing', () => {
  it('fits imputation, encoding and scaling on the training rows only (simple-statistics as reference)', async () => {
    const problem = defineProblem(await loadCsv(csv(base)), { target: 'y' });
    const train = Int32Array.from([0, 1, 2, 3, 4]);
    const prep = fitPrep(problem, train);
    const x = prep.columns[0];
    expect(x.kind).toBe('numeric');
    if (x.kind === 'numeric') {
      // training x values: 1, 2, (missing), 10, 4 -> median 3 (simple-statistics), imputed column 1,2,3,10,4
      expect(x.fill).toBe(median([1, 2, 10, 4]));
      expect(Math.abs(x.mean - mean([1, 2, 3, 10, 4]))).toBeLessThan(1e-12);
      // population sd (divide by n), as standardisation uses
      expect(Math.abs(x.sd - standardDeviation([1, 2, 3, 10, 4]))).toBeLessThan(1e-12);
    }
    // categorical c: training levels a, b (a most frequent, fills the missing one); c and d unseen
    expect(prep.names).toEqual(['x', 'c=a', 'c=b']);
    const test = Int32Array.from([5, 7, 4]);
    const m = applyPrep(problem, prep, test, false);
    expect(Array.from(m.data)).toEqual([5, 0, 0, 7, 0, 0, 4, 1, 0]);
  });

  it('ignores the test rows: changing them leaves the fitted preprocessing unchanged (no leakage)', async () => {
    const train = Int32Array.from([0, 1, 2, 3, 4]);
    const a = fitPrep(defineProblem(await loadCsv(csv(base)), { target: 'y' }), train);
    const changed = [...base.slice(0, 5), '1000,z,q', ',z,p', '-50,a,q'];
    const b = fitPrep(defineProblem(await loadCsv(csv(changed)), { target: 'y' }), train);
    expect(JSON.stringify(b.columns)).toBe(JSON.stringify(a.columns));
    expect(b.names).toEqual(a.names);
  });

  it('reads only training rows while fitting (instrumented column)', async () => {
    const problem = defineProblem(await loadCsv(csv(base)), { target: 'y' });
    const x = problem.features[0];
    if (x.kind !== 'numeric') throw new Error('expected numeric');
    const read = new Set<number>();
    const spy = new Proxy(x.values, {
      get(target, key, receiver) {
        if (typeof key === 'string' && /^\d+$/.test(key)) read.add(Number(key));
        const v = Reflect.get(target, key, target);
        return typeof v === 'function' ? v.bind(target) : v;
      },
    });
    const features = [{ ...x, values: spy as unknown as Float64Array }, problem.features[1]];
    const train = Int32Array.from([1, 3, 5]);
    fitPrep({ ...problem, features }, train);
    expect(read.size).toBeGreaterThan(0);
    expect([...read].sort()).toEqual([...train].map((i) => problem.rows[i]).sort());
  });

  it('standardises numeric columns when asked and centres a constant column', async () => {
    const problem = defineProblem(await loadCsv({ text: 'x,k,y\n1,5,a\n3,5,b\n', name: 'm' }), { target: 'y' });
    const prep = fitPrep(problem, Int32Array.from([0, 1]));
    const m = applyPrep(problem, prep, Int32Array.from([0, 1]), true);
    expect(Array.from(m.data)).toEqual([-1, 0, 1, 0]);
  });

  it('imputes with the median by selection, equal to simple-statistics on odd and even counts with ties', async () => {
    const rng = createRng(4);
    for (const n of [2, 3, 7, 50, 51, 400]) {
      const xs = Array.from({ length: n }, () => Math.floor(rng.next() * 20) / 2);
      const problem = defineProblem(await loadCsv({ text: `x,y\n${xs.map((x, i) => `${x},${i % 2 ? 'a' : 'b'}`).join('\n')}\n`, name: 'm' }), { target: 'y', task: 'classification' });
      const prep = fitPrep(problem, Int32Array.from(xs.keys()));
      const x = prep.columns[0];
      expect(x.kind === 'numeric' && x.fill).toBe(median(xs));
    }
  });

  it('imputes with the mean when asked', async () => {
    const problem = defineProblem(await loadCsv(csv(base)), { target: 'y' });
    const prep = fitPrep(problem, Int32Array.from([0, 1, 2, 3]), 'mean');
    const x = prep.columns[0];
    expect(x.kind === 'numeric' && x.fill).toBe(13 / 3);
  });
});

describe('matrices made on demand (lazyPrep) equal the eager ones (applyPrep)', () => {
  // mechanics: the same fitted preparation, read three ways, must give the same numbers bit for bit
  it('column(j), block(start, end) and data agree with applyPrep, scaled and not, one-hot slots included', async () => {
    const problem = defineProblem(await loadCsv(csv(base)), { target: 'y' });
    const prep = fitPrep(problem, Int32Array.from([0, 1, 2, 3, 4, 6]));
    const idx = Int32Array.from([7, 5, 0, 4, 2, 6]);
    for (const scale of [false, true]) {
      const eager = applyPrep(problem, prep, idx, scale);
      const lazy = lazyPrep(problem, prep, idx, scale);
      expect(lazy.rows).toBe(eager.rows);
      expect(lazy.cols).toBe(eager.cols);
      expect(eager.cols).toBe(prep.names.length);
      expect(eager.cols).toBeGreaterThan(2);
      for (let j = 0; j < eager.cols; j++) {
        const want = Array.from({ length: eager.rows }, (_, i) => eager.data[i * eager.cols + j]);
        expect(Array.from(matrixColumn(lazy, j))).toEqual(want);
        // into a reused buffer holding the last column's values (and junk): every cell rewritten
        const buffer = new Float64Array(eager.rows).fill(j === 0 ? 99 : NaN);
        if (j > 0) matrixColumn(lazy, j - 1, buffer);
        expect(matrixColumn(lazy, j, buffer)).toBe(buffer);
        expect(Array.from(buffer)).toEqual(want);
        expect(Array.from(matrixColumn(eager, j, new Float64Array(eager.rows).fill(7)))).toEqual(want);
      }
      expect(() => matrixColumn(lazy, 0, new Float64Array(eager.rows + 1))).toThrow(RangeError);
      expect(Array.from(matrixBlock(lazy, 2, 5))).toEqual(Array.from(eager.data.subarray(2 * eager.cols, 5 * eager.cols)));
      expect(Array.from(lazy.data)).toEqual(Array.from(eager.data));
    }
  });
});
