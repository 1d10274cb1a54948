/**
 * `foldwise gate --previous PREV.json --current NEW.json [--metric M ...] [--slices] [--learner SPEC]
 * [--current-learner SPEC] [--max-drop D] [--alpha A] [--worst-allowed X] [--accept]
 * [--json FILE|-]`: passes or fails a change against the previous report, the committed one.
 * ("Baseline" is the majority/mean learner; the gate's committed report is the "previous"
 * report. The flag was --baseline before format 2; that spelling fails naming --previous.)
 *
 * The rule (src/compare/gate.ts and gate-rule.ts): fail only when a one-sided corrected t test
 * rejects H0 "drop <= max-drop" at alpha (paired by (repeat, fold) when the runs share their
 * folds, a labelled unpaired Welch rule when only the plan, seed or stratification differ), or
 * when the current mean is worse than --worst-allowed. A short Markdown verdict goes to standard output (unless
 * --json -) and is appended to the file named by the environment variable GITHUB_STEP_SUMMARY,
 * when set (read from io.env).
 *
 * The previous report's file is never written, except by --accept on a passing gate: then the current
 * report's text replaces it atomically (writeFileAtomic). Exit codes: 0 pass, 1 fail,
 * 2 not comparable or bad input (a not-comparable verdict is still printed and appended).
 */
import { appendFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { type Command, Option } from 'commander';
import { DEFAULT_ALPHA, DEFAULT_MAX_DROP, gateReports } from '../compare/gate.js';
import { DEFAULT_POWER } from '../stats/power.js';
import { NotComparableError } from '../compare/match-reports.js';
import { readReport } from '../compare/read-report.js';
import { renderGateMarkdown, renderNotComparableMarkdown } from '../compare/render.js';
import type { GateVerdict } from '../model/compare.js';
import { EXIT_OK, EXIT_REGRESSION, UsageError } from '../errors.js';
import { checkWritable, writeFilesAtomic, type FileWrite } from '../report/atomic.js';
import { guardPaths } from './guard.js';
import type { Io } from './io.js';

interface GateFlags {
  previous?: string;
  /** the flag's name before format 2: refused with the new name */
  baseline?: string;
  current: string;
  metric?: string[];
  slices?: boolean;
  learner?: string;
  currentLearner?: string;
  maxDrop: string;
  alpha: string;
  worstAllowed?: string;
  absoluteMin?: string;
  power: string;
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
  const summary = io.env?.GITHUB_STEP_SUMMARY;
  if (flags.baseline !== undefined) throw new UsageError(`gate --baseline is now --previous (the committed report; "baseline" names the majority/mean learner): write --previous ${flags.baseline}`);
  if (flags.previous === undefined) throw new UsageError("gate: required option '--previous <file>' not specified: the committed report to gate against");
  const previous = flags.previous;
  // the previous report is an input; only --accept on a pass replaces it, by design
  const inputs = [{ option: '--previous', path: previous }, { option: '--current', path: flags.current }];
  guardPaths(inputs, [{ option: '--json', path: flags.json }]);
  // the summary is appended to (a failure there is only a warning), but never to an input
  if (summary) guardPaths(inputs, [{ option: 'GITHUB_STEP_SUMMARY', path: summary }], false);
  if (flags.accept) checkWritable(previous, '--previous');
  const base = readReport(previous, 'gate --previous');
  const cur = readReport(flags.current, 'gate --current');
  const toStdout = flags.json !== '-';

  const power = parseNumberOption(flags.power, '--power', 'a number above alpha and below 1 (such as 0.8)');
  let verdict: GateVerdict;
  try {
    verdict = gateReports(base, cur, { metrics: flags.metric, slices: flags.slices, learner: flags.learner, currentLearner: flags.currentLearner, maxDrop, alpha, worstAllowed, power });
  } catch (e) {
    if (e instanceof NotComparableError) {
      const md = renderNotComparableMarkdown(e.reason);
      if (toStdout) io.stdout.write(md);
      appendSummary(io, md);
    }
    throw e;
  }
  const files: FileWrite[] = [];
  if (flags.accept) {
    const accepted = verdict.verdict === 'pass';
    if (accepted && resolve(previous) !== resolve(flags.current)) files.push({ path: previous, text: cur.text, option: '--previous' });
    verdict = { ...verdict, accepted };
  }
  for (const w of verdict.warnings) io.stderr.write(`foldwise: warning: ${w}\n`);
  const md = renderGateMarkdown(verdict);
  const json = `${JSON.stringify(verdict, null, 2)}\n`;
  if (flags.json !== undefined && flags.json !== '-') files.push({ path: flags.json, text: json, option: '--json' });
  // the accepted baseline and the verdict file are written together or not at all
  writeFilesAtomic(files);
  if (flags.json === '-') io.stdout.write(json);
  if (toStdout) io.stdout.write(md);
  appendSummary(io, md);
  return verdict.verdict === 'pass' ? EXIT_OK : EXIT_REGRESSION;
}

export function registerGate(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('gate')
    .description('pass or fail a change: a current eval report against the previous (committed) report, failing only on a drop beyond fold noise')
    .option('--previous <file>', 'the previous JSON report, the committed one (never written, except by --accept on a pass)')
    .addOption(new Option('--baseline <file>').hideHelp())
    .requiredOption('--current <file>', 'the JSON report of the run under test')
    .option('--metric <name>', "the metric to gate on (default: the previous report's headline); repeatable: every one is gated, the family-wise error kept at alpha by Holm's method", (v: string, prev: string[] = []) => [...prev, v])
    .option('--slices', 'also gate every slice level both reports carry (eval --slice), the family-wise error over slices and metrics kept at alpha by Holm\'s method')
    .option('--learner <spec>', "the learner to gate (default: the previous report's best, the baseline learner left out)")
    .option('--current-learner <spec>', 'the learner in the current report, when its spec differs (default: the same spec)')
    .option('--max-drop <d>', "allowed drop in the metric's units, in its worse direction", String(DEFAULT_MAX_DROP))
    .option('--alpha <a>', 'one-sided level of the test that the drop exceeds --max-drop beyond fold noise', String(DEFAULT_ALPHA))
    .option('--power <p>', 'the power at which the verdict states the smallest drop it could have caught', String(DEFAULT_POWER))
    .option('--worst-allowed <x>', "also fail when the current mean is worse than this score in the metric's better direction (a floor for accuracy, a ceiling for rmse)")
    .addOption(new Option('--absolute-min <x>', 'the old name of --worst-allowed (refused)').hideHelp())
    .option('--accept', 'when the gate passes, replace the previous report by the current one, atomically')
    .option('--json <file>', 'write the verdict as JSON (format foldwise-gate/2) to a file, or - for standard output')
    .option('--verbose', 'print stack traces of errors')
    .action((flags: GateFlags) => setCode(runGate(flags, io)));
}
