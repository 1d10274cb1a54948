/**
 * `tune`: hyperparameter search with nested selection (the core of `foldwise tune`).
 *
 * Choosing options by the same cross-validation that reports the score is optimistic: the best
 * of many noisy means is biased upwards (Varma & Simon 2006, "Bias in error estimation when
 * using cross-validation for model selection", BMC Bioinformatics 7:91, free at
 * https://doi.org/10.1186/1471-2105-7-91; Cawley & Talbot 2010, JMLR 11:2079-2107). So:
 *
 * 1. Optional holdout (--holdout F, or the holdout part of a holdout outer plan): set aside
 *    before anything else and touched once, at the end.
 * 2. Outer plan (default kfold:5) over the search rows. For each outer fold, the inner plan
 *    (default kfold:3) is built on the outer training rows only; every candidate is scored by
 *    it on the headline metric; the rule (best or one-se, pick.ts) picks one; that candidate is
 *    refitted on the outer training rows and scored on the outer test rows with every metric.
 *    The outer scores, summarised as in `eval` (summarize: mean, median, sd, min, max,
 *    quartiles, Nadeau-Bengio corrected interval), are the estimate to quote.
 * 3. Recommendation: the inner plan run on all search rows, the same rule: the candidate to
 *    deploy. Its inner mean is the non-nested, optimistic figure and is labelled so.
 * 4. The holdout, if any, is scored once by the recommendation fitted on all search rows.
 *
 * Shared work (fold-work.ts): preprocessing once per split, one neighbour search per split for
 * all kNN candidates, one forest per split for candidates that differ only in tree count.
 *
 * Randomness, all from the run's seed: outer plan deriveSeed(seed, "plan") (so with no holdout
 * the outer folds are eval's folds for the same seed), holdout deriveSeed(seed, "holdout"),
 * inner plans deriveSeed(seed, "inner", repeat, fold) per outer fold and
 * deriveSeed(seed, "inner", "all") for the recommendation, sampling deriveSeed(seed, "sample"),
 * fits deriveSeed(seed, "fit", stage..., learner) where the stage names the split.
 */
import { quickSuspects } from '../audit/quick-audit.js';
import { pairedStats } from '../compare/paired-stats.js';
import type { ReportComparisons } from '../model/compare.js';
import { COMPARISON_LEVEL } from '../compare/within-report.js';
import { baseline, baselineConstantFor } from '../learners/baseline.js';
import { performance } from 'node:perf_hooks';
import { dataSection, defineProblem, type Problem, type ProblemOptions } from '../data/problem.js';
import type { Table } from '../data/types.js';
import { quoted } from '../data/load-csv.js';
import { InputError, UsageError } from '../errors.js';
import type { Target } from '../learning.js';
import { costRows, type CostMatrix, defaultMetrics, getMetric } from '../metrics/index.js';
import type { Metric } from '../metrics/types.js';
import { formatPlan, parsePlan } from '../plans/index.js';
import type { BuiltPlan, Fold, PlanSpec } from '../plans/types.js';
import { foldLabel } from '../model/fold-label.js';
import type { LearnerThreshold } from '../model/threshold.js';
import type { Impute } from '../prep/fold-prep.js';
import type { ScoreSummary } from '../model/report.js';
import type { TuneCandidate, TuneOuterFold, TuneReport, TuneWinner } from '../model/tune.js';
import { checkSeed, readRunCosts, type CostsText, DEFAULT_SEED, resolveMetrics, thresholdPlanOf } from '../run/prepare.js';
import { innerThreshold, type InnerThreshold, type ThresholdPlan } from '../run/threshold-inner.js';
import { learnerThreshold, type CutFold } from '../threshold/scores.js';
import { createRng, deriveSeed } from '../rng.js';
import { SplitData, subsetTarget } from '../run/tasks.js';
import { summarize } from '../stats/index.js';
import { pooledRefused, scoreNote } from '../stats/score-notes.js';
import { VERSION } from '../version.js';
import { describeRanks } from './complexity.js';
import { edgeWarnings } from './edges.js';
import { newWorkCount, predictAll, type WorkCount } from './fold-work.js';
import { splitHoldout } from './holdout-split.js';
import { type InnerStat, innerStat, type Pick, PICK_RULES, pickCandidate, type PickRule } from './pick.js';
import { allRows, planOver, type SubsetPlan } from './plan-over.js';
import { concatPredictions, concatTargets, type Prediction, scoreOf } from '../metrics/scoring.js';
import { parseSearchSpace, type SearchCandidate, searchCandidates } from './space.js';
import type { TunePredictions } from './tune-predictions.js';

export const TUNE_SCHEMA = 'foldwise-tune/2';
export const DEFAULT_OUTER_PLAN = 'kfold:5';
export const DEFAULT_INNER_PLAN = 'kfold:3';
/** The search when no --learner is given: kNN over seven k values and both weightings. */
export const DEFAULT_SEARCH: readonly string[] = ['knn:k=1|3|5|9|15|25|41,vote=equal|inverse'];

export interface TuneOptions extends ProblemOptions {
  /** run the quick data audit first and record its findings in the report's `audit` (default true) */
  readonly audit?: boolean;
  /** search specs with lists and ranges, such as "knn:k=1..21+2" (default DEFAULT_SEARCH) */
  readonly learners?: readonly string[];
  /** outer plan text or spec (default kfold:5) */
  readonly plan?: string | PlanSpec;
  /** inner plan text or spec (default kfold:3) */
  readonly inner?: string | PlanSpec;
  /** stratify classification plans by class (default true) */
  readonly stratify?: boolean;
  /** metric names, headline first; the headline decides the selection */
  readonly metrics?: readonly string[];
  readonly pick?: PickRule;
  /** random search: number of candidates to draw */
  readonly sample?: number;
  /** candidate limit (default 200) */
  readonly maxCandidates?: number;
  /** fraction of rows set aside as a final holdout */
  readonly holdout?: number;
  readonly seed?: number;
  readonly impute?: Impute;
  /** include wall-clock timings (default true) */
  readonly timing?: boolean;
  /** --costs FILE: the cost matrix's name and text, for the cost metric */
  readonly costs?: CostsText;
  /** --threshold RULE (two-class targets): chosen on an inner split of each outer training fold after the pick */
  readonly threshold?: string;
  /** --threshold-folds: the folds of that inner split (default 5) */
  readonly thresholdFolds?: number;
}


/** Rethrows a plan error of the inner plan under the --inner option's name. */
function asInner(e: unknown, where: string): never {
  if (e instanceof InputError || e instanceof UsageError) {
    const msg = `${e.message.replace(/^--plan /, '--inner ')}${where}`;
    throw e instanceof InputError ? new InputError(msg) : new UsageError(msg);
  }
  throw e;
}

function parseInner(inner: string | PlanSpec | undefined): PlanSpec {
  let spec: PlanSpec;
  try {
    spec = typeof inner === 'object' ? inner : parsePlan(inner ?? DEFAULT_INNER_PLAN);
  } catch (e) {
    asInner(e, '');
  }
  if (spec.kind === 'holdout' && spec.holdout > 0) {
    throw new UsageError(`--inner ${formatPlan(spec)}: an inner plan has no use for a holdout part; write holdout:A/B/0, or use --holdout F to keep rows out of the whole search`);
  }
  return spec;
}

function innerPlan(problem: Problem, spec: PlanSpec, rows: Int32Array, stratify: boolean | undefined, seed: number, where: string): SubsetPlan {
  try {
    return planOver(problem, spec, rows, stratify, createRng(seed));
  } catch (e) {
    asInner(e, ` (inner plan on ${where}, ${rows.length} rows)`);
  }
}

function label(f: { repeat: number; fold: number }, repeats: number): string {
  return repeats > 1 ? `outer fold ${f.repeat + 1}.${f.fold + 1}` : `outer fold ${f.fold + 1}`;
}

/** Scores every candidate by the inner plan on the headline metric; returns one InnerStat per candidate. */
function innerSearch(
  problem: Problem,
  plan: BuiltPlan,
  candidates: readonly SearchCandidate[],
  head: Metric,
  impute: Impute,
  seedOf: (repeat: number, fold: number) => number,
  work: WorkCount,
): InnerStat[] {
  const y = problem.target;
  const scores = candidates.map(() => [] as (number | null)[]);
  for (const f of plan.folds) {
    const split = new SplitData(problem, f.train, f.test, impute);
    const yTest = subsetTarget(y, f.test);
    const preds = predictAll(split, y, candidates, seedOf(f.repeat, f.fold), work);
    preds.forEach((p, i) => scores[i].push(scoreOf(head, yTest, p)));
  }
  return scores.map((s) => innerStat(s));
}

function scoresOf(metrics: readonly Metric[], actual: Target, pred: Prediction): Record<string, number | null> {
  const out: Record<string, number | null> = {};
  for (const m of metrics) out[m.name] = scoreOf(m, actual, pred);
  return out;
}

function meanOf(values: readonly number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

function checkPick(p: Pick, head: Metric, where: string): void {
  if (p.pick < 0) {
    throw new InputError(`${head.name} is undefined in every inner fold of ${where} for every candidate; choose another --metric or a plan with larger folds`);
  }
}

/** Runs the nested search on a loaded table. Pure apart from reading the clock for timings. */
export function tune(table: Table, options: TuneOptions): TuneReport {
  return tuneWithPredictions(table, options).report;
}

/** Everything the search's pieces of work need, the same in every thread (it follows from the table and the options). */
export interface TuneSetup {
  readonly started: number;
  readonly options: TuneOptions;
  readonly seed: number;
  readonly rule: PickRule;
  readonly problem: Problem;
  readonly outerSpec: PlanSpec;
  readonly innerSpec: PlanSpec;
  readonly metrics: readonly Metric[];
  readonly head: Metric;
  /** --costs: the cost matrix (absent without it) */
  readonly costs?: CostMatrix;
  /** --threshold: the rule and the inner folds (absent without it) */
  readonly threshold?: ThresholdPlan;
  readonly specs: readonly string[];
  readonly candidates: readonly SearchCandidate[];
  readonly search: ReturnType<typeof searchCandidates>['plan'];
  readonly impute: Impute;
  readonly warnings: readonly string[];
  readonly searchRows: Int32Array;
  readonly holdoutRows?: Int32Array;
  readonly holdoutFrom?: 'option' | 'plan';
  readonly outer: SubsetPlan;
}

/** One outer fold's work: the inner search on its training rows, the pick, its refit and the baseline on the outer test rows. */
export interface OuterWork {
  readonly stats: InnerStat[];
  readonly innerWarnings: readonly string[];
  readonly innerFolds: number;
  readonly pick: Pick;
  readonly tuned: Prediction;
  readonly baseline: Prediction;
  /** --threshold: the threshold chosen for the pick on an inner split of this fold's training rows (absent: no rule, no probabilities, or one class inside) */
  readonly threshold?: InnerThreshold;
  readonly work: WorkCount;
}

/** The recommendation's work: the inner search on all search rows. */
export interface AllWork {
  readonly stats: InnerStat[];
  readonly innerWarnings: readonly string[];
  readonly foldsPerRepeat: number;
  readonly repeats: number;
  readonly stratified: boolean;
  /**
   * --threshold: the threshold of the recommended candidate, chosen by the rule on an inner split
   * of all search rows (absent: no rule, no pick, no probabilities, or one class inside)
   */
  readonly threshold?: InnerThreshold;
  readonly work: WorkCount;
}

/**
 * The fold whose seeds the recommendation's threshold uses: repeat 0, fold 0 with all search rows
 * as its training rows. So it is the threshold `eval --threshold` chooses for the same learner on
 * a first fold that trains on exactly these rows (`--plan loo` on a file with one extra row in
 * front), which is how it is checked. Its split differs from outer fold 1's, whose rows differ.
 */
function recommendationFold(rows: Int32Array): Fold {
  return { repeat: 0, fold: 0, train: rows, test: new Int32Array(0) };
}

/** Checks the options and builds the holdout, the outer plan and the candidates (steps before any fit). */
export function setupTune(table: Table, options: TuneOptions, started = performance.now()): TuneSetup {
  const seed = checkSeed(options.seed ?? DEFAULT_SEED);
  const rule = options.pick ?? 'best';
  if (!PICK_RULES.includes(rule)) throw new UsageError(`--pick ${rule}: expected one of ${PICK_RULES.join(', ')}`);
  const problem = defineProblem(table, options);
  const outerSpec = typeof options.plan === 'object' ? options.plan : parsePlan(options.plan ?? DEFAULT_OUTER_PLAN);
  const innerSpec = parseInner(options.inner);
  const costs = readRunCosts(problem, options.costs, options.metrics);
  const metrics = resolveMetrics(problem, options.metrics, costs);
  const head = metrics[0];
  const threshold = thresholdPlanOf(problem, options, outerSpec);
  const specs = options.learners?.length ? options.learners : DEFAULT_SEARCH;
  const space = parseSearchSpace(specs);
  const { candidates, plan: search } = searchCandidates(space, problem.task, { sample: options.sample, maxCandidates: options.maxCandidates }, seed);
  const impute = options.impute ?? 'median';
  const n = problem.rows.length;
  const warnings: string[] = [...table.warnings, ...search.warnings];
  // --threshold with a headline that calls classes at the default cut: a user's choice, said once
  // (the candidates are compared at 0.5, before the threshold they will be used with is chosen)
  if (threshold && !head.needsProba) {
    warnings.push(`--threshold ${threshold.text}: the hyperparameters are picked by ${head.name} at the default cut (0.5), before the threshold is chosen; for a pick that does not depend on a cut, put a probability metric first (--metric roc-auc, log-loss or brier)`);
  }
  if (problem.excludedRows > 0) {
    warnings.push(`${problem.excludedRows} row${problem.excludedRows === 1 ? '' : 's'} with a missing target (${quoted(problem.targetName)}) left out`);
  }

  // 1. the holdout, then the outer plan over the rows left
  let searchRows = allRows(n);
  let holdoutRows: Int32Array | undefined;
  let holdoutFrom: 'option' | 'plan' | undefined;
  let outer: SubsetPlan;
  const outerRng = createRng(deriveSeed(seed, 'plan'));
  if (options.holdout !== undefined) {
    if (outerSpec.kind === 'holdout' && outerSpec.holdout > 0) {
      throw new UsageError(`--holdout ${options.holdout}: the plan ${formatPlan(outerSpec)} already sets a holdout part aside; use one or the other`);
    }
    const split = splitHoldout(problem, options.holdout, outerSpec, options.stratify, seed);
    searchRows = split.search;
    holdoutRows = split.holdout;
    holdoutFrom = 'option';
    outer = planOver(problem, outerSpec, searchRows, options.stratify, outerRng);
  } else {
    outer = planOver(problem, outerSpec, searchRows, options.stratify, outerRng);
    if (outer.plan.holdout) {
      const f0 = outer.plan.folds[0];
      searchRows = Int32Array.from([...f0.train, ...f0.test]).sort();
      holdoutRows = outer.plan.holdout.length ? outer.plan.holdout : undefined;
      holdoutFrom = holdoutRows ? 'plan' : undefined;
    }
  }
  warnings.push(...outer.plan.warnings);
  if (outerSpec.kind === 'forward' && innerSpec.kind !== 'forward') {
    warnings.push(`the outer plan is time-ordered but the inner plan ${formatPlan(innerSpec)} is not: inner folds train on later rows than they test; use --inner forward:K`);
  }
  if (outerSpec.kind === 'loo') warnings.push('leave-one-out outer plan: each outer fold scores one row, so per-fold spread is degenerate; read the pooled scores');
  return { started, options, seed, rule, problem, outerSpec, innerSpec, metrics, head, ...(costs ? { costs } : {}), ...(threshold ? { threshold } : {}), specs, candidates, search, impute, warnings, searchRows, holdoutRows, holdoutFrom, outer };
}

/** Step 2 for outer fold `index` (in plan order). Its seeds depend on the fold only, so folds can run in any order or thread. */
export function outerFoldWork(s: TuneSetup, index: number): OuterWork {
  const { problem, seed, candidates, head, impute } = s;
  const y = problem.target;
  const f = s.outer.plan.folds[index];
  const where = label(f, s.outer.plan.repeats);
  const work = newWorkCount();
  const inner = innerPlan(problem, s.innerSpec, f.train, s.options.stratify, deriveSeed(seed, 'inner', f.repeat, f.fold), `the training rows of ${where}`);
  const stats = innerSearch(problem, inner.plan, candidates, head, impute, (r, k) => deriveSeed(seed, 'fit', 'outer', f.repeat, f.fold, 'inner', r, k), work);
  const p = pickCandidate(candidates, stats, s.rule, head.higherIsBetter);
  checkPick(p, head, where);
  const chosen = candidates[p.pick];
  const split = new SplitData(problem, f.train, f.test, impute);
  const tuned = predictAll(split, y, [chosen], deriveSeed(seed, 'fit', 'outer', f.repeat, f.fold), work)[0];
  // the baseline on the same outer split, for the paired comparison of the tuned estimate
  const bModel = baseline.fit(split.matrix('train', false), subsetTarget(y, f.train), { constant: baselineConstantFor(head.name) }, { rng: createRng(0), seed: 0 });
  const bTest = split.matrix('test', false);
  const bPred: Prediction = { predicted: bModel.predict(bTest), probs: bModel.probabilities?.(bTest) };
  // --threshold: the pick (its hyperparameters already chosen) refitted on an inner split of the
  // outer training rows only, as eval does for each learner (src/run/threshold-inner.ts)
  let cut: { threshold?: InnerThreshold } = {};
  if (s.threshold && tuned.probs) {
    const t0 = performance.now();
    const chosenThreshold = innerThreshold(problem, seed, chosen, f, f.train, s.threshold, (train, test) => new SplitData(problem, train, test, impute));
    work.fitMs += performance.now() - t0;
    work.fits += s.threshold.innerFolds;
    work.plainFits += s.threshold.innerFolds;
    if (chosenThreshold) cut = { threshold: chosenThreshold };
  }
  return { stats, innerWarnings: inner.plan.warnings, innerFolds: inner.plan.folds.length, pick: p, tuned, baseline: bPred, ...cut, work };
}

/** Step 3's search: the inner plan on all search rows. */
export function allSearchWork(s: TuneSetup): AllWork {
  const work = newWorkCount();
  const allInner = innerPlan(s.problem, s.innerSpec, s.searchRows, s.options.stratify, deriveSeed(s.seed, 'inner', 'all'), 'all search rows');
  const stats = innerSearch(s.problem, allInner.plan, s.candidates, s.head, s.impute, (r, k) => deriveSeed(s.seed, 'fit', 'all', 'inner', r, k), work);
  // --threshold: the recommendation's threshold, after its pick (the same pick finishTune makes
  // from these stats), chosen as eval chooses one for a fold whose training rows are all search rows
  let cut: { threshold?: InnerThreshold } = {};
  if (s.threshold) {
    const p = pickCandidate(s.candidates, stats, s.rule, s.head.higherIsBetter);
    if (p.pick >= 0) {
      const t0 = performance.now();
      const chosen = innerThreshold(s.problem, s.seed, s.candidates[p.pick], recommendationFold(s.searchRows), s.searchRows, s.threshold, (train, test) => new SplitData(s.problem, train, test, s.impute));
      work.fitMs += performance.now() - t0;
      work.fits += s.threshold.innerFolds;
      work.plainFits += s.threshold.innerFolds;
      if (chosen) cut = { threshold: chosen };
    }
  }
  return { stats, innerWarnings: allInner.plan.warnings, foldsPerRepeat: allInner.plan.foldsPerRepeat, repeats: allInner.plan.repeats, stratified: allInner.stratified, ...cut, work };
}

function addWork(to: WorkCount, from: WorkCount): void {
  to.fits += from.fits;
  to.plainFits += from.plainFits;
  to.fitMs += from.fitMs;
  to.predictMs += from.predictMs;
}

/** --threshold in tune: the section of the tuned procedure when every outer fold has probabilities and a threshold; a warning otherwise (as eval's). */
function tunedThreshold(
  folds: readonly Fold[],
  outerWork: readonly OuterWork[],
  preds: readonly Prediction[],
  actual: readonly Target[],
  metrics: readonly Metric[],
  sizes: { testRows: number; trainRows: number },
  warnings: string[],
): LearnerThreshold | undefined {
  const cut: CutFold[] = [];
  for (const [i, f] of folds.entries()) {
    const probs = preds[i].probs;
    const t = outerWork[i].threshold;
    const a = actual[i];
    if (!probs || !t || a.task !== 'classification') {
      warnings.push(
        probs
          ? `tuned: --threshold: the inner split of outer fold ${foldLabel(f)} held one class only, so no threshold is reported`
          : `tuned: the pick of outer fold ${foldLabel(f)} gives no class probabilities, so --threshold is not applied`,
      );
      return undefined;
    }
    cut.push({ repeat: f.repeat, fold: f.fold, actual: a.codes, probs, threshold: t.value, met: t.met });
  }
  if (!cut.length) return undefined;
  const unmet = cut.filter((f) => !f.met).length;
  if (unmet) warnings.push(`tuned: --threshold: the rule was not met inside ${unmet} of ${cut.length} outer folds; those folds use the threshold closest to meeting it`);
  return learnerThreshold(cut, metrics, sizes);
}

/** The nested search, also giving the outer (and holdout) predictions of the tuned procedure and the baseline. */
export function tuneWithPredictions(table: Table, options: TuneOptions): { report: TuneReport; predictions: TunePredictions } {
  const s = setupTune(table, options);
  const folds = s.outer.plan.folds.map((_, i) => outerFoldWork(s, i));
  return finishTune(s, folds, allSearchWork(s));
}

/**
 * Steps 3 (the pick on all search rows) and 4 and the report, from the outer folds' work in plan
 * order and the recommendation's search: the same whichever thread did each piece.
 */
export function finishTune(s: TuneSetup, outerWork: readonly OuterWork[], all: AllWork): { report: TuneReport; predictions: TunePredictions } {
  const { problem, options, seed, rule, outerSpec, innerSpec, metrics, head, specs, candidates, search, impute, searchRows, holdoutRows, holdoutFrom, outer, started } = s;
  const y = problem.target;
  const warnings = [...s.warnings];
  const suspects = options.audit === false ? [] : quickSuspects(problem, { plan: outerSpec, stratify: options.stratify, seed });

  // 2. nested selection, outer fold by outer fold
  const work = newWorkCount();
  const perFold: InnerStat[][] = [];
  const outerFolds: TuneOuterFold[] = [];
  const baselineScores: (number | null)[] = [];
  const outerPreds: Prediction[] = [];
  const outerActual: Target[] = [];
  const predictions: TunePredictions = { problem, outer: [] };
  const repeats = outer.plan.repeats;
  let fellBack = false;
  outer.plan.folds.forEach((f, i) => {
    const where = label(f, repeats);
    const { stats, pick: p, tuned: pred, baseline: bPred } = outerWork[i];
    for (const w of outerWork[i].innerWarnings) warnings.push(`inner plan on ${where}: ${w}`);
    addWork(work, outerWork[i].work);
    fellBack ||= p.fellBack;
    perFold.push(stats);
    const chosen = candidates[p.pick];
    const yTest = subsetTarget(y, f.test);
    outerPreds.push(pred);
    outerActual.push(yTest);
    baselineScores.push(scoreOf(head, yTest, bPred));
    predictions.outer.push({ repeat: f.repeat, fold: f.fold, test: f.test, trainRows: f.train.length, pick: chosen.spec, tuned: pred, baseline: bPred, actual: yTest });
    outerFolds.push({
      repeat: f.repeat,
      fold: f.fold,
      trainRows: f.train.length,
      testRows: f.test.length,
      innerFolds: outerWork[i].innerFolds,
      pick: chosen.id,
      pickSpec: chosen.spec,
      best: candidates[p.best].id,
      innerMean: stats[p.pick].mean!,
      innerSd: stats[p.pick].sd,
      scores: scoresOf(metrics, yTest, pred),
      ...(pred.notes ? { notes: pred.notes } : {}),
    });
  });

  // 3. the recommendation: the same search on all search rows
  for (const w of all.innerWarnings) warnings.push(`inner plan on all search rows: ${w}`);
  addWork(work, all.work);
  const allStats = all.stats;
  const final = pickCandidate(candidates, allStats, rule, head.higherIsBetter);
  checkPick(final, head, 'all search rows');
  fellBack ||= final.fellBack;
  if (fellBack) warnings.push('--pick one-se: an inner plan gave fewer than two scores, so there was no standard error and the best candidate was taken');
  const rec = candidates[final.pick];
  warnings.push(...edgeWarnings(rec, candidates, 'the recommended'));
  if (s.threshold && y.task === 'classification') {
    if (!all.threshold) warnings.push(`the recommendation: --threshold: no threshold to deploy, since ${rec.spec} gives no class probabilities or its inner predictions on all search rows held one class`);
    else if (!all.threshold.met) warnings.push('the recommendation: --threshold: the rule was not met on the inner split of all search rows; its threshold is the one closest to meeting it');
  }
  const undefinedFor = allStats.filter((st) => st.mean === null).length;
  if (undefinedFor > 0) warnings.push(`${head.name} is undefined in every inner fold for ${undefinedFor} of ${candidates.length} candidates; they were never picked`);

  // 4. the holdout, scored once
  let holdout: TuneReport['holdout'];
  if (holdoutRows) {
    const split = new SplitData(problem, searchRows, holdoutRows, impute);
    const pred = predictAll(split, y, [rec], deriveSeed(seed, 'fit', 'all'), work)[0];
    holdout = { trainRows: searchRows.length, testRows: holdoutRows.length, spec: rec.spec, scores: scoresOf(metrics, subsetTarget(y, holdoutRows), pred) };
    predictions.holdout = { test: holdoutRows, trainRows: searchRows.length, pick: rec.spec, tuned: pred, actual: subsetTarget(y, holdoutRows) };
  }

  // summaries of the outer scores, as eval summarises fold scores
  const trainMean = meanOf(outerFolds.map((f) => f.trainRows));
  const testMean = meanOf(outerFolds.map((f) => f.testRows));
  const summary: Record<string, ScoreSummary | null> = {};
  const pooled: Record<string, number | null> = {};
  const classes = y.task === 'classification' ? y.classes.length : 0;
  const pooledPred = concatPredictions(outerPreds, classes);
  const pooledActual = concatTargets(outerActual);
  for (const m of metrics) {
    const values = outerFolds.map((f) => f.scores[m.name]).filter((v): v is number => v !== null);
    const missing = outerFolds.length - values.length;
    if (missing > 0 && missing < outerFolds.length) warnings.push(`outer estimate: ${m.name} is undefined in ${missing} of ${outerFolds.length} outer folds; its summary uses the other folds`);
    if (m.needsProba && !pooledPred.probs) warnings.push(`outer estimate: some picks give no class probabilities, so ${m.name} is not reported on pooled predictions`);
    summary[m.name] = values.length ? summarize(values, { testRows: testMean, trainRows: trainMean }, 0.95, m) : null;
    const note = scoreNote(m, outerFolds);
    if (note) warnings.push(`outer estimate: ${note}`);
    pooled[m.name] = pooledRefused(m, outerFolds) ? null : scoreOf(m, pooledActual, pooledPred);
  }

  // --threshold: the tuned procedure's outer folds at the threshold each chose inside, beside 0.5
  const outerThreshold = s.threshold ? tunedThreshold(outer.plan.folds, outerWork, outerPreds, outerActual, metrics, { testRows: testMean, trainRows: trainMean }, warnings) : undefined;

  // the tuned estimate against the baseline on the same outer folds (as eval compares learners)
  const paired = outerFolds.map((f, i) => [f.scores[head.name], baselineScores[i]] as const).filter((p): p is readonly [number, number] => p[0] !== null && p[1] !== null);
  const comparisons: ReportComparisons | undefined = paired.length
    ? {
        metric: head.name,
        higherIsBetter: head.higherIsBetter,
        level: COMPARISON_LEVEL,
        pairs: [
          {
            learner: 'tuned',
            reference: 'baseline',
            against: ['baseline'],
            ...pairedStats(paired.map((p) => p[0]), paired.map((p) => p[1]), { testRows: testMean, trainRows: trainMean }, head.higherIsBetter, outerFolds.length - paired.length, head),
          },
        ],
      }
    : undefined;

  // stability of the picks over the outer folds
  const wins = new Map<number, number>();
  for (const f of outerFolds) wins.set(f.pick, (wins.get(f.pick) ?? 0) + 1);
  const winners: TuneWinner[] = [...wins]
    .map(([id, folds]) => ({ id, spec: candidates[id].spec, folds }))
    .sort((a, b) => b.folds - a.folds || a.id - b.id);

  const tuneCandidates: TuneCandidate[] = candidates.map((c, i) => ({
    id: c.id,
    name: c.learner.name,
    spec: c.spec,
    params: { ...c.params },
    inner: perFold.map((s) => s[i]),
    all: allStats[i],
    wins: wins.get(c.id) ?? 0,
  }));
  const learnersSearched = [...new Set(candidates.map((c) => c.learner))];

  const report: TuneReport = {
    schema: TUNE_SCHEMA,
    tool: { name: 'foldwise', version: VERSION },
    command: 'tune',
    data: dataSection(problem),
    plan: {
      outer: { kind: outerSpec.kind, text: formatPlan(outerSpec), folds: outer.plan.foldsPerRepeat, repeats: outer.plan.repeats, stratified: outer.stratified },
      inner: { kind: innerSpec.kind, text: formatPlan(innerSpec), folds: all.foldsPerRepeat, repeats: all.repeats, stratified: all.stratified },
      ...(problem.groupName !== undefined ? { group: problem.groupName } : {}),
      ...(problem.orderName !== undefined ? { order: problem.orderName } : {}),
      seed,
      searchRows: searchRows.length,
      ...(holdoutRows && holdoutFrom
        ? { holdout: { rows: holdoutRows.length, from: holdoutFrom, ...(holdoutFrom === 'option' ? { fraction: options.holdout } : {}) } }
        : {}),
    },
    settings: { impute, ...(s.costs ? { costs: { sha256: s.costs.sha256, classes: [...s.costs.classes], matrix: costRows(s.costs) } } : {}) },
    metrics: metrics.map((m) => m.name),
    selection: { metric: head.name, higherIsBetter: head.higherIsBetter, rule, complexity: learnersSearched.map((l) => describeRanks(l)) },
    search: {
      specs: [...specs],
      gridSize: search.gridSize,
      tried: candidates.length,
      sampled: search.sampled,
      limit: search.limit,
      fits: work.fits,
      plainLoopFits: work.plainFits,
    },
    candidates: tuneCandidates,
    ...(s.threshold && y.task === 'classification' ? { threshold: { rule: s.threshold.text, positive: y.classes[1], innerFolds: s.threshold.innerFolds, ...(s.threshold.timeOrdered ? { timeOrdered: true as const } : {}) } } : {}),
    outer: { folds: outerFolds, summary, pooled, ...(outerThreshold ? { threshold: outerThreshold } : {}) },
    stability: { distinct: winners.length, winners, topShare: winners[0].folds / outerFolds.length },
    recommendation: {
      id: rec.id,
      spec: rec.spec,
      params: { ...rec.params },
      innerMean: allStats[final.pick].mean!,
      innerSd: allStats[final.pick].sd,
      best: candidates[final.best].id,
      bestSpec: candidates[final.best].spec,
      bestInnerMean: allStats[final.best].mean!,
      matchesTopWinner: winners[0].id === rec.id,
      ...(all.threshold && y.task === 'classification'
        ? { threshold: { value: Number.isFinite(all.threshold.value) ? all.threshold.value : null, met: all.threshold.met, rows: searchRows.length } }
        : {}),
    },
    ...(holdout ? { holdout } : {}),
    ...(comparisons ? { comparisons } : {}),
    warnings: [...new Set(warnings)],
    audit: { ran: options.audit !== false, suspects },
    ...(options.timing === false ? {} : { timing: { totalMs: performance.now() - started, fitMs: work.fitMs, predictMs: work.predictMs } }),
  };
  return { report, predictions };
}
