/**
 * Structural tests of the regression charts of the HTML eval page (src/report/html/
 * regression-charts.ts): predicted against actual with the identity line, residuals against
 * predicted with a zero line, drawn from the report's sample of pooled out-of-fold predictions.
 * Every dot must be one pair of the sample, in order, at a position linear in its values. The
 * data is the Palmer penguins file that the npm package vega-datasets ships (CC0; Gorman,
 * Williams & Fraser 2014), body mass in grams as the target, run through eval in-process.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { esc } from '../../src/report/html/escape.js';
import { count, sampleText, value } from '../../src/report/html/regression-charts.js';
import type { LearnerReport, Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { figureOf } from '../helpers/html.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const TARGET = 'Body Mass (g)';

async function run(name: string, args: string[]): Promise<{ report: Report; html: string }> {
  const json = join(tmp.dir, `${name}.json`);
  const r = await cli(['eval', penguins, '--target', TARGET, ...args, '--no-timing', '--quiet', '--jobs', '1', '--json', json]);
  expect(r.code).toBe(0);
  const out = join(tmp.dir, `${name}.html`);
  const g = await cli(['render', json, '--html', out]);
  expect(g.stderr).toBe('');
  expect(g.code).toBe(0);
  return { report: JSON.parse(readFileSync(json, 'utf8')) as Report, html: readFileSync(out, 'utf8') };
}

interface Dot {
  cx: number;
  cy: number;
  title: string;
}

/** The dots inside the <g class="{group}"> of a figure. */
function dotsOf(fig: string, group: string): { attrs: string; dots: Dot[] } {
  const m = new RegExp(`<g class="${group}"([^>]*)>([\\s\\S]*?)</g>`).exec(fig);
  expect(m).not.toBeNull();
  const dots = [...m![2].matchAll(/<circle cx="([^"]+)" cy="([^"]+)" r="3"><title>([^<]*)<\/title><\/circle>/g)].map((d) => ({ cx: Number(d[1]), cy: Number(d[2]), title: d[3] }));
  return { attrs: m![1], dots };
}

/** Asserts pixel = a + b * value for one a, b over all points (to the 0.01 px rounding of the page). */
function expectLinear(points: readonly (readonly [number, number])[]): number {
  const lo = points.reduce((a, b) => (b[0] < a[0] ? b : a));
  const hi = points.reduce((a, b) => (b[0] > a[0] ? b : a));
  expect(hi[0]).toBeGreaterThan(lo[0]);
  const slope = (hi[1] - lo[1]) / (hi[0] - lo[0]);
  for (const [v, p] of points) expect(Math.abs(p - (lo[1] + (v - lo[0]) * slope))).toBeLessThan(0.02);
  return slope;
}

const best = (r: Report): LearnerReport => [...r.learners].sort((a, b) => a.summary.rmse!.mean - b.summary.rmse!.mean)[0];

describe('regression charts of a repeated k-fold run (1,026 pooled predictions, 1,000 drawn)', async () => {
  const { report, html } = await run('reg', ['--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:5x3']);
  const top = best(report);
  const sample = top.pooledSample!;

  it('draws one dot per pair of the best learner\'s sample, in order, with that pair\'s values', () => {
    expect(report.metrics[0]).toBe('rmse');
    expect(sample.total).toBe(1026);
    expect(sample.actual.length).toBe(1000);
    const fig = figureOf(html, 'scatter');
    const { attrs, dots } = dotsOf(fig, 'predictions');
    expect(attrs).toContain(`data-learner="${esc(top.spec)}"`);
    expect(attrs).toContain('data-total="1026"');
    expect(dots.length).toBe(sample.actual.length);
    dots.forEach((d, j) => expect(d.title).toBe(`actual ${value(sample.actual[j])}, predicted ${value(sample.predicted[j])}`));
    // across: linear in the actual value; up: linear in the predicted value, larger values higher
    const sx = expectLinear(dots.map((d, j) => [sample.actual[j], d.cx]));
    const sy = expectLinear(dots.map((d, j) => [sample.predicted[j], d.cy]));
    expect(sx).toBeGreaterThan(0);
    // the same scale on both axes, so the identity line is at 45 degrees
    expect(Math.abs(sy + sx)).toBeLessThan(1e-3 * sx);
  });

  it('draws the identity line from corner to corner of the shared scale, and labels both axes with the target', () => {
    const fig = figureOf(html, 'scatter');
    const line = /<line class="identity" x1="([^"]+)" y1="([^"]+)" x2="([^"]+)" y2="([^"]+)" data-from="([^"]+)" data-to="([^"]+)"/.exec(fig);
    expect(line).not.toBeNull();
    const [x1, y1, x2, y2, from, to] = line!.slice(1).map(Number);
    expect(from).toBeLessThanOrEqual(Math.min(...sample.actual, ...sample.predicted));
    expect(to).toBeGreaterThanOrEqual(Math.max(...sample.actual, ...sample.predicted));
    // on the line, predicted = actual: equal pixel steps across and up
    expect(Math.abs(x2 - x1 - (y1 - y2))).toBeLessThan(0.02);
    const { dots } = dotsOf(fig, 'predictions');
    const j = sample.actual.findIndex((a, i) => a === sample.predicted[i]);
    if (j >= 0) {
      // a pair predicted exactly lies on the line
      const t = (dots[j].cx - x1) / (x2 - x1);
      expect(Math.abs(dots[j].cy - (y1 + t * (y2 - y1)))).toBeLessThan(0.05);
    }
    expect(fig).toContain(`>${esc(`actual ${TARGET}`)}</text>`);
    expect(fig).toContain(`>${esc(`predicted ${TARGET}`)}</text>`);
    expect(fig).toMatch(/role="img" aria-label="[^"]+" aria-describedby="scatter-desc"/);
    expect(fig).toMatch(/<desc id="scatter-desc">Scatter plot of 1,000 of 1,026 pooled out-of-fold predictions[^<]{100,}<\/desc>/);
    expect(fig).toContain(`<figcaption>${esc(`A sample of 1,000 of 1,026 pooled out-of-fold predictions of ${top.spec}`)}`);
  });

  it('draws the residuals (actual − predicted) against the prediction, with a zero line', () => {
    const fig = figureOf(html, 'residuals');
    const { dots } = dotsOf(fig, 'residuals');
    expect(dots.length).toBe(1000);
    const residuals = sample.actual.map((a, j) => a - sample.predicted[j]);
    dots.forEach((d, j) => expect(d.title).toBe(`predicted ${value(sample.predicted[j])}, residual ${value(residuals[j])}`));
    expect(expectLinear(dots.map((d, j) => [sample.predicted[j], d.cx]))).toBeGreaterThan(0);
    const sy = expectLinear(dots.map((d, j) => [residuals[j], d.cy]));
    expect(sy).toBeLessThan(0);
    const zero = /<line class="zero" x1="[^"]+" x2="[^"]+" y1="([^"]+)" y2="([^"]+)"/.exec(fig);
    expect(zero).not.toBeNull();
    expect(zero![1]).toBe(zero![2]);
    // the zero line sits where a residual of 0 would be drawn
    const k = residuals.findIndex((r) => r !== 0);
    expect(Math.abs(Number(zero![1]) - (dots[k].cy - residuals[k] * sy))).toBeLessThan(0.02);
    expect(fig).toContain('>residual (actual − predicted)</text>');
    expect(fig).toContain(`>${esc(`predicted ${TARGET}`)}</text>`);
    expect(fig).toContain(`<figcaption>${esc('A sample of 1,000 of 1,026 pooled out-of-fold predictions')}`);
  });

  it('folds the other learners\' charts away, and the classification views are absent', () => {
    const others = report.learners.filter((l) => l !== top);
    expect(others.length).toBe(2);
    const details = html.slice(html.indexOf('<details><summary>Predicted-against-actual and residual charts of the other learners'));
    expect(details.length).toBeGreaterThan(1000);
    for (const l of others) {
      const n = report.learners.indexOf(l) + 1;
      const fig = figureOf(details, `scatter-${n}`);
      expect(dotsOf(fig, 'predictions').dots.length).toBe(l.pooledSample!.actual.length);
      expect(dotsOf(figureOf(details, `residuals-${n}`), 'residuals').dots.length).toBe(l.pooledSample!.actual.length);
    }
    expect(html.match(/<figure class="chart" id="(scatter|residuals)/g)?.length).toBe(6);
    expect(html).not.toContain('<table class="confusion"');
    expect(html).not.toContain('id="recall"');
  });
});

describe('regression charts of a single k-fold (every pooled prediction drawn)', async () => {
  const { report, html } = await run('reg5', ['--learner', 'knn', '--plan', 'kfold:5']);
  it('says that the sample holds all of them', () => {
    const top = best(report);
    expect(top.pooledSample!.total).toBe(342);
    expect(dotsOf(figureOf(html, 'scatter'), 'predictions').dots.length).toBe(342);
    expect(html).toContain(`<figcaption>${esc(`All 342 pooled out-of-fold predictions of ${top.spec}`)}`);
  });

  it('leaves room left of the summary chart for "mean X" lines of scores in the hundreds', () => {
    // right-aligned labels end at x; at 13 px each character takes about 0.6 x 13 px (textWidth)
    const labels = [...html.matchAll(/<text x="([0-9.]+)" y="[0-9.]+" text-anchor="end" font-size="13"[^>]*>(mean [^<]+)<\/text>/g)];
    expect(labels.length).toBe(report.learners.length);
    expect(labels.some((m) => m[2].length >= 13)).toBe(true);
    for (const m of labels) expect(Number(m[1]) - m[2].length * 13 * 0.6).toBeGreaterThanOrEqual(0);
  });
});

describe('a classification page', async () => {
  it('has no regression charts', async () => {
    const json = join(tmp.dir, 'cls.json');
    expect((await cli(['eval', penguins, '--target', 'Species', '--learner', 'knn', '--plan', 'kfold:5', '--no-timing', '--quiet', '--jobs', '1', '--json', json])).code).toBe(0);
    const r = JSON.parse(readFileSync(json, 'utf8')) as Report;
    expect(r.learners.some((l) => l.pooledSample)).toBe(false);
    const out = join(tmp.dir, 'cls.html');
    expect((await cli(['render', json, '--html', out])).code).toBe(0);
    expect(readFileSync(out, 'utf8')).not.toMatch(/id="(scatter|residuals)/);
  });
});

describe('text helpers', () => {
  it('write counts with thousands separators and values with six significant digits', () => {
    expect(count(1026)).toBe('1,026');
    expect(count(1234567)).toBe('1,234,567');
    expect(count(999)).toBe('999');
    expect(value(4512.5)).toBe('4512.5');
    expect(value(-137.123456)).toBe('−137.123');
    expect(value(Number.NaN)).toBe('–');
    expect(sampleText({ total: 1026, actual: [], predicted: [] }, 1000)).toBe('A sample of 1,000 of 1,026');
    expect(sampleText({ total: 342, actual: [], predicted: [] }, 342)).toBe('All 342');
  });
});
