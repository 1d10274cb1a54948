/**
 * `foldwise score PREDICTIONS`: foldwise's metrics, per-fold summaries, pooled scores, corrected
 * intervals and paired comparisons, from a predictions file (src/score/). The report has the
 * eval report's format with a `source` field, so compare, gate and render read it.
 * Exit codes: 0 written, 2 bad input or usage.
 */
import { COSTS_HELP, costsOf, type CostsFlags } from './costs-option.js';
import { parseGivenThreshold, SCORE_THRESHOLD_HELP } from './threshold-option.js';
import { Option, type Command } from 'commander';
import { readFileSync } from 'node:fs';
import { loadTable, sniffFormat } from '../data/load-table.js';
import { fieldsOfTable, type PredictionFields } from '../score/read-predictions.js';
import { EXIT_OK, InputError, UsageError } from '../errors.js';
import { TASKS, type Task } from '../learning.js';
import { getMetric } from '../metrics/index.js';
import { checkWritable } from '../report/atomic.js';
import { renderEvalHtml } from '../report/html/index.js';
import { renderJson } from '../report/json.js';
import { renderMarkdown } from '../report/markdown.js';
import { scoreReport } from '../score/score-report.js';
import { DEFAULT_SLICE_BINS, parseSliceBins } from '../slices/slice-columns.js';
import { writeOutputs } from './output.js';
import { parseDelimiter } from './data-options.js';
import type { Io } from './io.js';

interface ScoreFlags extends CostsFlags {
  actual?: string;
  predicted?: string;
  fold?: string;
  repeat?: string;
  learner?: string;
  row?: string;
  prob?: string;
  probColumns?: string;
  task?: Task;
  trainRows?: string;
  metric?: string[];
  delimiter: string;
  json?: string;
  markdown?: string;
  html?: string;
  slice?: string[];
  sliceBins?: string;
  threshold?: string;
}

const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

async function readAll(path: string, io: Io): Promise<string | PredictionFields> {
  if (path === '-') {
    if (!io.stdin) throw new UsageError('predictions "-": no standard input available');
    const chunks: Buffer[] = [];
    for await (const c of io.stdin) chunks.push(typeof c === 'string' ? Buffer.from(c) : (c as Buffer));
    return Buffer.concat(chunks).toString('utf8');
  }
  if ((await sniffFormat(path)) !== 'csv') {
    // typed predictions: only nulls are missing, so a class named NA stays a class
    return fieldsOfTable(await loadTable({ path }, { missing: [''] }));
  }
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(`${path}: ${code === 'ENOENT' ? 'no such file; check the path' : `cannot be read (${code})`}`);
  }
}

function parseTrainRows(text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  if (!/^\d+$/.test(text) || Number(text) < 1) throw new UsageError(`--train-rows ${text}: expected a whole number from 1`);
  return Number(text);
}

export function registerScore(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('score')
    .description('score predictions made anywhere: per-fold summaries, pooled scores, corrected intervals and comparisons')
    .argument('<predictions>', 'a CSV of predictions (written by foldwise eval --predictions, or any with named columns), or - for standard input')
    .option('--actual <column>', 'the column of actual values (default for foldwise files: actual)')
    .option('--predicted <column>', 'the column of predicted classes or values')
    .option('--fold <column>', 'the column naming each row\'s fold')
    .option('--repeat <column>', 'the column naming each row\'s repeat (default: one repeat)')
    .option('--learner <column>', 'the column naming the model, for several models in one long file')
    .option('--row <column>', 'the column of 0-based data rows (gives the fold assignment fingerprint)')
    .option('--prob <prefix>', 'probability columns: those whose names start with PREFIX, the rest of the name being the class')
    .option('--prob-columns <list>', 'probability columns by name, comma-separated; each name is its class')
    .addOption(new Option('--task <task>', 'force the task instead of inferring it').choices(TASKS))
    .option('--train-rows <n>', 'training rows of every fold, when the file does not say (for the corrected intervals)')
    .option('--metric <name>', 'metric to report (repeatable; the first is the headline)', collect)
    .option('--costs <file>', COSTS_HELP)
    .option('--threshold <t>', SCORE_THRESHOLD_HELP)
    .option('--slice <column>', 'also score every metric per level of this column of the predictions file (repeatable; numeric columns are cut into quantile bins)', collect)
    .option('--slice-bins <n>', `quantile bins of a numeric --slice column, edges fixed on all lines (default ${DEFAULT_SLICE_BINS})`)
    .option('--delimiter <char>', 'field separator, one character; "tab" or "\\t" for tab', ',')
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output')
    .option('--html <file>', 'write a self-contained HTML page with charts to a file, or - for standard output')
    .option('--verbose', 'print stack traces of errors')
    .action(async (path: string, flags: ScoreFlags) => {
      if ([flags.json, flags.markdown, flags.html].filter((f) => f === '-').length > 1) {
        throw new UsageError('--json -, --markdown - and --html -: only one of them can go to standard output');
      }
      for (const [option, p] of [['--json', flags.json], ['--markdown', flags.markdown], ['--html', flags.html]] as const) {
        if (p !== undefined && p !== '-') checkWritable(p, option);
      }
      if (flags.prob !== undefined && flags.probColumns !== undefined) throw new UsageError('--prob and --prob-columns: give one of them');
      const trainRows = parseTrainRows(flags.trainRows);
      const costs = costsOf(flags);
      const threshold = flags.threshold === undefined ? undefined : parseGivenThreshold(flags.threshold);
      const text = await readAll(path, io);
      const report = scoreReport(text, path, {
        actual: flags.actual,
        predicted: flags.predicted,
        fold: flags.fold,
        repeat: flags.repeat,
        learner: flags.learner,
        row: flags.row,
        probPrefix: flags.prob,
        probColumns: flags.probColumns?.split(',').map((s) => s.trim()).filter(Boolean),
        task: flags.task,
        delimiter: parseDelimiter(flags.delimiter),
        metrics: flags.metric,
        trainRows,
        ...(costs ? { costs } : {}),
        ...(threshold !== undefined ? { threshold } : {}),
        ...(flags.slice?.length ? { slice: flags.slice, sliceBins: parseSliceBins(flags.sliceBins) } : {}),
      });
      for (const w of report.warnings) io.stderr.write(`foldwise: warning: ${w.replace(/\r?\n|\r/g, ' ')}\n`);
      writeOutputs(io, flags, {
        json: () => renderJson(report),
        markdown: () => renderMarkdown(report, (m) => getMetric(m).higherIsBetter),
        html: () => renderEvalHtml(report),
      });
      setCode(EXIT_OK);
    });
}
