import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { finiteValues } from '../../src/stats/finite-values.js';

// The contract is the module's own (src/stats/finite-values.ts): no outside reference applies;
// these pin the messages the callers show and the copy they get.
describe('finiteValues: the shared input check of the fold statistics', () => {
  it('returns a plain array copy of an array-like of finite numbers', () => {
    const src = new Float64Array([0.5, -2, 0]);
    const out = finiteValues('f', 'v', src);
    expect(Array.isArray(out)).toBe(true);
    expect(out).toEqual([0.5, -2, 0]);
    expect(finiteValues('f', 'v', [])).toEqual([]);
  });

  it('refuses what is not array-like', () => {
    expect(() => finiteValues('f', 'v', null as never)).toThrow(new InputError('f: v must be an array of numbers'));
    expect(() => finiteValues('f', 'v', undefined as never)).toThrow('f: v must be an array of numbers');
    expect(() => finiteValues('f', 'v', { length: '2' } as never)).toThrow('f: v must be an array of numbers');
    expect(() => finiteValues('f', 'v', 3 as never)).toThrow('f: v must be an array of numbers');
  });

  it('refuses an array-like whose length is not a whole number >= 0 with its InputError, not a RangeError (issue 24, mutation testing)', () => {
    // an array-like has a length that is an integer >= 0 (ECMAScript, LengthOfArrayLike);
    // new Array(-1), new Array(2.5) and new Array(NaN) throw RangeError "Invalid array length"
    for (const length of [-1, 2.5, Number.NaN, Infinity]) {
      expect(() => finiteValues('f', 'v', { length } as never)).toThrow(new InputError('f: v must be an array of numbers'));
    }
    // one entry short of a length beyond any array: the first missing entry is named
    expect(() => finiteValues('f', 'v', { length: 2 ** 32, 0: 1 } as never)).toThrow(new InputError('f: v[1] is not a number'));
    expect(finiteValues('f', 'v', { length: 2, 0: 1, 1: 2 } as never)).toEqual([1, 2]);
  });

  it('names the first bad entry: not a number, NaN, infinite', () => {
    expect(() => finiteValues('f', 'v', [1, '2'] as never)).toThrow('f: v[1] is not a number');
    expect(() => finiteValues('f', 'v', [1, null] as never)).toThrow('f: v[1] is not a number');
    expect(() => finiteValues('f', 'v', [Number.NaN])).toThrow('f: v[0] is NaN; filter missing scores before calling');
    expect(() => finiteValues('f', 'v', [0, 0, -Infinity])).toThrow('f: v[2] is not finite (-Infinity)');
    expect(() => finiteValues('f', 'v', [Infinity])).toThrow(InputError);
  });
});
