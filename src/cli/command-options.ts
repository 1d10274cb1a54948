/**
 * The options of learners from outside that eval and tune share: `--command NAME=PROGRAM`
 * (repeatable) defines the program of `command:NAME`, `--keep-temp` keeps each fold's temporary
 * folder for debugging. Turned here into the CommandSetup the core takes, with the environment
 * and temporary folder of the caller (the core never reads them from the process).
 */
import { type Command } from 'commander';
import { accessSync, constants, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { isAbsolute, join, resolve } from 'node:path';
import { InputError } from '../errors.js';
import { processGone } from '../report/atomic.js';
import { onCleanup } from './cleanup.js';
import { parseCommandPrograms, type CommandSetup } from '../learners/index.js';
import type { Io } from './io.js';

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

/** A fold folder of a foldwise process in the temporary folder: `foldwise-<pid>-NAME-FOLD-XXXXXX`. */
const FOLD_FOLDER = /^foldwise-(\d+)-[a-z]/;

/**
 * Removes the fold folders of foldwise process `pid`, or with `pid` undefined those of processes
 * that are gone (killed, crashed); returns the names removed.
 */
export function removeFoldFolders(root: string, pid?: number): string[] {
  let names: string[];
  try {
    names = readdirSync(root);
  } catch {
    return [];
  }
  const removed: string[] = [];
  for (const n of names) {
    const m = FOLD_FOLDER.exec(n);
    if (!m) continue;
    const owner = Number(m[1]);
    if (pid === undefined ? owner !== process.pid && processGone(owner) : owner === pid) {
      rmSync(join(root, n), { recursive: true, force: true });
      removed.push(n);
    }
  }
  return removed;
}

/**
 * The setup of command: learners, or undefined when none is defined. Each fold's folder is
 * named by this process's id and removed on every path: by the fold itself, when the command
 * ends (also after a failure or a stop: a program still running there is then ended by its
 * supervisor), and, when this process was killed, by the next run. With --keep-temp the
 * folders are named without the id and stay.
 */
export function commandSetupOf(flags: CommandFlags, io: Io): CommandSetup | undefined {
  if (!flags.command?.length) return undefined;
  const env = io.env ?? {};
  const baseDir = io.cwd ?? resolve('.');
  const root = env.TMPDIR && isAbsolute(env.TMPDIR) ? env.TMPDIR : tmpdir();
  const programs = parseCommandPrograms(flags.command, baseDir, env);
  const where = env.TMPDIR ? `TMPDIR ${root}` : `the temporary folder ${root}`;
  try {
    if (!statSync(root).isDirectory()) throw Object.assign(new Error('not a folder'), { code: 'ENOTDIR' });
    accessSync(root, constants.W_OK);
  } catch (e) {
    throw new InputError(`${where}: not a writable folder (${(e as NodeJS.ErrnoException).code ?? 'error'}); set TMPDIR to a folder you can write`);
  }
  removeFoldFolders(root);
  const keepTemp = Boolean(flags.keepTemp);
  if (!keepTemp) onCleanup(() => removeFoldFolders(root, process.pid));
  return { programs, env, tempRoot: root, keepTemp };
}
