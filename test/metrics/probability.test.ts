import { describe, expect, it } from 'vitest';
import { brier } from '../../src/metrics/brier.js';
import { logLoss } from '../../src/metrics/log-loss.js';
import type { ClassificationInput } from '../../src/metrics/types.js';

// three rows, two classes; probs rows (p0, p1): (.8, .2), (.3, .7), (.6, .4); actual 0, 1, 1
const input: ClassificationInput = {
  actual: Int32Array.from([0, 1, 1]),
  predicted: Int32Array.from([0, 1, 0]),
  classes: 2,
  probs: Float64Array.from([0.8, 0.2, 0.3, 0.7, 0.6, 0.4]),
};

describe('log-loss', () => {
  it('matches a hand computation', () => {
    // -(ln .8 + ln .7 + ln .4) / 3 = (0.223144 + 0.356675 + 0.916291) / 3 = 0.498703
    expect(Math.abs(logLoss(input) - -(Math.log(0.8) + Math.log(0.7) + Math.log(0.4)) / 3)).toBeLessThan(1e-12);
    expect(Math.abs(logLoss(input) - 0.498703)).toBeLessThan(1e-6);
  });

  it('clips probabilities to [2^-53, 1 - 2^-53] (documented; was 1e-15 before format 2)', () => {
    const sure: ClassificationInput = {
      actual: Int32Array.from([0, 1]),
      predicted: Int32Array.from([1, 1]),
      classes: 2,
      probs: Float64Array.from([0, 1, 0, 1]),
    };
    // row 0: p(actual) = 0 -> 2^-53 -> 53 ln 2 = 36.736801; row 1: p = 1 -> 1 - 2^-53 -> ~1.1e-16
    const expected = (-Math.log(2 ** -53) - Math.log(1 - 2 ** -53)) / 2;
    expect(1 - 2 ** -53).toBeLessThan(1); // the upper clip is a double below 1
    expect(Math.abs(logLoss(sure) - expected)).toBeLessThan(1e-12);
    expect(Math.abs(logLoss(sure) - 36.736801 / 2)).toBeLessThan(1e-6);
  });

  it('scores ln(k) for a uniform guess over k classes', () => {
    const k = 4;
    const uniform: ClassificationInput = {
      actual: Int32Array.from([0, 3, 2]),
      predicted: Int32Array.from([0, 0, 0]),
      classes: k,
      probs: new Float64Array(3 * k).fill(1 / k),
    };
    expect(Math.abs(logLoss(uniform) - Math.log(k))).toBeLessThan(1e-12);
  });
});

describe('brier (multi-class form of Brier 1950)', () => {
  it('matches a hand computation, and is twice the one-column binary form', () => {
    // row 0: (.8 - 1)^2 + (.2 - 0)^2 = .04 + .04 = .08
    // row 1: (.3 - 0)^2 + (.7 - 1)^2 = .09 + .09 = .18
    // row 2: (.6 - 0)^2 + (.4 - 1)^2 = .36 + .36 = .72
    // mean = .98 / 3 = 0.326667; one-column form (p1 - y)^2: (.04 + .09 + .36) / 3 = 0.163333
    expect(Math.abs(brier(input) - 0.98 / 3)).toBeLessThan(1e-12);
    expect(Math.abs(brier(input) / 2 - 0.49 / 3)).toBeLessThan(1e-12);
  });

  it('is 0 for certain correct forecasts and 2 for certain wrong ones', () => {
    const base = { actual: Int32Array.from([0, 2]), predicted: Int32Array.from([0, 2]), classes: 3 };
    expect(brier({ ...base, probs: Float64Array.from([1, 0, 0, 0, 0, 1]) })).toBe(0);
    expect(brier({ ...base, probs: Float64Array.from([0, 1, 0, 1, 0, 0]) })).toBe(2);
  });
});

describe('log-loss clip at the top', () => {
  it('a certain right answer costs -ln(1 - 2^-53), about 2^-53, not 0', () => {
    // -ln(1 - x) = x + x^2/2 + ... (Taylor series), so for x = 2^-53 the cost is 2^-53 to within 1e-31
    const v = logLoss({ actual: Int32Array.from([1]), predicted: Int32Array.from([1]), classes: 2, probs: Float64Array.from([0, 1]) });
    expect(v).toBeGreaterThan(0);
    expect(Math.abs(v - 2 ** -53)).toBeLessThan(1e-31);
  });
});
