/**
 * `foldwise compare FIRST.json SECOND.json [--metric M] [--learner SPEC]...`: the same learners
 * across two eval reports made on the same data, plan and seed, paired by (repeat, fold), as a
 * Markdown table on standard output (difference = second minus first). Exit codes: 0 compared;
 * 2 when a file is missing or not a report, or the runs are not comparable (one line naming
 * exactly what differs).
 */
import type { Command } from 'commander';
import { compareReports } from '../compare/compare-reports.js';
import { readReport } from '../compare/read-report.js';
import { renderCompareMarkdown } from '../compare/render.js';
import { EXIT_OK } from '../errors.js';
import { writeFileAtomic } from '../report/atomic.js';
import { guardPaths } from './guard.js';
import type { Io } from './io.js';

interface CompareFlags {
  json?: string;
  metric?: string;
  learner?: string[];
  verbose?: boolean;
}

const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

function runCompare(firstPath: string, secondPath: string, flags: CompareFlags, io: Io): number {
  guardPaths([{ option: 'compare', path: firstPath }, { option: 'compare', path: secondPath }], [{ option: '--json', path: flags.json }]);
  const first = readReport(firstPath, 'compare');
  const second = readReport(secondPath, 'compare');
  const result = compareReports(first, second, { metric: flags.metric, learners: flags.learner });
  for (const w of result.warnings) io.stderr.write(`foldwise: warning: ${w}\n`);
  if (flags.json !== undefined) {
    const text = `${JSON.stringify({ schema: 'foldwise-compare/2', ...result }, null, 2)}\n`;
    if (flags.json === '-') io.stdout.write(text);
    else writeFileAtomic(flags.json, text, '--json');
  }
  if (flags.json !== '-') io.stdout.write(renderCompareMarkdown(result));
  return EXIT_OK;
}

export function registerCompare(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('compare')
    .description('compare the same learners across two eval reports on the same data, plan and seed, fold by fold')
    .argument('<first>', 'the first JSON report (foldwise eval --json)')
    .argument('<second>', 'the second JSON report; differences are second minus first')
    .option('--metric <name>', 'the metric to compare (default: the first report\'s headline)')
    .option('--learner <spec>', 'a learner spec present in both reports (repeatable; default: every spec in both)', collect)
    .option('--json <file>', 'also write the comparison as JSON (schema/compare.schema.json) to a file, or - for standard output instead of Markdown')
    .option('--verbose', 'print stack traces of errors')
    .action((first: string, second: string, flags: CompareFlags) => setCode(runCompare(first, second, flags, io)));
}
