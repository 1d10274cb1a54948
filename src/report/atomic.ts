/**
 * Atomic file writes: the text goes to a temporary file in the same folder, is flushed to
 * disk, and is renamed over the target, so a reader sees the old file or the whole new one,
 * never half of it. A symbolic link is followed (the file it points to is replaced, the link
 * kept), and a target that is not a regular file (a device such as /dev/null, a pipe) is written
 * in place, since renaming over it would replace the device itself. Errors name the path and
 * what to do.
 *
 * `writeFilesAtomic` writes several files as one step: every temporary file is written first
 * (and every device written), and only when all of them succeeded are they renamed over their
 * targets; a failure removes the temporary files, so a failed run leaves no trace.
 *
 * A rewritten file keeps its permission bits; a read-only file is refused. A temporary file is
 * named `.NAME.<pid>-<hex>.tmp` after the process that writes it, so a later write to the same
 * folder removes those of processes that died during a write (kill -9).
 */
import { randomBytes } from 'node:crypto';
import { accessSync, closeSync, constants, fchmodSync, fsyncSync, openSync, readdirSync, realpathSync, renameSync, rmSync, statSync, writeFileSync, type Stats } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../errors.js';

/**
 * Checks that `path` can be written: its folder exists and is writable, it is not a folder
 * itself (nor a name ending in a folder separator), and an existing file is not read-only.
 */
export function checkWritable(path: string, option: string): void {
  if (path === '') throw new InputError(`${option} '': an empty file name; give a file name, or - for standard output`);
  let dir;
  try {
    dir = statSync(dirname(path));
  } catch {
    throw new InputError(`${option} ${path}: the folder ${dirname(path)} does not exist; create it first`);
  }
  if (!dir.isDirectory()) throw new InputError(`${option} ${path}: ${dirname(path)} is not a folder`);
  let existing: Stats | undefined;
  try {
    existing = statSync(path);
  } catch {
    existing = undefined;
  }
  if (existing?.isDirectory()) throw new InputError(`${option} ${path}: is a folder; give a file name`);
  if (/[\\/]$/.test(path)) throw new InputError(`${option} ${path}: ends with a folder separator; give a file name`);
  if (existing) {
    try {
      // no write bit at all: made read-only on purpose (also when running as root)
      if (existing.isFile() && (existing.mode & 0o222) === 0) throw new Error('read-only');
      accessSync(path, constants.W_OK);
    } catch {
      throw new InputError(`${option} ${path}: the file is read-only; make it writable (chmod u+w) or give another name`);
    }
    if (!existing.isFile()) return; // a device or pipe is written in place
  }
  try {
    accessSync(dirname(path), constants.W_OK);
  } catch {
    throw new InputError(`${option} ${path}: the folder ${dirname(path)} is not writable; check its permissions`);
  }
}

function writeError(option: string, path: string, e: unknown): InputError {
  const code = (e as NodeJS.ErrnoException).code ?? String(e);
  const hint = code === 'ENOSPC' ? 'the disk is full; free some space' : code === 'EDQUOT' ? 'the disk quota is used up' : 'check the path and permissions';
  return new InputError(`${option} ${path}: cannot be written (${code}); ${hint}`);
}

const escapeRe = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** true when no process `pid` exists (a process of another user counts as existing). */
export function processGone(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return false;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'ESRCH';
  }
}

/** The temporary name next to `target`: `.NAME.<pid>-<hex>.tmp`. */
export function tempNameOf(target: string): string {
  return join(dirname(target), `.${basename(target)}.${process.pid}-${randomBytes(6).toString('hex')}.tmp`);
}

/**
 * Removes the temporary files of `target` left by writers that died: `.NAME.<pid>-<hex>.tmp`
 * of a process that no longer exists, and the unnamed `.NAME.<hex>.tmp` of older versions when
 * older than an hour. Returns how many were removed.
 */
export function removeStaleTemps(target: string): number {
  const dir = dirname(target);
  const base = escapeRe(basename(target));
  const named = new RegExp(`^\\.${base}\\.(\\d+)-[0-9a-f]{12}\\.tmp$`);
  const unnamed = new RegExp(`^\\.${base}\\.[0-9a-f]{12}\\.tmp$`);
  let removed = 0;
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return 0;
  }
  for (const n of names) {
    const m = named.exec(n);
    let stale = m !== null && processGone(Number(m[1]));
    if (!stale && unnamed.test(n)) {
      try {
        stale = Date.now() - statSync(join(dir, n)).mtimeMs > 3600_000;
      } catch {
        stale = false;
      }
    }
    if (stale) {
      rmSync(join(dir, n), { force: true });
      removed++;
    }
  }
  return removed;
}

export interface FileWrite {
  readonly path: string;
  readonly text: string | Uint8Array;
  /** the option that named the file, for messages */
  readonly option: string;
}

interface Staged {
  readonly write: FileWrite;
  readonly target: string;
  readonly tmp?: string;
}

/** Writes every file or none: temporary files first, renames last. */
export function writeFilesAtomic(writes: readonly FileWrite[]): void {
  const staged: Staged[] = [];
  const cleanup = (): void => {
    for (const s of staged) if (s.tmp) rmSync(s.tmp, { force: true });
  };
  try {
    for (const w of writes) {
      checkWritable(w.path, w.option);
      let target = w.path;
      try {
        target = realpathSync(w.path);
      } catch {
        // no such file yet: write a new one at `path`
      }
      if (target !== w.path) checkWritable(target, w.option);
      let existing: Stats | undefined;
      try {
        existing = statSync(target);
      } catch {
        existing = undefined;
      }
      if (existing && !existing.isFile()) {
        staged.push({ write: w, target });
        continue;
      }
      removeStaleTemps(target);
      const tmp = tempNameOf(target);
      let fd = -1;
      try {
        fd = openSync(tmp, 'wx', 0o666);
        staged.push({ write: w, target, tmp });
        if (existing) fchmodSync(fd, existing.mode & 0o7777);
        writeFileSync(fd, w.text); // loops until every byte is written
        fsyncSync(fd);
      } catch (e) {
        throw writeError(w.option, w.path, e);
      } finally {
        if (fd >= 0) closeSync(fd);
      }
    }
    // devices and pipes are written in place, before any file is replaced
    for (const s of staged) {
      if (s.tmp) continue;
      try {
        writeFileSync(s.target, s.write.text);
      } catch (e) {
        throw writeError(s.write.option, s.write.path, e);
      }
    }
    for (const s of staged) {
      if (!s.tmp) continue;
      try {
        renameSync(s.tmp, s.target);
      } catch (e) {
        throw writeError(s.write.option, s.write.path, e);
      }
    }
  } catch (e) {
    cleanup();
    throw e;
  }
}

export function writeFileAtomic(path: string, text: string | Uint8Array, option = 'output'): void {
  writeFilesAtomic([{ path, text, option }]);
}
