/**
 * `foldwise gate --baseline BASE.json --current NEW.json [--metric M] [--learner SPEC]
 * [--current-learner SPEC] [--max-drop D] [--alpha A] [--worst-allowed X] [--accept]
 * [--json FILE|-]`: passes or fails a change against a committed baseline report.
 *
 * The rule (src/compare/gate.ts and gate-rule.ts): fail only when a one-sided corrected t test
 * rejects H0 "drop <= max-drop" at alpha (paired by (repeat, fold) when the runs share their
 * folds, a labelled unpaired Welch rule when only the plan, seed or stratification differ), or
 * when the current mean is worse than --worst-allowed. A short Markdown verdict goes to standard output (unless
 * --json -) and is appended to the file named by the environment variable GITHUB_STEP_SUMMARY,
 * when set (read from io.env).
 *
 * The baseline file is never written, except by --accept on a passing gate: then the current
 * report's text replaces it atomically (writeFileAtomic). Exit codes: 0 pass, 1 fail,
 * 2 not comparable or bad input (a not-comparable verdict is still printed and appended).
 */
import { appendFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { Option, type Command } from 'commander';
import { DEFAULT_ALPHA, DEFAULT_MAX_DROP, gateReports } from '../compare/gate.js';
import { NotComparableError } from '../compare/match-reports.js';
import { readReport } from '../compare/read-report.js';
import { renderGateMarkdown, renderNotComparableMarkdown } from '../compare/render.js';
import type { GateVerdict } from '../compare/types.js';
import { EXIT_OK, EXIT_REGRESSION, UsageError } from '../errors.js';
import { checkWritable, writeFileAtomic } from '../report/atomic.js';
import type { Io } from './run.js';

interface GateFlags {
  baseline: string;
  current: string;
  metric?: string;
  learner?: string;
  currentLearner?: string;
  maxDrop: string;
  alpha: string;
  worstAllowed?: string;
  absoluteMin?: string;
  accept?: boolean;
  json?: string;
  verbose?: boolean;
}

/** Parses a decimal number option strictly ("0.02", "-0.5", "1e-3"); throws a UsageError. */
export function parseNumberOption(text: string, option: string, what: string): number {
  const t = text.trim();
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) throw new UsageError(`${option} ${text}: expected ${what}`);
  return Number(t);
}

function appendSummary(io: Io, markdown: string): void {
  const path = io.env?.GITHUB_STEP_SUMMARY;
  if (!path) return;
  try {
    appendFileSync(path, `${markdown}\n`);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? String(e);
    io.stderr.write(`foldwise: warning: GITHUB_STEP_SUMMARY ${path}: cannot be appended (${code}); the verdict is on standard output only\n`);
  }
}

function runGate(flags: GateFlags, io: Io): number {
  const maxDrop = parseNumberOption(flags.maxDrop, '--max-drop', "a number >= 0, in the metric's units");
  const alpha = parseNumberOption(flags.alpha, '--alpha', 'a number above 0 and below 0.5 (such as 0.05)');
  if (flags.absoluteMin !== undefined) {
    throw new UsageError('--absolute-min is now --worst-allowed (the worst mean score allowed: a floor when higher is better, a ceiling when lower is better)');
  }
  const worstAllowed = flags.worstAllowed === undefined ? undefined : parseNumberOption(flags.worstAllowed, '--worst-allowed', "a number, in the metric's units");
  if (flags.json && flags.json !== '-') checkWritable(flags.json, '--json');
  if (flags.accept) checkWritable(flags.baseline, '--baseline');
  const base = readReport(flags.baseline, 'gate --baseline');
  const cur = readReport(flags.current, 'gate --current');
  const toStdout = flags.json !== '-';

  let verdict: GateVerdict;
  try {
    verdict = gateReports(base, cur, { metric: flags.metric, learner: flags.learner, currentLearner: flags.currentLearner, maxDrop, alpha, worstAllowed });
  } catch (e) {
    if (e instanceof NotComparableError) {
      const md = renderNotComparableMarkdown(e.reason);
      if (toStdout) io.stdout.write(md);
      appendSummary(io, md);
    }
    throw e;
  }
  if (flags.accept) {
    const accepted = verdict.verdict === 'pass';
    if (accepted && resolve(flags.baseline) !== resolve(flags.current)) writeFileAtomic(flags.baseline, cur.text, '--baseline');
    verdict = { ...verdict, accepted };
  }
  for (const w of verdict.warnings) io.stderr.write(`foldwise: warning: ${w}\n`);
  const md = renderGateMarkdown(verdict);
  if (flags.json) {
    const json = `${JSON.stringify(verdict, null, 2)}\n`;
    if (flags.json === '-') io.stdout.write(json);
    else writeFileAtomic(flags.json, json, '--json');
  }
  if (toStdout) io.stdout.write(md);
  appendSummary(io, md);
  return verdict.verdict === 'pass' ? EXIT_OK : EXIT_REGRESSION;
}

export function registerGate(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('gate')
    .description('pass or fail a change: a current eval report against a committed baseline, failing only on a drop beyond fold noise')
    .requiredOption('--baseline <file>', 'the committed baseline JSON report (never written, except by --accept on a pass)')
    .requiredOption('--current <file>', 'the JSON report of the run under test')
    .option('--metric <name>', "the metric to gate on (default: the baseline's headline)")
    .option('--learner <spec>', "the learner to gate (default: the baseline report's best, the baseline learner left out)")
    .option('--current-learner <spec>', 'the learner in the current report, when its spec differs (default: the same spec)')
    .option('--max-drop <d>', "allowed drop in the metric's units, in its worse direction", String(DEFAULT_MAX_DROP))
    .option('--alpha <a>', 'one-sided level of the test that the drop exceeds --max-drop beyond fold noise', String(DEFAULT_ALPHA))
    .option('--worst-allowed <x>', "also fail when the current mean is worse than this score in the metric's better direction (a floor for accuracy, a ceiling for rmse)")
    .addOption(new Option('--absolute-min <x>', 'the old name of --worst-allowed (refused)').hideHelp())
    .option('--accept', 'when the gate passes, replace the baseline file by the current report, atomically')
    .option('--json <file>', 'write the verdict as JSON (format foldwise-gate/1) to a file, or - for standard output')
    .option('--verbose', 'print stack traces of errors')
    .action((flags: GateFlags) => setCode(runGate(flags, io)));
}
