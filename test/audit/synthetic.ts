/**
 * Seeded synthetic tables with a known generating process, for the audit's property checks.
 * Nothing here is real data; every column's process is stated beside it.
 */
import { loadCsv } from '../../src/data/load-csv.js';
import type { Table } from '../../src/data/types.js';
import { createRng, type Rng } from '../../src/rng.js';

/** A standard normal variate (Box-Muller). */
export function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

export type Cell = string | number | null;

/** Columns (name -> cells) as CSV text; null is an empty cell. */
export function toCsv(columns: ReadonlyMap<string, readonly Cell[]>): string {
  const names = [...columns.keys()];
  const n = columns.get(names[0])!.length;
  const lines = [names.join(',')];
  for (let i = 0; i < n; i++) lines.push(names.map((c) => { const v = columns.get(c)![i]; return v === null ? '' : String(v); }).join(','));
  return `${lines.join('\n')}\n`;
}

export async function tableOf(columns: ReadonlyMap<string, readonly Cell[]>, name = 'synthetic.csv'): Promise<Table> {
  return loadCsv({ text: toCsv(columns), name });
}

/**
 * The clean process: four standard normal features x1..x4 and a three-level categorical c
 * (uniform), a whole-number feature k uniform on 0..49, a positive whole-number amount
 * round(1000 exp(z)); the binary target y = [x1 + x2 + x3 + x4 + 0.3 [c = b] + 1.5 e > 0]
 * (e standard normal), so the signal is spread evenly over four features. x4 is missing
 * completely at random in 10% of rows (unrelated to anything).
 */
export function cleanColumns(n: number, seed: number): Map<string, Cell[]> {
  const rng = createRng(seed);
  const cols = new Map<string, Cell[]>([['x1', []], ['x2', []], ['x3', []], ['x4', []], ['c', []], ['k', []], ['amount', []], ['y', []]]);
  for (let i = 0; i < n; i++) {
    const x = [gauss(rng), gauss(rng), gauss(rng), gauss(rng)];
    const c = ['a', 'b', 'c'][rng.int(3)];
    const score = x[0] + x[1] + x[2] + x[3] + (c === 'b' ? 0.3 : 0) + 1.5 * gauss(rng);
    x.forEach((v, j) => cols.get(`x${j + 1}`)!.push(Number(v.toFixed(6))));
    if (rng.next() < 0.1) cols.get('x4')![i] = null;
    cols.get('c')!.push(c);
    cols.get('k')!.push(rng.int(50));
    cols.get('amount')!.push(Math.round(1000 * Math.exp(gauss(rng))));
    cols.get('y')!.push(score > 0 ? 'yes' : 'no');
  }
  return cols;
}
