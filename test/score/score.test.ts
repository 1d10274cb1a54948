/**
 * `foldwise score PREDICTIONS` (issue 15): the report of a predictions file. Checks: a round trip
 * on the Palmer penguins file (vega-datasets, CC0; Gorman, Williams & Fraser 2014) gives the eval
 * report's summaries, pooled scores and comparisons to the last digit; published worked examples
 * scored through `score`; bad files refused with one line naming the line; compare and gate
 * pair a score report with the eval run only when the folds are the same.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());
const expectValid = schemaCheck('report.schema.json');

async function roundTrip(args: string[], name: string): Promise<{ evalReport: Report; scored: Report; csv: string; json: string }> {
  const json = join(tmp.dir, `${name}.json`);
  const csv = join(tmp.dir, `${name}.csv`);
  const e = await cli([...args, '--json', json, '--predictions', csv, '--no-timing', '--quiet']);
  expect(e.code).toBe(0);
  const s = await cli(['score', csv, '--json', '-']);
  expect(s.stderr).toBe('');
  expect(s.code).toBe(0);
  return { evalReport: JSON.parse(readFileSync(json, 'utf8')), scored: JSON.parse(s.stdout), csv, json };
}

/** A predictions CSV of one learner: folds assigned round robin so every fold holds both classes where the data allow. */
function fileOf(actual: string[], predicted: string[], probs?: number[][], classes?: string[]): string {
  const head = ['actual', 'predicted', 'fold', ...(probs ? classes!.map((c) => `p_${c}`) : [])];
  const lines = actual.map((a, i) => [a, predicted[i], String((i % 2) + 1), ...(probs ? probs[i].map(String) : [])].join(','));
  return `${head.join(',')}\n${lines.join('\n')}\n`;
}

describe('score: a round trip through eval --predictions', () => {
  it('gives the eval report\'s summaries, pooled scores, confusion and comparisons to the last digit (classification)', async () => {
    const { evalReport, scored } = await roundTrip(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--learner', 'forest:trees=10', '--plan', 'kfold:5x2'], 'rt-c');
    expectValid(scored);
    expect(scored.command).toBe('score');
    expect(scored.source).toEqual({ kind: 'predictions', file: expect.any(String), foldwise: true, trainRows: 'file' });
    expect(scored.learners.map((l) => l.spec)).toEqual(evalReport.learners.map((l) => l.spec));
    expect(scored.learners.length).toBe(3);
    for (let i = 0; i < scored.learners.length; i++) {
      const a = scored.learners[i];
      const b = evalReport.learners[i];
      expect(a.folds).toEqual(b.folds);
      expect(a.summary).toEqual(b.summary);
      expect(a.pooled).toEqual(b.pooled);
      expect(a.confusion).toEqual(b.confusion);
    }
    expect(scored.comparisons).toEqual(evalReport.comparisons);
    expect(scored.plan.assignment).toBe(evalReport.plan.assignment);
    expect(scored.plan.folds).toBe(5);
    expect(scored.plan.repeats).toBe(2);
  });

  it('does the same for regression, and a holdout plan with --final scores the holdout lines as the final part', async () => {
    const { evalReport, scored } = await roundTrip(['eval', penguins, '--target', 'Body Mass (g)', '--drop', 'Island', '--learner', 'linear', '--plan', 'kfold:4'], 'rt-r');
    expectValid(scored);
    expect(scored.learners.length).toBe(2);
    for (let i = 0; i < 2; i++) {
      expect(scored.learners[i].summary).toEqual(evalReport.learners[i].summary);
      expect(scored.learners[i].pooled).toEqual(evalReport.learners[i].pooled);
      expect(scored.learners[i].pooledSample).toEqual(evalReport.learners[i].pooledSample);
    }
    const h = await roundTrip(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'holdout:0.6/0.2/0.2', '--final'], 'rt-h');
    expect(h.scored.learners[1].final).toEqual(h.evalReport.learners[1].final);
    expect(h.scored.learners[1].final).toBeDefined();
  });

  it('compare and gate pair the score report with its eval run (same fold assignment)', async () => {
    const { json, csv } = await roundTrip(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:5'], 'rt-g');
    const scoredJson = join(tmp.dir, 'rt-g-scored.json');
    expect((await cli(['score', csv, '--json', scoredJson])).code).toBe(0);
    const c = await cli(['compare', json, scoredJson, '--json', '-']);
    expect(c.stderr).toBe('');
    expect(c.code).toBe(0);
    const g = await cli(['gate', '--previous', json, '--current', scoredJson]);
    expect(g.code).toBe(0);
    expect(g.stdout).toMatch(/pass/i);
  });
});

describe('score: published worked examples through the scoring path', () => {
  it('Cohen (1960) Table 2: kappa .492 from a predictions file', async () => {
    // Cohen (1960), Educational and Psychological Measurement 20:37-46, Table 2 (N = 200), the
    // same cells as test/metrics/kappa.test.ts: rows judge A (actual), columns judge B.
    const table = [
      [88, 14, 18],
      [10, 40, 10],
      [2, 6, 12],
    ];
    const names = ['a', 'b', 'c'];
    const actual: string[] = [];
    const predicted: string[] = [];
    table.forEach((row, i) => row.forEach((n, j) => { for (let k = 0; k < n; k++) (actual.push(names[i]), predicted.push(names[j])); }));
    expect(actual.length).toBe(200);
    const f = tmp.file('cohen.csv', fileOf(actual, predicted));
    const s = await cli(['score', f, '--actual', 'actual', '--predicted', 'predicted', '--fold', 'fold', '--metric', 'kappa', '--train-rows', '100', '--json', '-']);
    expect(s.code).toBe(0);
    const r = JSON.parse(s.stdout) as Report;
    expect(Math.abs(r.learners[0].pooled.kappa! - (0.7 - 0.41) / (1 - 0.41))).toBeLessThan(1e-12);
    expect(Math.abs(r.learners[0].pooled.kappa! - 0.492)).toBeLessThan(5e-4); // published to three decimals
    expect(r.source?.trainRows).toBe('option');
  });

  it('Fawcett (2006) Fig. 3: pooled ROC AUC 0.68 from probability columns', async () => {
    // Fawcett, "An introduction to ROC analysis", Pattern Recognition Letters 27:861-874, Fig. 3
    // (the same instances as test/metrics/roc-auc.test.ts): AUC 0.68.
    const classes = 'ppnpppnnpnpnpnnnpnpn';
    const scores = [0.9, 0.8, 0.7, 0.6, 0.55, 0.54, 0.53, 0.52, 0.51, 0.505, 0.4, 0.39, 0.38, 0.37, 0.36, 0.35, 0.34, 0.33, 0.3, 0.1];
    expect(scores.length).toBe(20);
    const actual = [...classes];
    const predicted = scores.map((s) => (s >= 0.5 ? 'p' : 'n'));
    const f = tmp.file('fawcett.csv', fileOf(actual, predicted, scores.map((s) => [1 - s, s]), ['n', 'p']));
    const s = await cli(['score', f, '--actual', 'actual', '--predicted', 'predicted', '--fold', 'fold', '--prob', 'p_', '--metric', 'roc-auc', '--json', '-']);
    expect(s.code).toBe(0);
    const r = JSON.parse(s.stdout) as Report;
    expect(r.data.classes).toEqual(['n', 'p']);
    expect(Math.abs(r.learners[0].pooled['roc-auc']! - 0.68)).toBeLessThan(1e-12);
    // no training sizes in the file: assumed k-fold, and said so
    expect(r.source?.trainRows).toBe('assumed-kfold');
    expect(r.learners[0].folds.map((x) => x.trainRows)).toEqual([10, 10]);
    expect(s.stderr).toMatch(/assumed to have trained on the other folds/);
  });

  it('Hanley & McNeil (1982) Table I: pooled AUC 0.893 with tied ratings', async () => {
    // Hanley & McNeil, Radiology 143:29-36, Table I (as in test/metrics/roc-auc.test.ts): 58
    // normal, 51 abnormal CT images rated 1..5; ratings as scores (r - 1) / 4. Published area 0.893.
    const normal = [33, 6, 6, 11, 2];
    const abnormal = [3, 2, 2, 11, 33];
    const actual: string[] = [];
    const probs: number[][] = [];
    for (let r = 0; r < 5; r++) {
      for (let i = 0; i < normal[r]; i++) (actual.push('normal'), probs.push([r / 4, 1 - r / 4]));
      for (let i = 0; i < abnormal[r]; i++) (actual.push('abnormal'), probs.push([r / 4, 1 - r / 4]));
    }
    expect(actual.length).toBe(109);
    const predicted = probs.map((p) => (p[0] >= 0.5 ? 'abnormal' : 'normal'));
    const f = tmp.file('hanley.csv', fileOf(actual, predicted, probs, ['abnormal', 'normal']));
    const s = await cli(['score', f, '--actual', 'actual', '--predicted', 'predicted', '--fold', 'fold', '--prob', 'p_', '--metric', 'roc-auc', '--json', '-']);
    expect(s.code).toBe(0);
    const auc = (JSON.parse(s.stdout) as Report).learners[0].pooled['roc-auc']!;
    expect(Math.abs(auc - 0.893)).toBeLessThan(5e-4); // published to three decimals
  });

  it('Chicco & Jurman (2020) use cases C2 and B2: published accuracy and MCC through score', async () => {
    // Chicco & Jurman, BMC Genomics 21:6 (2020), "Use cases" (the counts and two-decimal values
    // of test/metrics/mcc.test.ts, from memory of the paper): C2 TP 2, FN 9, TN 88, FP 1 gives
    // accuracy 0.90 and MCC 0.31; B2 TP 10, FN 40, TN 46, FP 4 gives 0.56 and 0.17.
    for (const c of [{ tp: 2, fn: 9, tn: 88, fp: 1, acc: 0.9, mcc: 0.31 }, { tp: 10, fn: 40, tn: 46, fp: 4, acc: 0.56, mcc: 0.17 }]) {
      const actual = [...Array(c.tp + c.fn).fill('pos'), ...Array(c.tn + c.fp).fill('neg')];
      const predicted = [...Array(c.tp).fill('pos'), ...Array(c.fn).fill('neg'), ...Array(c.tn).fill('neg'), ...Array(c.fp).fill('pos')];
      expect(actual.length).toBe(100);
      const f = tmp.file(`mcc-${c.tp}.csv`, fileOf(actual, predicted));
      const s = await cli(['score', f, '--actual', 'actual', '--predicted', 'predicted', '--fold', 'fold', '--metric', 'mcc', '--metric', 'accuracy', '--json', '-']);
      expect(s.code).toBe(0);
      const pooled = (JSON.parse(s.stdout) as Report).learners[0].pooled;
      expect(Math.abs(pooled.mcc! - c.mcc)).toBeLessThan(0.005 + 1e-12);
      expect(Math.abs(pooled.accuracy! - c.acc)).toBeLessThan(0.005 + 1e-12);
    }
  });
});

describe('score: bad files are one line, exit 2, naming the line', () => {
  const good = 'actual,predicted,fold,p_a,p_b\na,a,1,0.9,0.1\nb,b,1,0.2,0.8\na,b,2,0.4,0.6\nb,b,2,0.3,0.7\n';
  const args = (f: string, more: string[] = []): string[] => ['score', f, '--actual', 'actual', '--predicted', 'predicted', '--fold', 'fold', '--prob', 'p_', ...more];
  const cases: [string, string, string[], RegExp][] = [
    ['a missing column', good, ['--learner', 'model'], /line 1: no column "model" \(--learner\)/],
    ['a probability row not summing to 1', good.replace('0.2,0.8', '0.2,0.9'), [], /line 3: the probabilities sum to 1\.1/],
    ['an unknown class', good.replace('b,b,2,0.3', 'b,c,2,0.3'), [], /line 5: predicted class "c" is not among the classes a, b/],
    ['a fold column with one fold', good.replace(/,2,/g, ',1,'), [], /every prediction is in one fold/],
    ['a probability that is text', good.replace('0.4,0.6', 'x,0.6'), [], /line 4: probability "p_a" "x" is not a number/],
    ['a short line', good.replace('a,b,2,0.4,0.6', 'a,b,2,0.4'), [], /line 4: 4 fields, expected 5/],
  ];
  for (const [what, text, more, message] of cases) {
    it(what, async () => {
      const f = tmp.file(`bad-${what.replace(/\W+/g, '-')}.csv`, text);
      const r = await cli(args(f, more));
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trim().split('\n').length).toBe(1);
      expect(r.stdout).toBe('');
    });
  }
  it('text in a numeric prediction (regression)', async () => {
    const f = tmp.file('bad-reg.csv', 'y,yhat,fold\n1.5,1.4,1\n2.5,2.6,1\n3.5,oops,2\n4.5,4.4,2\n');
    const r = await cli(['score', f, '--actual', 'y', '--predicted', 'yhat', '--fold', 'fold', '--task', 'regression']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/line 4: predicted "oops" is not a number/);
  });
  it('an outside file without --fold', async () => {
    const f = tmp.file('nofold.csv', good);
    const r = await cli(['score', f, '--actual', 'actual', '--predicted', 'predicted']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/give --fold COL/);
  });
});

describe('score: a gate between a foldwise run and an outside run', () => {
  it('is refused when the outside file gives no rows, or other folds', async () => {
    const { json, csv } = await roundTrip(['eval', penguins, '--target', 'Species', '--drop', 'Island', '--learner', 'knn', '--plan', 'kfold:5'], 'rt-o');
    // the same predictions without the row column: no fold assignment to check
    const lines = readFileSync(csv, 'utf8').trimEnd().split('\n').map((l) => l.split(','));
    const noRow = lines.map((l) => [l[6], l[7], l[3], l[5], ...l.slice(8)].join(',')).join('\n');
    const f = tmp.file('outside.csv', `${noRow}\n`);
    const out = join(tmp.dir, 'outside.json');
    const s = await cli(['score', f, '--actual', 'actual', '--predicted', 'predicted_class', '--fold', 'fold', '--learner', 'learner', '--prob', 'prob:', '--json', out]);
    expect(s.stderr).toMatch(/^foldwise: warning: the predictions file gives no training sizes/);
    expect(s.code).toBe(0);
    const g = await cli(['gate', '--previous', json, '--current', out]);
    expect(g.code).toBe(2);
    expect(g.stderr).toMatch(/plan\.assignment/);
    // rows given, but the folds shifted by one: another assignment
    const shifted = lines.map((l, i) => (i === 0 ? l : [l[1], l[6], l[7], String((Number(l[3]) % 5) + 1), l[5], ...l.slice(8)]).join(','));
    const shiftedHead = ['row', 'actual', 'predicted_class', 'fold', 'learner', ...lines[0].slice(8)].join(',');
    const f2 = tmp.file('shifted.csv', `${[shiftedHead, ...shifted.slice(1)].join('\n')}\n`);
    const out2 = join(tmp.dir, 'shifted.json');
    // folds renumbered 1->2, ..., 5->1: the same groups of rows under other fold numbers
    expect((await cli(['score', f2, '--actual', 'actual', '--predicted', 'predicted_class', '--fold', 'fold', '--learner', 'learner', '--row', 'row', '--prob', 'prob:', '--json', out2])).code).toBe(0);
    const g2 = await cli(['gate', '--previous', json, '--current', out2]);
    expect(g2.code).toBe(2);
    expect(g2.stderr).toMatch(/plan\.assignment/);
  });
});
