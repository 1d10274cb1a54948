/**
 * Atomic file writes: the text goes to a temporary file in the same folder, is flushed to
 * disk, and is renamed over the target, so a reader sees the old file or the whole new one,
 * never half of it. A symbolic link is followed (the file it points to is replaced, the link
 * kept), and a target that is not a regular file (a device such as /dev/null, a pipe) is written
 * in place, since renaming over it would replace the device itself. Errors name the path and
 * what to do.
 */
import { randomBytes } from 'node:crypto';
import { accessSync, closeSync, constants, fsyncSync, openSync, realpathSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../errors.js';

/**
 * Checks that `path` can be written: its folder exists and is writable, and it is not a folder
 * itself (nor a name ending in a folder separator).
 */
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
  if (/[\\/]$/.test(path)) throw new InputError(`${option} ${path}: ends with a folder separator; give a file name`);
  try {
    accessSync(dirname(path), constants.W_OK);
  } catch {
    throw new InputError(`${option} ${path}: the folder ${dirname(path)} is not writable; check its permissions`);
  }
}

function writeError(option: string, path: string, e: unknown): InputError {
  const code = (e as NodeJS.ErrnoException).code ?? String(e);
  return new InputError(`${option} ${path}: cannot be written (${code}); check the path and permissions`);
}

export function writeFileAtomic(path: string, text: string | Uint8Array, option = 'output'): void {
  checkWritable(path, option);
  let target = path;
  try {
    target = realpathSync(path);
  } catch {
    // no such file yet: write a new one at `path`
  }
  if (target !== path) checkWritable(target, option);
  let existing;
  try {
    existing = statSync(target);
  } catch {
    existing = undefined;
  }
  if (existing && !existing.isFile()) {
    try {
      writeFileSync(target, text);
    } catch (e) {
      throw writeError(option, path, e);
    }
    return;
  }
  const tmp = join(dirname(target), `.${basename(target)}.${randomBytes(6).toString('hex')}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, 'wx', 0o644);
    writeFileSync(fd, text); // loops until every byte is written
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    renameSync(tmp, target);
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    throw writeError(option, path, e);
  }
}
