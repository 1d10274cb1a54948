/**
 * Every interval foldwise reports (ci95 in eval summaries and comparisons, tune's outer summary,
 * compare and gate), recomputed from the report's own fold scores and fold sizes by the
 * independent implementation in test/helpers/intervals.ts (jstat's t quantile, the Nadeau &
 * Bengio 2003 factor 1/J + n_test/n_train written out, the add-two binomial floor of Agresti &
 * Coull 1998 for accuracy, the metric ranges). Swapping training and test sizes anywhere in the
 * runner, or dropping a floor or a clip, makes these checks fail. Data: seeded synthetic files
 * (test/compare/synthetic.ts) and small invented files for the edge cases of issue 24.
 */
import jStat from 'jstat';
import { mean, sampleVariance } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import type { CrossComparison, GateVerdict } from '../../src/model/compare.js';
import type { LearnerReport, Report } from '../../src/model/report.js';
import type { TuneReport } from '../../src/model/tune.js';
import { cli } from '../helpers/cli.js';
import { agrestiFloor, expectedInterval, expectedPairedInterval, expectedPairedT, meanSizes } from '../helpers/intervals.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from './synthetic.js';

const tmp = tempFolder();
const cls = tmp.file('cls.csv', syntheticCsv('classification', 150, 31));
const reg = tmp.file('reg.csv', syntheticCsv('regression', 120, 32));

// Written out here, not read from the registry: which metrics are shares of test rows
// (accuracy = correct / test rows) and the values each metric can take (their definitions).
const PROPORTION = new Set(['accuracy']);
const RANGE: Record<string, readonly [number, number]> = {
  accuracy: [0, 1],
  'balanced-accuracy': [0, 1],
  'macro-f1': [0, 1],
  'roc-auc': [0, 1],
  mcc: [-1, 1],
  brier: [0, 2],
  'log-loss': [0, -Math.log(2 ** -53)],
  rmse: [0, Infinity],
  mae: [0, Infinity],
  r2: [-Infinity, 1],
};
const CLS_METRICS = ['accuracy', 'balanced-accuracy', 'macro-f1', 'roc-auc', 'mcc', 'brier', 'log-loss'];

function close(actual: readonly [number, number] | null, expected: [number, number] | null, what: string): void {
  if (expected === null) {
    expect(actual, what).toBeNull();
    return;
  }
  expect(actual, what).not.toBeNull();
  expect(Math.abs(actual![0] - expected[0]), `${what} lower`).toBeLessThan(1e-9);
  expect(Math.abs(actual![1] - expected[1]), `${what} upper`).toBeLessThan(1e-9);
}

async function json<T>(argv: string[]): Promise<T> {
  const r = await cli([...argv, '--json', '-']);
  expect(r.code, r.stderr).toBeLessThan(2);
  return JSON.parse(r.stdout) as T;
}

function checkSummaries(learners: readonly LearnerReport[], metrics: readonly string[]): number {
  let checked = 0;
  for (const l of learners) {
    const sizes = meanSizes(l.folds);
    for (const m of metrics) {
      const scores = l.folds.map((f) => f.scores[m]).filter((v): v is number => v !== null);
      expect(scores.length).toBeGreaterThan(1);
      close(l.summary[m]!.ci95, expectedInterval(scores, sizes, PROPORTION.has(m), RANGE[m]), `${l.spec} ${m}`);
      checked++;
    }
  }
  return checked;
}

function foldScores(l: LearnerReport, m: string): number[] {
  return l.folds.map((f) => f.scores[m] as number);
}

describe('every reported ci95, recomputed from the report itself', () => {
  const CLS = [cls, '--target', 'y', '--learner', 'baseline', '--learner', 'knn', '--learner', 'logistic', '--plan', 'kfold:5x2', '--no-timing', '--no-audit'];
  const cm = CLS_METRICS.flatMap((m) => ['--metric', m]);

  it('eval: every summary and every comparison (classification, 5x2 folds of 120/30 rows)', async () => {
    const report = await json<Report>(['eval', ...CLS, ...cm]);
    expect(report.learners[0].folds[0]).toMatchObject({ trainRows: 120, testRows: 30 });
    expect(checkSummaries(report.learners, CLS_METRICS)).toBe(3 * CLS_METRICS.length);
    const pairs = report.comparisons!.pairs;
    expect(pairs.length).toBeGreaterThan(1);
    for (const p of pairs) {
      const l = report.learners.find((x) => x.spec === p.learner)!;
      const r = report.learners.find((x) => x.spec === p.reference)!;
      const d = foldScores(l, 'accuracy').map((v, i) => v - foldScores(r, 'accuracy')[i]);
      const sizes = meanSizes(l.folds);
      close(p.ci95, expectedPairedInterval(d, sizes, true, RANGE.accuracy), `${p.learner} vs ${p.reference}`);
      expect(Math.abs(p.t! - expectedPairedT(d, sizes, true)!)).toBeLessThan(1e-9);
      expect(Math.abs(p.p! - 2 * jStat.studentt.cdf(-Math.abs(p.t!), d.length - 1))).toBeLessThan(1e-9);
    }
  });

  it('eval: regression summaries (rmse, mae, r2)', async () => {
    const report = await json<Report>(['eval', reg, '--target', 'y', '--learner', 'baseline', '--learner', 'knn', '--plan', 'kfold:4', '--metric', 'rmse', '--metric', 'mae', '--metric', 'r2', '--no-timing', '--no-audit']);
    expect(checkSummaries(report.learners, ['rmse', 'mae', 'r2'])).toBe(6);
  });

  it("tune: the outer estimate's summaries", async () => {
    const report = await json<TuneReport>(['tune', cls, '--target', 'y', '--learner', 'knn:k=3|9', '--plan', 'kfold:4', '--no-timing', '--no-audit', ...cm]);
    const folds = report.outer.folds;
    expect(folds.length).toBe(4);
    const sizes = meanSizes(folds);
    for (const m of CLS_METRICS) {
      const scores = folds.map((f) => f.scores[m]).filter((v): v is number => v !== null);
      close(report.outer.summary[m]!.ci95, expectedInterval(scores, sizes, PROPORTION.has(m), RANGE[m]), `tune ${m}`);
    }
  });

  it('compare and gate: paired, from the two reports (second minus first)', async () => {
    const a = tmp.file('a.json', JSON.stringify(await json<Report>(['eval', ...CLS])));
    const b = tmp.file('b.json', JSON.stringify(await json<Report>(['eval', ...CLS, '--drop', 'x2'])));
    const first = JSON.parse(await import('node:fs').then((fs) => fs.readFileSync(a, 'utf8'))) as Report;
    const second = JSON.parse(await import('node:fs').then((fs) => fs.readFileSync(b, 'utf8'))) as Report;
    const c = await json<CrossComparison>(['compare', a, b]);
    expect(c.rows.length).toBe(3);
    for (const row of c.rows) {
      const l1 = first.learners.find((l) => l.spec === row.first)!;
      const l2 = second.learners.find((l) => l.spec === row.second)!;
      const d = foldScores(l2, 'accuracy').map((v, i) => v - foldScores(l1, 'accuracy')[i]);
      close(row.stats!.ci95, expectedPairedInterval(d, meanSizes(l2.folds), true, RANGE.accuracy), `compare ${row.first}`);
    }
    const v = await json<GateVerdict>(['gate', '--previous', a, '--current', b, '--learner', 'knn']);
    const kb = first.learners.find((l) => l.spec === 'knn')!;
    const kc = second.learners.find((l) => l.spec === 'knn')!;
    const change = foldScores(kc, 'accuracy').map((x, i) => x - foldScores(kb, 'accuracy')[i]);
    close(v.ci95, expectedPairedInterval(change, meanSizes(kb.folds), true, RANGE.accuracy), 'gate paired');
    // one-sided p of H0 "drop <= 0": P(T >= t) with t = mean drop / SE
    const t = -expectedPairedT(change, meanSizes(kb.folds), true)!;
    expect(Math.abs(v.t! - t)).toBeLessThan(1e-9);
    expect(Math.abs(v.p - (1 - jStat.studentt.cdf(t, change.length - 1)))).toBeLessThan(1e-9);
  });

  it('gate: unpaired (another seed), Welch with each variance corrected and floored', async () => {
    const a = tmp.file('u1.json', JSON.stringify(await json<Report>(['eval', ...CLS])));
    const bReport = await json<Report>(['eval', ...CLS, '--seed', '7']);
    const b = tmp.file('u2.json', JSON.stringify(bReport));
    const aReport = JSON.parse(await import('node:fs').then((fs) => fs.readFileSync(a, 'utf8'))) as Report;
    const v = await json<GateVerdict>(['gate', '--previous', a, '--current', b, '--learner', 'knn']);
    expect(v.rule).toBe('unpaired');
    const side = (r: Report) => {
      const l = r.learners.find((x) => x.spec === 'knn')!;
      const s = foldScores(l, 'accuracy');
      const sz = meanSizes(l.folds);
      const floor = agrestiFloor(mean(s), sz.testRows + sz.trainRows);
      return { m: mean(s), j: s.length, v: Math.max((1 / s.length + sz.testRows / sz.trainRows) * sampleVariance(s), floor) };
    };
    const sb = side(aReport);
    const sc = side(bReport);
    const se = Math.sqrt(sb.v + sc.v);
    const df = (sb.v + sc.v) ** 2 / (sb.v ** 2 / (sb.j - 1) + sc.v ** 2 / (sc.j - 1));
    const half = jStat.studentt.inv(0.975, df) * se;
    close(v.ci95, [Math.max(-1, sc.m - sb.m - half), Math.min(1, sc.m - sb.m + half)], 'gate unpaired');
    expect(Math.abs(v.df - df)).toBeLessThan(1e-9);
  });
});

describe('the edge cases of issue 24, end to end', () => {
  // invented: 40 rows, 3 of class pos; a constant learner must stay at its no-skill value
  const rare = tmp.file(
    'rare.csv',
    `x,y\n${Array.from({ length: 40 }, (_, i) => `${(i * 7) % 40},${i % 13 === 5 ? 'pos' : 'neg'}`).join('\n')}\n`,
  );

  it('macro metrics: a fold that lacks a class scores null, never a perfect 1.0 for a constant predictor', async () => {
    const report = await json<Report>(['eval', rare, '--target', 'y', '--learner', 'baseline', '--plan', 'kfold:5', '--no-timing', '--no-audit', '--metric', 'balanced-accuracy', '--metric', 'macro-f1', '--metric', 'macro-recall', '--metric', 'macro-precision']);
    const l = report.learners[0];
    expect(l.folds.length).toBe(5);
    for (const m of ['balanced-accuracy', 'macro-f1', 'macro-recall', 'macro-precision']) {
      const scores = l.folds.map((f) => f.scores[m]);
      // 3 pos rows in 5 folds: at least 2 folds have none
      expect(scores.filter((s) => s === null).length, m).toBeGreaterThanOrEqual(2);
      for (const s of scores) if (s !== null) expect(s, m).toBeLessThan(1);
      expect(l.summary[m]!.mean, m).toBeLessThan(0.75);
    }
    for (const s of l.folds.map((f) => f.scores['balanced-accuracy'])) if (s !== null) expect(s).toBe(0.5);
    expect(l.pooled['balanced-accuracy']).toBe(0.5);
    expect(report.warnings.some((w) => w.includes('balanced-accuracy is undefined in'))).toBe(true);
  });

  it('pooled ROC AUC under leave-one-out is refused with a warning (a constant learner pooled to 0)', async () => {
    const small = tmp.file('small.csv', `x,y\n${Array.from({ length: 24 }, (_, i) => `${i},${i % 3 === 0 ? 'a' : 'b'}`).join('\n')}\n`);
    const r = await cli(['eval', small, '--target', 'y', '--learner', 'baseline', '--plan', 'loo', '--metric', 'accuracy', '--metric', 'roc-auc', '--no-timing', '--no-audit', '--json', '-']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expect(report.learners[0].pooled['roc-auc']).toBeNull();
    expect(report.learners[0].pooled.accuracy).not.toBeNull();
    expect(report.warnings.some((w) => w.includes('roc-auc is not scored on the pooled predictions'))).toBe(true);
    // larger test folds keep the pooled AUC
    const k = await json<Report>(['eval', small, '--target', 'y', '--learner', 'baseline', '--plan', 'kfold:3', '--metric', 'roc-auc', '--no-timing', '--no-audit']);
    expect(k.learners[0].pooled['roc-auc']).not.toBeNull();
  });

  it('separable data: equal fold scores give a floored accuracy interval and no interval for the others', async () => {
    const sep = tmp.file('sep.csv', `x,y\n${Array.from({ length: 100 }, (_, i) => `${i < 50 ? i : i + 1000},${i < 50 ? 'lo' : 'hi'}`).join('\n')}\n`);
    const r = await cli(['eval', sep, '--target', 'y', '--learner', 'knn', '--plan', 'kfold:5', '--metric', 'accuracy', '--metric', 'roc-auc', '--no-timing', '--no-audit', '--json', '-']);
    const report = JSON.parse(r.stdout) as Report;
    const s = report.learners.find((l) => l.name === 'knn')!.summary;
    expect(s.accuracy!.mean).toBe(1);
    expect(s.accuracy!.ci95![1]).toBe(1);
    expect(s.accuracy!.ci95![0]).toBeLessThan(0.97);
    expect(s['roc-auc']!.ci95).toBeNull();
    // no warning for it: the baseline's balanced accuracy is like this in every report
    expect(report.warnings.some((w) => w.includes('roc-auc'))).toBe(false);
  });
});
