/**
 * sortFinite (src/learners/cart/radix-sort.ts) against the built-in Float64Array.prototype.sort,
 * which orders numbers ascending with -0 before +0 (ECMAScript, %TypedArray%.prototype.sort with
 * no comparator): the same doubles in the same order, bit for bit, on invented arrays that stress
 * the key transform (signs, zeros of both signs, subnormals, the largest doubles, ties).
 */
import { describe, expect, it } from 'vitest';
import { sortFinite } from '../../src/learners/cart/radix-sort.js';
import { createRng } from '../../src/rng.js';

/** The first position where the two arrays' bit patterns differ, or -1 (a short failure message, not a diff of 10^5 values). */
function firstDifference(a: Float64Array, b: Float64Array): number {
  const x = new Uint32Array(a.buffer, a.byteOffset, 2 * a.length);
  const y = new Uint32Array(b.buffer, b.byteOffset, 2 * b.length);
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return i >> 1;
  return -1;
}
function expectSameAsBuiltIn(values: Float64Array): void {
  const want = values.slice().sort();
  const got = sortFinite(values.slice());
  expect(got.length).toBe(want.length);
  expect(firstDifference(got, want)).toBe(-1);
}

describe('sortFinite', () => {
  const rng = createRng(17);
  const special = [0, -0, 5e-324, -5e-324, 2.2250738585072014e-308, -2.2250738585072014e-308, Number.MAX_VALUE, -Number.MAX_VALUE, 1, -1, 0.5, -0.5, 1 + 2 ** -52, 1 - 2 ** -53];

  it('sorts empty, one and two values', () => {
    expectSameAsBuiltIn(new Float64Array(0));
    expectSameAsBuiltIn(Float64Array.of(3));
    expectSameAsBuiltIn(Float64Array.of(2, -1));
    expectSameAsBuiltIn(Float64Array.of(0, -0));
  });

  it('matches the built-in sort on mixed signs, both zeros, subnormals and the largest doubles', () => {
    const a = new Float64Array(5000);
    for (let i = 0; i < a.length; i++) a[i] = rng.next() < 0.3 ? special[rng.int(special.length)] : (rng.next() - 0.5) * 10 ** (rng.int(40) - 20);
    expect(a.some((v) => Object.is(v, -0)) && a.some((v) => Object.is(v, 0))).toBe(true);
    expectSameAsBuiltIn(a);
  });

  it('matches it on rounded decimals with many ties, sorted and reversed input, and all equal', () => {
    const a = new Float64Array(200_000);
    for (let i = 0; i < a.length; i++) a[i] = Math.round((rng.next() * 8 - 4) * 1e3) / 1e3;
    expectSameAsBuiltIn(a);
    const up = a.slice().sort();
    expectSameAsBuiltIn(up);
    expectSameAsBuiltIn(up.slice().reverse());
    expectSameAsBuiltIn(new Float64Array(1000).fill(-2.5));
    // keys that differ only in the low 16 bits, and only in the top 16
    expectSameAsBuiltIn(Float64Array.from({ length: 3000 }, (_, i) => 1 + (i % 97) * 2 ** -52));
    expectSameAsBuiltIn(Float64Array.from({ length: 3000 }, (_, i) => (i % 2 ? -1 : 1) * 2 ** ((i % 61) - 30)));
  });

  it('sorts a view in place, leaving the rest of its buffer alone, and uses the scratch it is given', () => {
    const whole = Float64Array.of(9, 3, -1, 2, 8, 7);
    const view = whole.subarray(1, 5);
    const scratch = new Uint32Array(8);
    expect(sortFinite(view, scratch)).toBe(view);
    expect(Array.from(whole)).toEqual([9, -1, 2, 3, 8, 7]);
    expect(() => sortFinite(Float64Array.of(1, 2, 3), new Uint32Array(5))).toThrow('sortFinite: scratch of 5 words for 3 values');
  });
});
