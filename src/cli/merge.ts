/** `foldwise merge PARTS... --json OUT`: parts of a sharded run (eval or growth) into the report of the whole run. */
import { writeOutputs } from './output.js';
import type { Command } from 'commander';
import { readFileSync } from 'node:fs';
import { EXIT_OK, InputError, UsageError } from '../errors.js';
import { getMetric } from '../metrics/index.js';
import { guardPaths } from './guard.js';
import { renderJson } from '../report/json.js';
import { renderMarkdown } from '../report/markdown.js';
import { mergePartsWithRecords, parsePartial } from '../run/partial.js';
import { GROWTH_PARTIAL_FORMAT, mergeGrowthParts, parseGrowthPartial } from '../growth/run-growth.js';
import { renderGrowthMarkdown } from '../report/growth-markdown.js';
import { renderGrowthHtml } from '../report/html/growth-page.js';
import { checkPredictionsPath, withPredictions } from './predictions-output.js';
import type { Io } from './io.js';

interface MergeFlags {
  json?: string;
  markdown?: string;
  html?: string;
  predictions?: string;
  timing: boolean;
}

function readPart(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(`${path}: ${code === 'ENOENT' ? 'no such file; check the path' : `cannot be read (${code})`}`);
  }
}

export function registerMerge(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('merge')
    .description('merge the parts of a sharded run (eval --shard or growth --shard) into one report')
    .argument('<parts...>', 'part files written by foldwise eval or growth --shard I/N --json FILE')
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output')
    .option('--html <file>', 'parts of foldwise growth: write the HTML page to a file, or - for standard output')
    .option('--predictions <file>', 'write every out-of-fold prediction the parts carry as CSV to a file, or - for standard output')
    .option('--no-timing', 'leave timings out (byte-identical to a single run with --no-timing)')
    .option('--verbose', 'print stack traces of errors')
    .action(async (paths: string[], flags: MergeFlags) => {
      if ([flags.json, flags.markdown, flags.html, flags.predictions].filter((f) => f === '-').length > 1) {
        throw new UsageError('--json -, --markdown -, --html - and --predictions -: only one of them can go to standard output');
      }
      checkPredictionsPath(flags.predictions);
      guardPaths(
        paths.map((path) => ({ option: 'merge', path })),
        [{ option: '--json', path: flags.json }, { option: '--markdown', path: flags.markdown }, { option: '--html', path: flags.html }, { option: '--predictions', path: flags.predictions }],
      );
      const texts = paths.map(readPart);
      // parts of foldwise growth carry their own format; every part must be of one kind
      const growth = texts.map(isGrowthPart);
      if (growth.some((g) => g !== growth[0])) {
        const i = growth.indexOf(!growth[0]);
        throw new InputError(`merge: ${paths[i]} is a part of foldwise ${growth[i] ? 'growth' : 'eval'} and ${paths[0]} of foldwise ${growth[0] ? 'growth' : 'eval'}; merge the parts of one run`);
      }
      if (growth[0]) {
        if (flags.predictions) throw new UsageError('--predictions: parts of foldwise growth carry scores, not predictions');
        const report = mergeGrowthParts(texts.map((t, i) => parseGrowthPartial(t, paths[i])), paths);
        writeOutputs(io, flags, { json: () => `${JSON.stringify(report, null, 2)}\n`, markdown: () => renderGrowthMarkdown(report), html: () => renderGrowthHtml(report) });
        setCode(EXIT_OK);
        return;
      }
      if (flags.html) throw new UsageError('--html: merge writes a page for parts of foldwise growth only; render an eval report with foldwise render');
      const parts = texts.map((t, i) => parsePartial(t, paths[i]));
      const { report, frame, records, keep } = mergePartsWithRecords(parts, paths, flags.timing);
      if (flags.predictions) {
        const missing = records.find((r) => !r.failed && !r.rows);
        if (missing) throw new InputError(`merge --predictions: the parts carry no row numbers (task ${missing.id}); they were made by an older foldwise: rerun the shards`);
      }
      await withPredictions(io, flags.predictions, () => ({ frame, records, keep }), () => {
        if (flags.predictions === '-' && flags.json === undefined && flags.markdown === undefined) return;
        writeOutputs(io, flags, { json: () => renderJson(report), markdown: () => renderMarkdown(report, (m) => getMetric(m).higherIsBetter) });
      });
      setCode(EXIT_OK);
    });
}

/** Whether a part's text is a part of foldwise growth (by its schema field; anything else is read as an eval part). */
function isGrowthPart(text: string): boolean {
  try {
    return (JSON.parse(text) as { schema?: unknown } | null)?.schema === GROWTH_PARTIAL_FORMAT;
  } catch {
    return false;
  }
}
