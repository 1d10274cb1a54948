/**
 * `npm run bench -- auditscale`: the audit at the size of real work (issue #14, "The audit at
 * scale"): the quick audit eval runs first and the full `foldwise audit`, on a seeded table of
 * ROWS x 20 numeric features and a two-class target made in memory here (so the loader's speed
 * is not part of the figure). Process: x_j ~ N(0, 1) rounded to 4 decimals; class "1" when
 * x_0 + 0.5 x_1 - 0.5 x_2 + e > 0 with e ~ N(0, 1). Goals: full audit at most 15 s at 10^6 rows.
 * Wall and CPU time (user + system of this process) are both given, with the load average of
 * the machine when the case started: on a shared machine the CPU time is the steadier figure.
 */
import { availableParallelism, loadavg } from 'node:os';
import { audit, quickSuspects } from '../../src/audit/index.js';
import type { Column, Table } from '../../src/data/types.js';
import { createRng } from '../../src/rng.js';
import { fixed, timeOnce, type BenchCase } from '../case.js';

export function scaleTable(rows: number, features: number, seed: number): Table {
  const rng = createRng(seed);
  const cols: Float64Array[] = Array.from({ length: features }, () => new Float64Array(rows));
  const codes = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < features; j++) {
      let u = 0;
      while (u === 0) u = rng.next();
      cols[j][i] = Math.round(10_000 * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next())) / 10_000;
    }
    let u = 0;
    while (u === 0) u = rng.next();
    const e = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
    codes[i] = cols[0][i] + 0.5 * cols[1][i] - 0.5 * cols[2][i] + e > 0 ? 1 : 0;
  }
  const columns: Column[] = cols.map((values, j) => ({ kind: 'numeric', name: `x${j}`, position: j, values, missing: 0 }));
  columns.push({ kind: 'categorical', name: 'y', position: features, codes, levels: ['0', '1'], missing: 0 });
  const lines = new Int32Array(rows);
  for (let i = 0; i < rows; i++) lines[i] = i + 2;
  return {
    source: `scale-${rows}x${features}.csv`,
    rows,
    columns,
    byName: new Map(columns.map((c) => [c.name, c])),
    fingerprint: { sha256: '0'.repeat(64), rows, columns: columns.length, schema: columns.map((c) => [c.name, c.kind] as const) },
    lines,
    warnings: [],
  };
}

export const cases: BenchCase[] = [
  {
    name: 'auditscale-1m',
    doc: 'quick and full audit time at 10^5 and 10^6 rows x 20 numeric features (issue #14)',
    run({ log }) {
      const rows: (string | number)[][] = [];
      const load = loadavg().map((x) => fixed(x, 2)).join(' ');
      const cpus = availableParallelism();
      for (const n of [100_000, 1_000_000]) {
        const table = scaleTable(n, 20, 14);
        log(`table of ${n} x 20 made`);
        const quick = timeOnce(() => quickSuspects(table, { target: 'y', plan: 'kfold:10', seed: 1 }));
        log(`quick audit ${fixed(quick.time.wallMs / 1000, 2)} s wall, ${fixed(quick.time.cpuMs / 1000, 2)} s CPU`);
        const full = timeOnce(() => audit(table, { target: 'y', plan: 'kfold:10', seed: 1 }));
        log(`full audit ${fixed(full.time.wallMs / 1000, 2)} s wall, ${fixed(full.time.cpuMs / 1000, 2)} s CPU`);
        const s = (ms: number): string => fixed(ms / 1000, 2);
        rows.push([n, s(quick.time.wallMs), s(quick.time.cpuMs), s(full.time.wallMs), s(full.time.cpuMs), quick.value.length, full.value.suspects.length]);
      }
      return [
        {
          title: 'Audit at scale (20 numeric features, two classes, kfold:10, seed 1)',
          columns: ['rows', 'quick audit s wall', 's CPU', 'full audit s wall', 's CPU', 'printed findings', 'suspects'],
          rows,
          notes: [`goal (issue #14): full audit at most 15 s at 1,000,000 rows; load average at the start ${load} (1, 5, 15 min) on ${cpus} cores`],
        },
      ];
    },
  },
];
