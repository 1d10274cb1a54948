/**
 * Histogram split search of `boost`: sibling subtraction (Ke et al. 2017, "LightGBM", NIPS,
 * sec. 2: a parent's histogram minus one child's is the other child's) and the gain formula of
 * Chen & Guestrin (2016, eq. 7), checked by brute force on seeded synthetic data.
 */
import { describe, expect, it } from 'vitest';
import { binMatrix } from '../../../src/learners/cart/bins.js';
import { bestSplit, buildHistogram, layoutOf, splitGain, subtractHistogram } from '../../../src/learners/boost/histogram.js';
import { createRng } from '../../../src/rng.js';

const n = 300;
const p = 4;
const rng = createRng(21);
const data = Float64Array.from({ length: n * p }, () => Math.round(rng.next() * 40) / 4);
const binned = binMatrix({ rows: n, cols: p, data }, 16, 'boost');
const rowCodes = new Uint8Array(n * p);
for (let j = 0; j < p; j++) for (let i = 0; i < n; i++) rowCodes[i * p + j] = binned.codes[j * n + i];
const g = Float64Array.from({ length: n }, () => rng.next() - 0.5);
const h = Float64Array.from({ length: n }, () => 0.1 + rng.next());
const features = Int32Array.from({ length: p }, (_, j) => j);

for (const unit of [false, true]) {
  describe(`histograms (stride ${unit ? 2 : 3})`, () => {
    const layout = layoutOf(binned.cuts, unit);
    const hh = unit ? new Float64Array(n).fill(1) : h;
    const make = (rows: Int32Array) => {
      const hist = new Float64Array(layout.stride * layout.total);
      buildHistogram(hist, layout, rowCodes, p, features, rows, Float64Array.from(rows, (i) => g[i]), Float64Array.from(rows, (i) => hh[i]), 0, rows.length);
      return hist;
    };
    const all = Int32Array.from({ length: n }, (_, i) => i);
    const left = all.filter((i) => i % 3 === 0);
    const right = all.filter((i) => i % 3 !== 0);

    it('parent minus one child equals the other child', () => {
      const parent = make(all);
      subtractHistogram(parent, make(left), layout, features);
      const direct = make(right);
      expect(parent.length).toBe(direct.length);
      expect(parent.length).toBeGreaterThan(0);
      let worst = 0;
      for (let e = 0; e < parent.length; e++) worst = Math.max(worst, Math.abs(parent[e] - direct[e]));
      expect(worst).toBeLessThan(1e-12);
    });

    it('bestSplit finds the split of largest gain that brute force over thresholds finds', () => {
      const limits = { leafRows: 10, leafHessian: 0.5, ridge: 0.7 };
      let G = 0;
      let H = 0;
      for (let i = 0; i < n; i++) {
        G += g[i];
        H += hh[i];
      }
      const out = { feature: -1, bin: -1, gain: 0 };
      bestSplit(make(all), layout, features, G, H, n, limits, out);
      // brute force: every feature, every cut, sums straight from the rows
      let best = { feature: -1, bin: -1, gain: 0 };
      for (let j = 0; j < p; j++) {
        for (let b = 0; b < binned.cuts[j].length; b++) {
          let GL = 0;
          let HL = 0;
          let CL = 0;
          for (let i = 0; i < n; i++) {
            if (binned.codes[j * n + i] <= b) {
              GL += g[i];
              HL += hh[i];
              CL++;
            }
          }
          if (CL < 10 || n - CL < 10 || HL < 0.5 || H - HL < 0.5) continue;
          const gain = splitGain(GL, HL, G - GL, H - HL, 0.7);
          if (gain > best.gain + 1e-12) best = { feature: j, bin: b, gain };
        }
      }
      expect(best.feature).toBeGreaterThanOrEqual(0);
      expect(out.feature).toBe(best.feature);
      expect(out.bin).toBe(best.bin);
      expect(Math.abs(out.gain - best.gain)).toBeLessThan(1e-9);
    });
  });
}
