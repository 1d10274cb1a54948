/**
 * The command line. `run(argv, io)` parses arguments into typed options, calls the core, and
 * writes results; it never exits the process, so tests call it in-process. `bin.ts` is the only
 * place that touches `process`.
 */
import { Command, CommanderError, Option } from 'commander';
import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import type { CsvSource, LoadOptions } from '../data/load-csv.js';
import { DEFAULT_MISSING } from '../data/load-csv.js';
import { loadTable } from '../data/load-table.js';
import { shareTableInPlace } from '../run/share.js';
import { DATE_ORDERS, parseDateOrder } from '../data/dates.js';
import type { ProblemOptions } from '../data/problem.js';
import { EXIT_BAD_INPUT, EXIT_OK, FoldwiseError, UsageError } from '../errors.js';
import { LEARNERS } from '../learners/index.js';
import { TASKS, type Task } from '../learning.js';
import { getMetric, METRICS } from '../metrics/index.js';
import { IMPUTE_CHOICES, type Impute } from '../prep/fold-prep.js';
import { writeFileAtomic } from '../report/atomic.js';
import { guardPaths } from './guard.js';
import { renderJson } from '../report/json.js';
import { renderEvalHtml } from '../report/html/index.js';
import { renderMarkdown } from '../report/markdown.js';
import { DEFAULT_PLAN, DEFAULT_SEED } from '../run/evaluate.js';
import { ON_FOLD_ERROR_CHOICES, type OnFoldError } from '../run/tasks.js';
import { DEFAULT_TIMEOUT_S } from '../learners/command/protocol.js';
import { execute, InterruptedError } from '../run/execute.js';
import { readSettings } from '../run/identity.js';
import { withWiderSamples } from '../run/pooled-sample.js';
import { parseShard } from '../run/shard.js';
import { DEFAULT_SLICE_BINS, parseSliceBins } from '../slices/slice-columns.js';
import { registerMerge } from './merge.js';
import { registerScore } from './score.js';
import { registerGrowth } from './growth.js';
import { registerPower } from './power.js';
import { progressFor } from './progress.js';
import { VERSION } from '../version.js';
import { registerAudit } from './audit.js';
import { registerTune } from './tune.js';
import { registerRender } from './render.js';
import { registerCompare } from './compare.js';
import { registerGate } from './gate.js';
import { addCommandOptions, commandSetupOf, type CommandFlags } from './command-options.js';
import { COSTS_HELP, costsOf, type CostsFlags } from './costs-option.js';
import { parseThresholdFolds, THRESHOLD_FOLDS_HELP, THRESHOLD_HELP } from './threshold-option.js';
import { writeOutputs } from './output.js';
import { checkPredictionsPath, withPredictions } from './predictions-output.js';
import { runCleanups } from './cleanup.js';
import { runSplit } from './split.js';
import { printAuditSuspects } from './warnings.js';
import type { Io } from './io.js';
import {
  addDataOptions,
  checkOutputs,
  loadOptionsOf,
  parseDelimiter,
  jobsOf,
  parseMissing,
  parseSeed,
  problemOptionsOf,
  sourceOf,
  type DataFlags,
} from './data-options.js';

export type { Io } from './io.js';
export { addDataOptions, checkOutputs, loadOptionsOf, parseDelimiter, parseJobs, parseMissing, parseSeed, problemOptionsOf, sourceOf, type DataFlags } from './data-options.js';


const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

interface EvalFlags extends DataFlags, CommandFlags, CostsFlags {
  onFoldError: OnFoldError;
  plan: string;
  stratify: boolean;
  learner?: string[];
  baseline: boolean;
  metric?: string[];
  seed: string;
  impute: Impute;
  final?: boolean;
  json?: string;
  markdown?: string;
  timing: boolean;
  jobs: string;
  overCores?: boolean;
  shard?: string;
  journal?: string;
  quiet?: boolean;
  audit: boolean;
  html?: string;
  predictions?: string;
  predictionsKeep?: string[];
  slice?: string[];
  sliceBins?: string;
  importance?: boolean;
  importanceRepeats?: string;
  importanceClusters?: boolean;
  threshold?: string;
  thresholdFolds?: string;
}

/** --importance-repeats: a whole number (its range is checked with the run's options). */
function parseImportanceRepeats(text: string): number {
  if (!/^\d+$/.test(text)) throw new UsageError(`--importance-repeats ${text}: expected a whole number from 1 to 1000`);
  return Number(text);
}

async function runEval(data: string, flags: EvalFlags, io: Io): Promise<number> {
  if ([flags.json, flags.markdown, flags.html].filter((f) => f === '-').length > 1) {
    throw new UsageError('--json -, --markdown - and --html -: only one of them can go to standard output');
  }
  if (flags.predictions === '-' && [flags.json, flags.markdown, flags.html].includes('-')) {
    throw new UsageError('--predictions - and a report to -: only one of them can go to standard output');
  }
  checkPredictionsPath(flags.predictions);
  checkOutputs(data, [['--json', flags.json], ['--markdown', flags.markdown], ['--html', flags.html], ['--journal', flags.journal], ['--predictions', flags.predictions]], [['--costs', flags.costs]]);
  if (flags.journal === '-') throw new UsageError('--journal -: a journal is a file that is read back on resume; give a file name');
  const seed = parseSeed(flags.seed);
  const costs = costsOf(flags);
  const jobs = jobsOf(flags.jobs, flags.overCores, io);
  const shard = flags.shard === undefined ? undefined : parseShard(flags.shard);
  if (shard && (!flags.json || flags.markdown || flags.html)) throw new UsageError('--shard: write the part with --json FILE (parts have no Markdown); then foldwise merge the parts');
  if (shard && flags.predictions) throw new UsageError('--predictions with --shard: the part carries its predictions; give --predictions to foldwise merge');
  const commands = commandSetupOf(flags, io);
  const progress = progressFor(io, Boolean(flags.quiet));
  // tasks in worker threads read the columns in shared memory: the loader puts the numeric
  // columns there as it reads, and shareTableInPlace moves the rest (coded columns) once, so the
  // table is not held twice (as loaded, and shared for the workers)
  const toWorkers = jobs > 1 || Boolean(io.armStops);
  const loaded = await loadTable(sourceOf(data, io), { ...loadOptionsOf(flags), ...(progress ? { onProgress: progress.loading } : {}), ...(toWorkers ? { shared: true } : {}) });
  const table = toWorkers ? shareTableInPlace(loaded) : loaded;
  if (flags.audit) progress?.phase('checking the data (quick audit; --no-audit skips it)');
  let resumedNote = '';
  let disarm: (() => void) | undefined;
  const missing = flags.missing !== undefined ? parseMissing(flags.missing) : DEFAULT_MISSING;
  const result = await execute(table, {
    ...problemOptionsOf(flags),
    plan: flags.plan,
    stratify: flags.stratify,
    learners: flags.learner,
    baseline: flags.baseline,
    metrics: flags.metric,
    seed,
    impute: flags.impute,
    final: flags.final,
    timing: flags.timing,
    audit: flags.audit,
    onFoldError: flags.onFoldError,
    ...(flags.slice?.length ? { slice: flags.slice, sliceBins: parseSliceBins(flags.sliceBins) } : {}),
    ...(flags.importance ? { importance: true } : {}),
    ...(flags.importanceRepeats !== undefined ? { importanceRepeats: parseImportanceRepeats(flags.importanceRepeats) } : {}),
    ...(flags.importanceClusters ? { importanceClusters: true } : {}),
    ...(flags.threshold !== undefined ? { threshold: flags.threshold } : {}),
    ...(flags.thresholdFolds !== undefined ? { thresholdFolds: parseThresholdFolds(flags.thresholdFolds) } : {}),
    ...(costs ? { costs } : {}),
  }, {
    commands,
    jobs,
    shard,
    journal: flags.journal,
    keep: flags.predictionsKeep,
    stopRequested: io.interrupted,
    stop: io.stop,
    // the tasks run in worker threads (also with --jobs 1) so that signals are seen during a long fit
    isolate: Boolean(io.armStops),
    onTasks: () => {
      disarm = io.armStops?.();
    },
    notice: (text) => io.stderr.write(`foldwise: warning: ${text}\n`),
    read: readSettings(missing, flags.categorical ?? [], parseDelimiter(flags.delimiter ?? ',')),
    baseDir: io.cwd ?? resolve('.'),
    progress: (done, total, resumed) => {
      if (resumed && !resumedNote) {
        resumedNote = `foldwise: resumed ${resumed} of ${total} tasks from the journal ${flags.journal}\n`;
        if (!flags.quiet) io.stderr.write(resumedNote);
      }
      progress?.tasks(done, total);
    },
  }).finally(() => {
    progress?.stop();
    disarm?.();
  });
  if (io.stop?.aborted) throw new InterruptedError(`stopped (${String(io.stop.reason)})`, io.stop.reason);
  if (result.kind === 'partial') {
    writeFileAtomic(flags.json!, `${JSON.stringify(result.partial)}\n`, '--json');
    return EXIT_OK;
  }
  const report = result.report;
  printAuditSuspects(io, report.audit);
  for (const w of report.warnings) io.stderr.write(`foldwise: warning: ${w.replace(/\r?\n|\r/g, ' ')}\n`);
  if (commands?.keepTemp) io.stderr.write(`foldwise: --keep-temp: the folders of each fold are in ${commands.tempRoot} (foldwise-NAME-FOLD-*)\n`);
  // with the predictions on standard output, a report is written only where a flag says
  const reportsAsked = flags.json !== undefined || flags.markdown !== undefined || flags.html !== undefined;
  const made = () => ({ frame: result.frame, records: result.records, keep: flags.predictionsKeep ?? [] });
  await withPredictions(io, flags.predictions, made, () => {
    if (flags.predictions === '-' && !reportsAsked) return;
    writeOutputs(io, flags, {
      json: () => renderJson(report),
      markdown: () => renderMarkdown(report, (m) => getMetric(m).higherIsBetter),
      // the page is made where every prediction is known: its charts draw up to 5,000 of them
      html: () => renderEvalHtml(withWiderSamples(report, result.records)),
    });
  });
  return EXIT_OK;
}

function listLearners(io: Io): number {
  for (const l of LEARNERS.values()) {
    io.stdout.write(`${l.name}  (${l.tasks.join(', ')})  ${l.doc}\n`);
    for (const p of l.params) {
      const range =
        p.kind === 'choice' ? p.choices.join('|') : p.kind === 'text' ? 'text' : `${p.kind} ${p.min ?? '-inf'}..${p.max ?? 'inf'}`;
      io.stdout.write(`    ${p.name}=${p.default}  [${range}]  ${p.doc}\n`);
    }
  }
  io.stdout.write('module:PATH  an ES module of yours with the learner interface (see README)\n');
  io.stdout.write('command:NAME  a program of yours in any language, given with --command NAME=PROGRAM, run per fold through files (see README)\n');
  io.stdout.write(`    timeout=${DEFAULT_TIMEOUT_S}  [number 0..604800]  seconds a fold may take\n`);
  io.stdout.write('    prep=foldwise  [foldwise|raw]  foldwise preprocessing first, or the columns as read; other key=value options go to the program as text\n');
  return EXIT_OK;
}

function listMetrics(io: Io): number {
  for (const m of METRICS.values()) {
    io.stdout.write(`${m.name}  (${m.task}${m.needsProba ? ', needs probabilities' : ''}, ${m.higherIsBetter ? 'higher' : 'lower'} is better)  ${m.doc}\n`);
  }
  return EXIT_OK;
}

function program(io: Io, setCode: (code: number) => void): Command {
  const prog = new Command('foldwise')
    .description('honest, repeatable cross-validated evaluation of models on tabular CSV data')
    .version(VERSION, '--version')
    .exitOverride()
    .configureOutput({
      writeOut: (s) => io.stdout.write(s),
      writeErr: (s) => io.stderr.write(s),
      outputError: (s, write) => write(`foldwise: ${s.replace(/^error: /, '').trim().replace(/\s*\n\s*/g, ' ')}\n`),
    })
    .showSuggestionAfterError(true);

  addCommandOptions(addDataOptions(prog.command('eval').description('cross-validate learners on a CSV and report per-fold scores with summaries')))
    .option('--plan <plan>', 'resampling plan: kfold:K, kfold:KxR, loo, resplit:N@F, holdout:A/B/C, holdout:A/B, forward:K', DEFAULT_PLAN)
    .option('--no-stratify', 'do not stratify classification plans by class')
    .option('--learner <spec>', 'learner NAME or NAME:key=value,... (repeatable; see foldwise learners)', collect)
    .option('--no-baseline', 'do not evaluate the baseline beside the learners')
    .option('--metric <name>', 'metric to report (repeatable; the first is the headline; see foldwise metrics)', collect)
    .option('--costs <file>', COSTS_HELP)
    .option('--seed <n>', 'random seed, a whole number from 0 to 4294967295', String(DEFAULT_SEED))
    .addOption(new Option('--impute <how>', 'numeric imputation, fitted on training rows').choices(IMPUTE_CHOICES).default('median'))
    .option('--final', 'also score the holdout part of a holdout plan, once')
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output')
    .option('--html <file>', 'write a self-contained HTML page with charts to a file, or - for standard output')
    .option('--no-timing', 'leave timings out, so the same inputs and seed give a byte-identical report')
    .option('--jobs <n>', 'worker threads (default and most: the available cores; see --over-cores)', String(availableParallelism()))
    .option('--over-cores', 'let --jobs exceed the number of cores (each worker costs memory, and more workers than cores gain no speed)')
    .option('--shard <i/n>', 'run only shard I of N and write a part for foldwise merge (with --json FILE)')
    .option('--journal <file>', 'record finished tasks; rerunning the same command resumes from it')
    .option('--quiet', 'no progress bar or notes on standard error (warnings still print)')
    .option('--predictions <file>', 'write every out-of-fold prediction as CSV to a file, or - for standard output')
    .option('--predictions-keep <column>', 'copy an input column (an id, say) into each line of the predictions file (repeatable)', collect)
    .option('--no-audit', 'skip the quick data audit that runs before evaluating')
    .option('--slice <column>', 'also score every metric per level of this column, which need not be a feature (repeatable; numeric columns are cut into quantile bins)', collect)
    .option('--slice-bins <n>', `quantile bins of a numeric --slice column, edges fixed on all rows (default ${DEFAULT_SLICE_BINS})`)
    .option('--importance', "permutation importance: each feature's drop of the headline metric on each fold's test rows when its values are shuffled")
    .option('--importance-repeats <n>', 'shuffles per feature and fold for --importance (default 5)')
    .option('--threshold <rule>', THRESHOLD_HELP)
    .option('--threshold-folds <k>', THRESHOLD_FOLDS_HELP)
    .option('--importance-clusters', "with --importance, also shuffle each of the audit's correlated clusters as one input")
    .addOption(new Option('--on-fold-error <what>', 'when a fold of a command: learner fails: fail the run, or skip the fold and record it in the report').choices(ON_FOLD_ERROR_CHOICES).default('fail'))
    .action(async (data: string, flags: EvalFlags) => setCode(await runEval(data, flags, io)));

  addDataOptions(prog.command('split').description('write the parts of a resampling plan as CSV, Parquet or Arrow files'))
    .option('--plan <plan>', 'resampling plan (as for eval)', DEFAULT_PLAN)
    .option('--no-stratify', 'do not stratify by class')
    .option('--seed <n>', 'random seed, a whole number from 0 to 4294967295', String(DEFAULT_SEED))
    .option('--out <dir>', 'folder for the part files (created if missing)')
    .option('--assign <file>', 'write a row-to-fold assignment CSV')
    .option('--format <format>', 'format of the part files: csv, parquet or arrow (default: the input\'s)')
    .action(async (data: string, flags) => setCode(await runSplit(data, flags, io)));

  registerCompare(prog, io, setCode);
  registerGate(prog, io, setCode);
  registerAudit(prog, io, setCode);
  registerTune(prog, io, setCode);
  registerRender(prog, io, setCode);
  registerMerge(prog, io, setCode);
  registerScore(prog, io, setCode);
  registerPower(prog, io, setCode);
  registerGrowth(prog, io, setCode);

  prog.command('learners').description('list the learners and their options').action(() => setCode(listLearners(io)));
  prog.command('metrics').description('list the metrics').action(() => setCode(listMetrics(io)));
  return prog;
}

/** Runs the CLI on `argv` (without the node and script paths) and returns the exit code. */
export async function run(argv: readonly string[], io: Io): Promise<number> {
  let code = EXIT_OK;
  let verbose = false;
  try {
    const prog = program(io, (c) => (code = c));
    prog.hook('preAction', (_this, action) => {
      verbose = Boolean(action.opts().verbose);
    });
    await prog.parseAsync([...argv], { from: 'user' });
    return code;
  } catch (e) {
    return errorCode(e, io, verbose);
  } finally {
    runCleanups();
  }
}

function errorCode(e: unknown, io: Io, verbose: boolean): number {
  if (e instanceof CommanderError) {
    // help and version exit with code 0; every other commander error is a usage error
    return e.exitCode === 0 ? EXIT_OK : EXIT_BAD_INPUT;
  }
  if (e instanceof FoldwiseError) {
    io.stderr.write(`foldwise: ${e.message.replace(/\r?\n|\r/g, ' ')}\n`);
    if (verbose && e.stack) io.stderr.write(`${e.stack}\n`);
    return e.exitCode;
  }
  const err = e as Error;
  io.stderr.write(`foldwise: internal error: ${err?.message ?? String(e)} (this is a bug; rerun with --verbose and report it)\n`);
  if (verbose && err?.stack) io.stderr.write(`${err.stack}\n`);
  return 70;
}
