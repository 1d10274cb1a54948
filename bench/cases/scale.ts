/**
 * The scale bench (issue 14): seeded files of 100,000 and 1,000,000 rows (bench/scale-data.ts),
 * written to a temporary folder and removed afterwards, and one table of figures with their goals.
 *
 * Each figure is measured in a child process (bench/cases/scale-load.ts and the like), so its
 * peak RSS is that of the step alone. The machine is shared: MB/s is given by wall time and by
 * CPU time (user + system of the child), and beside the parser's own pass on the same file.
 *
 * To add rows (another learner, another input format), append a producer to
 * SCALE_ROWS: it gets the files and returns table rows; the columns are fixed below.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type BenchCase, fixed } from '../case.js';
import { scaleColumns, writeScaleCsv, type ScaleKind } from '../scale-data.js';

export interface ScaleFile {
  readonly kind: ScaleKind;
  readonly rows: number;
  readonly format: 'csv' | 'parquet' | 'arrow';
  readonly path: string;
  readonly bytes: number;
}

export interface ScaleContext {
  readonly files: readonly ScaleFile[];
  readonly log: (line: string) => void;
}

/** One row of the table: what was measured, on which file, the figure and its goal. */
export interface ScaleRow {
  readonly measure: string;
  readonly file: ScaleFile;
  /** the figure as text, with its unit */
  readonly figure: string;
  readonly peakRssMb?: number;
  /** the goal as text, '' when there is none */
  readonly goal: string;
  /** whether the goal is met: "yes", "no", or a qualified answer; undefined when there is no goal */
  readonly met?: string;
}

export type ScaleRowProducer = (ctx: ScaleContext) => Promise<ScaleRow[]> | ScaleRow[];

export const SCALE_SIZES = [100_000, 1_000_000] as const;
export const SCALE_SEED = 20_140;

const here = fileURLToPath(new URL('.', import.meta.url));

/** Runs a child script of this folder and parses the JSON line it prints. */
export function child<T>(script: string, args: readonly string[]): T {
  const out = execFileSync(process.execPath, [join(here, script), ...args], { encoding: 'utf8', maxBuffer: 1 << 20 });
  return JSON.parse(out.trim().split('\n').pop()!) as T;
}

interface LoadFigures {
  rows: number;
  wallMs: number;
  cpuMs: number;
  peakRssMb: number;
  columnMb: number;
}

const MB = 1e6;
/** Load speed goals of issue 14 (MB/s, by wall time on an idle machine). */
const LOAD_GOAL: Record<ScaleKind, number> = { numeric: 60, 'half-categorical': 30 };

/** CSV load: foldwise's loader and, as the ceiling, papaparse's own pass (no typing). */
export const csvLoadRows: ScaleRowProducer = ({ files, log }) => {
  const rows: ScaleRow[] = [];
  for (const file of files) {
    log(`load ${file.kind} ${file.rows} rows (${fixed(file.bytes / MB, 1)} MB)`);
    const ours = child<LoadFigures>('scale-load.js', [file.path, 'foldwise']);
    const parser = child<LoadFigures>('scale-load.js', [file.path, 'papaparse']);
    if (ours.rows !== file.rows) throw new Error(`scale: loaded ${ours.rows} rows of ${file.path}, expected ${file.rows}`);
    const mb = file.bytes / MB;
    const wallRate = mb / (ours.wallMs / 1000);
    const cpuRate = mb / (ours.cpuMs / 1000);
    const bound = 2 * ours.columnMb * (2 ** 20 / MB) + 100;
    rows.push({
      measure: 'CSV load speed',
      file,
      figure: `${fixed(wallRate, 1)} MB/s wall (${fixed(ours.wallMs / 1000, 2)} s), ${fixed(cpuRate, 1)} MB/s CPU; papaparse alone ${fixed(mb / (parser.wallMs / 1000), 1)} wall, ${fixed(mb / (parser.cpuMs / 1000), 1)} CPU (ours/papaparse CPU time ${fixed(ours.cpuMs / parser.cpuMs, 2)})`,
      peakRssMb: ours.peakRssMb,
      goal: `>= ${LOAD_GOAL[file.kind]} MB/s`,
      met: wallRate >= LOAD_GOAL[file.kind] ? 'yes' : cpuRate >= LOAD_GOAL[file.kind] ? 'by CPU time only' : 'no',
    });
    rows.push({
      measure: 'CSV load peak RSS',
      file,
      figure: `${fixed(ours.peakRssMb, 0)} MB (loaded columns ${fixed(ours.columnMb * 2 ** 20 / MB, 0)} MB)`,
      peakRssMb: ours.peakRssMb,
      goal: `<= 2 x columns + 100 MB = ${fixed(bound, 0)} MB`,
      met: ours.peakRssMb * (2 ** 20 / MB) <= bound ? 'yes' : 'no',
    });
  }
  return rows;
};

/**
 * One long quoted field (issue 26): a file holding a 12 MB and one holding a 50 MB field, each
 * loaded in a child process. Linear time makes the ratio of the times about 50/12 = 4.2; the
 * quadratic parse the issue measured took 1.4 s and 16.5 s (ratio 11.8).
 */
export const longFieldRows: ScaleRowProducer = ({ files, log }) => {
  const dir = dirname(files[0].path);
  const seconds: number[] = [];
  const cpu: number[] = [];
  const sized: ScaleFile[] = [];
  for (const mb of [12, 50]) {
    const path = join(dir, `field-${mb}mb.csv`);
    const field = 'w'.repeat(mb * MB);
    writeFileSync(path, `note,y\n"${field}",1\nshort,0\n`);
    log(`load one ${mb} MB field`);
    const r = child<LoadFigures>('scale-load.js', [path, 'foldwise']);
    seconds.push(r.wallMs / 1000);
    cpu.push(r.cpuMs / 1000);
    sized.push({ kind: 'numeric', rows: 2, format: 'csv', path, bytes: statSync(path).size });
    rmSync(path, { force: true });
  }
  const ratio = cpu[1] / cpu[0];
  return [
    {
      measure: 'one long quoted field',
      file: sized[1],
      figure: `12 MB: ${fixed(seconds[0], 2)} s wall, ${fixed(cpu[0], 2)} s CPU; 50 MB: ${fixed(seconds[1], 2)} s wall, ${fixed(cpu[1], 2)} s CPU; CPU ratio ${fixed(ratio, 1)}`,
      goal: 'linear: CPU ratio 50 MB / 12 MB <= 6 (4.2 when linear)',
      met: ratio <= 6 ? 'yes' : 'no',
    },
  ];
};

/** Parquet and Arrow load goals of issue 14 (seconds for 10^6 x 20) and the command handoff goal. */
const TYPED_GOAL_S = { parquet: 3, arrow: 1 } as const;
const HANDOFF_GOAL_S = 2;

/**
 * Parquet and Arrow load (issue 14): each numeric CSV loaded, written by foldwise's writers
 * (hyparquet-writer, snappy; apache-arrow IPC file), and loaded back in a child process; and
 * the command: handoff at format=arrow vs csv (train and test files of every row).
 */
export const typedLoadRows: ScaleRowProducer = async ({ files, log }) => {
  const { loadTable } = await import('../../src/data/load-table.js');
  const { formatBytes, loadColumnarWriters, outColumn } = await import('../../src/io/write-columnar.js');
  await loadColumnarWriters();
  const rows: ScaleRow[] = [];
  for (const file of files.filter((f) => f.kind === 'numeric')) {
    const t = await loadTable({ path: file.path });
    for (const format of ['parquet', 'arrow'] as const) {
      const path = `${file.path}.${format}`;
      writeFileSync(path, formatBytes(format, t.columns.map((c) => outColumn(c)), t.rows));
      const typed: ScaleFile = { ...file, format, path, bytes: statSync(path).size };
      log(`load ${format} ${file.rows} rows (${fixed(typed.bytes / MB, 1)} MB)`);
      const r = child<LoadFigures>('scale-load.js', [path, 'typed']);
      if (r.rows !== file.rows) throw new Error(`scale: loaded ${r.rows} rows of ${path}, expected ${file.rows}`);
      const goal = file.rows === 1_000_000 ? TYPED_GOAL_S[format] : undefined;
      rows.push({
        measure: `${format === 'parquet' ? 'Parquet' : 'Arrow'} load time`,
        file: typed,
        figure: `${fixed(r.wallMs / 1000, 2)} s wall, ${fixed(r.cpuMs / 1000, 2)} s CPU`,
        peakRssMb: r.peakRssMb,
        goal: goal === undefined ? '' : `<= ${goal} s`,
        ...(goal === undefined ? {} : { met: r.wallMs / 1000 <= goal ? 'yes' : r.cpuMs / 1000 <= goal ? 'by CPU time only' : 'no' }),
      });
      rmSync(path, { force: true });
    }
    if (file.rows !== 1_000_000) continue;
    for (const how of ['handoff-arrow', 'handoff-csv'] as const) {
      log(`command handoff ${how} ${file.rows} rows`);
      const r = child<LoadFigures>('scale-load.js', [file.path, how]);
      for (const ext of ['train', 'test']) rmSync(`${file.path}.${ext}.${how === 'handoff-arrow' ? 'arrow' : 'csv'}`, { force: true });
      rows.push({
        measure: `command: handoff, format=${how.slice('handoff-'.length)} (train + test files of every row)`,
        file,
        figure: `${fixed(r.wallMs / 1000, 2)} s wall, ${fixed(r.cpuMs / 1000, 2)} s CPU`,
        peakRssMb: r.peakRssMb,
        goal: how === 'handoff-arrow' ? `<= ${HANDOFF_GOAL_S} s` : '',
        ...(how === 'handoff-arrow' ? { met: r.wallMs / 1000 <= HANDOFF_GOAL_S ? 'yes' : r.cpuMs / 1000 <= HANDOFF_GOAL_S ? 'by CPU time only' : 'no' } : {}),
      });
    }
  }
  return rows;
};

interface RunFigures {
  code: number;
  wallMs: number;
  cpuMs: number;
  peakRssMb: number;
}

/** Peak memory goal of issue 14: a default forest eval with --jobs 2 within 3 x the float64 columns. */
const FOREST_RSS_FACTOR = 3;
/** The quick audit's share goal of issue 14: at most 10% of the eval it runs before. */
const AUDIT_SHARE_GOAL = 0.1;

/**
 * Eval at size (issue 14), each a foldwise command in a child process (scale-eval.ts):
 * - the quick audit's cost: `eval --learner baseline --plan kfold:3` with the audit and with
 *   --no-audit on the same file; the difference is the audit (the baseline costs next to nothing);
 * - a forest eval, `eval --learner forest --plan kfold:3 --jobs 2 --no-audit` with default
 *   forest options: its wall and CPU time, and its peak RSS against 3 x the float64 columns;
 * - the audit's share of that forest eval (audit / (forest eval + audit)). The default eval
 *   (kfold:10 with knn and forest) costs far more than this kfold:3 forest eval and the audit
 *   the same, so its share there is smaller still; knn at 10^6 rows takes too long to run here.
 * On the numeric files only; slow at 10^6 rows (minutes of CPU for the forest folds).
 */
export const evalRows: ScaleRowProducer = ({ files, log }) => {
  const rows: ScaleRow[] = [];
  for (const file of files.filter((f) => f.kind === 'numeric')) {
    const out = `${file.path}.report.json`;
    const evalOf = (extra: readonly string[]): RunFigures => {
      const r = child<RunFigures>('scale-eval.js', ['eval', file.path, '--target', 'y', '--json', out, '--no-timing', '--plan', 'kfold:3', ...extra]);
      if (r.code !== 0) throw new Error(`scale: eval ${extra.join(' ')} exited ${r.code}`);
      return r;
    };
    log(`eval baseline with and without the quick audit, ${file.rows} rows`);
    const plain = evalOf(['--learner', 'baseline', '--no-audit']);
    const audited = evalOf(['--learner', 'baseline']);
    const auditWall = Math.max(0, audited.wallMs - plain.wallMs) / 1000;
    const auditCpu = Math.max(0, audited.cpuMs - plain.cpuMs) / 1000;
    rows.push({
      measure: 'quick audit (eval baseline with it - without it)',
      file,
      figure: `${fixed(auditWall, 2)} s wall, ${fixed(auditCpu, 2)} s CPU`,
      peakRssMb: audited.peakRssMb,
      goal: '',
    });
    log(`eval forest --jobs 2, ${file.rows} rows`);
    const forestRun = evalOf(['--learner', 'forest', '--jobs', '2', '--no-audit']);
    const columnsMb = (scaleColumns(file.kind).length * 8 * file.rows) / 2 ** 20;
    const bound = FOREST_RSS_FACTOR * columnsMb;
    rows.push({
      measure: 'eval --learner forest --plan kfold:3 --jobs 2 (default forest options)',
      file,
      figure: `${fixed(forestRun.wallMs / 1000, 1)} s wall, ${fixed(forestRun.cpuMs / 1000, 1)} s CPU`,
      peakRssMb: forestRun.peakRssMb,
      // the goal is for 10^6 rows; at 10^5 the columns (17 MB) are below Node's own footprint
      ...(file.rows === 1_000_000 ? { goal: `peak RSS <= 3 x columns = ${fixed(bound, 0)} MB`, met: forestRun.peakRssMb <= bound ? 'yes' : 'no' } : { goal: '' }),
    });
    const share = auditWall / (forestRun.wallMs / 1000 + auditWall);
    const cpuShare = auditCpu / (forestRun.cpuMs / 1000 + auditCpu);
    rows.push({
      measure: "quick audit's share of that forest eval",
      file,
      figure: `${fixed(100 * share, 1)}% by wall time, ${fixed(100 * cpuShare, 1)}% by CPU time`,
      goal: `<= ${100 * AUDIT_SHARE_GOAL}% of a default eval`,
      met: share <= AUDIT_SHARE_GOAL ? 'yes' : cpuShare <= AUDIT_SHARE_GOAL ? 'by CPU time only' : 'no',
    });
    rmSync(out, { force: true });
  }
  return rows;
};

/** Producers of the table's rows, in order. Add a line here for a new measure or format. */
export const SCALE_ROWS: ScaleRowProducer[] = [csvLoadRows, longFieldRows, typedLoadRows, evalRows];

async function run({ log }: { log: (line: string) => void }) {
  const dir = mkdtempSync(join(tmpdir(), 'foldwise-scale-'));
  try {
    const files: ScaleFile[] = [];
    for (const rows of SCALE_SIZES) {
      for (const kind of ['numeric', 'half-categorical'] as const) {
        const path = join(dir, `${kind}-${rows}.csv`);
        log(`writing ${path}`);
        const bytes = await writeScaleCsv(path, kind, rows, SCALE_SEED);
        files.push({ kind, rows, format: 'csv', path, bytes });
      }
    }
    const out: ScaleRow[] = [];
    for (const producer of SCALE_ROWS) out.push(...(await producer({ files, log })));
    return [
      {
        title: 'Scale: data at 10^5 and 10^6 rows',
        columns: ['measure', 'format', 'data', 'rows', 'MB', 'figure', 'peak RSS MB', 'goal', 'met'],
        rows: out.map((r) => [
          r.measure,
          r.file.format,
          r.file.rows === 2 ? 'one long field' : `${r.file.kind} (${scaleColumns(r.file.kind).length} columns)`,
          r.file.rows,
          fixed(r.file.bytes / MB, 1),
          r.figure,
          r.peakRssMb === undefined ? '' : fixed(r.peakRssMb, 0),
          r.goal,
          r.met ?? '',
        ]),
        notes: [
          `Seeded files (seed ${SCALE_SEED}) from bench/scale-data.ts in a temporary folder; each figure from a child process.`,
          'Goals are by wall time on an idle machine; on a shared machine compare the CPU figure and the ratio to papaparse on the same file.',
          'Parquet and Arrow rows come with those readers (issue 14).',
        ],
      },
    ];
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

export const cases: BenchCase[] = [
  {
    name: 'scale',
    doc: 'data at 10^5 and 10^6 rows: load MB/s and peak RSS per format, the quick audit and its share, a forest eval (slow), with the goals of issue 14',
    run,
  },
];
