/**
 * `foldwise growth`: would more data help? For each outer fold of the plan, every learner (and
 * the baseline) is trained on nested, stratified, seeded subsets of the fold's training part
 * (subsets.ts) at each of the `--sizes`, and always scored on the same outer test rows, so the
 * points of a curve differ only in how much the learner saw. Preprocessing is fitted on each
 * subset alone. The score on the subset's own training rows is kept beside the test score: a
 * wide gap that closes slowly says variance (more data helps), two low curves that meet say bias.
 *
 * Per size: the fold scores summarised with the corrected interval (Nadeau-Bengio, with the
 * subset's rows as the training size). Per learner: the inverse power law a - b n^-c fitted to
 * the mean test scores by profile least squares (power-law.ts), the gain it predicts from
 * doubling the largest size with a 95% percentile interval from a bootstrap over folds (folds
 * resampled with replacement, the fit redone; it ignores that folds share training rows, so it
 * is narrower than the truth), and the size from which the curve is flat within noise: every
 * later step's paired fold difference has a corrected interval that covers zero.
 *
 * Randomness: the order of a fold's training rows from deriveSeed(seed, "growth", repeat, fold);
 * each fit from deriveSeed(seed, "growth-fit", spec, size, repeat, fold); the bootstrap from
 * deriveSeed(seed, "growth-boot", spec).
 */
import type { Table } from '../data/types.js';
import { dataSection } from '../data/problem.js';
import { FoldwiseError, InputError, UsageError } from '../errors.js';
import { CommandFoldError } from '../learners/command/errors.js';
import { costRows, getMetric } from '../metrics/index.js';
import type { ReportCosts } from '../model/report.js';
import type { Metric } from '../metrics/types.js';
import { foldLabel } from '../model/fold-label.js';
import { prepareRun, type EvaluateOptions, type Prepared } from '../run/prepare.js';
import { createRng, deriveSeed } from '../rng.js';
import { scoreOf, type Prediction } from '../metrics/scoring.js';
import { moduleFoldError, SplitData, subsetTarget, type Candidate, type TaskSpec } from '../run/tasks.js';
import { summarize, type Summary, type SummaryRules } from '../stats/index.js';
import { VERSION } from '../version.js';
import { C_GRID, doublingGain, fitPowerLaw, type PowerLawFit } from './power-law.js';
import { nestedOrder, sizesInRows } from './subsets.js';

export const GROWTH_SCHEMA = 'foldwise-growth/1';
export const DEFAULT_SIZES = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1];
export const BOOTSTRAP_ROUNDS = 400;

export interface GrowthOptions extends EvaluateOptions {
  /** fractions in (0, 1] of each fold's training part, or whole counts of rows above 1 */
  readonly sizes?: readonly number[];
}

export interface GrowthFold {
  readonly repeat: number;
  readonly fold: number;
  readonly rows: number;
  readonly test: number | null;
  readonly train: number | null;
}

export interface GrowthPoint {
  /** the --sizes entry */
  readonly size: number;
  /** mean training rows over the folds */
  readonly rows: number;
  readonly test: Summary | null;
  readonly train: Summary | null;
  readonly folds: readonly GrowthFold[];
}

export interface GrowthLearner {
  readonly name: string;
  readonly spec: string;
  readonly points: readonly GrowthPoint[];
  /** a - b n^-c on the mean test scores (negated for a lower-is-better metric); null when it cannot be fitted */
  readonly fit: (PowerLawFit & { readonly method: string }) | null;
  /** the fitted gain in the metric's units from doubling the largest size, and its bootstrap interval */
  readonly doubling: { readonly rows: number; readonly gain: number; readonly ci95: readonly [number, number] | null } | null;
  /** the first size from which every later step is flat within noise; null when the last step still moves */
  readonly flatFrom: number | null;
}

export interface GrowthReport {
  readonly schema: typeof GROWTH_SCHEMA;
  readonly tool: { readonly name: 'foldwise'; readonly version: string };
  readonly command: 'growth';
  readonly data: ReturnType<typeof dataSection>;
  readonly plan: { readonly text: string; readonly folds: number; readonly repeats: number; readonly stratified: boolean; readonly seed: number };
  /** --costs FILE: the matrix of the cost metric, as eval's settings.costs (absent without it) */
  readonly settings?: { readonly costs: ReportCosts };
  readonly metric: string;
  readonly higherIsBetter: boolean;
  readonly sizes: readonly number[];
  readonly learners: readonly GrowthLearner[];
  readonly warnings: readonly string[];
}

export function checkSizes(sizes: readonly number[]): number[] {
  if (sizes.length === 0) throw new UsageError('--sizes: give at least one size');
  for (const s of sizes) {
    if (!Number.isFinite(s) || s <= 0 || (s > 1 && !Number.isInteger(s))) {
      throw new UsageError(`--sizes ${s}: expected a fraction above 0 and at most 1, or a whole number of rows above 1`);
    }
  }
  const sorted = [...sizes];
  for (let i = 1; i < sorted.length; i++) {
    const key = (v: number): number => (v <= 1 ? v : Infinity);
    if (key(sorted[i]) === key(sorted[i - 1]) ? sorted[i] <= sorted[i - 1] : key(sorted[i]) < key(sorted[i - 1])) {
      throw new UsageError('--sizes: list the sizes once each, smallest first (fractions before counts)');
    }
  }
  return sorted;
}

const mean = (v: readonly number[]): number => v.reduce((s, x) => s + x, 0) / v.length;
/** Fold scores summarised as eval summarises them, with the metric's rules (floor, range). */
const summaryOf = (v: readonly (number | null)[], testRows: number, trainRows: number, rules: SummaryRules): Summary | null => {
  const xs = v.filter((x): x is number => x !== null);
  return xs.length ? summarize(xs, { testRows, trainRows }, 0.95, rules) : null;
};

function quantile(sorted: readonly number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  return sorted[lo] + (h - lo) * ((sorted[Math.ceil(h)] ?? sorted[lo]) - sorted[lo]);
}

/** What assembling the report needs besides the task results: everything known before fitting (shard parts carry it). */
export interface GrowthFrame {
  readonly data: ReturnType<typeof dataSection>;
  readonly plan: GrowthReport['plan'];
  /** --costs: the matrix as the report shows it */
  readonly costs?: ReportCosts;
  readonly metric: string;
  readonly sizes: readonly number[];
  readonly learners: readonly { readonly name: string; readonly spec: string }[];
  /** the plan's folds, in order */
  readonly folds: readonly { readonly repeat: number; readonly fold: number }[];
  /** the mean number of test rows of a fold (the corrected interval's test size) */
  readonly testMean: number;
  readonly warnings: readonly string[];
}

/** One task of growth: one learner fitted on one size's subset of one fold's training rows. */
export interface GrowthTaskSpec extends TaskSpec {
  readonly sizeIndex: number;
}

/** A growth task's outcome: the rows it trained on and its two scores (no predictions: growth keeps scores only). */
export interface GrowthResult {
  /** {fold}@{size}:{spec}, such as r1.f3@0.1:knn:k=15 */
  readonly id: string;
  readonly rows: number;
  readonly test: number | null;
  /** null for a command: learner (its program predicts the test rows only) */
  readonly train: number | null;
  /** why the task failed (a command: learner's fold under --on-fold-error skip) */
  readonly failed?: string;
}

/** A growth run prepared: the runner's preparation, the sizes, the task list and the report frame. */
export interface GrowthPrepared {
  readonly prepared: Prepared;
  readonly sizes: readonly number[];
  readonly tasks: readonly GrowthTaskSpec[];
  readonly frame: GrowthFrame;
}

/** A command: learner's model holds its test rows' predictions only, so it has no training score. */
const testOnly = (c: Candidate): boolean => c.learner.name.startsWith('command:');

/** Validates the options and lists the tasks, fold by fold, size by size, learner by learner; fits nothing. */
export function prepareGrowth(table: Table, options: GrowthOptions): GrowthPrepared {
  const sizes = checkSizes(options.sizes ?? DEFAULT_SIZES);
  const prepared = prepareRun(table, options);
  const { problem, plan, candidates, seed } = prepared;
  if (plan.folds.length < 2) throw new UsageError(`--plan ${prepared.planText}: growth needs a plan with at least 2 folds, for the intervals`);
  const metric = prepared.metrics[0];
  const warnings: string[] = [...prepared.warnings];
  let testMean = 0;
  const tasks: GrowthTaskSpec[] = [];
  plan.folds.forEach((f, fi) => {
    testMean += f.test.length / plan.folds.length;
    const rowsAt = sizesInRows(sizes, f.train.length);
    rowsAt.forEach((rows, si) => {
      candidates.forEach((c, ci) => tasks.push({ id: growthTaskId(f, sizes[si], c.spec), foldIndex: fi, candidateIndex: ci, sizeIndex: si, cost: rows }));
    });
  });
  const tooSmall = sizesInRows(sizes, Math.min(...plan.folds.map((f) => f.train.length))).filter((r, i, a) => i > 0 && r === a[i - 1]).length;
  if (tooSmall) warnings.push(`${tooSmall} size${tooSmall === 1 ? '' : 's'} give the same number of rows as the size before on some fold; give sizes further apart`);
  for (const c of candidates.filter(testOnly)) warnings.push(`${c.spec}: no training scores (its program predicts the test rows only), so its curve has no training line`);
  const frame: GrowthFrame = {
    data: dataSection(problem),
    plan: { text: prepared.planText, folds: plan.foldsPerRepeat, repeats: plan.repeats, stratified: prepared.stratified, seed },
    ...(prepared.costs ? { costs: { sha256: prepared.costs.sha256, classes: [...prepared.costs.classes], matrix: costRows(prepared.costs) } } : {}),
    metric: metric.name,
    sizes,
    learners: candidates.map((c) => ({ name: c.learner.name, spec: c.spec })),
    folds: plan.folds.map((f) => ({ repeat: f.repeat, fold: f.fold })),
    testMean,
    warnings,
  };
  return { prepared, sizes, tasks, frame };
}

export function growthTaskId(f: { readonly repeat: number; readonly fold: number }, size: number, spec: string): string {
  return `${foldLabel(f)}@${size}:${spec}`;
}

/**
 * Runs growth tasks in the given order: a fold's nested order is drawn once, and a subset's
 * preprocessing is fitted once for consecutive tasks of the same fold and size. Each task's
 * outcome depends on its fold, size and learner only (seeds from deriveSeed), so any grouping,
 * thread or shard gives the same results.
 */
export function runGrowthTasks(g: GrowthPrepared, tasks: readonly TaskSpec[], done?: (r: GrowthResult) => void, stopRequested?: () => boolean): GrowthResult[] {
  const { problem, plan, candidates, seed } = g.prepared;
  const metric = g.prepared.metrics[0];
  const y = problem.target;
  const out: GrowthResult[] = [];
  const orders = new Map<number, Int32Array>();
  let split: SplitData | undefined;
  let splitOf = '';
  for (const spec of tasks) {
    if (stopRequested?.()) break;
    const t = spec as GrowthTaskSpec;
    const f = plan.folds[t.foldIndex];
    let order = orders.get(t.foldIndex);
    if (!order) orders.set(t.foldIndex, (order = nestedOrder(f.train, y, createRng(deriveSeed(seed, 'growth', f.repeat, f.fold)))));
    const rows = sizesInRows(g.sizes, order.length)[t.sizeIndex];
    if (splitOf !== `${t.foldIndex}:${t.sizeIndex}`) {
      split = new SplitData(problem, order.slice(0, rows).sort(), f.test, g.prepared.impute);
      splitOf = `${t.foldIndex}:${t.sizeIndex}`;
    }
    const r = runGrowthTask(g, t, split!, rows, metric);
    out.push(r);
    done?.(r);
  }
  return out;

  function runGrowthTask(g: GrowthPrepared, t: GrowthTaskSpec, split: SplitData, rows: number, metric: Metric): GrowthResult {
    const c = candidates[t.candidateIndex];
    const f = plan.folds[t.foldIndex];
    const size = g.sizes[t.sizeIndex];
    const scale = c.learner.needsScaling;
    const Xtrain = split.matrix('train', scale);
    const Xtest = split.matrix('test', scale);
    const actualTrain = subsetTarget(y, split.train);
    const fitSeed = deriveSeed(seed, 'growth-fit', c.spec, size, f.repeat, f.fold);
    const fold = split.view(`${foldLabel(f)}@${size}`, scale);
    try {
      const model = c.learner.fit(Xtrain, actualTrain, c.params, { rng: createRng(fitSeed), seed: fitSeed, fold });
      const predict = (X: typeof Xtrain): Prediction => {
        const predicted = model.predict(X);
        const probs = metric.needsProba ? model.probabilities?.(X) : undefined;
        return probs ? { predicted, probs } : { predicted };
      };
      const test = scoreOf(metric, subsetTarget(y, split.test), predict(Xtest));
      const train = testOnly(c) ? null : scoreOf(metric, actualTrain, predict(Xtrain));
      return { id: t.id, rows, test, train };
    } catch (caught) {
      const e = c.learner.name.startsWith('module:') && !(caught instanceof FoldwiseError) ? moduleFoldError(c.learner.name, fold.label, caught) : caught;
      if (!(e instanceof CommandFoldError) || g.prepared.onFoldError !== 'skip') throw e;
      return { id: t.id, rows, test: null, train: null, failed: e.message };
    }
  }
}

/** The report from the frame and every task's result in the run's order (the same from every way of running). */
export function assembleGrowth(frame: GrowthFrame, results: readonly GrowthResult[]): GrowthReport {
  const { sizes, seed } = { sizes: frame.sizes, seed: frame.plan.seed };
  const metric = getMetric(frame.metric);
  const sign = metric.higherIsBetter ? 1 : -1;
  const warnings: string[] = [...frame.warnings];
  const testMean = frame.testMean;
  const F = frame.folds.length;
  const L = frame.learners.length;
  const S = sizes.length;
  if (results.length !== F * S * L) throw new InputError(`growth: ${results.length} task results for ${F * S * L} tasks`);
  // results come fold by fold, size by size, learner by learner
  const scores = frame.learners.map(() => sizes.map(() => [] as GrowthFold[]));
  results.forEach((r, k) => {
    const ci = k % L;
    const si = Math.floor(k / L) % S;
    const fo = frame.folds[Math.floor(k / (L * S))];
    scores[ci][si].push({ repeat: fo.repeat, fold: fo.fold, rows: r.rows, test: r.test, train: r.train });
  });
  const failed = results.filter((r) => r.failed);
  if (failed.length) warnings.push(`${failed.length} task${failed.length === 1 ? '' : 's'} failed and ${failed.length === 1 ? 'is' : 'are'} left out of the curves: ${failed.slice(0, 3).map((r) => r.failed).join('; ')}${failed.length > 3 ? '; ...' : ''}`);
  const candidates = frame.learners;
  const plan = { folds: frame.folds };
  const learners: GrowthLearner[] = candidates.map((c, ci) => {
    const points: GrowthPoint[] = sizes.map((size, si) => {
      const folds = scores[ci][si];
      const rows = mean(folds.map((f) => f.rows));
      return { size, rows, test: summaryOf(folds.map((f) => f.test), testMean, rows, metric), train: summaryOf(folds.map((f) => f.train), testMean, rows, metric), folds };
    });
    const usable = points.filter((p) => p.test);
    const fit = fitPowerLaw(usable.map((p) => p.rows), usable.map((p) => sign * p.test!.mean));
    let doubling: GrowthLearner['doubling'] = null;
    const last = points[points.length - 1];
    if (fit) {
      const n = last.rows;
      const gains: number[] = [];
      const rng = createRng(deriveSeed(seed, 'growth-boot', c.spec));
      const F = plan.folds.length;
      for (let b = 0; b < BOOTSTRAP_ROUNDS; b++) {
        const pick = Array.from({ length: F }, () => rng.int(F));
        const xs: number[] = [];
        const ys: number[] = [];
        points.forEach((p) => {
          const v = pick.map((k) => p.folds[k].test).filter((x): x is number => x !== null);
          if (v.length) (xs.push(mean(pick.map((k) => p.folds[k].rows))), ys.push(sign * mean(v)));
        });
        const bf = fitPowerLaw(xs, ys);
        if (bf) gains.push(sign * doublingGain(bf, n));
      }
      gains.sort((a, b) => a - b);
      doubling = { rows: 2 * n, gain: sign * doublingGain(fit, n), ci95: gains.length >= 20 ? [quantile(gains, 0.025), quantile(gains, 0.975)] : null };
    }
    // flat within noise: paired fold differences between consecutive sizes
    let flatFrom: number | null = null;
    for (let si = points.length - 2; si >= 0; si--) {
      const a = points[si].folds;
      const b = points[si + 1].folds;
      const diffs = a.map((fa, k) => (fa.test === null || b[k].test === null ? null : b[k].test! - fa.test)).filter((d): d is number => d !== null);
      const s = diffs.length >= 2 ? summarize(diffs, { testRows: testMean, trainRows: points[si + 1].rows }) : null;
      if (!s?.ci95 || s.ci95[0] > 0 || s.ci95[1] < 0) break;
      flatFrom = points[si].size;
    }
    if (fit && (fit.c === C_GRID[0] || fit.c === C_GRID[C_GRID.length - 1])) {
      warnings.push(`${c.spec}: the fitted exponent c = ${fit.c} is at the edge of the searched range (${C_GRID[0]} to ${C_GRID[C_GRID.length - 1]}), so the curve's shape is not pinned down; read its doubling gain and interval as rough`);
    }
    return {
      name: c.name,
      spec: c.spec,
      points,
      fit: fit ? { ...fit, a: sign * fit.a, b: sign * fit.b, method: 'profile least squares over c = 0.02..3 step 0.02, a and b by ordinary least squares on the mean test scores' } : null,
      doubling,
      flatFrom,
    };
  });
  return {
    schema: GROWTH_SCHEMA,
    tool: { name: 'foldwise', version: VERSION },
    command: 'growth',
    data: frame.data,
    plan: frame.plan,
    ...(frame.costs ? { settings: { costs: frame.costs } } : {}),
    metric: metric.name,
    higherIsBetter: metric.higherIsBetter,
    sizes,
    learners,
    warnings,
  };
}

/** The whole growth run in this thread (the CLI runs it through executeGrowth, for --jobs, shards and journals). */
export function growth(table: Table, options: GrowthOptions): GrowthReport {
  const g = prepareGrowth(table, options);
  return assembleGrowth(g.frame, runGrowthTasks(g, g.tasks));
}
