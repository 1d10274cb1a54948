/**
 * The output guard every command calls before any work: no output may name one of the
 * command's inputs (data file, baseline, report or part read, journal), nor another output.
 * Paths are compared after resolving links (realpath), and existing files also by device and
 * inode, so a hard link or `./x/../data.csv` is caught too. Every output must be writable
 * (`checkWritable`): an empty name, a missing folder, a folder, a read-only file are refused.
 * Devices (/dev/null, /dev/stdout) may be named by several outputs.
 */
import { realpathSync, statSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { UsageError } from '../errors.js';
import { checkWritable } from '../report/atomic.js';

export interface NamedPath {
  /** how the path was given, for messages: "--json", "the data file", "--baseline" */
  readonly option: string;
  readonly path: string | undefined;
}

interface Where {
  readonly real: string;
  readonly inode?: string;
  readonly regular: boolean;
}

function whereIs(p: string): Where {
  let real: string;
  try {
    real = realpathSync(p);
  } catch {
    try {
      real = join(realpathSync(dirname(p)), basename(p));
    } catch {
      real = resolve(p);
    }
  }
  try {
    const s = statSync(real);
    return { real, inode: `${s.dev}:${s.ino}`, regular: s.isFile() };
  } catch {
    return { real, regular: true };
  }
}

const same = (a: Where, b: Where): boolean => a.real === b.real || (a.inode !== undefined && a.inode === b.inode);

/** Refuses outputs that name an input or each other, and outputs that cannot be written. */
export function guardPaths(inputs: readonly NamedPath[], outputs: readonly NamedPath[], writable = true): void {
  const ins = inputs.filter((i) => i.path !== undefined && i.path !== '-' && i.path !== '').map((i) => ({ ...i, where: whereIs(i.path!) }));
  const seen: { label: string; where: Where }[] = [];
  for (const o of outputs) {
    if (o.path === undefined || o.path === '-') continue;
    if (o.path === '') throw new UsageError(`${o.option} '': an empty file name; give a file name, or - for standard output`);
    const where = whereIs(o.path);
    const label = `${o.option} ${o.path}`;
    for (const i of ins) {
      if (same(where, i.where) && (where.regular || i.where.regular)) {
        throw new UsageError(`${label}: is ${i.option === 'the data file' ? 'the input file' : `the file read by ${i.option} (an input)`}; give another name`);
      }
    }
    const before = seen.find((s) => same(s.where, where));
    if (before && where.regular) throw new UsageError(`${before.label} and ${label}: the same file; give two names`);
    seen.push({ label, where });
    if (writable) checkWritable(o.path, o.option);
  }
}
