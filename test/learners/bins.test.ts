/**
 * Bin codes (src/learners/cart/bins.ts): codeOfPadded, the branchless code used by binMatrix and
 * codeRows, against its definition, "the number of cuts strictly below x", counted here by a
 * plain loop over the cuts (an independent path, not the binary search of codeOf), and against
 * codeOf. Cuts are invented: every size from 0 to 254 points, with the values at and a few ulps
 * around each cut, NaN (below nothing: code 0), +-Infinity, +-0 and values beyond the range.
 */
import { describe, expect, it } from 'vitest';
import { MAX_BINS, binMatrix, codeOf, codeOfPadded, paddedCuts } from '../../src/learners/cart/bins.js';
import { createRng } from '../../src/rng.js';

function countBelow(cuts: Float64Array, x: number): number {
  let k = 0;
  for (const c of cuts) if (c < x) k++;
  return k;
}

/** The next double above x (x finite). */
function up(x: number): number {
  const b = new Float64Array([x]);
  const u = new BigInt64Array(b.buffer);
  if (x === 0) return 5e-324;
  u[0] += x > 0 ? 1n : -1n;
  return b[0];
}
function down(x: number): number {
  return -up(-x);
}

function probes(cuts: Float64Array): number[] {
  const out = [NaN, Infinity, -Infinity, 0, -0, 1e300, -1e300];
  for (const c of cuts) out.push(c, up(c), down(c), up(up(c)), down(down(c)));
  return out;
}

describe('codeOfPadded', () => {
  const rng = createRng(23);
  it('counts the cuts strictly below x, for every number of cuts from 0 to 254', () => {
    let checked = 0;
    for (let size = 0; size <= MAX_BINS - 1; size++) {
      const cuts = new Float64Array(size);
      let v = -3 + rng.next();
      for (let k = 0; k < size; k++) {
        cuts[k] = v;
        v += 0.001 + rng.next();
      }
      const padded = paddedCuts(cuts);
      expect(padded.length).toBe(256);
      for (const x of probes(cuts)) {
        const want = countBelow(cuts, x);
        const got = codeOfPadded(padded, x);
        if (got !== want || codeOf(cuts, x) !== want) throw new Error(`size ${size}, x ${x}: padded ${got}, codeOf ${codeOf(cuts, x)}, count ${want}`);
        checked++;
      }
    }
    // 255 sizes, 7 fixed probes each plus 5 per cut: 7 * 255 + 5 * (0 + 1 + ... + 254)
    expect(checked).toBe(7 * 255 + 5 * ((254 * 255) / 2));
  });

  it('gives NaN code 0 and +Infinity the top code', () => {
    const cuts = new Float64Array([-1, 0, 2.5]);
    const padded = paddedCuts(cuts);
    expect(codeOfPadded(padded, NaN)).toBe(0);
    expect(codeOfPadded(padded, Infinity)).toBe(3);
    expect(codeOfPadded(padded, -Infinity)).toBe(0);
    expect(codeOfPadded(padded, 2.5)).toBe(2);
    expect(codeOfPadded(padded, up(2.5))).toBe(3);
  });

  it('refuses more cuts than a byte code can count', () => {
    expect(() => paddedCuts(new Float64Array(MAX_BINS))).toThrow(RangeError);
  });
});

describe('binMatrix codes', () => {
  it('are the count of the column cuts below each value', () => {
    const rng = createRng(5);
    const n = 3000;
    const p = 3;
    const data = new Float64Array(n * p);
    for (let i = 0; i < n; i++) {
      data[i * p] = rng.next() * 10 - 5; // many distinct values: quantile cuts
      data[i * p + 1] = Math.floor(rng.next() * 7); // 7 values: a cut between each pair
      data[i * p + 2] = i % 2 === 0 ? -0 : 0; // one value (-0 === 0): no cuts
    }
    const binned = binMatrix({ rows: n, cols: p, data }, 64, 'test');
    expect(binned.cuts.map((c) => c.length)).toEqual([63, 6, 0]);
    let wrong = 0;
    for (let j = 0; j < p; j++) {
      for (let i = 0; i < n; i++) if (binned.codes[j * n + i] !== countBelow(binned.cuts[j], data[i * p + j])) wrong++;
    }
    expect(wrong).toBe(0);
  });
});
