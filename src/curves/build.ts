/**
 * The curves of one learner from its out-of-fold predictions: ROC and precision-recall (one
 * class positive for two classes, one-vs-rest per class for more, with macro and
 * prevalence-weighted mean areas), a band of per-fold curves, and the reliability curve.
 *
 * Sizes are bounded: a pooled curve keeps at most MAX_CURVE_POINTS points (its area is
 * computed on all of them first), a band GRID_POINTS, the reliability curve RELIABILITY_BINS
 * bins, and beyond CURVE_CLASS_LIMIT classes only the most frequent classes keep points (every
 * class keeps its areas up to CLASS_AREA_LIMIT classes; beyond that no per-class entry is
 * kept at all, only the averages).
 */
import { brierParts, fewForecasts } from '../metrics/brier-parts.js';
import { calibrationPairs, equalCountBins } from '../metrics/calibration-bins.js';
import type { ScoreSummary } from '../model/report.js';
import { summarize } from '../stats/index.js';
import { commonGrid, prOnGrid, quartileBand, rocOnGrid } from './band.js';
import { operatingPoints, rocArea, stepwiseArea, type OperatingPoints } from './points.js';
import type { Calibration, ClassCurves, Curve, LearnerCurves } from '../model/curves.js';
import { wilsonInterval } from './wilson.js';

export const MAX_CURVE_POINTS = 200;
export const CURVE_CLASS_LIMIT = 8;
export const CLASS_AREA_LIMIT = 100;
export const RELIABILITY_BINS = 10;
export const BRIER_GROUP_LIMIT = 100;

export interface CurveFold {
  readonly actual: Int32Array;
  /** rows x classes */
  readonly proba: Float64Array;
}

export interface CurveSizes {
  readonly testRows: number;
  readonly trainRows: number;
}

/** Evenly spaced indices 0 .. m-1, both ends kept, at most `max` of them. */
export function thinIndices(m: number, max: number): number[] {
  if (m <= max) return Array.from({ length: m }, (_, i) => i);
  const out: number[] = [];
  for (let k = 0; k < max; k++) out.push(Math.round((k * (m - 1)) / (max - 1)));
  return out;
}

function columnOf(proba: Float64Array, classes: number, k: number, outcomeOf: Int32Array): { score: Float64Array; outcome: Uint8Array } {
  const n = outcomeOf.length;
  const score = new Float64Array(n);
  const outcome = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    score[i] = proba[i * classes + k];
    outcome[i] = outcomeOf[i] === k ? 1 : 0;
  }
  return { score, outcome };
}

function summaryOf(values: number[], sizes: CurveSizes): ScoreSummary | null {
  const ok = values.filter((v) => Number.isFinite(v));
  // areas lie in [0, 1]: their intervals are clipped there, as the metrics of the registry are
  return ok.length ? summarize(ok, sizes, 0.95, { range: [0, 1] }) : null;
}

function curveOf(
  pooled: OperatingPoints,
  folds: readonly OperatingPoints[],
  kind: 'roc' | 'pr',
  drawn: boolean,
  sizes: CurveSizes,
): Curve {
  const areaOf = kind === 'roc' ? rocArea : stepwiseArea;
  const area = areaOf(pooled);
  const foldAreas = summaryOf(folds.map(areaOf), sizes);
  const defined = kind === 'roc' ? pooled.positives > 0 && pooled.negatives > 0 : pooled.positives > 0;
  if (!drawn || !defined) return { area: Number.isFinite(area) ? area : null, foldAreas };
  // the pooled curve: ROC from (0, 0); PR from the first threshold on (precision is undefined before it)
  const first = kind === 'roc' ? 0 : 1;
  const m = pooled.tp.length - first;
  const x: number[] = [];
  const y: number[] = [];
  for (const k of thinIndices(m, MAX_CURVE_POINTS)) {
    const j = k + first;
    if (kind === 'roc') {
      x.push(pooled.fp[j] / pooled.negatives);
      y.push(pooled.tp[j] / pooled.positives);
    } else {
      x.push(pooled.tp[j] / pooled.positives);
      y.push(pooled.tp[j] / (pooled.tp[j] + pooled.fp[j]));
    }
  }
  const usable = folds.filter((f) => (kind === 'roc' ? f.positives > 0 && f.negatives > 0 : f.positives > 0));
  const grid = commonGrid();
  const band =
    usable.length >= 2
      ? { grid, folds: usable.length, ...quartileBand(usable.map((f) => (kind === 'roc' ? rocOnGrid(f, grid) : prOnGrid(f, grid)))) }
      : undefined;
  return { area, foldAreas, pointsTotal: m, x, y, ...(band ? { band } : {}) };
}

function calibrationOf(actual: Int32Array, proba: Float64Array, classes: number): Calibration {
  const { score, outcome } = calibrationPairs(actual, proba, classes);
  const n = score.length;
  const bins = equalCountBins(score, outcome, RELIABILITY_BINS);
  let ece = 0;
  let mce = 0;
  for (const b of bins) {
    const gap = Math.abs(b.observed - b.meanScore);
    ece += (b.count / n) * gap;
    mce = Math.max(mce, gap);
  }
  const parts = fewForecasts(proba, classes, BRIER_GROUP_LIMIT) ? brierParts({ actual, predicted: new Int32Array(n), classes, probs: proba }) : undefined;
  return {
    form: classes === 2 ? 'positive-class' : 'top-label',
    bins: bins.map((b) => ({
      count: b.count,
      meanScore: b.meanScore,
      observed: b.observed,
      interval: wilsonInterval(b.hits, b.count),
      lowScore: b.lowScore,
      highScore: b.highScore,
    })),
    ece,
    mce,
    ...(parts ? { brierParts: parts } : { distinctForecastsAbove: BRIER_GROUP_LIMIT }),
  };
}

function meanArea(entries: readonly { area: number | null; weight: number }[]): { macro: number | null; weighted: number | null } {
  const ok = entries.filter((e): e is { area: number; weight: number } => e.area !== null);
  if (!ok.length) return { macro: null, weighted: null };
  const w = ok.reduce((s, e) => s + e.weight, 0);
  return { macro: ok.reduce((s, e) => s + e.area, 0) / ok.length, weighted: w > 0 ? ok.reduce((s, e) => s + e.area * e.weight, 0) / w : null };
}

/** The learner's curves; `folds` are its scored folds (with probabilities), `classNames` the data's classes. */
export function learnerCurves(folds: readonly CurveFold[], classNames: readonly string[], sizes: CurveSizes): LearnerCurves {
  if (folds.length === 0) throw new RangeError('learnerCurves: no folds');
  const classes = classNames.length;
  const rows = folds.reduce((s, f) => s + f.actual.length, 0);
  const actual = new Int32Array(rows);
  const proba = new Float64Array(rows * classes);
  let at = 0;
  for (const f of folds) {
    actual.set(f.actual, at);
    proba.set(f.proba, at * classes);
    at += f.actual.length;
  }
  const counts = new Array<number>(classes).fill(0);
  for (let i = 0; i < rows; i++) counts[actual[i]]++;
  const positive = classes === 2 ? [1] : Array.from({ length: classes }, (_, k) => k);
  // most frequent first (ties in class order) decides which classes keep their points
  const drawnSet = new Set([...positive].sort((a, b) => counts[b] - counts[a] || a - b).slice(0, CURVE_CLASS_LIMIT));
  const kept = classes > CLASS_AREA_LIMIT ? [] : positive;
  const perClass: ClassCurves[] = [];
  const rocAreas: { area: number | null; weight: number }[] = [];
  const prAreas: { area: number | null; weight: number }[] = [];
  for (const k of positive) {
    const pooledCol = columnOf(proba, classes, k, actual);
    const pooled = operatingPoints(pooledCol.score, pooledCol.outcome);
    const foldPoints = folds.map((f) => {
      const c = columnOf(f.proba, classes, k, f.actual);
      return operatingPoints(c.score, c.outcome);
    });
    const drawn = drawnSet.has(k) && kept.includes(k);
    const roc = curveOf(pooled, foldPoints, 'roc', drawn, sizes);
    const pr = curveOf(pooled, foldPoints, 'pr', drawn, sizes);
    rocAreas.push({ area: roc.area, weight: counts[k] });
    prAreas.push({ area: pr.area, weight: counts[k] });
    if (kept.includes(k)) perClass.push({ class: classNames[k], positives: counts[k], prevalence: counts[k] / rows, roc, pr });
  }
  let average: LearnerCurves['average'];
  if (classes > 2) {
    const r = meanArea(rocAreas);
    const p = meanArea(prAreas);
    average = { macro: { roc: r.macro, pr: p.macro }, weighted: { roc: r.weighted, pr: p.weighted } };
  }
  return {
    rows,
    classes: perClass,
    ...(classes > 2 ? { classesDrawn: Math.min(CURVE_CLASS_LIMIT, kept.length) } : {}),
    ...(average ? { average } : {}),
    calibration: calibrationOf(actual, proba, classes),
  };
}
