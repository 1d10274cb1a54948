/**
 * `foldwise power`: how many repeats of a report's plan a gate needs to catch a drop.
 *
 * From a report (the committed one a gate compares against), take the learner's fold scores of
 * the metric and the plan's sizes. The noise of a gate's paired differences is the variance of
 * the differences between two runs' fold scores: with a second report (`--current`) paired by
 * (repeat, fold) it is measured; with one report it is bounded by twice the variance of the
 * learner's fold scores, Var(a - b) = Var(a) + Var(b) - 2 Cov(a, b) <= 2 Var(a) when the two
 * runs' fold scores are positively correlated with equal spread (the usual case: the same folds
 * and a similar model), so the advice errs towards more repeats.
 *
 * The plan with R repeats has J = kR folds; the minimal detectable difference (src/stats/power.ts)
 * falls with R towards a limit set by the rows the folds share. The advice is the fewest repeats
 * whose MDD is at most the drop asked for: then a gate with --max-drop 0 catches a true drop of
 * that size with the requested power (a gate with --max-drop D catches drops of D + MDD). The
 * time is the report's own timing scaled by R / R_now: from the fits and predictions alone
 * (lower end) to the whole run (upper end, which includes loading and the audit, which do not
 * grow with repeats).
 */
import { sampleVariance } from 'simple-statistics';
import { InputError, UsageError } from '../errors.js';
import { getMetric } from '../metrics/index.js';
import type { LearnerReport, Report } from '../model/report.js';
import { minimalDetectable, repeatsFor, type PowerSetting } from '../stats/power.js';
import { pairFolds } from './pair-folds.js';
import { baselineOf, bestBy, findLearner } from './select.js';

export interface PowerAdvice {
  readonly metric: string;
  readonly learner: string;
  readonly plan: string;
  readonly foldsPerRepeat: number;
  readonly repeatsNow: number;
  readonly testRows: number;
  readonly trainRows: number;
  /** variance of the fold differences, and where it came from */
  readonly variance: number;
  readonly varianceFrom: 'paired' | 'twice-fold-variance';
  readonly alpha: number;
  readonly power: number;
  /** the drop to catch, in the metric's units */
  readonly drop: number;
  /** the MDD of the plan as it is */
  readonly mddNow: number;
  /** the fewest repeats whose MDD is at most `drop`, or null when no number of repeats reaches it */
  readonly repeats: number | null;
  readonly mddAtRepeats: number;
  /** what no number of repeats gets below */
  readonly limit: number;
  /** the run time with the advised repeats, from fits alone to the whole run, in ms; null without timing */
  readonly timeMs: readonly [number, number] | null;
}

function meanOf(xs: readonly number[]): number {
  return xs.reduce((a, b) => a + b, 0) / xs.length;
}

function scores(l: LearnerReport, metric: string, where: string): number[] {
  const v = l.folds.map((f) => f.scores[metric]);
  if (v.some((x) => x === null || x === undefined || !Number.isFinite(x))) throw new InputError(`power: ${where}: ${l.spec} has folds without a ${metric} score`);
  return v as number[];
}

export function planPower(
  report: Report,
  path: string,
  o: { readonly metric?: string; readonly learner?: string; readonly drop: number; readonly current?: { readonly report: Report; readonly path: string } } & PowerSetting,
): PowerAdvice {
  if (!(o.drop > 0)) throw new UsageError(`--drop ${o.drop}: give the drop to catch, a number > 0 in the metric's units`);
  const metric = o.metric ?? report.metrics[0];
  if (!report.metrics.includes(metric)) throw new UsageError(`--metric ${metric}: the report does not score it (it scores ${report.metrics.join(', ')})`);
  const higher = getMetric(metric).higherIsBetter;
  const kind = report.plan.kind;
  if (kind === 'loo' || kind === 'holdout' || kind === 'given') {
    throw new UsageError(`power: the plan ${report.plan.text} has no repeats to add; the advice is for kfold:K (kfold:KxR) and resplit/shuffle plans`);
  }
  let learner: LearnerReport;
  if (o.learner !== undefined) learner = findLearner(report, o.learner, '--learner', path);
  else {
    const base = baselineOf(report);
    const pick = bestBy(report, metric, higher, (l) => l !== base) ?? bestBy(report, metric, higher);
    if (!pick) throw new InputError(`power: ${path}: no learner has a ${metric} score`);
    learner = pick;
  }
  const mine = scores(learner, metric, path);
  if (mine.length < 2) throw new InputError(`power: ${path}: ${learner.spec} has ${mine.length} fold; the advice needs at least 2`);
  let variance: number;
  let varianceFrom: PowerAdvice['varianceFrom'];
  if (o.current) {
    const other = findLearner(o.current.report, learner.spec, '--learner', o.current.path);
    const p = pairFolds(learner, other, metric);
    if (p.unmatched > 0 || p.a.length < 2) throw new InputError(`power: ${path} and ${o.current.path} do not share their folds; give reports of the same plan and seed`);
    variance = sampleVariance(p.a.map((x, i) => x - p.b[i]));
    varianceFrom = 'paired';
  } else {
    variance = 2 * sampleVariance(mine);
    varianceFrom = 'twice-fold-variance';
  }
  const testRows = meanOf(learner.folds.map((f) => f.testRows));
  const trainRows = meanOf(learner.folds.map((f) => f.trainRows));
  const foldsPerRepeat = report.plan.folds;
  const repeatsNow = report.plan.repeats;
  const setting = { alpha: o.alpha, power: o.power };
  const x = { variance, testRows, trainRows };
  const mddNow = minimalDetectable({ ...x, folds: foldsPerRepeat * repeatsNow }, setting);
  const advice = repeatsFor(o.drop, { ...x, foldsPerRepeat }, setting);
  const t = report.timing;
  const timeMs =
    t && advice.repeats !== null
      ? ([
          (t.learners.reduce((s, l) => s + l.fitMs + l.predictMs, 0) * advice.repeats) / repeatsNow,
          (t.totalMs * advice.repeats) / repeatsNow,
        ] as const)
      : null;
  return {
    metric,
    learner: learner.spec,
    plan: report.plan.text,
    foldsPerRepeat,
    repeatsNow,
    testRows,
    trainRows,
    variance,
    varianceFrom,
    alpha: o.alpha,
    power: o.power,
    drop: o.drop,
    mddNow,
    repeats: advice.repeats,
    mddAtRepeats: advice.mdd,
    limit: advice.limit,
    timeMs,
  };
}

const num = (v: number): string => (Math.abs(v) >= 1 ? v.toFixed(3) : v.toPrecision(3));
const secs = (ms: number): string => (ms < 60_000 ? `${(ms / 1000).toFixed(1)} s` : `${(ms / 60_000).toFixed(1)} min`);

export function renderPowerMarkdown(a: PowerAdvice): string {
  const lines = [
    `# How many repeats to catch a drop of ${num(a.drop)} ${a.metric}`,
    '',
    `Learner ${a.learner}, plan ${a.plan} (${a.foldsPerRepeat} folds x ${a.repeatsNow} repeat${a.repeatsNow === 1 ? '' : 's'}), one-sided alpha ${a.alpha}, power ${a.power}.`,
    '',
    `- Noise of the paired differences: variance ${a.variance.toPrecision(3)}, ${a.varianceFrom === 'paired' ? 'measured from the two reports fold by fold' : 'bounded by twice the variance of the fold scores (one report; give --current for a measured figure)'}.`,
    `- With the plan as it is, the smallest drop a gate (--max-drop 0) catches with power ${a.power}: **${num(a.mddNow)}**.`,
  ];
  if (a.repeats === null) {
    lines.push(
      `- No number of repeats gets there: repeats only shrink part of the noise, and the smallest detectable drop stays above ${num(a.limit)} however many there are (the folds share their rows). Use more data, or accept a larger drop.`,
    );
  } else {
    lines.push(`- Repeats needed: **${a.repeats}** (kfold:${a.foldsPerRepeat}x${a.repeats} for a k-fold plan), which catches a drop of ${num(a.mddAtRepeats)} with power ${a.power}.`);
    if (a.timeMs) lines.push(`- Time for that plan: about ${secs(a.timeMs[0])} (fits and predictions) to ${secs(a.timeMs[1])} (the whole run), scaled from this report's timing.`);
    else lines.push('- Time: the report has no timing (made with --no-timing); rerun without it for an estimate.');
    lines.push(`- A gate run with --max-drop ${num(a.drop)} on that plan catches drops of about ${num(a.drop + a.mddAtRepeats)} with that power; with --max-drop 0 it catches ${num(a.mddAtRepeats)}.`);
    lines.push(`- No number of repeats gets the smallest detectable drop below ${num(a.limit)}.`);
  }
  return `${lines.join('\n')}\n`;
}
