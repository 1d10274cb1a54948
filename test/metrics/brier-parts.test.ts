import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { brier } from '../../src/metrics/brier.js';
import { brierParts, fewForecasts } from '../../src/metrics/brier-parts.js';
import { PENGUINS_JSON } from '../helpers/penguins.js';
import { binaryScores } from './helpers.js';

// Murphy (1973), "A new vector partition of the probability score", J. Applied Meteorology
// 12:595-600: Brier = reliability - resolution + uncertainty, exactly, when rows are grouped by
// their forecast.

describe('Brier partition (Murphy 1973)', () => {
  it('matches a hand computation on two forecast values', () => {
    // p(class 1) = .2 for three rows (actual 0, 0, 1) and .7 for three (actual 1, 1, 0).
    // One-column form: o = 1/3 and 2/3, obar = 1/2
    //   reliability = (3 (.2 - 1/3)^2 + 3 (.7 - 2/3)^2) / 6 = 0.0094444
    //   resolution  = (3 (1/3 - 1/2)^2 + 3 (2/3 - 1/2)^2) / 6 = 1/36
    //   uncertainty = 1/4;  Brier = (.04 + .04 + .64 + .09 + .09 + .49) / 6 = 1.39 / 6
    // The vector (two-column) form doubles each part.
    const input = binaryScores([0, 0, 1, 1, 1, 0], [0.2, 0.2, 0.2, 0.7, 0.7, 0.7]);
    const p = brierParts(input);
    expect(p.groups).toBe(2);
    expect(Math.abs(p.reliability - 2 * 0.0094444444)).toBeLessThan(1e-9);
    expect(Math.abs(p.resolution - 2 / 36)).toBeLessThan(1e-12);
    expect(Math.abs(p.uncertainty - 0.5)).toBeLessThan(1e-12);
    expect(Math.abs(p.brier - 2 * (1.39 / 6))).toBeLessThan(1e-12);
    expect(Math.abs(p.brier - brier(input))).toBeLessThan(1e-12);
    expect(Math.abs(p.reliability - p.resolution + p.uncertainty - p.brier)).toBeLessThan(1e-12);
  });

  it('holds the identity on the penguins data (three species) for two island-based forecasters', () => {
    // Palmer penguins (vega-datasets, CC0; Gorman, Williams & Fraser 2014). Forecast of each
    // bird's species from its island alone: the island's species shares, smoothed by adding
    // `add` to every count (add = 0 is perfectly reliable in-sample; add = 5 is not).
    const raw = JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, string | number | null>[];
    expect(raw.length).toBe(344);
    const species = ['Adelie', 'Chinstrap', 'Gentoo'];
    const islands = [...new Set(raw.map((r) => String(r.Island)))].sort();
    expect(islands.length).toBe(3);
    const actual = Int32Array.from(raw.map((r) => species.indexOf(String(r.Species))));
    expect(actual.every((c) => c >= 0)).toBe(true);
    const counts = islands.map(() => [0, 0, 0]);
    raw.forEach((r, i) => counts[islands.indexOf(String(r.Island))][actual[i]]++);
    // uncertainty from the species counts 152 / 68 / 124 (recounted from the file)
    const shares = [0, 1, 2].map((k) => actual.filter((c) => c === k).length / 344);
    expect(shares.map((s) => Math.round(s * 344))).toEqual([152, 68, 124]);
    const unc = 1 - (152 ** 2 + 68 ** 2 + 124 ** 2) / 344 ** 2;
    for (const add of [0, 5]) {
      const proba = new Float64Array(344 * 3);
      raw.forEach((r, i) => {
        const c = counts[islands.indexOf(String(r.Island))];
        const total = c[0] + c[1] + c[2] + 3 * add;
        for (let k = 0; k < 3; k++) proba[i * 3 + k] = (c[k] + add) / total;
      });
      const input = { actual, predicted: new Int32Array(344), classes: 3, probs: proba };
      const p = brierParts(input);
      expect(p.groups).toBe(3);
      expect(Math.abs(p.uncertainty - unc)).toBeLessThan(1e-12);
      expect(Math.abs(p.brier - brier(input))).toBeLessThan(1e-12);
      expect(Math.abs(p.reliability - p.resolution + p.uncertainty - p.brier)).toBeLessThan(1e-12);
      if (add === 0) expect(p.reliability).toBeLessThan(1e-15);
      else expect(p.reliability).toBeGreaterThan(1e-4);
      expect(p.resolution).toBeGreaterThan(0.1); // the island says much about the species
    }
  });
});

describe('fewForecasts (when the report keeps the partition)', () => {
  it('counts distinct probability vectors up to the limit', () => {
    // 100 distinct vectors, each twice: at most 100 -> true; one more distinct vector -> false
    const rows = 201;
    const proba = new Float64Array(2 * rows);
    for (let i = 0; i < 200; i++) (proba[2 * i] = (i % 100) / 100), (proba[2 * i + 1] = 1 - (i % 100) / 100);
    expect(fewForecasts(proba.subarray(0, 400), 2, 100)).toBe(true);
    proba[400] = 0.555;
    proba[401] = 0.445;
    expect(fewForecasts(proba, 2, 100)).toBe(false);
    expect(fewForecasts(proba, 2, 101)).toBe(true);
  });
});

describe('Brier partition: grouping and messages', () => {
  it('keeps apart two vectors whose numbers run together into the same text', () => {
    // as text without a separator both read "1e-701e-700.9999999": (1e-7, 0, 1e-70, .9999999) and
    // (1e-70, 1e-7, 0, .9999999); they are different forecasts, so two groups
    const proba = Float64Array.from([1e-7, 0, 1e-70, 0.9999999, 1e-70, 1e-7, 0, 0.9999999]);
    const input = { actual: Int32Array.from([3, 3]), predicted: Int32Array.from([3, 3]), classes: 4, probs: proba };
    expect(brierParts(input).groups).toBe(2);
    expect(fewForecasts(proba, 4, 1)).toBe(false);
  });

  it('names itself brier_parts in a refusal', () => {
    expect(() => brierParts({ actual: Int32Array.from([0]), predicted: Int32Array.from([0]), classes: 2 })).toThrow(
      'brier_parts: needs class probabilities, but probs is missing',
    );
  });
});
