/**
 * `foldwise tune DATA --target COL [--learner SPEC ...]`: hyperparameter search with nested
 * selection (src/search/tune.ts). The search space is counted and checked against the candidate
 * limit before the data is read, and the count is printed on standard error up front. The
 * report goes to standard output as Markdown (default) and/or as JSON, and with --html as a
 * self-contained HTML page with charts (src/report/html/tune-page.ts).
 *
 * Loader options, --seed, --impute, --no-stratify, --json, --markdown, --html, --no-timing,
 * --quiet, --jobs and --over-cores are those of eval; exit codes too: 0 done, 2 bad input or
 * usage, 130/143/129 stopped by a signal while the search runs on worker threads (--jobs > 1,
 * src/search/tune-threads.ts; with --jobs 1 it runs in this thread and signals keep their
 * default action).
 */
import { writeOutputs } from './output.js';
import { type Command, Option } from 'commander';
import { resolve } from 'node:path';
import { loadTable } from '../data/load-table.js';
import { defineProblem } from '../data/problem.js';
import { parsePlan } from '../plans/parse.js';
import { resolveMetrics } from '../run/prepare.js';
import { loadExternalLearners } from '../learners/index.js';
import { EXIT_OK, UsageError } from '../errors.js';
import { IMPUTE_CHOICES, type Impute } from '../prep/fold-prep.js';
import { renderTuneHtml } from '../report/html/index.js';
import { renderTuneMarkdown } from '../report/tune-markdown.js';
import { readRunCosts, DEFAULT_SEED, thresholdPlanOf } from '../run/prepare.js';
import { DEFAULT_MAX_CANDIDATES, MAX_CANDIDATES_LIMIT, parseSearchSpace, planSearch } from '../search/space.js';
import { PICK_RULES, type PickRule } from '../search/pick.js';
import { DEFAULT_INNER_PLAN, DEFAULT_OUTER_PLAN, DEFAULT_SEARCH, type TuneOptions, tuneWithPredictions } from '../search/tune.js';
import { tuneOnThreads } from '../search/tune-threads.js';
import { InterruptedError } from '../run/execute.js';
import { availableParallelism } from 'node:os';
import { tuneRecords } from '../search/tune-predictions.js';
import { checkKeep, keptText } from '../run/predictions-out.js';
import { checkPredictionsPath, withPredictions } from './predictions-output.js';
import { addDataOptions, checkOutputs, type DataFlags, jobsOf, loadOptionsOf, parseSeed, sourceOf, problemOptionsOf } from './data-options.js';
import type { Io } from './io.js';
import { printAuditSuspects } from './warnings.js';
import { addCommandOptions, commandSetupOf, type CommandFlags } from './command-options.js';
import { COSTS_HELP, costsOf, type CostsFlags } from './costs-option.js';
import { parseThresholdFolds, THRESHOLD_FOLDS_HELP, THRESHOLD_HELP } from './threshold-option.js';

interface TuneFlags extends DataFlags, CommandFlags, CostsFlags {
  threshold?: string;
  thresholdFolds?: string;
  plan: string;
  inner: string;
  stratify: boolean;
  learner?: string[];
  metric?: string[];
  pick: PickRule;
  sample?: string;
  maxCandidates?: string;
  holdout?: string;
  seed: string;
  impute: Impute;
  json?: string;
  markdown?: string;
  html?: string;
  predictions?: string;
  predictionsKeep?: string[];
  timing: boolean;
  audit: boolean;
  quiet?: boolean;
  jobs: string;
  overCores?: boolean;
}

const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

/** A whole-number option from 1 to MAX_CANDIDATES_LIMIT. */
export function parseCount(text: string, option: string): number {
  if (!/^\d+$/.test(text.trim()) || Number(text) < 1 || Number(text) > MAX_CANDIDATES_LIMIT) {
    throw new UsageError(`${option} ${text}: expected a whole number from 1 to ${MAX_CANDIDATES_LIMIT}`);
  }
  return Number(text);
}

/** --holdout F: a decimal fraction above 0 and below 1. */
export function parseHoldout(text: string): number {
  const t = text.trim();
  const v = /^(?:\d+\.?\d*|\.\d+)$/.test(t) ? Number(t) : NaN;
  if (!(v > 0 && v < 1)) throw new UsageError(`--holdout ${text}: expected a fraction above 0 and below 1 (such as 0.2)`);
  return v;
}

async function runTune(data: string, flags: TuneFlags, io: Io): Promise<number> {
  if (flags.json === '-' && flags.markdown === '-') throw new UsageError('--json - and --markdown -: only one of them can go to standard output');
  if (flags.html === '-' && (flags.json === '-' || flags.markdown === '-')) {
    throw new UsageError(`${flags.json === '-' ? '--json' : '--markdown'} - and --html -: only one of them can go to standard output`);
  }
  if (flags.predictions === '-' && [flags.json, flags.markdown, flags.html].includes('-')) throw new UsageError('--predictions - and another output to -: only one of them can go to standard output');
  checkPredictionsPath(flags.predictions);
  checkOutputs(data, [['--json', flags.json], ['--markdown', flags.markdown], ['--html', flags.html], ['--predictions', flags.predictions]], [['--costs', flags.costs]]);
  const seed = parseSeed(flags.seed);
  const costs = costsOf(flags);
  const jobs = jobsOf(flags.jobs, flags.overCores, io);
  const sample = flags.sample === undefined ? undefined : parseCount(flags.sample, '--sample');
  const maxCandidates = flags.maxCandidates === undefined ? undefined : parseCount(flags.maxCandidates, '--max-candidates');
  const holdout = flags.holdout === undefined ? undefined : parseHoldout(flags.holdout);
  const specs = flags.learner?.length ? flags.learner : DEFAULT_SEARCH;

  // module: and command: learners must be registered before the search space is read
  const commands = commandSetupOf(flags, io);
  await loadExternalLearners(specs.map((s) => s.split(';')[0]), io.cwd ?? resolve('.'), commands);
  // count the candidates before reading any data
  const counted = planSearch(parseSearchSpace(specs), { sample, maxCandidates });
  const grid = counted.gridSize === null ? 'an unbounded space' : `a grid of ${counted.gridSize}`;
  const note = `foldwise: tune: ${counted.tried} candidate${counted.tried === 1 ? '' : 's'} ${counted.sampled ? 'sampled from' : 'in'} ${grid}; outer ${flags.plan}, inner ${flags.inner}\n`;

  // with --jobs > 1 the search runs on worker threads: load the numeric columns into shared memory, so they are not copied there
  const table = await loadTable(sourceOf(data, io), { ...loadOptionsOf(flags), ...(jobs > 1 ? { shared: true } : {}) });
  // the note comes once the data, target, plans and metrics are known to be usable, so that a
  // refused run prints its one error line only
  const problem = defineProblem(table, problemOptionsOf(flags));
  resolveMetrics(problem, flags.metric, readRunCosts(problem, costs, flags.metric));
  const thresholdFolds = flags.thresholdFolds === undefined ? undefined : parseThresholdFolds(flags.thresholdFolds);
  const threshold = { ...(flags.threshold !== undefined ? { threshold: flags.threshold } : {}), ...(thresholdFolds !== undefined ? { thresholdFolds } : {}) };
  thresholdPlanOf(problem, threshold, parsePlan(flags.plan));
  try {
    parsePlan(flags.inner);
  } catch (e) {
    if (e instanceof UsageError) throw new UsageError(e.message.replace(/^--plan\b/, '--inner'));
    throw e;
  }
  if (!flags.quiet) io.stderr.write(note);
  const keep = flags.predictionsKeep ?? [];
  const options: TuneOptions = {
    ...problemOptionsOf(flags),
    plan: flags.plan,
    inner: flags.inner,
    stratify: flags.stratify,
    learners: specs,
    metrics: flags.metric,
    pick: flags.pick,
    sample,
    maxCandidates,
    holdout,
    seed,
    impute: flags.impute,
    timing: flags.timing,
    audit: flags.audit,
    ...(costs ? { costs } : {}),
    ...threshold,
  };
  let result: ReturnType<typeof tuneWithPredictions>;
  if (jobs > 1) {
    // the search runs on worker threads, so this thread sees a stop signal: the workers (and
    // the programs of command: learners) are ended and the exit code is 128 + the signal's number
    const disarm = io.armStops?.();
    try {
      result = await tuneOnThreads(table, options, {
        jobs,
        baseDir: io.cwd ?? resolve('.'),
        commands,
        stop: io.stop,
        stopError: (reason) => new InterruptedError(`tune: stopped (${String(reason)}); nothing was written`, reason),
      });
    } finally {
      disarm?.();
    }
  } else {
    result = tuneWithPredictions(table, options);
  }
  const { report, predictions } = result;
  printAuditSuspects(io, report.audit);
  for (const w of report.warnings) io.stderr.write(`foldwise: warning: ${w.replace(/\r?\n|\r/g, ' ')}\n`);
  const y = predictions.problem.target;
  if (flags.predictions) checkKeep(table, keep, y.task, y.task === 'classification' ? y.classes : []);
  const made = () => {
    const { frame, records } = tuneRecords(predictions, report.metrics);
    return { frame, records: keep.length ? records.map((r) => ({ ...r, keep: keptText(table, keep, r.rows!) })) : records, keep };
  };
  await withPredictions(io, flags.predictions, made, () => {
    if (flags.predictions === '-' && flags.json === undefined && flags.markdown === undefined && flags.html === undefined) return;
    writeOutputs(io, flags, { json: () => `${JSON.stringify(report, null, 2)}\n`, markdown: () => renderTuneMarkdown(report), html: () => renderTuneHtml(report) });
  });
  return EXIT_OK;
}

export function registerTune(prog: Command, io: Io, setCode: (code: number) => void): void {
  addCommandOptions(
    addDataOptions(
      prog
        .command('tune')
        .description('search learner options with nested cross-validation: an honest outer estimate, and the candidate to deploy'),
    ),
  )
    .option('--plan <plan>', 'outer resampling plan (as for eval)', DEFAULT_OUTER_PLAN)
    .option('--inner <plan>', 'inner plan, run on each outer fold\'s training rows (as for eval)', DEFAULT_INNER_PLAN)
    .option('--no-stratify', 'do not stratify classification plans by class')
    .option('--learner <spec>', 'search space NAME:key=A|B|C,key=FROM..TO+STEP or FROM..TO*FACTOR (repeatable; see foldwise learners)', collect)
    .option('--metric <name>', 'metric to report (repeatable; the first is the headline and decides the pick)', collect)
    .option('--costs <file>', COSTS_HELP)
    .option('--threshold <rule>', `${THRESHOLD_HELP}; in tune, for the pick of each outer fold`)
    .option('--threshold-folds <k>', THRESHOLD_FOLDS_HELP)
    .addOption(new Option('--pick <rule>', 'best inner mean, or the simplest within one standard error of it').choices(PICK_RULES).default('best'))
    .option('--sample <n>', 'random search: try n candidates drawn from the space (seeded)')
    .option('--max-candidates <n>', `most candidates a search may try (default ${DEFAULT_MAX_CANDIDATES})`)
    .option('--holdout <fraction>', 'set this share of the rows aside before any selection and score the recommendation on it once')
    .option('--seed <n>', 'random seed, a whole number from 0 to 4294967295', String(DEFAULT_SEED))
    .addOption(new Option('--impute <how>', 'numeric imputation, fitted on training rows').choices(IMPUTE_CHOICES).default('median'))
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output')
    .option('--html <file>', 'write a self-contained HTML page with charts to a file, or - for standard output')
    .option('--predictions <file>', 'write the outer-fold (and holdout) predictions of the tuned procedure and the baseline as CSV, or - for standard output')
    .option('--predictions-keep <column>', 'copy an input column into each line of the predictions file (repeatable)', collect)
    .option('--no-timing', 'leave timings out, so the same inputs and seed give a byte-identical report')
    .option('--no-audit', 'skip the quick data audit that runs before the search')
    .option('--quiet', 'no notes on standard error (warnings still print), as for eval')
    .option('--jobs <n>', 'worker threads, one outer fold at a time each (default and most: the available cores; see --over-cores); the report is the same for every n', String(availableParallelism()))
    .option('--over-cores', 'let --jobs exceed the number of cores (each worker costs memory, and more workers than cores gain no speed)')
    .action(async (data: string, flags: TuneFlags) => setCode(await runTune(data, flags, io)));
}
