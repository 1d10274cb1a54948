/**
 * The curve charts of the HTML page, on a two-class run of the penguins file (Sex; vega-datasets,
 * CC0, Gorman, Williams & Fraser 2014) and a three-class one (Species). The charts are checked
 * against the report they are drawn from: one pooled line with the curve's points, the band
 * polygon of the quartiles, one dot and one whisker per reliability bin.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { renderEvalHtml } from '../../src/report/html/index.js';
import { evaluate } from '../../src/run/evaluate.js';
import { figureOf, tags } from '../helpers/html.js';
import { penguinsCsv } from '../helpers/penguins.js';

function sexCsv(): string {
  const lines = penguinsCsv().trimEnd().split('\n');
  const sex = lines[0].split(',').indexOf('Sex');
  return `${[lines[0], ...lines.slice(1).filter((l) => ['MALE', 'FEMALE'].includes(l.split(',')[sex]))].join('\n')}\n`;
}

describe('HTML curve charts, two classes', async () => {
  const table = await loadCsv({ text: sexCsv(), name: 'sex.csv' });
  const report = evaluate(table, { target: 'Sex', learners: ['knn'], plan: 'kfold:5', seed: 5, timing: false });
  const html = renderEvalHtml(report);
  const knn = report.learners.find((l) => l.name === 'knn')!;

  it('draws the pooled ROC line, its band and the chance diagonal', () => {
    const roc = figureOf(html, 'roc');
    const lines = tags(roc, 'polyline').filter((t) => t.get('class') === 'curve');
    expect(lines.length).toBe(1);
    const c = knn.curves!.classes[0].roc;
    expect(lines[0].get('points')!.split(' ').length).toBe(c.x!.length);
    const band = tags(roc, 'polygon').filter((t) => t.get('class') === 'band');
    expect(band.length).toBe(1);
    expect(band[0].get('points')!.split(' ').length).toBe(2 * c.band!.grid.length);
    expect(roc).toContain(`area ${c.area!.toFixed(4)}`);
  });

  it('draws the PR curve as steps with the prevalence line', () => {
    const pr = figureOf(html, 'pr');
    const c = knn.curves!.classes[0].pr;
    const lines = tags(pr, 'polyline').filter((t) => t.get('class') === 'curve');
    expect(lines.length).toBe(1);
    // steps: every point after the first gets a corner, 2m - 1 coordinates
    expect(lines[0].get('points')!.split(' ').length).toBe(2 * c.x!.length - 1);
    expect(tags(pr, 'line').filter((t) => t.get('class') === 'prevalence').length).toBe(1);
  });

  it('draws one dot and one Wilson whisker per reliability bin', () => {
    const rel = figureOf(html, 'reliability');
    const bins = knn.curves!.calibration.bins;
    expect(bins.length).toBeGreaterThan(1);
    expect(tags(rel, 'circle').filter((t) => t.get('class') === 'bin').length).toBe(bins.length);
    expect(tags(rel, 'line').filter((t) => t.get('class') === 'interval').length).toBe(bins.length);
    expect(rel).toContain(`ECE ${knn.curves!.calibration.ece.toFixed(4)}`);
  });
});

describe('HTML curve charts, three classes', async () => {
  const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
  const report = evaluate(table, { target: 'Species', learners: ['knn'], plan: 'kfold:5', seed: 5, timing: false });
  const html = renderEvalHtml(report);

  it('draws one one-vs-rest line per class with a legend, no band', () => {
    const roc = figureOf(html, 'roc');
    expect(tags(roc, 'polyline').filter((t) => t.get('class') === 'curve').length).toBe(3);
    expect(tags(roc, 'polygon').filter((t) => t.get('class') === 'band').length).toBe(0);
    for (const name of ['Adelie', 'Chinstrap', 'Gentoo']) expect(roc).toContain(`${name}: `);
  });
});
