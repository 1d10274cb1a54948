/**
 * `foldwise growth DATA --target COL [--sizes 0.1,0.2,...,1] [eval's plan, learner, metric and
 * seed options] [--jobs N] [--shard I/N] [--journal FILE] [--command NAME=PROGRAM]
 * [--json FILE|-] [--markdown FILE|-] [--html FILE|-]`: learning curves (src/growth/growth.ts),
 * run like eval (src/growth/run-growth.ts): worker threads, shards for `foldwise merge`, a
 * journal to resume from, `command:` learners. Exit codes: 0, 2 bad input, 130/143 stopped.
 */
import { COSTS_HELP, costsOf, type CostsFlags } from './costs-option.js';
import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import { Option, type Command } from 'commander';
import { DEFAULT_MISSING } from '../data/load-csv.js';
import { loadTable } from '../data/load-table.js';
import { EXIT_OK, UsageError } from '../errors.js';
import { executeGrowth } from '../growth/run-growth.js';
import { renderGrowthHtml } from '../report/html/growth-page.js';
import { renderGrowthMarkdown } from '../report/growth-markdown.js';
import { IMPUTE_CHOICES, type Impute } from '../prep/fold-prep.js';
import { writeFileAtomic } from '../report/atomic.js';
import { DEFAULT_PLAN, DEFAULT_SEED } from '../run/evaluate.js';
import { InterruptedError } from '../run/execute.js';
import { readSettings } from '../run/identity.js';
import { parseShard } from '../run/shard.js';
import { ON_FOLD_ERROR_CHOICES, type OnFoldError } from '../run/tasks.js';
import { addCommandOptions, commandSetupOf, type CommandFlags } from './command-options.js';
import { addDataOptions, checkOutputs, loadOptionsOf, parseDelimiter, parseJobs, parseMissing, parseSeed, problemOptionsOf, sourceOf, type DataFlags } from './data-options.js';
import type { Io } from './io.js';
import { writeOutputs } from './output.js';
import { progressFor } from './progress.js';

interface GrowthFlags extends DataFlags, CommandFlags, CostsFlags {
  plan: string;
  stratify: boolean;
  learner?: string[];
  baseline: boolean;
  metric?: string;
  seed: string;
  impute: Impute;
  sizes?: string;
  json?: string;
  markdown?: string;
  html?: string;
  jobs: string;
  overCores?: boolean;
  shard?: string;
  journal?: string;
  quiet?: boolean;
  onFoldError: OnFoldError;
}

const collect = (v: string, prev: string[] = []): string[] => [...prev, v];

export function parseSizes(text: string): number[] {
  return text.split(',').map((t) => {
    const s = t.trim();
    if (!/^(\d+(\.\d+)?|\.\d+)$/.test(s)) throw new UsageError(`--sizes ${text}: "${s}" is not a number; give fractions such as 0.1 or row counts such as 200, comma-separated`);
    return Number(s);
  });
}

async function runGrowth(data: string, flags: GrowthFlags, io: Io): Promise<number> {
  if ([flags.json, flags.markdown, flags.html].filter((f) => f === '-').length > 1) throw new UsageError('--json -, --markdown - and --html -: only one of them can go to standard output');
  checkOutputs(data, [['--json', flags.json], ['--markdown', flags.markdown], ['--html', flags.html], ['--journal', flags.journal]], [['--costs', flags.costs]]);
  const costs = costsOf(flags);
  if (flags.journal === '-') throw new UsageError('--journal -: a journal is a file that is read back on resume; give a file name');
  const sizes = parseSizes(flags.sizes ?? '');
  const seed = parseSeed(flags.seed);
  const asked = parseJobs(flags.jobs);
  // each worker holds its own copy of the subset matrices: more workers than cores only costs memory
  const cores = availableParallelism();
  const jobs = flags.overCores ? asked : Math.min(asked, cores);
  if (jobs < asked) io.stderr.write(`foldwise: warning: --jobs ${asked}: capped at the ${cores} cores of this machine (add --over-cores to run ${asked} workers anyway)\n`);
  const shard = flags.shard === undefined ? undefined : parseShard(flags.shard);
  if (shard && (!flags.json || flags.json === '-' || flags.markdown || flags.html)) throw new UsageError('--shard: write the part with --json FILE (parts have no Markdown or HTML); then foldwise merge the parts');
  const commands = commandSetupOf(flags, io);
  const progress = progressFor(io, Boolean(flags.quiet));
  // the tasks run on worker threads (with --jobs > 1, and with --jobs 1 when signals are caught): numeric columns loaded into shared memory are not copied there
  const table = await loadTable(sourceOf(data, io), { ...loadOptionsOf(flags), ...(progress ? { onProgress: progress.loading } : {}), ...(jobs > 1 || io.armStops ? { shared: true } : {}) });
  const missing = flags.missing !== undefined ? parseMissing(flags.missing) : DEFAULT_MISSING;
  let resumedNote = '';
  let disarm: (() => void) | undefined;
  const result = await executeGrowth(
    table,
    {
      ...problemOptionsOf(flags),
      plan: flags.plan,
      stratify: flags.stratify,
      learners: flags.learner,
      baseline: flags.baseline,
      ...(flags.metric ? { metrics: [flags.metric] } : {}),
      seed,
      impute: flags.impute,
      onFoldError: flags.onFoldError,
      sizes,
      ...(costs ? { costs } : {}),
    },
    {
      commands,
      jobs,
      shard,
      journal: flags.journal,
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
    },
  ).finally(() => {
    progress?.stop();
    disarm?.();
  });
  if (io.stop?.aborted) throw new InterruptedError(`stopped (${String(io.stop.reason)})`, io.stop.reason);
  if (result.kind === 'partial') {
    writeFileAtomic(flags.json!, `${JSON.stringify(result.partial)}\n`, '--json');
    return EXIT_OK;
  }
  const report = result.report;
  for (const w of report.warnings) io.stderr.write(`foldwise: warning: ${w.replace(/\r?\n|\r/g, ' ')}\n`);
  if (commands?.keepTemp) io.stderr.write(`foldwise: --keep-temp: the folders of each fold and size are in ${commands.tempRoot} (foldwise-NAME-FOLD-*)\n`);
  writeOutputs(io, flags, {
    json: () => `${JSON.stringify(report, null, 2)}\n`,
    markdown: () => renderGrowthMarkdown(report),
    html: () => renderGrowthHtml(report),
  });
  return EXIT_OK;
}

export function registerGrowth(prog: Command, io: Io, setCode: (code: number) => void): void {
  addCommandOptions(addDataOptions(prog.command('growth').description('learning curves: scores on the same test rows when learners train on growing nested parts of each training fold')))
    .option('--sizes <list>', 'training sizes: fractions of each training fold (0.1,...,1) or row counts, smallest first', '0.1,0.2,0.3,0.4,0.5,0.6,0.7,0.8,0.9,1')
    .option('--plan <plan>', 'resampling plan (as for eval)', DEFAULT_PLAN)
    .option('--no-stratify', 'do not stratify the plan and the subsets by class')
    .option('--learner <spec>', 'learner (repeatable; as for eval, including command:NAME with --command)', collect)
    .option('--no-baseline', 'leave the baseline out')
    .option('--metric <name>', 'the metric of the curves (default: the task\'s headline)')
    .option('--costs <file>', COSTS_HELP)
    .option('--seed <n>', 'random seed, a whole number from 0 to 4294967295', String(DEFAULT_SEED))
    .addOption(new Option('--impute <how>', 'numeric imputation, fitted on each training subset').choices(IMPUTE_CHOICES).default('median'))
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output (the default)')
    .option('--html <file>', 'write a self-contained HTML page with one chart per learner to a file, or - for standard output')
    .option('--jobs <n>', 'worker threads (default and most: the available cores; see --over-cores)', String(availableParallelism()))
    .option('--over-cores', 'let --jobs exceed the number of cores')
    .option('--shard <i/n>', 'run only shard I of N of the (fold, size, learner) tasks and write a part for foldwise merge (with --json FILE)')
    .option('--journal <file>', 'record finished tasks; rerunning the same command resumes from it')
    .option('--quiet', 'no progress bar or notes on standard error (warnings still print)')
    .addOption(new Option('--on-fold-error <what>', 'when a fold of a command: learner fails: fail the run, or leave that point out and say so').choices(ON_FOLD_ERROR_CHOICES).default('fail'))
    .action(async (data: string, flags: GrowthFlags) => setCode(await runGrowth(data, flags, io)));
}
