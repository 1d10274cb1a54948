/**
 * Seeded synthetic CSV files with a known generating process, for property checks of the
 * comparisons and the gate (invented data: for tests only).
 *   x1, x2, x3 ~ N(0, 1) independently (Box-Muller on the project's seeded generator), e ~ N(0, 1)
 *   classification: y = "yes" when x1 + 0.5 x2 + 0.5 e > 0, else "no"  (x1 carries most signal,
 *                   x3 none), so dropping x1 costs a nearest-neighbour learner many points
 *   regression:     y = 2 x1 - x2 + 0.3 e
 */
import { createRng, type Rng } from '../../src/rng.js';

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

export function syntheticCsv(task: 'classification' | 'regression', n: number, seed: number): string {
  const rng = createRng(seed);
  const lines = ['x1,x2,x3,y'];
  for (let i = 0; i < n; i++) {
    const x1 = gauss(rng);
    const x2 = gauss(rng);
    const x3 = gauss(rng);
    const e = gauss(rng);
    const y = task === 'classification' ? (x1 + 0.5 * x2 + 0.5 * e > 0 ? 'yes' : 'no') : (2 * x1 - x2 + 0.3 * e).toFixed(4);
    lines.push(`${x1.toFixed(4)},${x2.toFixed(4)},${x3.toFixed(4)},${y}`);
  }
  return `${lines.join('\n')}\n`;
}
