/**
 * `score --threshold T`: the scores of a predictions file with the positive class called at
 * probability >= T, beside 0.5, in the shape eval uses for --threshold. Checks: every fold's
 * precision, recall and F1 of the positive class and its accuracy at T and at 0.5 recomputed
 * here from the predictions file itself (read with papaparse, the calls made in this test), and
 * the means across folds; a rule (max-f1, ...) refused with exit 2 and one line, since a
 * threshold chosen on the rows being scored would be fitted to them; multi-class and regression
 * predictions, a file without probabilities and numbers outside (0, 1) refused with exit 2.
 *
 * Data: the Palmer penguins file of vega-datasets (CC0; Gorman, Williams & Fraser 2014), Adelie
 * and Gentoo only, beak and flipper columns dropped (the species overlap on body mass, so the
 * calls at T differ from those at 0.5).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { PENGUINS_JSON, penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const all = JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, string | number | null>[];
const rows = all.filter((r) => r.Species !== 'Chinstrap');
const header = Object.keys(rows[0]);
const data = tmp.file('adelie-gentoo.csv', `${Papa.unparse([header, ...rows.map((r) => header.map((h) => (r[h] === null ? '' : String(r[h]))))], { newline: '\n' })}\n`);
const three = tmp.file('penguins.csv', penguinsCsv());
const drops = ['--drop', 'Beak Length (mm)', '--drop', 'Beak Depth (mm)', '--drop', 'Flipper Length (mm)'];
const expectValid = schemaCheck('report.schema.json');

async function predictions(args: string[], name: string): Promise<string> {
  const csv = join(tmp.dir, `${name}.csv`);
  const e = await cli(['eval', ...args, '--plan', 'kfold:4', '--no-timing', '--no-audit', '--quiet', '--json', join(tmp.dir, `${name}.json`), '--predictions', csv]);
  expect(e.code).toBe(0);
  return csv;
}

/** Precision, recall and F1 of Gentoo and accuracy, with a row called Gentoo when prob:Gentoo >= cut (computed here, not by foldwise). */
function figures(lines: readonly Record<string, string>[], cut: number): { precision: number; recall: number; f1: number; accuracy: number } {
  let tp = 0;
  let fp = 0;
  let fn = 0;
  let right = 0;
  for (const x of lines) {
    const call = Number(x['prob:Gentoo']) >= cut ? 'Gentoo' : 'Adelie';
    if (call === 'Gentoo') x.actual === 'Gentoo' ? tp++ : fp++;
    else if (x.actual === 'Gentoo') fn++;
    if (call === x.actual) right++;
  }
  return { precision: tp / (tp + fp), recall: tp / (tp + fn), f1: (2 * tp) / (2 * tp + fp + fn), accuracy: right / lines.length };
}

describe('score --threshold T', () => {
  it('reports every fold at T beside 0.5, as recomputed from the predictions file', async () => {
    const csv = await predictions([data, '--target', 'Species', ...drops, '--learner', 'knn:k=15', '--learner', 'logistic'], 'two');
    const T = 0.3;
    const r = await cli(['score', csv, '--threshold', String(T), '--json', '-']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout) as Report;
    expectValid(s);
    expect(s.threshold).toEqual({ rule: '0.3', positive: 'Gentoo', given: true });
    const lines = Papa.parse<Record<string, string>>(readFileSync(csv, 'utf8'), { header: true, skipEmptyLines: true }).data;
    expect(lines.length).toBe(3 * rows.length);
    const mean = (v: number[]): number => v.reduce((a, b) => a + b, 0) / v.length;
    let differs = 0;
    const specs = ['knn:k=15', 'logistic'];
    for (const spec of specs) {
      const l = s.learners.find((x) => x.spec === spec)!;
      const lt = l.threshold!;
      expect(lt.folds.length).toBe(4);
      const at: number[] = [];
      const half: number[] = [];
      for (const f of lt.folds) {
        const mine = lines.filter((x) => x.learner === spec && Number(x.fold) === f.fold + 1 && Number(x.repeat) === f.repeat + 1);
        expect(mine.length).toBeGreaterThan(50);
        expect(f.threshold).toBe(T);
        expect(f.met).toBe(true);
        const hand = figures(mine, T);
        expect(Math.abs(f.precision! - hand.precision)).toBeLessThan(1e-12);
        expect(Math.abs(f.recall! - hand.recall)).toBeLessThan(1e-12);
        expect(Math.abs(f.f1! - hand.f1)).toBeLessThan(1e-12);
        expect(Math.abs(f.scores.accuracy! - hand.accuracy)).toBeLessThan(1e-12);
        at.push(hand.accuracy);
        half.push(figures(mine, 0.5).accuracy);
        if (hand.accuracy !== half[half.length - 1]) differs++;
      }
      expect(Math.abs(lt.summary.accuracy!.mean - mean(at))).toBeLessThan(1e-12);
      expect(Math.abs(lt.atDefault.accuracy!.mean - mean(half))).toBeLessThan(1e-12);
      // the 0.5 figures beside it are those of the report without --threshold
      expect(Math.abs(lt.atDefault.accuracy!.mean - l.summary.accuracy!.mean)).toBeLessThan(1e-12);
    }
    // T moves some calls on this data, so a report at 0.5 under T's name would show
    expect(differs).toBeGreaterThan(0);

    const md = await cli(['score', csv, '--threshold', '0.3', '--markdown', '-']);
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('## At the given threshold 0.3');
    expect(md.stdout).toContain('| figure | at 0.3 | 95% interval (corrected) | at 0.5 | interval at 0.5 |');
    expect(md.stdout).not.toContain('chosen inside the training folds');
    const html = await cli(['score', csv, '--threshold', '0.3', '--html', '-']);
    expect(html.code).toBe(0);
    expect(html.stdout).toContain('At the given threshold 0.3');
  });

  it('refuses a rule with one line pointing to eval and tune, and numbers outside (0, 1)', async () => {
    const csv = await predictions([data, '--target', 'Species', ...drops, '--learner', 'knn:k=15'], 'rule');
    for (const rule of ['max-f1', 'youden', 'precision>=0.9', 'recall>=0.8', 'cost:FP=1,FN=5']) {
      const r = await cli(['score', csv, '--threshold', rule, '--json', '-']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toBe(
        `foldwise: --threshold ${rule}: score does not choose a threshold, since one chosen on the rows being scored would overstate the score; choose it without seeing the test rows with eval --threshold ${rule} or tune --threshold ${rule}, or give score a number in (0, 1)\n`,
      );
    }
    for (const t of ['0', '1', '1.5', '-0.2']) {
      const r = await cli(['score', csv, '--threshold', t, '--json', '-']);
      expect(r.code).toBe(2);
      expect(r.stderr).toBe(`foldwise: --threshold ${t}: a threshold is a probability of the positive class strictly between 0 and 1\n`);
    }
    const odd = await cli(['score', csv, '--threshold', 'half', '--json', '-']);
    expect(odd.code).toBe(2);
    expect(odd.stderr.split('\n').length).toBe(2);
  });

  it('refuses multi-class and regression predictions and a file without probabilities with exit 2 and one line', async () => {
    const multi = await predictions([three, '--target', 'Species', '--learner', 'knn:k=15'], 'three');
    const m = await cli(['score', multi, '--threshold', '0.3', '--json', '-']);
    expect(m.code).toBe(2);
    expect(m.stdout).toBe('');
    expect(m.stderr).toBe('foldwise: --threshold 0.3: a threshold needs two-class predictions, but these have 3 classes; leave it out\n');

    const reg = await predictions([three, '--target', 'Body Mass (g)', '--learner', 'knn:k=15'], 'reg');
    const g = await cli(['score', reg, '--threshold', '0.3', '--json', '-']);
    expect(g.code).toBe(2);
    expect(g.stderr).toBe('foldwise: --threshold 0.3: a threshold needs two-class predictions, but these are for regression; leave it out\n');

    // two classes, no probability columns named
    const two = Papa.parse<Record<string, string>>(readFileSync(join(tmp.dir, 'rule.csv'), 'utf8'), { header: true, skipEmptyLines: true }).data.filter((x) => x.learner === 'knn:k=15');
    expect(two.length).toBe(rows.length);
    const bare = tmp.file('bare.csv', `${Papa.unparse(two.map((x) => ({ y: x.actual, yhat: x.predicted_class, f: x.fold })), { newline: '\n' })}\n`);
    const b = await cli(['score', bare, '--actual', 'y', '--predicted', 'yhat', '--fold', 'f', '--threshold', '0.3', '--json', '-']);
    expect(b.code).toBe(2);
    expect(b.stderr).toBe('foldwise: --threshold 0.3: a threshold is applied to the probability of Gentoo, but the file gives no probabilities; name their columns with --prob or --prob-columns\n');
  });
});
