/**
 * `--threshold` under a time-ordered (forward) outer plan: the inner split of each outer
 * training fold is in time order too, so every inner fit uses earlier rows than the rows it
 * predicts (the forward-chaining rule of time series cross-validation: Hyndman &
 * Athanasopoulos, Forecasting: Principles and Practice, 3rd ed., section 5.10). A spying learner
 * records, for every inner fit, the days of the rows it was fitted on and of the rows it
 * predicted; a shuffled inner split fits on later days than it predicts and fails here.
 *
 * Data: invented (mechanics): a packing line's daily reject flag, days 1..60 written to the
 * file out of order so file order and time order differ.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { evaluate, prepareRun } from '../../src/run/evaluate.js';
import { runTasks, taskList } from '../../src/run/tasks.js';
import { createRng } from '../../src/rng.js';
import { innerForward } from '../../src/threshold/inner-folds.js';
import { matrixColumn, type Learner, type Matrix } from '../../src/learning.js';
import { renderMarkdown } from '../../src/report/markdown.js';
import { cli } from '../helpers/cli.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();

function lineCsv(days: number, seed: number): string {
  const rng = createRng(seed);
  const order = Array.from({ length: days }, (_, i) => i + 1);
  for (let i = order.length - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    [order[i], order[j]] = [order[j], order[i]];
  }
  const out = ['day,t,load,reject'];
  for (const d of order) {
    const load = rng.next();
    out.push(`${d},${d},${load.toFixed(4)},${rng.next() < 0.2 + 0.5 * load ? 'yes' : 'no'}`);
  }
  return out.join('\n') + '\n';
}

interface Seen {
  label: string;
  fitDays: number[];
  predictDays: number[];
}

/** A learner that records the days (column t) it is fitted on and predicts, and scores rows by load. */
function spy(seen: Seen[]): Learner {
  const days = (X: Matrix, j: number): number[] => [...matrixColumn(X, j)];
  return {
    name: 'spy',
    tasks: ['classification'],
    params: [],
    needsScaling: false,
    doc: 'test spy',
    fit(X, _y, _p, ctx) {
      const t = ctx.fold!.columns.indexOf('t');
      const load = ctx.fold!.columns.indexOf('load');
      expect(t).toBeGreaterThanOrEqual(0);
      const record: Seen = { label: ctx.fold!.label, fitDays: days(X, t), predictDays: [] };
      seen.push(record);
      const probs = (Y: Matrix): Float64Array => {
        record.predictDays = days(Y, t);
        const l = matrixColumn(Y, load);
        return Float64Array.from({ length: 2 * Y.rows }, (_, k) => (k % 2 ? l[k >> 1] : 1 - l[k >> 1]));
      };
      return {
        predict: (Y) => Int32Array.from(matrixColumn(Y, load), (v) => (v >= 0.5 ? 1 : 0)),
        probabilities: probs,
        toJSON: () => ({}),
      };
    },
    load() {
      throw new Error('not used');
    },
  };
}

describe('--threshold under a forward plan: the inner split keeps time order', () => {
  it('every inner fit is fitted on earlier days than the days it predicts; the earliest block is never predicted', async () => {
    const table = await loadCsv({ text: lineCsv(60, 5), name: 'line.csv' });
    const prepared = prepareRun(table, { target: 'reject', order: 'day', learners: ['logistic'], plan: 'forward:3', threshold: 'max-f1', thresholdFolds: 3, seed: 2, timing: false, audit: false });
    expect(prepared.threshold?.timeOrdered).toBe(true);
    const seen: Seen[] = [];
    const spied = { ...prepared, candidates: [{ ...prepared.candidates[1], learner: spy(seen), spec: 'spy' }] };
    const results = runTasks(spied, taskList(spied));
    expect(results.length).toBe(3);
    for (const r of results) expect(r.threshold).toBeDefined();
    const inner = seen.filter((s) => /\.t\d+$/.test(s.label));
    const outer = seen.filter((s) => !/\.t\d+$/.test(s.label));
    // 3 outer folds, each with 3 inner fits
    expect(outer.length).toBe(3);
    expect(inner.length).toBe(9);
    for (const s of inner) {
      expect(s.fitDays.length).toBeGreaterThan(0);
      expect(s.predictDays.length).toBeGreaterThan(0);
      expect(Math.max(...s.fitDays)).toBeLessThan(Math.min(...s.predictDays));
    }
    // per outer fold: the inner fits only touch its training days, and the predicted days are
    // all of them but the earliest block (forward chaining predicts each later block once)
    for (const o of outer) {
      const mine = inner.filter((s) => s.label.startsWith(`${o.label}.t`));
      expect(mine.length).toBe(3);
      const train = new Set(o.fitDays);
      const predicted = mine.flatMap((s) => s.predictDays).sort((a, b) => a - b);
      expect(new Set(predicted).size).toBe(predicted.length);
      for (const d of [...predicted, ...mine.flatMap((s) => s.fitDays)]) expect(train.has(d)).toBe(true);
      const first = mine.find((s) => s.label.endsWith('.t1'))!;
      expect(predicted.length).toBe(train.size - first.fitDays.length);
      expect(Math.min(...predicted)).toBe(Math.max(...first.fitDays) + 1);
    }
  });

  it('a kfold plan keeps the stratified shuffled split (some inner fit sees later days than it predicts)', async () => {
    const table = await loadCsv({ text: lineCsv(60, 5), name: 'line.csv' });
    const prepared = prepareRun(table, { target: 'reject', learners: ['logistic'], plan: 'kfold:3', threshold: 'max-f1', thresholdFolds: 3, seed: 2, timing: false, audit: false });
    expect(prepared.threshold?.timeOrdered).toBe(false);
    const seen: Seen[] = [];
    const spied = { ...prepared, candidates: [{ ...prepared.candidates[1], learner: spy(seen), spec: 'spy' }] };
    runTasks(spied, taskList(spied));
    const inner = seen.filter((s) => /\.t\d+$/.test(s.label));
    expect(inner.length).toBe(9);
    expect(inner.some((s) => Math.max(...s.fitDays) > Math.min(...s.predictDays))).toBe(true);
  });

  it('the report says the inner split is time-ordered (JSON and Markdown); too few rows for it is refused', async () => {
    const table = await loadCsv({ text: lineCsv(60, 5), name: 'line.csv' });
    const report = evaluate(table, { target: 'reject', order: 'day', learners: ['logistic'], plan: 'forward:3', threshold: 'youden', thresholdFolds: 3, seed: 2, timing: false, audit: false });
    schemaCheck('report.schema.json')(JSON.parse(JSON.stringify(report)));
    expect(report.threshold?.timeOrdered).toBe(true);
    expect(report.learners[1].threshold?.folds.length).toBe(3);
    expect(renderMarkdown(report, () => true)).toContain('a time-ordered 3-fold inner split (each inner fold fits on earlier rows and predicts the block after them)');
    const plain = evaluate(table, { target: 'reject', learners: ['logistic'], plan: 'kfold:3', threshold: 'youden', thresholdFolds: 3, seed: 2, timing: false, audit: false });
    expect(plain.threshold?.timeOrdered).toBeUndefined();
    // 8 days: forward:3 gives a first outer training fold of 2 days, fewer than 3 + 1 inner blocks
    const small = await loadCsv({ text: lineCsv(8, 5), name: 'small.csv' });
    expect(() => evaluate(small, { target: 'reject', order: 'day', learners: ['logistic'], plan: 'forward:3', threshold: 'youden', thresholdFolds: 3, seed: 2, timing: false, audit: false })).toThrow(
      /^--threshold: the time-ordered inner split of an outer training fold needs at least 4 rows; the data has 2 usable rows; use a smaller --threshold-folds$/,
    );
  });

  it('the same bytes with --jobs 1 and 2 (workers build the time-ordered split too)', async () => {
    const data = tmp.file('line.csv', lineCsv(60, 5));
    const args = ['eval', data, '--target', 'reject', '--order', 'day', '--learner', 'logistic', '--plan', 'forward:3', '--threshold', 'max-f1', '--threshold-folds', '3', '--no-timing', '--no-audit', '--quiet', '--json', '-'];
    const one = await cli([...args, '--jobs', '1']);
    const two = await cli([...args, '--jobs', '2']);
    expect(one.code).toBe(0);
    expect((JSON.parse(one.stdout) as { threshold: { timeOrdered?: boolean } }).threshold.timeOrdered).toBe(true);
    expect(two.stdout).toBe(one.stdout);
  });

  it('innerForward cuts ties and groups like the forward plan: no tie or group straddles a cut', () => {
    // days with ties (two rows a day) and groups of two days
    const order = Float64Array.from({ length: 24 }, (_, i) => Math.floor(i / 2));
    const groups = Int32Array.from({ length: 24 }, (_, i) => Math.floor(i / 4));
    const parts = innerForward(order, 3, createRng(1), groups);
    expect(parts.length).toBe(3);
    for (const p of parts) {
      const lastFit = Math.max(...Array.from(p.train, (i) => order[i]));
      const firstTest = Math.min(...Array.from(p.test, (i) => order[i]));
      expect(lastFit).toBeLessThan(firstTest);
      const fitGroups = new Set(Array.from(p.train, (i) => groups[i]));
      for (const i of p.test) expect(fitGroups.has(groups[i])).toBe(false);
    }
  });
});
