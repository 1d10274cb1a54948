/**
 * Task results through JSON (journals and shard parts). JSON has no NaN or infinity:
 * JSON.stringify writes them as null (ECMA-262, JSON.stringify, SerializeJSONProperty step for
 * non-finite numbers), so reading back must give NaN, never 0, or a merged report would score a
 * non-finite prediction as a prediction of 0.
 */
import { describe, expect, it } from 'vitest';
import { fromJsonNumbers, resultFromJSON, resultToJSON } from '../../src/run/result-json.js';

describe('task results as JSON', () => {
  it('round-trips doubles exactly and non-finite values as NaN', () => {
    const r = { id: 'r1.f1:x', predicted: Float64Array.from([0.1 + 0.2, NaN, Infinity, -5e-324]), fitMs: 1, predictMs: 2 };
    const back = resultFromJSON(JSON.parse(JSON.stringify(resultToJSON(r))), false, 'test');
    expect(back.predicted.length).toBe(4);
    expect(back.predicted[0]).toBe(0.30000000000000004);
    expect(Number.isNaN(back.predicted[1])).toBe(true);
    expect(Number.isNaN(back.predicted[2])).toBe(true);
    expect(back.predicted[3]).toBe(-5e-324);
    expect(fromJsonNumbers([null, 0, 1])).toEqual([NaN, 0, 1]);
  });
  it('refuses what is not a task result', () => {
    expect(() => resultFromJSON({ id: 'a', predicted: ['1'] }, false, 'journal line 2')).toThrow(/journal line 2: not a task result/);
    expect(() => resultFromJSON(null, true, 'x')).toThrow(/x: not a task result/);
  });
});
