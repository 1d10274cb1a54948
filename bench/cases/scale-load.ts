/**
 * Child process of the scale bench: loads one file and prints one JSON line with the wall time,
 * CPU time, peak RSS and the bytes of the loaded columns. Run alone so the peak RSS is the load's.
 *   node dist/bench/cases/scale-load.js FILE [foldwise|papaparse]
 * `papaparse` streams the file through papaparse with an empty row callback and no typing: the
 * parser's own pass, the ceiling the issue measured against.
 */
import { createReadStream } from 'node:fs';
import Papa from 'papaparse';
import { loadCsv } from '../../src/data/load-csv.js';

async function main(): Promise<void> {
  const [path, how = 'foldwise'] = process.argv.slice(2);
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  let rows = 0;
  let columnBytes = 0;
  if (how === 'papaparse') {
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
