/**
 * The options and parsers every data command shares (eval, tune, audit, split): the data file
 * and how to read it, the target and the problem flags, the seed, --jobs, and the output check.
 */
import { Option, type Command } from 'commander';
import { availableParallelism } from 'node:os';
import type { CsvSource, LoadOptions } from '../data/load-csv.js';
import { DEFAULT_MISSING } from '../data/load-csv.js';
import { DATE_ORDERS, parseDateOrder } from '../data/dates.js';
import type { ProblemOptions } from '../data/problem.js';
import { UsageError } from '../errors.js';
import { TASKS, type Task } from '../learning.js';
import { guardPaths } from './guard.js';
import type { Io } from './io.js';

const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

/** Parses --seed text strictly: digits only, 0 to 2^32-1. */
export function parseSeed(text: string): number {
  if (!/^\d+$/.test(text) || Number(text) > 0xffffffff) {
    throw new UsageError(`--seed ${text}: expected a whole number from 0 to 4294967295`);
  }
  return Number(text);
}

/** Parses --delimiter: one character, or the words "tab"/"\t" for a tab. */
export function parseDelimiter(text: string): string {
  if (text === '\\t' || text === 'tab') return '\t';
  return text;
}

/** --missing: comma-separated tokens that mean missing, besides the empty cell (always missing). */
export function parseMissing(text: string): string[] {
  return ['', ...text.split(',').map((t) => t.trim()).filter((t) => t !== '')];
}

export interface DataFlags {
  target: string;
  drop?: string[];
  categorical?: string[];
  delimiter?: string;
  missing?: string;
  task?: Task;
  group?: string;
  order?: string;
  dateFormat?: string;
  verbose?: boolean;
}

/** Options shared by every command that reads a CSV. */
export function addDataOptions(cmd: Command): Command {
  return cmd
    .argument('<data>', 'CSV, Parquet or Arrow file, or - for CSV on standard input')
    .requiredOption('--target <column>', 'the column to predict')
    .option('--drop <column>', 'leave a column out (repeatable)', collect)
    .option('--categorical <column>', 'read a column as categorical even if numeric (repeatable)', collect)
    .option('--delimiter <char>', 'field separator, one character; "tab" or "\\t" for tab', ',')
    .option('--missing <tokens>', `comma-separated texts that mean missing, besides an empty cell (default ${DEFAULT_MISSING.filter(Boolean).join(',')})`)
    .addOption(new Option('--task <task>', 'force the task instead of inferring it from the target').choices(TASKS))
    .option('--group <column>', 'keep rows with the same value of this column on one side of every split')
    .option('--order <column>', 'time order column (numbers or dates) for forward plans')
    .option('--date-format <order>', `order of day, month and year in dates such as 01/31/2001: ${DATE_ORDERS.join(', ')}`)
    .option('--verbose', 'print stack traces of errors');
}

export function sourceOf(data: string, io: Io): CsvSource {
  if (data === '-') {
    if (!io.stdin) throw new UsageError('data "-": no standard input available');
    return { stream: io.stdin, name: 'stdin' };
  }
  return { path: data };
}

/** The problem flags every data command shares: target, dropped columns, task, group and order. */
export function problemOptionsOf(flags: DataFlags): ProblemOptions {
  return { target: flags.target, drop: flags.drop, task: flags.task, group: flags.group, order: flags.order };
}

export function loadOptionsOf(flags: DataFlags): LoadOptions {
  return {
    delimiter: parseDelimiter(flags.delimiter ?? ','),
    ...(flags.missing !== undefined ? { missing: parseMissing(flags.missing) } : {}),
    ...(flags.categorical ? { categorical: flags.categorical } : {}),
    ...(flags.dateFormat !== undefined ? { dateFormat: parseDateOrder(flags.dateFormat) } : {}),
  };
}

/** --jobs: a whole number from 1 to 256. */
export function parseJobs(text: string): number {
  if (!/^\d+$/.test(text) || Number(text) < 1 || Number(text) > 256) throw new UsageError(`--jobs ${text}: expected a whole number from 1 to 256`);
  return Number(text);
}

/**
 * --jobs and --over-cores as eval and tune read them: the workers to run, capped at the cores of
 * this machine unless --over-cores is given (each worker holds its own copy of the fold
 * matrices: more workers than cores only cost memory), with a warning when capped.
 */
export function jobsOf(text: string, overCores: boolean | undefined, io: Io): number {
  const asked = parseJobs(text);
  const cores = availableParallelism();
  const jobs = overCores ? asked : Math.min(asked, cores);
  if (jobs < asked) io.stderr.write(`foldwise: warning: --jobs ${asked}: capped at the ${cores} cores of this machine (add --over-cores to run ${asked} workers anyway)\n`);
  return jobs;
}

/** Refuses outputs that would overwrite the data file, another input (such as --costs) or each other (see guard.ts). */
export function checkOutputs(data: string, outputs: readonly (readonly [string, string | undefined])[], inputs: readonly (readonly [string, string | undefined])[] = []): void {
  guardPaths([{ option: 'the data file', path: data }, ...inputs.map(([option, path]) => ({ option, path }))], outputs.map(([option, path]) => ({ option, path })));
}
