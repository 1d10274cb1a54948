/**
 * `foldwise audit DATA --target COL`: profiles the columns and the target and lists what could
 * make a cross-validated score a lie (src/audit), as Markdown (default, to standard output)
 * and/or JSON. Loader options, --plan, --seed and the exit codes are those of eval: 0 done
 * (whatever was found), 2 bad input or usage.
 */
import { writeOutputs } from './output.js';
import { Command, Option } from 'commander';
import { audit } from '../audit/audit.js';
import { renderAuditJson, renderAuditMarkdown } from '../audit/render.js';
import { AUDIT_LIMITS } from '../audit/types.js';
import { loadTable } from '../data/load-table.js';
import { EXIT_OK, UsageError } from '../errors.js';
import { DEFAULT_PLAN, DEFAULT_SEED } from '../run/evaluate.js';
import { addDataOptions, checkOutputs, loadOptionsOf, parseSeed, sourceOf, type DataFlags, problemOptionsOf } from './data-options.js';
import type { Io } from './io.js';

interface AuditFlags extends DataFlags {
  plan: string;
  stratify: boolean;
  seed: string;
  clusterThreshold: string;
  json?: string;
  markdown?: string;
}

/** Parses --cluster-threshold: a decimal number above 0 and at most 1. */
export function parseClusterThreshold(text: string): number {
  const v = /^(?:\d+\.?\d*|\.\d+)$/.test(text.trim()) ? Number(text) : NaN;
  if (!(v > 0 && v <= 1)) throw new UsageError(`--cluster-threshold ${text}: expected a number above 0 and at most 1 (such as 0.9)`);
  return v;
}

async function runAudit(data: string, flags: AuditFlags, io: Io): Promise<number> {
  if (flags.json === '-' && flags.markdown === '-') throw new UsageError('--json - and --markdown -: only one of them can go to standard output');
  checkOutputs(data, [['--json', flags.json], ['--markdown', flags.markdown]]);
  const seed = parseSeed(flags.seed);
  const clusterThreshold = parseClusterThreshold(flags.clusterThreshold);
  const table = await loadTable(sourceOf(data, io), loadOptionsOf(flags));
  const report = audit(table, {
    ...problemOptionsOf(flags),
    plan: flags.plan,
    stratify: flags.stratify,
    seed,
    clusterThreshold,
  });
  for (const w of report.warnings) io.stderr.write(`foldwise: warning: ${w}\n`);
  writeOutputs(io, flags, { json: () => renderAuditJson(report), markdown: () => renderAuditMarkdown(report) });
  return EXIT_OK;
}

export function registerAudit(prog: Command, io: Io, setCode: (code: number) => void): void {
  addDataOptions(prog.command('audit').description('profile the data and list what could make a cross-validated score a lie: leaks, ids, duplicates across folds, redundant features, informative missingness'))
    .option('--plan <plan>', 'the resampling plan eval will use (as for eval)', DEFAULT_PLAN)
    .option('--no-stratify', 'do not stratify classification plans by class')
    .option('--seed <n>', 'random seed, a whole number from 0 to 4294967295', String(DEFAULT_SEED))
    .addOption(new Option('--cluster-threshold <r>', "|Pearson r| (numeric) or Cramer's V (categorical) at which features join one cluster, above 0 and at most 1").default(String(AUDIT_LIMITS.clusterThreshold)))
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output')
    .action(async (data: string, flags: AuditFlags) => setCode(await runAudit(data, flags, io)));
}
