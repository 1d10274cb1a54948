/**
 * `tune --threshold`: for each outer fold the threshold is chosen for that fold's pick (after the
 * hyperparameters are chosen) on an inner split of the outer training rows, then applied to the
 * outer test rows, reported beside 0.5 as in eval. Checks: the figures at each fold's threshold
 * recomputed from the tune --predictions file (an independent path: the file's prob column
 * against the reported threshold); each fold's threshold is the one eval --threshold gives for
 * the same learner on the same outer fold (the outer plans coincide for the same seed); the
 * same bytes with --jobs 1 and 2; the schema.
 *
 * Data: the Palmer penguins file of vega-datasets (CC0; Gorman, Williams & Fraser 2014),
 * Adelie and Gentoo only, beak and flipper columns dropped (the species overlap on body mass).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { Report } from '../../src/model/report.js';
import type { TuneReport } from '../../src/model/tune.js';
import { cli } from '../helpers/cli.js';
import { PENGUINS_JSON } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const rows = (JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, string | number | null>[]).filter((r) => r.Species !== 'Chinstrap');
const header = Object.keys(rows[0]);
const data = tmp.file('adelie-gentoo.csv', `${Papa.unparse([header, ...rows.map((r) => header.map((h) => (r[h] === null ? '' : String(r[h]))))], { newline: '\n' })}\n`);
const common = [data, '--target', 'Species', '--drop', 'Beak Length (mm)', '--drop', 'Beak Depth (mm)', '--drop', 'Flipper Length (mm)', '--plan', 'kfold:4', '--threshold', 'max-f1', '--no-timing', '--no-audit', '--quiet'];
const tuneArgs = ['tune', ...common, '--learner', 'knn:k=9|11|13|15|17', '--inner', 'kfold:3'];

describe('tune --threshold', () => {
  it('reports per outer fold the threshold chosen for its pick, and the figures at it recomputed from the predictions file', async () => {
    const json = join(tmp.dir, 'tune.json');
    const csv = join(tmp.dir, 'tune.csv');
    const r = await cli([...tuneArgs, '--jobs', '1', '--json', json, '--predictions', csv]);
    expect(r.code).toBe(0);
    const t = JSON.parse(readFileSync(json, 'utf8')) as TuneReport;
    schemaCheck('tune.schema.json')(t);
    expect(rows.length).toBe(276);
    expect(t.threshold).toEqual({ rule: 'max-f1', positive: 'Gentoo', innerFolds: 5 });
    const th = t.outer.threshold!;
    expect(th.folds.length).toBe(4);
    // the picks differ between folds on this seed (so a threshold of the wrong candidate shows)
    expect(new Set(t.outer.folds.map((f) => f.pickSpec)).size).toBeGreaterThan(1);
    const lines = Papa.parse<Record<string, string>>(readFileSync(csv, 'utf8'), { header: true, skipEmptyLines: true }).data;
    const figures = (mine: Record<string, string>[], cut: number): { precision: number; recall: number; accuracy: number } => {
      let tp = 0;
      let fp = 0;
      let fn = 0;
      let right = 0;
      for (const x of mine) {
        const call = Number(x['prob:Gentoo']) >= cut ? 'Gentoo' : 'Adelie';
        if (call === 'Gentoo') x.actual === 'Gentoo' ? tp++ : fp++;
        else if (x.actual === 'Gentoo') fn++;
        if (call === x.actual) right++;
      }
      return { precision: tp / (tp + fp), recall: tp / (tp + fn), accuracy: right / mine.length };
    };
    const atCut: number[] = [];
    const atHalf: number[] = [];
    for (const [i, f] of th.folds.entries()) {
      const mine = lines.filter((x) => x.learner === 'tuned' && Number(x.fold) === f.fold + 1);
      expect(mine.length).toBe(t.outer.folds[i].testRows);
      expect(mine[0].pick).toBe(t.outer.folds[i].pickSpec);
      expect(f.threshold).not.toBeNull();
      const hand = figures(mine, f.threshold!);
      expect(Math.abs(f.precision! - hand.precision)).toBeLessThan(1e-12);
      expect(Math.abs(f.recall! - hand.recall)).toBeLessThan(1e-12);
      expect(Math.abs(f.scores.accuracy! - hand.accuracy)).toBeLessThan(1e-12);
      atCut.push(hand.accuracy);
      atHalf.push(figures(mine, 0.5).accuracy);
    }
    const mean = (v: number[]): number => v.reduce((a, b) => a + b, 0) / v.length;
    expect(Math.abs(th.summary.accuracy!.mean - mean(atCut))).toBeLessThan(1e-12);
    expect(Math.abs(th.atDefault.accuracy!.mean - mean(atHalf))).toBeLessThan(1e-12);
    // the same bytes on two worker threads
    const two = await cli([...tuneArgs, '--jobs', '2', '--json', '-']);
    expect(two.stdout).toBe(readFileSync(json, 'utf8'));

    // each fold's threshold is what eval --threshold chooses for that fold's pick on the same fold
    for (const spec of new Set(t.outer.folds.map((f) => f.pickSpec))) {
      const e = await cli(['eval', ...common, '--learner', spec, '--jobs', '1', '--json', '-']);
      expect(e.code).toBe(0);
      const lt = (JSON.parse(e.stdout) as Report).learners[1].threshold!;
      t.outer.folds.forEach((f, i) => {
        if (f.pickSpec !== spec) return;
        expect(lt.folds[i].fold).toBe(f.fold);
        expect(th.folds[i].threshold).toBe(lt.folds[i].threshold);
      });
    }

    // Markdown and HTML show the section for the tuned procedure
    const md = await cli([...tuneArgs, '--jobs', '1', '--markdown', '-']);
    expect(md.stdout).toContain('## Threshold chosen inside the training folds: max-f1');
    expect(md.stdout).toContain('### tuned');
    const html = await cli([...tuneArgs, '--jobs', '1', '--html', '-']);
    expect(html.stdout).toContain('Threshold chosen inside the training folds (max-f1)');
  });

  it('gives the recommendation the threshold eval --threshold chooses for a fold that trains on all search rows', async () => {
    const json = join(tmp.dir, 'rec.json');
    const r = await cli([...tuneArgs, '--jobs', '1', '--json', json]);
    expect(r.code).toBe(0);
    const t = JSON.parse(readFileSync(json, 'utf8')) as TuneReport;
    schemaCheck('tune.schema.json')(t);
    const rec = t.recommendation;
    expect(rec.threshold).toBeDefined();
    expect(rec.threshold!.rows).toBe(rows.length);
    expect(rec.threshold!.met).toBe(true);
    expect(rec.threshold!.value).not.toBeNull();
    // an independent path: eval --plan loo on the same rows with one extra row in front (a copy of
    // the first, so no level is new and no code moves). Its first fold (repeat 0, fold 0) tests
    // the extra row and trains on exactly the tune file's rows, in the same order.
    const lines = readFileSync(data, 'utf8').split('\n');
    const extra = tmp.file('extra-first.csv', [lines[0], lines[1], ...lines.slice(1)].join('\n'));
    const argsNoPlan = common.filter((a, i) => a !== '--plan' && common[i - 1] !== '--plan').slice(1);
    const e = await cli(['eval', extra, ...argsNoPlan, '--plan', 'loo', '--learner', rec.spec, '--jobs', '1', '--json', '-']);
    expect(e.code).toBe(0);
    const ev = JSON.parse(e.stdout) as Report;
    const lt = ev.learners.find((l) => l.spec === rec.spec)!.threshold!;
    expect(lt.folds.length).toBe(rows.length + 1);
    expect([lt.folds[0].repeat, lt.folds[0].fold]).toEqual([0, 0]);
    expect(rec.threshold!.value).toBe(lt.folds[0].threshold);
    expect(rec.threshold!.met).toBe(lt.folds[0].met);
    // another fold trains on other rows and chooses another threshold here, so the match is not by chance
    expect(lt.folds.some((f) => f.threshold !== rec.threshold!.value)).toBe(true);
    // the search counts the K extra fits of the recommendation's threshold
    const plain = JSON.parse((await cli([...tuneArgs.filter((a, i) => a !== '--threshold' && tuneArgs[i - 1] !== '--threshold'), '--jobs', '1', '--json', '-'])).stdout) as TuneReport;
    expect(t.search.fits - plain.search.fits).toBe(5 * (t.outer.folds.length + 1));

    // labelled as the threshold to deploy, not an estimate, in Markdown and HTML
    const md = await cli([...tuneArgs, '--jobs', '1', '--markdown', '-']);
    expect(md.stdout).toContain(`- Threshold to deploy with these settings (max-f1): call a row Gentoo when its probability of Gentoo is at least`);
    expect(md.stdout).toContain('It is a setting, not an estimate of performance');
    const html = await cli([...tuneArgs, '--jobs', '1', '--html', '-']);
    expect(html.stdout).toContain('<p class="deploy-threshold">Threshold to deploy with these settings (max-f1)');
  });

  it('under a forward outer plan gives the recommendation the time-ordered threshold eval --threshold chooses for a first fold training on all search rows', async () => {
    // the rows in a mixed time order (97 is prime to 276, so i -> 97 i mod 276 is a permutation)
    const cols = [...header, 'when'];
    const cells = (r: Record<string, string | number | null>, when: number): string[] => [...header.map((h) => (r[h] === null ? '' : String(r[h]))), String(when)];
    const timed = tmp.file('timed.csv', `${Papa.unparse([cols, ...rows.map((r, i) => cells(r, (97 * i) % rows.length))], { newline: '\n' })}\n`);
    // eval's file: the same rows, then two later copies; forward:2 cuts 3 blocks of 276, so fold 1 (repeat 0, fold 0) trains on exactly the first 276
    const later = [1, 2].flatMap((k) => rows.map((r, i) => cells(r, k * rows.length + ((97 * i) % rows.length))));
    const longer = tmp.file('timed-longer.csv', `${Papa.unparse([cols, ...rows.map((r, i) => cells(r, (97 * i) % rows.length)), ...later], { newline: '\n' })}\n`);
    const shared = ['--target', 'Species', ...common.slice(3, 9), '--order', 'when', '--threshold', 'max-f1', '--threshold-folds', '3', '--no-timing', '--no-audit', '--quiet'];
    const r = await cli(['tune', timed, ...shared, '--plan', 'forward:3', '--inner', 'forward:2', '--learner', 'forest:trees=15,min-leaf=1|8', '--jobs', '1', '--json', '-']);
    expect(r.code).toBe(0);
    const t = JSON.parse(r.stdout) as TuneReport;
    expect(t.threshold!.timeOrdered).toBe(true);
    const rec = t.recommendation;
    expect(rec.threshold!.rows).toBe(rows.length);
    const e = await cli(['eval', longer, ...shared, '--plan', 'forward:2', '--learner', rec.spec, '--jobs', '1', '--json', '-']);
    expect(e.code).toBe(0);
    const ev = JSON.parse(e.stdout) as Report;
    const first = ev.learners.find((l) => l.spec === rec.spec)!.threshold!.folds[0];
    expect([first.repeat, first.fold]).toEqual([0, 0]);
    expect(ev.learners[0].folds[0].trainRows).toBe(rows.length);
    expect(rec.threshold!.value).toBe(first.threshold);
    expect(rec.threshold!.met).toBe(first.met);
  });

  it('warns once when the pick is made by a metric at the default cut, and not under a probability metric', async () => {
    const small = ['tune', ...common, '--learner', 'knn:k=9|13', '--inner', 'kfold:3'];
    const line = 'foldwise: warning: --threshold max-f1: the hyperparameters are picked by accuracy at the default cut (0.5), before the threshold is chosen; for a pick that does not depend on a cut, put a probability metric first (--metric roc-auc, log-loss or brier)\n';
    const byAccuracy = await cli([...small, '--json', '-']);
    expect(byAccuracy.code).toBe(0);
    expect(byAccuracy.stderr.split(line).length - 1).toBe(1);
    expect((JSON.parse(byAccuracy.stdout) as TuneReport).warnings.filter((w) => w.includes('at the default cut')).length).toBe(1);
    for (const metric of ['roc-auc', 'log-loss', 'brier']) {
      const byProbability = await cli([...small, '--metric', metric, '--json', '-']);
      expect(byProbability.code).toBe(0);
      expect(byProbability.stderr).not.toContain('at the default cut');
    }
  });

  it('is refused on a three-class target before the search starts', async () => {
    const all = tmp.file('penguins3.csv', `${Papa.unparse([header, ...(JSON.parse(readFileSync(PENGUINS_JSON, 'utf8')) as Record<string, string | number | null>[]).map((r) => header.map((h) => (r[h] === null ? '' : String(r[h]))))], { newline: '\n' })}\n`);
    const r = await cli(['tune', all, '--target', 'Species', '--learner', 'knn:k=3|5', '--threshold', 'youden']);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('foldwise: --threshold youden: a threshold needs a two-class target, but "Species" has 3 classes; use it on a two-class target or leave it out\n');
  });
});
