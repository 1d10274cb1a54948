/**
 * Seeded CSV files for the scale bench (`npm run bench -- scale`), written to a folder the
 * caller gives (a temporary one). Invented data with a known generating process:
 *
 * - `numeric`: columns x0..x19 ~ N(0, 1) written with 4 decimals, and a two-class target
 *   y = 1 when x0 + x1 * x2 + sin(2 x3) + 0.5 e > 0 (e ~ N(0, 1)), else 0 (about 152 bytes a row).
 * - `half-categorical`: x0..x9 as above and c0..c9 categorical with 2, 3, 5, 8, 12, 20, 50, 100,
 *   500 and 1,000 levels drawn uniformly (level names `a0`, `a1`, ...); y as above from x0..x3.
 *
 * The same seed and size give the same bytes.
 */
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import { createRng, type Rng } from '../src/rng.js';

export type ScaleKind = 'numeric' | 'half-categorical';

export const CATEGORY_LEVELS = [2, 3, 5, 8, 12, 20, 50, 100, 500, 1000] as const;

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

/** Columns of the file: names and whether each is numeric (float64 once loaded). */
export function scaleColumns(kind: ScaleKind): { name: string; numeric: boolean }[] {
  if (kind === 'numeric') return [...Array.from({ length: 20 }, (_, j) => ({ name: `x${j}`, numeric: true })), { name: 'y', numeric: true }];
  return [
    ...Array.from({ length: 10 }, (_, j) => ({ name: `x${j}`, numeric: true })),
    ...CATEGORY_LEVELS.map((_, j) => ({ name: `c${j}`, numeric: false })),
    { name: 'y', numeric: true },
  ];
}

/** Writes the file; resolves to its size in bytes. */
export async function writeScaleCsv(path: string, kind: ScaleKind, rows: number, seed: number): Promise<number> {
  const rng = createRng(seed);
  const out = createWriteStream(path);
  let bytes = 0;
  let buffer = `${scaleColumns(kind).map((c) => c.name).join(',')}\n`;
  const numericCount = kind === 'numeric' ? 20 : 10;
  const x = new Float64Array(numericCount);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < numericCount; j++) x[j] = gauss(rng);
    let line = '';
    for (let j = 0; j < numericCount; j++) line += `${x[j].toFixed(4)},`;
    if (kind === 'half-categorical') for (const levels of CATEGORY_LEVELS) line += `a${rng.int(levels)},`;
    const f = x[0] + x[1] * x[2] + Math.sin(2 * x[3]) + 0.5 * gauss(rng);
    buffer += `${line}${f > 0 ? 1 : 0}\n`;
    if (buffer.length > 1 << 16) {
      bytes += Buffer.byteLength(buffer);
      if (!out.write(buffer)) await once(out, 'drain');
      buffer = '';
    }
  }
  bytes += Buffer.byteLength(buffer);
  out.end(buffer);
  await once(out, 'finish');
  return bytes;
}
