/**
 * The options of learners from outside that eval and tune share: `--command NAME=PROGRAM`
 * (repeatable) defines the program of `command:NAME`, `--keep-temp` keeps each fold's temporary
 * folder for debugging. Turned here into the CommandSetup the core takes, with the environment
 * and temporary folder of the caller (the core never reads them from the process).
 */
import { type Command } from 'commander';
import { tmpdir } from 'node:os';
import { isAbsolute, resolve } from 'node:path';
import { parseCommandPrograms, type CommandSetup } from '../learners/index.js';
import type { Io } from './run.js';

const collect = (value: string, previous: string[] = []): string[] => [...previous, value];

export interface CommandFlags {
  command?: string[];
  keepTemp?: boolean;
}

export function addCommandOptions(cmd: Command): Command {
  return cmd
    .option('--command <name=program>', 'the program behind --learner command:NAME, run per fold without a shell (repeatable; see README)', collect)
    .option('--keep-temp', "keep each fold's temporary folder of command: learners (for debugging)");
}

/** The setup of command: learners, or undefined when none is defined. */
export function commandSetupOf(flags: CommandFlags, io: Io): CommandSetup | undefined {
  if (!flags.command?.length) return undefined;
  const env = io.env ?? {};
  const baseDir = io.cwd ?? resolve('.');
  const root = env.TMPDIR && isAbsolute(env.TMPDIR) ? env.TMPDIR : tmpdir();
  return { programs: parseCommandPrograms(flags.command, baseDir, env), env, tempRoot: root, keepTemp: Boolean(flags.keepTemp) };
}
