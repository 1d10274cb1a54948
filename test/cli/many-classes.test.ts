/**
 * A target with more classes than CONFUSION_CLASS_LIMIT (25): the report folds the pooled
 * confusion matrix, so its size does not grow with the square of the classes, and every page
 * says how it was folded. The data: airports.csv shipped in the npm package vega-datasets (the
 * US airports of the ASA Data Expo 2009, from memory), target `state` (56 classes once the 12
 * rows without one are left out) from latitude and longitude. The folded matrix is recounted
 * here from the --predictions file with papaparse, an independent path.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { schemaCheck } from '../helpers/schema.js';
import type { Report } from '../../src/model/report.js';

const AIRPORTS = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'node_modules', 'vega-datasets', 'data', 'airports.csv');
const expectValid = schemaCheck('report.schema.json');
const tmp = tempFolder();

describe('eval on a 56-class target (vega-datasets airports.csv)', () => {
  it('folds the confusion matrix to 25 x 25, recountable from the predictions file, and says so on every page', async () => {
    const [json, md, html, render, pred] = ['r.json', 'r.md', 'r.html', 'again.html', 'p.csv'].map((f) => join(tmp.dir, f));
    const r = await cli(['eval', AIRPORTS, '--target', 'state', '--drop', 'iata', '--drop', 'name', '--drop', 'city', '--drop', 'country', '--learner', 'knn', '--plan', 'kfold:3', '--no-audit', '--no-timing', '--json', json, '--markdown', md, '--html', html, '--predictions', pred]);
    expect(r.code).toBe(0);
    const report = JSON.parse(readFileSync(json, 'utf8')) as Report;
    expectValid(report);
    const classes = report.data.classes!;
    expect(classes).toHaveLength(56);
    const rows = (Papa.parse(readFileSync(pred, 'utf8'), { header: true, skipEmptyLines: true }).data as Record<string, string>[]);
    expect(rows).toHaveLength(report.data.rowsUsed * report.learners.length);
    for (const l of report.learners) {
      expect(l.confusion).toBeUndefined();
      const f = l.confusionFolded!;
      expect(f.classes).toHaveLength(24);
      expect(f.otherClasses).toBe(32);
      expect(f.matrix).toHaveLength(25);
      // recount: the 24 classes with the most rows (ties in the report's class order), the rest folded
      const mine = rows.filter((row) => row.learner === l.spec);
      expect(mine).toHaveLength(report.data.rowsUsed);
      const size = new Map<string, number>(classes.map((c) => [c, 0]));
      for (const row of mine) size.set(row.actual, size.get(row.actual)! + 1);
      const kept = [...classes].sort((a, b) => size.get(b)! - size.get(a)! || classes.indexOf(a) - classes.indexOf(b)).slice(0, 24);
      expect(f.classes).toEqual(kept);
      const slot = (c: string) => (kept.includes(c) ? kept.indexOf(c) : 24);
      const matrix = Array.from({ length: 25 }, () => new Array<number>(25).fill(0));
      let otherCorrect = 0;
      for (const row of mine) {
        matrix[slot(row.actual)][slot(row.predicted_class)]++;
        if (slot(row.actual) === 24 && row.actual === row.predicted_class) otherCorrect++;
      }
      expect(f.matrix).toEqual(matrix);
      expect(f.otherCorrect).toBe(otherCorrect);
      // the pooled accuracy reads off the folded matrix
      const trace = kept.reduce((acc, _, k) => acc + matrix[k][k], 0) + otherCorrect;
      expect(Math.abs(l.pooled.accuracy! - trace / report.data.rowsUsed)).toBeLessThan(1e-12);
    }
    const markdown = readFileSync(md, 'utf8');
    expect(markdown).toContain('The target has 56 classes: the 24 with the most rows have their own row and column, and the last row and column hold the other 32 together;');
    expect(markdown).toContain('| (32 other classes) |');
    const page = readFileSync(html, 'utf8');
    const table = page.slice(page.indexOf('<table class="confusion"'), page.indexOf('</table>', page.indexOf('<table class="confusion"')));
    expect(table).toContain('data-folded="32"');
    expect(table.match(/<tr><th scope="row">/g)).toHaveLength(25);
    // the folded corner mixes right and wrong predictions: 24 outlined diagonal cells, not 25
    expect(table.match(/class="diag"/g)).toHaveLength(24);
    expect(page).toContain('Only the 24 classes with the most rows are drawn; the other 32 of the 56 classes are not.');
    expect(page.match(/class="recall"/g)).toHaveLength(24);
    // render reads the folded matrix back and draws the same page
    const again = await cli(['render', json, '--html', render]);
    expect(again.code).toBe(0);
    expect(readFileSync(render, 'utf8')).toBe(page);
  });
});
