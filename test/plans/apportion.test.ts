/**
 * Stratified split sizes. Reference: the largest remainder idea (Hamilton's method; free
 * account: Wikipedia, "Largest remainder method"): every cell is its quota rounded down or
 * up, every class's cells add up to the class size. Checked over random class sizes and
 * fractions; with two parts the totals must also be within half a row of their quotas.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { apportion } from '../../src/plans/apportion.js';
import { FC } from './helpers.js';

const arbFractions = (parts: number) =>
  fc.array(fc.double({ min: 0.01, max: 1, noNaN: true }), { minLength: parts, maxLength: parts }).map((w) => {
    const s = w.reduce((a, b) => a + b, 0);
    return w.map((x) => x / s);
  });

describe('apportion', () => {
  it('rounds every quota down or up and keeps class sizes', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 200 }), { minLength: 1, maxLength: 8 }),
        fc.integer({ min: 2, max: 4 }).chain(arbFractions),
        (sizes, fractions) => {
          const cells = apportion(sizes, fractions);
          expect(cells.length).toBe(sizes.length);
          cells.forEach((row, c) => {
            expect(row.reduce((a, b) => a + b, 0)).toBe(sizes[c]);
            row.forEach((v, p) => expect(Math.abs(v - fractions[p] * sizes[c])).toBeLessThan(1));
          });
        },
      ),
      { ...FC, numRuns: 300 },
    );
  });

  it('keeps two-part totals within half a row of their quotas', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 200 }), { minLength: 1, maxLength: 12 }), fc.double({ min: 0.01, max: 0.99, noNaN: true }), (sizes, f) => {
        const cells = apportion(sizes, [1 - f, f]);
        const n = sizes.reduce((a, b) => a + b, 0);
        const test = cells.reduce((a, row) => a + row[1], 0);
        expect(Math.abs(test - f * n)).toBeLessThanOrEqual(0.5 + 1e-9);
      }),
      { ...FC, numRuns: 300 },
    );
  });

  it('gives a zero share nothing, and exact quotas exactly', () => {
    expect(Array.from(apportion([10], [0.7, 0.3, 0])[0])).toEqual([7, 3, 0]);
    expect(Array.from(apportion([10], [0.6, 0.2, 0.2])[0])).toEqual([6, 2, 2]);
    // 2.5 + 7.5: the tie goes to the later part, as Math.round rounds halves up
    expect(Array.from(apportion([10], [0.75, 0.25])[0])).toEqual([7, 3]);
  });
});
