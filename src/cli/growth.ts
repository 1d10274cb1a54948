/**
 * `foldwise growth DATA --target COL [--sizes 0.1,0.2,...,1] [eval's plan, learner, metric and
 * seed options] [--json FILE|-] [--markdown FILE|-] [--html FILE|-]`: learning curves (src/growth/growth.ts).
 * Runs in this thread (no --jobs, shards or journal yet). Exit codes: 0, 2 bad input.
 */
import { Option, type Command } from 'commander';
import { loadCsv } from '../data/load-csv.js';
import { EXIT_OK, UsageError } from '../errors.js';
import { growth } from '../growth/growth.js';
import { renderGrowthHtml } from '../report/html/growth-page.js';
import { renderGrowthMarkdown } from '../report/growth-markdown.js';
import { IMPUTE_CHOICES, type Impute } from '../prep/fold-prep.js';
import { checkWritable, writeFileAtomic } from '../report/atomic.js';
import { DEFAULT_PLAN, DEFAULT_SEED } from '../run/evaluate.js';
import { addDataOptions, checkOutputs, loadOptionsOf, parseSeed, problemOptionsOf, sourceOf, type DataFlags } from './data-options.js';
import type { Io } from './io.js';

interface GrowthFlags extends DataFlags {
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
}

const collect = (v: string, prev: string[] = []): string[] => [...prev, v];

export function parseSizes(text: string): number[] {
  return text.split(',').map((t) => {
    const s = t.trim();
    if (!/^(\d+(\.\d+)?|\.\d+)$/.test(s)) throw new UsageError(`--sizes ${text}: "${s}" is not a number; give fractions such as 0.1 or row counts such as 200, comma-separated`);
    return Number(s);
  });
}

export function registerGrowth(prog: Command, io: Io, setCode: (code: number) => void): void {
  addDataOptions(prog.command('growth').description('learning curves: scores on the same test rows when learners train on growing nested parts of each training fold'))
    .option('--sizes <list>', 'training sizes: fractions of each training fold (0.1,...,1) or row counts, smallest first', '0.1,0.2,0.3,0.4,0.5,0.6,0.7,0.8,0.9,1')
    .option('--plan <plan>', 'resampling plan (as for eval)', DEFAULT_PLAN)
    .option('--no-stratify', 'do not stratify the plan and the subsets by class')
    .option('--learner <spec>', 'learner (repeatable; as for eval)', collect)
    .option('--no-baseline', 'leave the baseline out')
    .option('--metric <name>', 'the metric of the curves (default: the task\'s headline)')
    .option('--seed <n>', 'random seed, a whole number from 0 to 4294967295', String(DEFAULT_SEED))
    .addOption(new Option('--impute <how>', 'numeric imputation, fitted on each training subset').choices(IMPUTE_CHOICES).default('median'))
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output (the default)')
    .option('--html <file>', 'write a self-contained HTML page with one chart per learner to a file, or - for standard output')
    .action(async (data: string, flags: GrowthFlags) => {
      if ([flags.json, flags.markdown, flags.html].filter((f) => f === '-').length > 1) throw new UsageError('--json -, --markdown - and --html -: only one of them can go to standard output');
      checkOutputs(data, [['--json', flags.json], ['--markdown', flags.markdown], ['--html', flags.html]]);
      if (flags.html && flags.html !== '-') checkWritable(flags.html, '--html');
      if (flags.json && flags.json !== '-') checkWritable(flags.json, '--json');
      if (flags.markdown && flags.markdown !== '-') checkWritable(flags.markdown, '--markdown');
      const sizes = parseSizes(flags.sizes ?? '');
      const seed = parseSeed(flags.seed);
      const table = await loadCsv(sourceOf(data, io), loadOptionsOf(flags));
      const report = growth(table, {
        ...problemOptionsOf(flags),
        plan: flags.plan,
        stratify: flags.stratify,
        learners: flags.learner,
        baseline: flags.baseline,
        ...(flags.metric ? { metrics: [flags.metric] } : {}),
        seed,
        impute: flags.impute,
        sizes,
      });
      for (const w of report.warnings) io.stderr.write(`foldwise: warning: ${w.replace(/\r?\n|\r/g, ' ')}\n`);
      const json = `${JSON.stringify(report, null, 2)}\n`;
      const md = renderGrowthMarkdown(report);
      if (flags.json === '-') io.stdout.write(json);
      else if (flags.json) writeFileAtomic(flags.json, json, '--json');
      if (flags.html === '-') io.stdout.write(renderGrowthHtml(report));
      else if (flags.html) writeFileAtomic(flags.html, renderGrowthHtml(report), '--html');
      if (flags.markdown && flags.markdown !== '-') writeFileAtomic(flags.markdown, md, '--markdown');
      else if (flags.markdown === '-' || (flags.json !== '-' && flags.html !== '-')) io.stdout.write(md);
      setCode(EXIT_OK);
    });
}
