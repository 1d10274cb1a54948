/**
 * The programs behind `command:NAME` learners, as given with `--command NAME=PROGRAM`.
 *
 * PROGRAM is either words separated by spaces (`python3 ./fit.py --trees 200`), with no shell
 * meaning at all: no quoting, no variables, no globbing, no pipes; or, for words with spaces in
 * them, a JSON array of strings (`["python3", "./my model/fit.py"]`). The first word is the
 * program: an explicit path (starting with ./, ../ or /) or a bare name looked up on PATH.
 * Because the program runs inside a fresh temporary folder, every word starting with ./ or ../
 * is made absolute against the folder foldwise was started in. Nothing is ever run through a
 * shell.
 */
import { accessSync, constants, statSync } from 'node:fs';
import { delimiter, isAbsolute, join, resolve } from 'node:path';
import { UsageError } from '../../errors.js';

export interface CommandProgram {
  /** the NAME of `command:NAME` */
  readonly name: string;
  /** the program (absolute path or bare name found on PATH) and its fixed arguments */
  readonly argv: readonly string[];
  /** PROGRAM as the user wrote it (relative paths unresolved: the same on every machine) */
  readonly written: string;
}

/** Everything command: learners need from the caller: programs, environment, temp folder. */
export interface CommandSetup {
  readonly programs: readonly CommandProgram[];
  /** the environment the programs inherit (the CLI passes its own environment) */
  readonly env: Readonly<Record<string, string | undefined>>;
  /** absolute folder in which each fold's private temporary folder is made */
  readonly tempRoot: string;
  /** keep each fold's temporary folder instead of removing it (for debugging) */
  readonly keepTemp: boolean;
}

const NAME = /^[a-z][a-z0-9-]*$/;

function words(option: string, text: string): string[] {
  const t = text.trim();
  if (t.startsWith('[')) {
    let v: unknown;
    try {
      v = JSON.parse(t);
    } catch {
      throw new UsageError(`${option}: the program starts with "[" but is not a JSON array of strings; write ["program", "argument", ...]`);
    }
    if (!Array.isArray(v) || v.length === 0 || !v.every((w) => typeof w === 'string' && w !== '')) {
      throw new UsageError(`${option}: expected a non-empty JSON array of non-empty strings`);
    }
    return v as string[];
  }
  const list = t.split(/\s+/).filter((w) => w !== '');
  if (list.length === 0) throw new UsageError(`${option}: no program after "="; write NAME=PROGRAM [ARGUMENT...]`);
  return list;
}

const explicit = (w: string): boolean => /^(\.\.?\/|\/)/.test(w);

function isExecutableFile(path: string): boolean {
  try {
    if (!statSync(path).isFile()) return false;
    accessSync(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/**
 * Parses one `--command NAME=PROGRAM` value. `baseDir` (absolute) is the folder relative words
 * are resolved against; `env` gives the PATH bare program names are looked up on.
 */
export function parseCommandProgram(text: string, baseDir: string, env: Readonly<Record<string, string | undefined>>): CommandProgram {
  const option = `--command ${text}`;
  if (!isAbsolute(baseDir)) throw new UsageError(`command learners: base folder "${baseDir}" is not absolute`);
  const eq = text.indexOf('=');
  const name = eq < 0 ? '' : text.slice(0, eq).trim();
  if (eq < 0 || !NAME.test(name)) throw new UsageError(`${option}: expected NAME=PROGRAM with a lower-case NAME (letters, digits, -)`);
  const argv = words(option, text.slice(eq + 1)).map((w) => (/^\.\.?\//.test(w) ? resolve(baseDir, w) : w));
  const program = argv[0];
  if (explicit(program) || isAbsolute(program)) {
    if (!isExecutableFile(program)) {
      throw new UsageError(`${option}: ${program} is not an executable file; check the path, or run it through its interpreter (NAME=python3 ./script.py)`);
    }
  } else if (program.includes('/')) {
    throw new UsageError(`${option}: write the program as an explicit path (./${program}) or a bare name on PATH`);
  } else {
    const dirs = (env.PATH ?? '').split(delimiter).filter((d) => d !== '');
    if (!dirs.some((d) => isExecutableFile(join(d, program)))) {
      throw new UsageError(`${option}: "${program}" is not found on PATH; give its path or install it`);
    }
  }
  return { name, argv, written: text.slice(eq + 1).trim() };
}

/** Parses every --command value; a NAME given twice is refused. */
export function parseCommandPrograms(texts: readonly string[], baseDir: string, env: Readonly<Record<string, string | undefined>>): CommandProgram[] {
  const out: CommandProgram[] = [];
  for (const t of texts) {
    const p = parseCommandProgram(t, baseDir, env);
    if (out.some((q) => q.name === p.name)) throw new UsageError(`--command ${t}: "${p.name}" is defined twice`);
    out.push(p);
  }
  return out;
}
