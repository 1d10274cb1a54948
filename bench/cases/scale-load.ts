/**
 * Child process of the scale bench: loads one file and prints one JSON line with the wall time,
 * CPU time, peak RSS and the bytes of the loaded columns. Run alone so the peak RSS is the load's.
 *   node dist/bench/cases/scale-load.js FILE [foldwise|papaparse|typed|handoff-arrow|handoff-csv]
 * `typed` loads through loadTable (CSV, Parquet or Arrow by the file's bytes). `handoff-*` loads
 * the CSV first (not timed), then times what a command: learner does per fold: every row as a
 * row-major matrix written as train and test files in that format (format=arrow or csv).
 * `papaparse` streams the file through papaparse with an empty row callback and no typing: the
 * parser's own pass, the ceiling the issue measured against.
 */
import { createReadStream } from 'node:fs';
import Papa from 'papaparse';
import { writeFileSync } from 'node:fs';
import { loadCsv } from '../../src/data/load-csv.js';
import { loadTable } from '../../src/data/load-table.js';
import { matrixCsv } from '../../src/io/csv-text.js';
import { formatBytes, loadColumnarWriters, matrixColumns, targetColumn } from '../../src/io/write-columnar.js';

async function main(): Promise<void> {
  const [path, how = 'foldwise'] = process.argv.slice(2);
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let rows = 0;
  let columnBytes = 0;
  if (how.startsWith('handoff-')) {
    const t = await loadTable({ path });
    const cols = t.columns.filter((c) => c.kind === 'numeric');
    const X = { rows: t.rows, cols: cols.length, data: new Float64Array(t.rows * cols.length) };
    cols.forEach((c, j) => {
      if (c.kind === 'numeric') for (let i = 0; i < t.rows; i++) X.data[i * X.cols + j] = c.values[i];
    });
    const y = { task: 'regression' as const, values: Float64Array.from({ length: t.rows }, (_, i) => X.data[i * X.cols]) };
    const names = cols.map((c) => c.name);
    // the writers load on demand; load them before the clock starts, as a run does before its folds
    await loadColumnarWriters();
    const h0 = process.cpuUsage();
    const w0 = performance.now();
    if (how === 'handoff-arrow') {
      writeFileSync(`${path}.train.arrow`, formatBytes('arrow', [...matrixColumns(X, names), targetColumn('y', y)], X.rows));
      writeFileSync(`${path}.test.arrow`, formatBytes('arrow', matrixColumns(X, names), X.rows));
    } else {
      writeFileSync(`${path}.train.csv`, matrixCsv(X, names, { name: 'y', y }));
      writeFileSync(`${path}.test.csv`, matrixCsv(X, names));
    }
    const cpu = process.cpuUsage(h0);
    process.stdout.write(`${JSON.stringify({ rows: t.rows, wallMs: performance.now() - w0, cpuMs: (cpu.user + cpu.system) / 1000, peakRssMb: process.resourceUsage().maxRSS / 1024, columnMb: 0 })}\n`);
    return;
  }
  if (how === 'typed') {
    const t = await loadTable({ path });
    rows = t.rows;
    for (const c of t.columns) columnBytes += c.kind === 'numeric' ? c.values.byteLength : c.codes.byteLength;
  } else if (how === 'papaparse') {
    await new Promise<void>((resolve, reject) => {
      Papa.parse(createReadStream(path, { encoding: 'utf8' }) as never, {
        step: () => {
          rows++;
        },
        complete: () => resolve(),
        error: (e: Error) => reject(e),
      });
    });
    rows--;
  } else {
    const t = await loadCsv({ path });
    rows = t.rows;
    for (const c of t.columns) columnBytes += c.kind === 'numeric' ? c.values.byteLength : c.codes.byteLength;
  }
  const wallMs = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  process.stdout.write(
    `${JSON.stringify({ rows, wallMs, cpuMs: (cpu.user + cpu.system) / 1000, peakRssMb: process.resourceUsage().maxRSS / 1024, columnMb: columnBytes / 2 ** 20 })}\n`,
  );
}

main().catch((e: unknown) => {
  process.stderr.write(`${e instanceof Error ? e.message : String(e)}\n`);
  process.exitCode = 2;
});
