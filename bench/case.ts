/**
 * What a benchmark case is, and the measuring helpers cases share.
 * A case file in bench/cases/ exports `cases: BenchCase[]`; bench/run.ts lists the files.
 * Benchmarks are not part of `npm test`: speed goals live here, never in timed unit tests.
 */
export interface BenchTable {
  readonly title: string;
  readonly columns: readonly string[];
  readonly rows: readonly (readonly (string | number)[])[];
  /** lines printed under the table */
  readonly notes?: readonly string[];
}

export interface BenchOptions {
  /** repetitions of each timed run of our own code (the median is reported) */
  readonly runs: number;
  /** progress lines, printed as they come */
  readonly log: (line: string) => void;
}

export interface BenchCase {
  /** lower-case, hyphenated; selectable on the command line by the whole name or its first word */
  readonly name: string;
  readonly doc: string;
  run(options: BenchOptions): Promise<BenchTable[]> | BenchTable[];
}

export interface Timing {
  /** wall-clock milliseconds */
  readonly wallMs: number;
  /** user + system CPU milliseconds of this process */
  readonly cpuMs: number;
}

/** Runs fn once and times it. */
export function timeOnce<T>(fn: () => T): { value: T; time: Timing } {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const value = fn();
  const wallMs = performance.now() - t0;
  const c = process.cpuUsage(c0);
  return { value, time: { wallMs, cpuMs: (c.user + c.system) / 1000 } };
}

export function median(xs: readonly number[]): number {
  if (xs.length === 0) throw new Error('median of nothing');
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Runs fn `runs` times; returns the last value and the median wall and CPU times. */
export function timeMedian<T>(runs: number, fn: () => T): { value: T; time: Timing } {
  const walls: number[] = [];
  const cpus: number[] = [];
  let value: T | undefined;
  for (let r = 0; r < runs; r++) {
    const one = timeOnce(fn);
    walls.push(one.time.wallMs);
    cpus.push(one.time.cpuMs);
    value = one.value;
  }
  return { value: value as T, time: { wallMs: median(walls), cpuMs: median(cpus) } };
}

/** Peak resident set size of this process so far, in MB. */
export function peakRssMb(): number {
  return process.resourceUsage().maxRSS / 1024;
}

/** JavaScript heap in use plus ArrayBuffer memory (where typed arrays live), in MB. */
export function heapUsedMb(): number {
  const m = process.memoryUsage();
  return (m.heapUsed + m.arrayBuffers) / (1024 * 1024);
}

/** Fixed-point text with `digits` decimals. */
export function fixed(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : String(x);
}
