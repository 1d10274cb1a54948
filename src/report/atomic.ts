/**
 * Atomic file writes: the text goes to a temporary file in the same folder, is flushed to
 * disk, and is renamed over the target, so a reader sees the old file or the whole new one,
 * never half of it. Errors name the path and what to do.
 */
import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, openSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../errors.js';

/** Checks that `path` can be written: its folder exists and it is not a folder itself. */
export function checkWritable(path: string, option: string): void {
  let dir;
  try {
    dir = statSync(dirname(path));
  } catch {
    throw new InputError(`${option} ${path}: the folder ${dirname(path)} does not exist; create it first`);
  }
  if (!dir.isDirectory()) throw new InputError(`${option} ${path}: ${dirname(path)} is not a folder`);
  try {
    if (statSync(path).isDirectory()) throw new InputError(`${option} ${path}: is a folder; give a file name`);
  } catch (e) {
    if (e instanceof InputError) throw e;
  }
}

export function writeFileAtomic(path: string, text: string, option = 'output'): void {
  checkWritable(path, option);
  const tmp = join(dirname(path), `.${basename(path)}.${randomBytes(6).toString('hex')}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, 'wx', 0o644);
    writeSync(fd, text);
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    renameSync(tmp, path);
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    const code = (e as NodeJS.ErrnoException).code ?? String(e);
    throw new InputError(`${option} ${path}: cannot be written (${code}); check the path and permissions`);
  }
}
