/**
 * Progress on standard error (cli-progress): while a CSV loads (megabytes read of the file's
 * size), a note while the quick audit runs, then the tasks (done of total, elapsed, estimated
 * time left). Shown only when standard error is a terminal, not under CI, and not with --quiet;
 * it prints no colours (so NO_COLOR holds).
 */
import { SingleBar } from 'cli-progress';
import type { Io } from './run.js';

export interface Progress {
  /** bytes of the input read so far, of `total` when known */
  loading(bytes: number, total: number | undefined): void;
  /** a long phase without a measurable fraction (the quick audit) */
  phase(label: string): void;
  /** tasks done of total */
  tasks(done: number, total: number): void;
  stop(): void;
}

const MB = 1024 * 1024;

export function progressFor(io: Io, quiet: boolean): Progress | undefined {
  const stream = io.stderr as NodeJS.WriteStream;
  if (quiet || !stream.isTTY || io.env?.CI) return undefined;
  let bar: SingleBar | undefined;
  let kind: 'loading' | 'tasks' | undefined;
  const start = (k: 'loading' | 'tasks', format: string, total: number, value: number): void => {
    bar?.stop();
    kind = k;
    bar = new SingleBar({ stream, format, barCompleteChar: '#', barIncompleteChar: '.', hideCursor: true, clearOnComplete: true, etaBuffer: 20 });
    bar.start(total, value);
  };
  return {
    loading(bytes, total) {
      if (total === undefined || total < 4 * MB) return; // small or unknown size: nothing worth a bar
      const mb = Math.round((10 * bytes) / MB) / 10;
      if (kind !== 'loading') start('loading', 'foldwise loading [{bar}] {value}/{total} MB', Math.round((10 * total) / MB) / 10, mb);
      else bar!.update(mb);
    },
    phase(label) {
      bar?.stop();
      bar = undefined;
      kind = undefined;
      stream.write(`foldwise: ${label}...\r`);
    },
    tasks(done, total) {
      if (kind !== 'tasks') start('tasks', 'foldwise [{bar}] {value}/{total} tasks | {duration_formatted} elapsed | eta {eta_formatted}', total, done);
      else bar!.update(done);
    },
    stop() {
      bar?.stop();
    },
  };
}
