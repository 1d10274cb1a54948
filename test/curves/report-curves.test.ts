/**
 * Curves in the eval report, on the Palmer penguins file (vega-datasets, CC0; Gorman, Williams
 * & Fraser 2014): Sex for two classes (rows with a missing or "." sex left out), Species for
 * three. The exact areas must equal the registry metrics on the same pooled predictions; the
 * curves must stay within their size bounds.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { CURVE_CLASS_LIMIT, learnerCurves, MAX_CURVE_POINTS, RELIABILITY_BINS } from '../../src/curves/build.js';
import { GRID_POINTS } from '../../src/curves/band.js';
import { evaluate } from '../../src/run/evaluate.js';
import { createRng } from '../../src/rng.js';
import type { LearnerReport } from '../../src/model/report.js';
import { renderMarkdown } from '../../src/report/markdown.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';

const expectValid = schemaCheck('report.schema.json');
const METRICS = ['roc-auc', 'average-precision', 'ece', 'brier'];

function sexCsv(): string {
  const lines = penguinsCsv().trimEnd().split('\n');
  const header = lines[0].split(',');
  const sex = header.indexOf('Sex');
  expect(sex).toBeGreaterThan(0);
  const kept = lines.slice(1).filter((l) => {
    const v = l.split(',')[sex];
    return v === 'MALE' || v === 'FEMALE';
  });
  expect(kept.length).toBe(333); // 344 birds, 11 without a sex (10 missing, one ".")
  return `${[lines[0], ...kept].join('\n')}\n`;
}

function checkCurveBounds(l: LearnerReport): void {
  const c = l.curves!;
  for (const k of c.classes) {
    for (const curve of [k.roc, k.pr]) {
      if (!curve.x) continue;
      expect(curve.x.length).toBe(curve.y!.length);
      expect(curve.x.length).toBeLessThanOrEqual(MAX_CURVE_POINTS);
      expect(curve.band!.grid.length).toBe(GRID_POINTS);
      for (let i = 0; i < GRID_POINTS; i++) {
        expect(curve.band!.q1[i]).toBeLessThanOrEqual(curve.band!.median[i] + 1e-12);
        expect(curve.band!.median[i]).toBeLessThanOrEqual(curve.band!.q3[i] + 1e-12);
      }
    }
  }
  const bins = c.calibration.bins;
  expect(bins.length).toBeGreaterThan(0);
  expect(bins.length).toBeLessThanOrEqual(RELIABILITY_BINS);
  expect(bins.reduce((s, b) => s + b.count, 0)).toBe(c.rows);
  for (const b of bins) {
    expect(b.interval[0]).toBeLessThanOrEqual(b.observed);
    expect(b.interval[1]).toBeGreaterThanOrEqual(b.observed);
  }
}

describe('curves of a two-class run (penguins, Sex)', async () => {
  const table = await loadCsv({ text: sexCsv(), name: 'sex.csv' });
  const report = evaluate(table, { target: 'Sex', learners: ['knn', 'logistic'], plan: 'kfold:5', metrics: METRICS, seed: 5, timing: false });

  it('validates, and every learner with probabilities has one positive-class entry', () => {
    expectValid(report);
    expect(report.data.classes).toEqual(['FEMALE', 'MALE']);
    const withCurves = report.learners.filter((l) => l.curves);
    // knn, logistic and the baseline foldwise adds
    expect(withCurves.map((l) => l.name).sort()).toEqual(['baseline', 'knn', 'logistic']);
    for (const l of withCurves) {
      expect(l.curves!.rows).toBe(333);
      expect(l.curves!.classes.map((c) => c.class)).toEqual(['MALE']);
      expect(l.curves!.calibration.form).toBe('positive-class');
      checkCurveBounds(l);
    }
  });

  it('gives the exact pooled areas and ECE of the registry metrics', () => {
    for (const l of report.learners.filter((x) => x.curves)) {
      const c = l.curves!;
      expect(Math.abs(c.classes[0].roc.area! - (l.pooled['roc-auc'] as number))).toBeLessThan(1e-12);
      expect(Math.abs(c.classes[0].pr.area! - (l.pooled['average-precision'] as number))).toBeLessThan(1e-12);
      expect(Math.abs(c.calibration.ece - (l.pooled.ece as number))).toBeLessThan(1e-12);
      // the fold areas' summary is the registry summary of roc-auc / average-precision
      expect(Math.abs(c.classes[0].roc.foldAreas!.mean - l.summary['roc-auc']!.mean)).toBeLessThan(1e-12);
      const [a, b] = c.classes[0].pr.foldAreas!.ci95!;
      const [a2, b2] = l.summary['average-precision']!.ci95!;
      expect(Math.max(Math.abs(a - a2), Math.abs(b - b2))).toBeLessThan(1e-12);
      expect(c.classes[0].roc.band!.folds).toBe(5);
      // the pooled ROC curve runs from (0, 0) to (1, 1)
      const roc = c.classes[0].roc;
      expect([roc.x![0], roc.y![0]]).toEqual([0, 0]);
      expect([roc.x!.at(-1), roc.y!.at(-1)]).toEqual([1, 1]);
      if (c.calibration.brierParts) {
        const p = c.calibration.brierParts;
        expect(Math.abs(p.brier - (l.pooled.brier as number))).toBeLessThan(1e-12);
        expect(Math.abs(p.reliability - p.resolution + p.uncertainty - p.brier)).toBeLessThan(1e-12);
      } else {
        expect(c.calibration.distinctForecastsAbove).toBe(100);
      }
    }
    // knn (k = 5 by default, from memory of our own defaults) gives few distinct vectors: Murphy's partition is kept
    const knn = report.learners.find((l) => l.name === 'knn')!;
    expect(knn.curves!.calibration.brierParts).toBeDefined();
  });
});

describe('curves in the Markdown report', async () => {
  const table = await loadCsv({ text: sexCsv(), name: 'sex.csv' });
  const report = evaluate(table, { target: 'Sex', learners: ['knn'], plan: 'kfold:5', metrics: ['accuracy'], seed: 5, timing: false });

  it('gives the areas and calibration figures of each learner', () => {
    const md = renderMarkdown(report, () => true);
    expect(md).toContain('## Curves (pooled out-of-fold; MALE positive)');
    expect(md).toContain('## Calibration (pooled out-of-fold, equal-count bins)');
    const knn = report.learners.find((l) => l.name === 'knn')!;
    const row = md.split('\n').find((line) => line.startsWith('| knn |') && line.includes(knn.curves!.classes[0].roc.area!.toFixed(4)));
    expect(row).toBeDefined();
    expect(row).toContain(knn.curves!.classes[0].pr.area!.toFixed(4));
    const cal = md.slice(md.indexOf('## Curves')).split('\n').filter((line) => line.startsWith('| knn |'));
    expect(cal.length).toBe(2);
    expect(cal[1]).toContain(knn.curves!.calibration.ece.toFixed(4));
  });
});

describe('curves of a three-class run (penguins, Species)', async () => {
  const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
  const report = evaluate(table, { target: 'Species', learners: ['knn'], plan: 'kfold:5x2', metrics: METRICS, seed: 5, timing: false });
  const l = report.learners.find((x) => x.name === 'knn')!;

  it('has one-vs-rest curves per class, macro and prevalence-weighted areas', () => {
    expectValid(report);
    const c = l.curves!;
    expect(c.classes.map((k) => k.class)).toEqual(['Adelie', 'Chinstrap', 'Gentoo']);
    expect(c.classesDrawn).toBe(3);
    expect(c.rows).toBe(2 * 344);
    expect(c.calibration.form).toBe('top-label');
    checkCurveBounds(l);
    // macro mean of the pooled one-vs-rest areas is the registry's macro roc-auc / average-precision
    expect(Math.abs(c.average!.macro.roc! - (l.pooled['roc-auc'] as number))).toBeLessThan(1e-12);
    expect(Math.abs(c.average!.macro.pr! - (l.pooled['average-precision'] as number))).toBeLessThan(1e-12);
    // weighted by the species counts 152 / 68 / 124 (twice each: two repeats)
    expect(c.classes.map((k) => k.positives)).toEqual([304, 136, 248]);
    const w = (152 * c.classes[0].roc.area! + 68 * c.classes[1].roc.area! + 124 * c.classes[2].roc.area!) / 344;
    expect(Math.abs(c.average!.weighted.roc! - w)).toBeLessThan(1e-12);
  });
});

describe('size bounds', () => {
  it('thins a long pooled curve, keeps points for the most frequent classes only', () => {
    const rng = createRng(77);
    const classes = 12;
    const names = Array.from({ length: classes }, (_, k) => `c${k}`);
    const folds = [0, 1, 2].map(() => {
      const n = 600;
      const actual = new Int32Array(n);
      const proba = new Float64Array(n * classes);
      for (let i = 0; i < n; i++) {
        // class k with weight k + 1, so the frequent classes are the last ones
        let u = rng.next() * ((classes * (classes + 1)) / 2);
        let k = 0;
        while (u >= k + 1) (u -= k + 1, k++);
        actual[i] = k;
        let sum = 0;
        for (let j = 0; j < classes; j++) sum += proba[i * classes + j] = rng.next() + (j === k ? 0.5 : 0);
        for (let j = 0; j < classes; j++) proba[i * classes + j] /= sum;
      }
      return { actual, proba };
    });
    const c = learnerCurves(folds, names, { testRows: 600, trainRows: 1200 });
    expect(c.classes.length).toBe(classes);
    expect(c.classesDrawn).toBe(CURVE_CLASS_LIMIT);
    const drawn = c.classes.filter((k) => k.roc.x);
    expect(drawn.length).toBe(CURVE_CLASS_LIMIT);
    // the drawn classes are the most frequent ones
    const minDrawn = Math.min(...drawn.map((k) => k.positives));
    const maxUndrawn = Math.max(...c.classes.filter((k) => !k.roc.x).map((k) => k.positives));
    expect(minDrawn).toBeGreaterThanOrEqual(maxUndrawn);
    for (const k of drawn) {
      expect(k.roc.pointsTotal).toBeGreaterThan(MAX_CURVE_POINTS);
      expect(k.roc.x!.length).toBe(MAX_CURVE_POINTS);
      expect(k.pr.x!.length).toBe(MAX_CURVE_POINTS);
    }
    for (const k of c.classes) expect(k.roc.area).not.toBeNull();
    expect(JSON.stringify(c).length).toBeLessThan(400_000);
  });
});
