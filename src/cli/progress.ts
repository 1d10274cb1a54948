/**
 * The progress bar on standard error: tasks done of total, elapsed time and an estimate of the
 * time left (cli-progress). Shown only when standard error is a terminal, not under CI, and not
 * with --quiet; it prints no colours (so NO_COLOR holds).
 */
import { SingleBar } from 'cli-progress';
import type { Io } from './run.js';

export interface Progress {
  update(done: number, total: number, resumed: number): void;
  stop(): void;
}

export function progressFor(io: Io, quiet: boolean): Progress | undefined {
  const stream = io.stderr as NodeJS.WriteStream;
  if (quiet || !stream.isTTY || io.env?.CI) return undefined;
  let bar: SingleBar | undefined;
  return {
    update(done, total) {
      if (!bar) {
        bar = new SingleBar({
          stream,
          format: 'foldwise [{bar}] {value}/{total} tasks | {duration_formatted} elapsed | eta {eta_formatted}',
          barCompleteChar: '#',
          barIncompleteChar: '.',
          hideCursor: true,
          clearOnComplete: true,
          etaBuffer: 20,
        });
        bar.start(total, done);
      } else bar.update(done);
    },
    stop() {
      bar?.stop();
    },
  };
}
