/**
 * `foldwise power REPORT.json --drop D [--current OTHER.json] [--metric M] [--learner SPEC]
 * [--alpha A] [--power P] [--json FILE|-]`: how many repeats of the report's plan a gate needs to
 * catch a drop of D with power P (src/compare/plan-power.ts). Exit codes: 0, 2 bad input.
 */
import type { Command } from 'commander';
import { DEFAULT_ALPHA } from '../compare/gate.js';
import { planPower, renderPowerMarkdown } from '../compare/plan-power.js';
import { readReport } from '../compare/read-report.js';
import { EXIT_OK } from '../errors.js';
import { checkWritable, writeFileAtomic } from '../report/atomic.js';
import { DEFAULT_POWER } from '../stats/power.js';
import { parseNumberOption } from './gate.js';
import type { Io } from './io.js';

interface PowerFlags {
  drop: string;
  current?: string;
  metric?: string;
  learner?: string;
  alpha: string;
  power: string;
  json?: string;
}

export function registerPower(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('power')
    .description('how many repeats of a report\'s plan a gate needs to catch a drop, with the requested power')
    .argument('<report>', 'an eval report (JSON), e.g. the one a gate compares against')
    .requiredOption('--drop <d>', "the drop to catch, in the metric's units (such as 0.02)")
    .option('--current <report>', 'a second report of the same plan and seed: the noise is then measured fold by fold')
    .option('--metric <name>', "the metric (default: the report's headline)")
    .option('--learner <spec>', "the learner (default: the report's best, the baseline learner left out)")
    .option('--alpha <a>', 'one-sided level of the gate', String(DEFAULT_ALPHA))
    .option('--power <p>', 'the chance of catching the drop', String(DEFAULT_POWER))
    .option('--json <file>', 'write the advice as JSON to a file, or - for standard output')
    .option('--verbose', 'print stack traces of errors')
    .action((path: string, flags: PowerFlags) => {
      const drop = parseNumberOption(flags.drop, '--drop', "a number > 0, in the metric's units");
      const alpha = parseNumberOption(flags.alpha, '--alpha', 'a number above 0 and below 0.5');
      const power = parseNumberOption(flags.power, '--power', 'a number above alpha and below 1');
      if (flags.json && flags.json !== '-') checkWritable(flags.json, '--json');
      const report = readReport(path, 'power').report;
      const current = flags.current ? { report: readReport(flags.current, '--current').report, path: flags.current } : undefined;
      const advice = planPower(report, path, { metric: flags.metric, learner: flags.learner, drop, alpha, power, current });
      const json = `${JSON.stringify({ schema: 'foldwise-power/1', ...advice }, null, 2)}\n`;
      if (flags.json === '-') io.stdout.write(json);
      else {
        if (flags.json) writeFileAtomic(flags.json, json, '--json');
        io.stdout.write(renderPowerMarkdown(advice));
      }
      setCode(EXIT_OK);
    });
}
