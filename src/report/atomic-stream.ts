/**
 * Writing a large output in chunks: the chunks go to a temporary file beside the target
 * (`.NAME.<pid>-<hex>.tmp`, as src/report/atomic.ts names them), flushed, so memory does not grow
 * with the file; the caller then renames it into place with the run's other outputs (commit) or
 * removes it (abort), so a failed run leaves no trace. Standard output ("-") gets the chunks as
 * they come, waiting for the stream to drain when it asks to.
 */
import { closeSync, fsyncSync, openSync, realpathSync, renameSync, rmSync, statSync, writeSync } from 'node:fs';
import { InputError } from '../errors.js';
import { checkWritable, removeStaleTemps, tempNameOf } from './atomic.js';

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

export interface Staged {
  /** renames the temporary file into place */
  commit(): void;
  /** removes the temporary file */
  abort(): void;
}

const failed = (option: string, path: string, e: unknown): InputError => {
  if (e instanceof InputError) return e;
  const code = (e as NodeJS.ErrnoException).code ?? String(e);
  return new InputError(`${option} ${path}: cannot be written (${code}); check the path, the free space and the permissions`);
};

/** Writes the chunks to a temporary file beside `path`; nothing is in place until `commit`. */
export function stageChunks(path: string, chunks: Iterable<string | Uint8Array>, option: string): Staged {
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
  if (existing && !existing.isFile()) {
    // a device or a pipe is written in place when committed (renaming over it would replace it)
    const all = [...chunks];
    return {
      commit: () => {
        try {
          const fd = openSync(target, 'w');
          for (const c of all) (typeof c === 'string' ? writeSync(fd, c) : writeSync(fd, c));
          closeSync(fd);
        } catch (e) {
          throw failed(option, path, e);
        }
      },
      abort: () => undefined,
    };
  }
  removeStaleTemps(target);
  const tmp = tempNameOf(target);
  let fd = -1;
  try {
    fd = openSync(tmp, 'wx', existing ? existing.mode & 0o777 : 0o644);
    for (const c of chunks) (typeof c === 'string' ? writeSync(fd, c) : writeSync(fd, c));
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
  } catch (e) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    throw failed(option, path, e);
  }
  return {
    commit: () => {
      try {
        renameSync(tmp, target);
      } catch (e) {
        rmSync(tmp, { force: true });
        throw failed(option, path, e);
      }
    },
    abort: () => rmSync(tmp, { force: true }),
  };
}
