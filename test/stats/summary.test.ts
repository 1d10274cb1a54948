import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { summarize } from '../../src/stats/summary.js';
import { tQuantile } from '../../src/stats/t-quantile.js';

const TEN_FOLD = { testRows: 100, trainRows: 900 }; // testRows/trainRows = 1/9, as in 10-fold

// NIST Statistical Reference Datasets, univariate summary statistics
// (https://www.itl.nist.gov/div898/strd/univ/homepage.html). Definitions and certified values
// read from copies of the NIST files NumAcc1.dat, NumAcc3.dat and NumAcc4.dat (as kept in the
// data/NIST folder of the Math.NET Numerics repository):
//   NumAcc1: 10000001, 10000003, 10000002; certified mean 10000002, sd (n-1) 1.
//   NumAcc3: 1000000.2 then 500 pairs 1000000.1, 1000000.3 (1001 values); mean 1000000.2, sd 0.1.
//   NumAcc4: 10000000.2 then 500 pairs 10000000.1, 10000000.3 (1001 values); mean 10000000.2, sd 0.1.
function numAcc(first: number, low: number, high: number): number[] {
  const v = [first];
  for (let i = 0; i < 500; i++) v.push(low, high);
  return v;
}
const NUMACC1 = [10000001, 10000003, 10000002];
const NUMACC3 = numAcc(1000000.2, 1000000.1, 1000000.3);
const NUMACC4 = numAcc(10000000.2, 10000000.1, 10000000.3);

/**
 * The exact sample sd of the binary64 values (not of the decimals they were parsed from), by
 * integer arithmetic: each double is m * 2^e exactly, so n * sum x^2 - (sum x)^2 is exact in
 * BigInt. Used to show that what remains between our sd and the certified 0.1 is the rounding
 * of the decimal inputs to binary, not the algorithm.
 */
function exactSdOfDoubles(values: readonly number[]): number {
  const K = 64; // every value here is an integer multiple of 2^-K
  const scaled = values.map((x) => {
    const view = new DataView(new ArrayBuffer(8));
    view.setFloat64(0, x);
    const bits = view.getBigUint64(0);
    const exp = Number((bits >> 52n) & 0x7ffn) - 1075;
    const mant = (bits & ((1n << 52n) - 1n)) | (1n << 52n);
    return mant << BigInt(exp + K);
  });
  const n = BigInt(values.length);
  const s = scaled.reduce((a, b) => a + b, 0n);
  const q = scaled.reduce((a, b) => a + b * b, 0n);
  const num = n * q - s * s; // = n (n-1) var * 2^(2K)
  const den = n * (n - 1n);
  const digits = 10n ** 36n;
  const varScaled = (num * digits) / den / (1n << BigInt(2 * K)); // var * 10^36
  let r = BigInt(Math.floor(Math.sqrt(Number(varScaled))));
  for (let i = 0; i < 60; i++) r = (r + varScaled / r) / 2n;
  return Number(r) / 1e18;
}

describe('summarize: NIST StRD certified mean and sd', () => {
  it('NumAcc1 (lower difficulty) exactly', () => {
    const s = summarize(NUMACC1, TEN_FOLD);
    expect(s.n).toBe(3);
    expect(s.mean).toBe(10000002);
    expect(s.sd).toBe(1);
  });

  it('NumAcc3 (average difficulty): mean to 15 digits, sd to 9 digits', () => {
    const s = summarize(NUMACC3, TEN_FOLD);
    expect(s.n).toBe(1001);
    expect(Math.abs(s.mean - 1000000.2) / 1000000.2).toBeLessThan(1e-15);
    expect(Math.abs((s.sd as number) - 0.1)).toBeLessThan(1e-9); // measured 3.5e-11 (9.5 digits)
    expect(Math.abs((s.sd as number) - exactSdOfDoubles(NUMACC3))).toBeLessThan(1e-15);
  });

  it('NumAcc4 (higher difficulty): mean to 15 digits, sd to 8 digits', () => {
    const s = summarize(NUMACC4, TEN_FOLD);
    expect(s.n).toBe(1001);
    expect(Math.abs(s.mean - 10000000.2) / 10000000.2).toBeLessThan(1e-15);
    expect(Math.abs((s.sd as number) - 0.1)).toBeLessThan(1e-8); // measured 5.6e-10 (8.25 digits)
    // The 5.6e-10 is the binary rounding of 10000000.1 and 10000000.3 themselves: the exact sd
    // of the doubles is 0.1000000005587935..., and we match it to about 1e-16.
    expect(Math.abs((s.sd as number) - exactSdOfDoubles(NUMACC4))).toBeLessThan(1e-15);
  });

  it('NumAcc4 does defeat the one-pass textbook formula (so the check above has teeth)', () => {
    let sum = 0;
    let sumSq = 0;
    for (const x of NUMACC4) {
      sum += x;
      sumSq += x * x;
    }
    const n = NUMACC4.length;
    const naive = Math.sqrt(Math.max(0, (sumSq - (sum * sum) / n) / (n - 1)));
    expect(Math.abs(naive - 0.1)).toBeGreaterThan(0.01);
  });
});

describe('summarize: quantiles', () => {
  // Rule (simple-statistics `quantile`, Hyndman & Fan 1996 definition 7): sorted x_0..x_{n-1},
  // h = (n-1) p, result x_floor(h) + (h - floor(h)) (x_ceil(h) - x_floor(h)). Hand-computed:
  it('n = 6, interpolating', () => {
    // sorted 1, 2, 4, 7, 10, 20
    // q1: h = 5 * 0.25 = 1.25 -> 2 + 0.25 * (4 - 2) = 2.5
    // median: h = 2.5 -> 4 + 0.5 * (7 - 4) = 5.5
    // q3: h = 3.75 -> 7 + 0.75 * (10 - 7) = 9.25
    const s = summarize([10, 1, 7, 2, 20, 4], TEN_FOLD);
    expect(s.q1).toBe(2.5);
    expect(s.median).toBe(5.5);
    expect(s.q3).toBe(9.25);
    expect(s.min).toBe(1);
    expect(s.max).toBe(20);
  });

  it('n = 5, landing on order statistics', () => {
    // sorted 1, 2, 4, 7, 10: h = 1, 2, 3 -> 2, 4, 7
    const s = summarize(new Float64Array([7, 1, 4, 10, 2]), TEN_FOLD);
    expect([s.q1, s.median, s.q3]).toEqual([2, 4, 7]);
  });
});

describe('summarize: corrected resampled t interval (Nadeau & Bengio 2003)', () => {
  // Hand derivation, 10-fold CV (J = 10, df = 9, testRows/trainRows = 1/9):
  //   values 0.78 0.82 0.79 0.81 0.80 0.80 0.77 0.83 0.76 0.84, mean 0.80
  //   deviations in hundredths: -2 +2 -1 +1 0 0 -3 +3 -4 +4, squares sum 60 -> 0.0060
  //   s^2 = 0.0060 / 9
  //   variance factor 1/10 + 1/9 = 19/90; corrected variance 19/90 * 0.006/9 = 0.114/810
  //   sqrt(0.114/810) = 0.01186342...
  //   t_{9, 0.975} = 2.262 (NIST e-Handbook table, sec. 1.3.6.7.2)
  //   half width 2.262 * 0.01186342 = 0.026835; interval [0.773165, 0.826835]
  // The table's 3-decimal t moves the half width by at most 0.0005 * 0.0119 = 6e-6.
  const values = [0.78, 0.82, 0.79, 0.81, 0.8, 0.8, 0.77, 0.83, 0.76, 0.84];

  it('matches the hand-derived 10-fold case', () => {
    const s = summarize(values, TEN_FOLD);
    expect(s.n).toBe(10);
    expect(Math.abs(s.mean - 0.8)).toBeLessThan(1e-12);
    expect(Math.abs((s.sd as number) - Math.sqrt(0.006 / 9))).toBeLessThan(1e-12);
    const ci = s.ci95 as [number, number];
    const half = 2.262 * Math.sqrt(0.114 / 810);
    expect(Math.abs(ci[0] - (0.8 - half))).toBeLessThan(1e-5);
    expect(Math.abs(ci[1] - (0.8 + half))).toBeLessThan(1e-5);
  });

  it('is wider than the uncorrected t interval, by sqrt((1/J + 1/9) / (1/J))', () => {
    const s = summarize(values, TEN_FOLD);
    const ci = s.ci95 as [number, number];
    const corrected = (ci[1] - ci[0]) / 2;
    const uncorrected = tQuantile(0.975, 9) * Math.sqrt(0.006 / 9 / 10); // mean +/- t s/sqrt(J)
    expect(corrected).toBeGreaterThan(uncorrected);
    expect(Math.abs(corrected / uncorrected - Math.sqrt(19 / 9))).toBeLessThan(1e-12);
  });

  it('uses df = J - 1 over all k*r scores of repeated k-fold (Bouckaert & Frank 2004)', () => {
    // 3 repeats of 10-fold: the 10 values three times, J = 30, df = 29.
    //   squares sum 3 * 0.006 = 0.018, s^2 = 0.018 / 29
    //   factor 1/30 + 1/9 = 13/90; corrected variance 13/90 * 0.018/29 = 0.234/2610
    //   t_{29, 0.975} = 2.045 (NIST table); half width 2.045 * sqrt(0.234/2610) = 0.019363
    const s = summarize([...values, ...values, ...values], TEN_FOLD);
    const ci = s.ci95 as [number, number];
    const half = 2.045 * Math.sqrt(0.234 / 2610);
    expect(s.n).toBe(30);
    expect(Math.abs((ci[1] - ci[0]) / 2 - half)).toBeLessThan(1e-5);
  });

  it('takes the level: 0.90 uses t_{9, 0.95} = 1.833 (NIST table)', () => {
    const ci = summarize(values, TEN_FOLD, 0.9).ci95 as [number, number];
    expect(Math.abs((ci[1] - ci[0]) / 2 - 1.833 * Math.sqrt(0.114 / 810))).toBeLessThan(1e-5);
  });

  // Issue 24 part 2 changed this case: equal values used to give the zero-width [mean, mean].
  it('gives no interval when all values are equal and no floor applies, and null spread for one value', () => {
    const same = summarize([0.7, 0.7, 0.7, 0.7], TEN_FOLD);
    expect(same.mean).toBe(0.7);
    expect(same.sd).toBe(0);
    expect(same.ci95).toBeNull();
    const one = summarize([0.65], TEN_FOLD);
    expect(one).toEqual({ n: 1, mean: 0.65, median: 0.65, sd: null, min: 0.65, max: 0.65, q1: 0.65, q3: 0.65, ci95: null });
  });
});

describe('summarize: input checks', () => {
  it('refuses NaN, infinities and empty input with InputError', () => {
    expect(() => summarize([0.8, Number.NaN, 0.7], TEN_FOLD)).toThrow(InputError);
    expect(() => summarize([0.8, Number.NaN, 0.7], TEN_FOLD)).toThrow(
      'summarize: values[1] is NaN; filter missing scores before calling',
    );
    expect(() => summarize([0.8, Infinity], TEN_FOLD)).toThrow('summarize: values[1] is not finite (Infinity)');
    expect(() => summarize([], TEN_FOLD)).toThrow('summarize: values is empty; need at least one score');
  });

  it('refuses a bad correction or level with UsageError', () => {
    expect(() => summarize([1, 2], { testRows: 0, trainRows: 9 })).toThrow(UsageError);
    expect(() => summarize([1, 2], { testRows: 1, trainRows: Number.NaN })).toThrow(
      'summarize: correction.trainRows must be a finite number > 0, got NaN',
    );
    expect(() => summarize([1, 2], TEN_FOLD, 1)).toThrow(
      'summarize: level must be a number strictly between 0 and 1, got 1',
    );
  });
});

describe('summarize: binomial floor and range (issue 24 parts 2 and 5)', () => {
  const FIVE = { testRows: 20, trainRows: 80 };
  const ACCURACY = { proportion: true, range: [0, 1] as const };

  it('equal accuracies of 1.0 are not certainty: the add-two binomial floor, clipped at 1', () => {
    // 5 folds of 20 test and 80 training rows, all correct. By hand: N = 100 rows,
    // p~ = (100 + 2) / (100 + 4) = 0.980769..., floor of Var(mean) = p~ (1 - p~) / 100,
    // half = t_{4,0.975} sqrt(floor) with t_{4,0.975} = 2.776 (NIST e-Handbook t table, 1.3.6.7.2).
    const s = summarize([1, 1, 1, 1, 1], FIVE, 0.95, ACCURACY);
    const p = 102 / 104;
    const half = jStat.studentt.inv(0.975, 4) * Math.sqrt((p * (1 - p)) / 100);
    expect(Math.abs(jStat.studentt.inv(0.975, 4) - 2.776)).toBeLessThan(5e-4);
    expect(s.ci95![1]).toBe(1);
    expect(Math.abs(s.ci95![0] - (1 - half))).toBeLessThan(1e-12);
    expect(s.ci95![0]).toBeLessThan(0.97);
  });

  it('the floor only binds when the sample variance is below it', () => {
    const wide = [0.6, 0.9, 0.7, 0.95, 0.5];
    expect(summarize(wide, FIVE, 0.95, ACCURACY).ci95).toEqual(summarize(wide, FIVE, 0.95, { range: [0, 1] }).ci95);
    const narrow = [0.8, 0.8, 0.85, 0.8, 0.8];
    const floored = summarize(narrow, FIVE, 0.95, ACCURACY).ci95!;
    const plain = summarize(narrow, FIVE).ci95!;
    expect(floored[1] - floored[0]).toBeGreaterThan(plain[1] - plain[0]);
    // a metric without a floor keeps its own spread
    expect(summarize(narrow, FIVE, 0.95, { range: [0, 1] }).ci95).toEqual(plain);
  });

  it('an interval past the range is clipped to it (an AUC never above 1 or below 0)', () => {
    const auc = [0.2, 1, 0.9, 1];
    const raw = summarize(auc, FIVE).ci95!;
    expect(raw[0]).toBeLessThan(0);
    expect(raw[1]).toBeGreaterThan(1);
    expect(summarize(auc, FIVE, 0.95, { range: [0, 1] }).ci95).toEqual([0, 1]);
    const err = summarize([0.1, 3, 0.2], FIVE, 0.95, { range: [0, Infinity] }).ci95!;
    expect(err[0]).toBe(0);
    expect(err[1]).toBe(summarize([0.1, 3, 0.2], FIVE).ci95![1]);
  });

  it('two equal accuracies already get the floored interval (df 1: t_{1,0.975} = 12.706, NIST table); one gets none', () => {
    // 2 folds of 20 test and 80 training rows, both all correct: p~ = 102/104 over N = 100 rows, and
    // the corrected variance of the mean is the floor itself, so half = 12.706 sqrt(p~ (1 - p~) / 100)
    const s = summarize([1, 1], FIVE, 0.95, ACCURACY);
    expect(s.sd).toBe(0);
    const half = 12.706 * Math.sqrt(((102 / 104) * (2 / 104)) / 100);
    expect(s.ci95![1]).toBe(1);
    expect(Math.abs(s.ci95![0] - (1 - half))).toBeLessThan(6e-4 * 0.014);
    expect(summarize([1], FIVE, 0.95, ACCURACY)).toMatchObject({ n: 1, sd: null, ci95: null });
  });
});

describe('summarize: extremes and equal values (issue 24, mutation testing)', () => {
  it('min and max wherever they stand in the input', () => {
    // by inspection of the ten hand-derived values above and a reordering of them
    const values = [0.78, 0.82, 0.79, 0.81, 0.8, 0.8, 0.77, 0.83, 0.76, 0.84];
    expect(summarize(values, TEN_FOLD)).toMatchObject({ min: 0.76, max: 0.84 });
    expect(summarize([0.84, ...values.slice(0, 9)], TEN_FOLD)).toMatchObject({ min: 0.76, max: 0.84 });
  });

  it('equal values that are not dyadic report the value itself, not a recomputation', () => {
    // simple-statistics' mean([0.1, 0.1, 0.1]) is 0.10000000000000002
    expect(summarize([0.1, 0.1, 0.1], TEN_FOLD)).toEqual({ n: 3, mean: 0.1, median: 0.1, sd: 0, min: 0.1, max: 0.1, q1: 0.1, q3: 0.1, ci95: null });
  });
});
