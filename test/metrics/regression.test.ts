import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { linearRegression, linearRegressionLine, mean, median, rSquared, rootMeanSquare } from 'simple-statistics';
import { mae } from '../../src/metrics/mae.js';
import { medae } from '../../src/metrics/medae.js';
import { r2 } from '../../src/metrics/r2.js';
import { rmse } from '../../src/metrics/rmse.js';
import { createRng } from '../../src/rng.js';

// Open data shipped by an npm package: Palmer penguins (vega-datasets, CC0; Gorman, Williams &
// Fraser 2014). A straight-line fit of body mass on flipper length gives realistic residuals.
interface Penguin {
  'Flipper Length (mm)': number | null;
  'Body Mass (g)': number | null;
}
const penguins = (
  JSON.parse(readFileSync(new URL('../../node_modules/vega-datasets/data/penguins.json', import.meta.url), 'utf8')) as Penguin[]
).filter((p) => p['Flipper Length (mm)'] != null && p['Body Mass (g)'] != null);
const pairs = penguins.map((p) => [p['Flipper Length (mm)'] as number, p['Body Mass (g)'] as number]);
const line = linearRegressionLine(linearRegression(pairs));
const actual = Float64Array.from(pairs.map((p) => p[1]));
const predicted = Float64Array.from(pairs.map((p) => line(p[0])));
const residuals = pairs.map((p) => p[1] - line(p[0]));

describe('regression metrics against simple-statistics on the penguins fit', () => {
  it('uses the 342 complete rows', () => expect(pairs.length).toBe(342));
  it('rmse = ss.rootMeanSquare(residuals)', () =>
    expect(Math.abs(rmse({ actual, predicted }) - rootMeanSquare(residuals))).toBeLessThan(1e-9));
  it('mae = ss.mean(|residuals|)', () =>
    expect(Math.abs(mae({ actual, predicted }) - mean(residuals.map(Math.abs)))).toBeLessThan(1e-9));
  it('medae = ss.median(|residuals|), even n', () =>
    expect(Math.abs(medae({ actual, predicted }) - median(residuals.map(Math.abs)))).toBeLessThan(1e-9));
  it('r2 = ss.rSquared(pairs, fitted line) for the least-squares line', () => {
    const ours = r2({ actual, predicted });
    expect(Math.abs(ours - rSquared(pairs, line))).toBeLessThan(1e-12);
    expect(ours).toBeGreaterThan(0.7); // flipper length explains most of the mass (sanity)
  });
});

describe('regression metrics on seeded synthetic data (odd n) against simple-statistics', () => {
  const rng = createRng(7);
  const n = 101;
  const a = new Float64Array(n);
  const p = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    a[i] = 10 * rng.next();
    p[i] = a[i] + (rng.next() - 0.5) * 3;
  }
  const res = Array.from(a, (v, i) => v - p[i]);
  it('rmse, mae, medae', () => {
    expect(Math.abs(rmse({ actual: a, predicted: p }) - rootMeanSquare(res))).toBeLessThan(1e-12);
    expect(Math.abs(mae({ actual: a, predicted: p }) - mean(res.map(Math.abs)))).toBeLessThan(1e-12);
    expect(Math.abs(medae({ actual: a, predicted: p }) - median(res.map(Math.abs)))).toBeLessThan(1e-12);
  });
});

describe('r2 special values', () => {
  it('is 1 for a perfect prediction and 0 for predicting the mean', () => {
    const a = Float64Array.from([1, 2, 3, 6]);
    expect(r2({ actual: a, predicted: a })).toBe(1);
    expect(Math.abs(r2({ actual: a, predicted: new Float64Array(4).fill(3) }))).toBeLessThan(1e-15);
  });
  it('is negative when worse than the mean: 1 - 56/14 = -3 (by hand)', () => {
    // actual 1 2 3 6, mean 3, SS_tot = 4 + 1 + 0 + 9 = 14; predicted 3 4 5 2: SS_res = 4+4+4+16 = 28
    const v = r2({ actual: Float64Array.from([1, 2, 3, 6]), predicted: Float64Array.from([3, 4, 5, 2]) });
    expect(Math.abs(v - (1 - 28 / 14))).toBeLessThan(1e-12);
  });
  it('is NaN when actual is constant (SS_tot = 0), even for a perfect prediction (documented)', () => {
    const c = Float64Array.from([5, 5, 5]);
    expect(r2({ actual: c, predicted: c })).toBeNaN();
    expect(r2({ actual: c, predicted: Float64Array.from([4, 5, 6]) })).toBeNaN();
    expect(r2({ actual: Float64Array.from([2]), predicted: Float64Array.from([2]) })).toBeNaN();
  });
});
