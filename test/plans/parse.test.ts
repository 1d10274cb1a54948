/**
 * Plan spec text: accepted forms, canonical text, and fixed error messages. The syntax is the
 * project's own (decided in the project brief), so the reference here is that decision; the
 * round trip is checked over random specs with fast-check.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { buildPlan, formatPlan, parsePlan, type PlanSpec } from '../../src/plans/index.js';
import { FC, input } from './helpers.js';

describe('parsePlan', () => {
  it('reads every accepted form', () => {
    expect(parsePlan('kfold')).toEqual({ kind: 'kfold', k: 10, repeats: 1 });
    expect(parsePlan('kfold:5')).toEqual({ kind: 'kfold', k: 5, repeats: 1 });
    expect(parsePlan('kfold:5x3')).toEqual({ kind: 'kfold', k: 5, repeats: 3 });
    expect(parsePlan('loo')).toEqual({ kind: 'loo' });
    expect(parsePlan('resplit:20@0.25')).toEqual({ kind: 'resplit', splits: 20, testFraction: 0.25 });
    expect(parsePlan('resplit:1@.5')).toEqual({ kind: 'resplit', splits: 1, testFraction: 0.5 });
    expect(parsePlan('holdout:0.6/0.2/0.2')).toEqual({ kind: 'holdout', train: 0.6, validation: 0.2, holdout: 0.2 });
    expect(parsePlan('holdout:0.7/0.3/0')).toEqual({ kind: 'holdout', train: 0.7, validation: 0.3, holdout: 0 });
    // issue 25 item 19: two parts are train/test, the same spec as A/B/0
    expect(parsePlan('holdout:0.8/0.2')).toEqual({ kind: 'holdout', train: 0.8, validation: 0.2, holdout: 0 });
    expect(parsePlan('holdout:0.8/0.2')).toEqual(parsePlan('holdout:0.8/0.2/0'));
    expect(parsePlan('forward:5')).toEqual({ kind: 'forward', k: 5 });
    expect(parsePlan('forward:1')).toEqual({ kind: 'forward', k: 1 });
    expect(parsePlan('  kfold:3  ')).toEqual({ kind: 'kfold', k: 3, repeats: 1 });
  });

  it('writes canonical text', () => {
    expect(formatPlan(parsePlan('kfold'))).toBe('kfold:10');
    expect(formatPlan(parsePlan('kfold:05x1'))).toBe('kfold:5');
    expect(formatPlan(parsePlan('kfold:5x3'))).toBe('kfold:5x3');
    expect(formatPlan(parsePlan('resplit:20@.250'))).toBe('resplit:20@0.25');
    expect(formatPlan(parsePlan('holdout:0.6/0.2/0.20'))).toBe('holdout:0.6/0.2/0.2');
    expect(formatPlan(parsePlan('holdout:0.8/0.2'))).toBe('holdout:0.8/0.2/0');
    expect(formatPlan(parsePlan('loo'))).toBe('loo');
    expect(formatPlan(parsePlan('forward:4'))).toBe('forward:4');
  });

  it('round-trips random specs through formatPlan', () => {
    const count = (min: number) => fc.integer({ min, max: 1_000_000 });
    const frac = fc.double({ min: 1e-12, max: 1 - 1e-12, noNaN: true });
    const arbSpec: fc.Arbitrary<PlanSpec> = fc.oneof(
      fc.record({ kind: fc.constant('kfold' as const), k: count(2), repeats: count(1) }),
      fc.constant({ kind: 'loo' as const }),
      fc.record({ kind: fc.constant('resplit' as const), splits: count(1), testFraction: frac }),
      fc
        .record({ a: frac, b: frac, zero: fc.boolean() })
        .map(({ a, b, zero }) => {
          // three positive shares (or two and a zero holdout) that sum to 1 within 1e-9
          const s = zero ? a + b : a + b + 0.5;
          return { kind: 'holdout' as const, train: a / s, validation: b / s, holdout: zero ? 0 : 0.5 / s };
        })
        .filter((h) => h.train > 0 && h.validation > 0 && Math.abs(h.train + h.validation + h.holdout - 1) <= 1e-9),
      fc.record({ kind: fc.constant('forward' as const), k: count(1) }),
    );
    fc.assert(
      fc.property(arbSpec, (spec) => {
        const text = formatPlan(spec);
        expect(parsePlan(text)).toEqual(spec);
        expect(formatPlan(parsePlan(text))).toBe(text);
      }),
      FC,
    );
  });

  const KFOLD = 'expected kfold:K or kfold:KxR with whole numbers K >= 2, R >= 1';
  const RESPLIT = 'expected resplit:N@F with a whole number N >= 1 and a fraction 0 < F < 1';
  const HOLDOUT = 'expected holdout:A/B/C with fractions A > 0, B > 0, C >= 0 that sum to 1 (or holdout:A/B, the same as holdout:A/B/0)';
  const FORWARD = 'expected forward:K with a whole number K >= 1';
  const cases: [string, string][] = [
    ['kfold:x', `--plan "kfold:x": ${KFOLD}`],
    ['kfold:', `--plan "kfold:": ${KFOLD}`],
    ['kfold:1', `--plan "kfold:1": ${KFOLD}`],
    ['kfold:5x0', `--plan "kfold:5x0": ${KFOLD}`],
    ['kfold:5x', `--plan "kfold:5x": ${KFOLD}`],
    ['kfold:2.5', `--plan "kfold:2.5": ${KFOLD}`],
    ['kfold:-5', `--plan "kfold:-5": ${KFOLD}`],
    ['kfold:5x3x2', `--plan "kfold:5x3x2": ${KFOLD}`],
    ['kfold:99999999999999999999', `--plan "kfold:99999999999999999999": ${KFOLD}`],
    ['loo:3', '--plan "loo:3": expected loo with nothing after it'],
    ['resplit', `--plan "resplit": ${RESPLIT}`],
    ['resplit:5', `--plan "resplit:5": ${RESPLIT}`],
    ['resplit:0@0.2', `--plan "resplit:0@0.2": ${RESPLIT}`],
    ['resplit:5@0', `--plan "resplit:5@0": ${RESPLIT}`],
    ['resplit:5@1', `--plan "resplit:5@1": ${RESPLIT}`],
    ['resplit:5@-0.2', `--plan "resplit:5@-0.2": ${RESPLIT}`],
    ['resplit:5@20%', `--plan "resplit:5@20%": ${RESPLIT}`],
    ['holdout:0.5/0.4', `--plan "holdout:0.5/0.4": ${HOLDOUT}`],
    ['holdout:0.5', `--plan "holdout:0.5": ${HOLDOUT}`],
    ['holdout:1/0', `--plan "holdout:1/0": ${HOLDOUT}`],
    ['holdout:0.5/0.5/0/0', `--plan "holdout:0.5/0.5/0/0": ${HOLDOUT}`],
    ['holdout:0.5/0.3/0.3', `--plan "holdout:0.5/0.3/0.3": ${HOLDOUT}`],
    ['holdout:0/0.5/0.5', `--plan "holdout:0/0.5/0.5": ${HOLDOUT}`],
    ['holdout:0.5/0/0.5', `--plan "holdout:0.5/0/0.5": ${HOLDOUT}`],
    ['holdout:0.6/0.2/a', `--plan "holdout:0.6/0.2/a": ${HOLDOUT}`],
    ['forward', `--plan "forward": ${FORWARD}`],
    ['forward:0', `--plan "forward:0": ${FORWARD}`],
    ['forward:k', `--plan "forward:k": ${FORWARD}`],
    ['kfld:5', '--plan "kfld:5": unknown plan "kfld"; expected one of kfold, loo, resplit, holdout, forward; did you mean "kfold"?'],
    ['', '--plan "": unknown plan ""; expected one of kfold, loo, resplit, holdout, forward'],
    ['KFOLD:5', '--plan "KFOLD:5": unknown plan "KFOLD"; expected one of kfold, loo, resplit, holdout, forward; did you mean "kfold"?'],
  ];
  it.each(cases)('rejects %j with a fixed message', (text, message) => {
    expect(() => parsePlan(text)).toThrow(UsageError);
    expect(() => parsePlan(text)).toThrow(message);
    try {
      parsePlan(text);
    } catch (e) {
      expect((e as Error).message).toBe(message);
    }
  });

  it('accepts holdout shares that sum to 1 within 1e-9 only', () => {
    expect(parsePlan('holdout:0.6/0.2/0.2000000005')).toEqual({ kind: 'holdout', train: 0.6, validation: 0.2, holdout: 0.2000000005 });
    expect(() => parsePlan('holdout:0.6/0.2/0.200000002')).toThrow(HOLDOUT);
  });

  it('checks specs built in code the same way', () => {
    expect(() => buildPlan({ kind: 'kfold', k: 1, repeats: 1 }, input(10, 1))).toThrow(`--plan "kfold:1": ${KFOLD}`);
    expect(() => buildPlan({ kind: 'resplit', splits: 3, testFraction: 1.5 }, input(10, 1))).toThrow(UsageError);
    expect(() => buildPlan({ kind: 'forward', k: 2.5 }, input(10, 1))).toThrow(FORWARD);
  });
});
