/**
 * Per-fold curves on a common grid, and their pointwise quartiles (the band the report draws
 * around the pooled curve).
 *
 * - ROC: at each false-positive rate g of the grid, the highest true-positive rate the fold
 *   reaches with a false-positive rate of at most g (a step curve: every value is an operating
 *   point the fold really has; no interpolation between thresholds).
 * - Precision-recall: at each recall r of the grid, the highest precision the fold reaches at a
 *   recall of at least r (the "interpolated precision" of information retrieval, Manning,
 *   Raghavan & Schutze 2008, ch. 8.4). This never joins PR points by straight lines (Davis &
 *   Goadrich 2006). At r = 0 it is the highest precision anywhere on the curve.
 * - Quartiles: q1, median and q3 of the folds' values at each grid point, by linear
 *   interpolation between order statistics (Hyndman & Fan 1996, definition 7).
 */
import type { OperatingPoints } from './points.js';

/** Number of points of the common grid: 0, 1/40, ..., 1. */
export const GRID_POINTS = 41;

export function commonGrid(): number[] {
  return Array.from({ length: GRID_POINTS }, (_, i) => i / (GRID_POINTS - 1));
}

/** The fold's ROC curve on the grid (see the file comment); the fold must have positives and negatives. */
export function rocOnGrid(p: OperatingPoints, grid: readonly number[]): number[] {
  return grid.map((g) => {
    let best = 0;
    for (let j = 0; j < p.tp.length; j++) if (p.fp[j] / p.negatives <= g + 1e-12) best = Math.max(best, p.tp[j] / p.positives);
    return best;
  });
}

/** The fold's precision-recall curve on the grid (see the file comment); the fold must have positives. */
export function prOnGrid(p: OperatingPoints, grid: readonly number[]): number[] {
  return grid.map((r) => {
    let best = 0;
    for (let j = 1; j < p.tp.length; j++) if (p.tp[j] / p.positives >= r - 1e-12) best = Math.max(best, p.tp[j] / (p.tp[j] + p.fp[j]));
    return best;
  });
}

function quantile(sorted: readonly number[], q: number): number {
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Pointwise q1, median and q3 of curves given on the same grid; needs at least one curve. */
export function quartileBand(curves: readonly (readonly number[])[]): { q1: number[]; median: number[]; q3: number[] } {
  if (curves.length === 0) throw new RangeError('quartileBand: no curves');
  const m = curves[0].length;
  const q1: number[] = [];
  const median: number[] = [];
  const q3: number[] = [];
  for (let i = 0; i < m; i++) {
    const col = curves.map((c) => c[i]).sort((a, b) => a - b);
    q1.push(quantile(col, 0.25));
    median.push(quantile(col, 0.5));
    q3.push(quantile(col, 0.75));
  }
  return { q1, median, q3 };
}
