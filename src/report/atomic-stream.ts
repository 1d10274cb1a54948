/**
 * Writing a large output in chunks, atomically: the chunks go to a temporary file in the same
 * folder, which is flushed and renamed over the target, so memory does not grow with the file
 * and a reader never sees half of it. Standard output ("-") gets the chunks as they come,
 * waiting for the stream to drain when it asks to.
 */
import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, openSync, realpathSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { InputError } from '../errors.js';
import { checkWritable } from './atomic.js';

export interface ChunkSink {
  write(text: string): unknown;
  once?(event: 'drain', listener: () => void): unknown;
}

/** Writes every chunk to `sink`, awaiting 'drain' whenever a write says the buffer is full. */
export async function writeChunks(sink: ChunkSink, chunks: Iterable<string>): Promise<void> {
  for (const c of chunks) {
    if (sink.write(c) === false && sink.once) await new Promise<void>((resolve) => sink.once!('drain', resolve));
  }
}

export function writeChunksAtomic(path: string, chunks: Iterable<string>, option: string): void {
  checkWritable(path, option);
  let target = path;
  try {
    target = realpathSync(path);
  } catch {
    // a new file
  }
  let existing;
  try {
    existing = statSync(target);
  } catch {
    existing = undefined;
  }
  const inPlace = existing !== undefined && !existing.isFile();
  const tmp = inPlace ? target : join(dirname(target), `.${basename(target)}.${randomBytes(6).toString('hex')}.tmp`);
  let fd = -1;
  try {
    fd = openSync(tmp, inPlace ? 'w' : 'wx', existing?.isFile() ? existing.mode & 0o777 : 0o644);
    for (const c of chunks) writeSync(fd, c);
    if (!inPlace) fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    if (!inPlace) renameSync(tmp, target);
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    if (!inPlace) rmSync(tmp, { force: true });
    if (e instanceof InputError) throw e;
    const code = (e as NodeJS.ErrnoException).code ?? String(e);
    throw new InputError(`${option} ${path}: cannot be written (${code}); check the path, the free space and the permissions`);
  }
}
