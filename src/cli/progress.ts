/**
 * Progress on standard error (cli-progress): while a CSV loads (megabytes read of the file's
 * size), a note while the quick audit runs, then the tasks (done of total, elapsed, estimated
 * time left). The bar is shown when standard error is a terminal and not under CI; it prints
 * no colours (so NO_COLOR holds). Off a terminal (a CI log, a file) a plain line
 * `foldwise: progress: 12/40 tasks done, 1m05s elapsed, about 3m20s left` is printed at most
 * every PLAIN_INTERVAL_S seconds (FOLDWISE_PROGRESS_SECONDS in the environment sets another
 * interval), so a short run prints none. Nothing at all with --quiet.
 */
import { SingleBar } from 'cli-progress';
import type { Io } from './io.js';

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

/** Seconds between plain progress lines off a terminal. */
export const PLAIN_INTERVAL_S = 30;

/** 65 -> "1m05s", 3725 -> "1h02m05s". */
export function duration(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const r = s % 60;
  const two = (n: number): string => String(n).padStart(2, '0');
  return h > 0 ? `${h}h${two(m)}m${two(r)}s` : m > 0 ? `${m}m${two(r)}s` : `${r}s`;
}

/** Plain progress lines for standard error off a terminal, at most one per `intervalS`. */
function plainProgress(io: Io, intervalS: number, now: () => number): Progress {
  const started = now();
  let last = started;
  let first: { at: number; done: number } | undefined;
  return {
    loading() {},
    phase() {},
    tasks(done, total) {
      const t = now();
      if (!first) first = { at: t, done };
      if ((t - last) / 1000 < intervalS || done >= total) return;
      last = t;
      const rate = (done - first.done) / Math.max(1e-9, (t - first.at) / 1000);
      const left = rate > 0 ? `, about ${duration((total - done) / rate)} left` : '';
      io.stderr.write(`foldwise: progress: ${done}/${total} tasks done, ${duration((t - started) / 1000)} elapsed${left}\n`);
    },
    stop() {},
  };
}

export function progressFor(io: Io, quiet: boolean, now: () => number = Date.now): Progress | undefined {
  const stream = io.stderr as NodeJS.WriteStream;
  if (quiet) return undefined;
  if (!stream.isTTY || io.env?.CI) {
    const set = Number(io.env?.FOLDWISE_PROGRESS_SECONDS);
    return plainProgress(io, io.env?.FOLDWISE_PROGRESS_SECONDS !== undefined && Number.isFinite(set) && set >= 0 ? set : PLAIN_INTERVAL_S, now);
  }
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
