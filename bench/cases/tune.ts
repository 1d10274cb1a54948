/**
 * Shared work of `foldwise tune` (issue 5): the whole nested search (outer kfold:5, inner
 * kfold:3, recommendation on all rows) on CSV text of the seeded synthetic problem, loaded
 * through the real loader, with one candidate against a grid.
 *
 * - kNN, 4,000 x 10 rows: the 10-value grid k = 1, 3, ..., 19 against a single k (19, the
 *   largest, whose neighbour list the grid shares; and 1, the cheapest). Goal: grid <= 1.3x the
 *   single k.
 * - Forest, 1,500 x 10 rows: trees = 25|50|100|200 against trees = 200 alone. Goal: grid <= 1.2x
 *   the largest forest alone.
 * After one untimed warm-up run of each learner, figures are medians of min(--runs, 5) whole
 * runs (load + tune), wall clock and process CPU time (CPU time is the fairer figure on a busy
 * machine); the ratios are of the medians.
 */
import { loadCsv } from '../../src/data/load-csv.js';
import type { Table } from '../../src/data/types.js';
import { tune } from '../../src/search/tune.js';
import { type BenchCase, fixed, median, peakRssMb } from '../case.js';
import { syntheticProblem } from '../synthetic.js';

function csvText(rows: number, cols: number, seed: number): string {
  const { X, y } = syntheticProblem('classification', rows, cols, seed);
  if (y.task !== 'classification') throw new Error('expected classes');
  const lines = [[...Array.from({ length: cols }, (_, j) => `x${j}`), 'label'].join(',')];
  for (let i = 0; i < rows; i++) {
    const cells = Array.from(X.data.subarray(i * cols, (i + 1) * cols), (v) => v.toFixed(5));
    lines.push(`${cells.join(',')},${y.codes[i] ? 'yes' : 'no'}`);
  }
  return `${lines.join('\n')}\n`;
}

interface Timed {
  readonly ms: number;
  readonly cpuMs: number;
  readonly fits: number;
  readonly plain: number;
  readonly estimate: number;
  readonly pick: string;
}

async function timeTune(text: string, learner: string, runs: number): Promise<Timed> {
  const ms: number[] = [];
  const cpu: number[] = [];
  let last: Timed | undefined;
  for (let r = 0; r < runs; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const table: Table = await loadCsv({ text, name: 'bench.csv' });
    const report = tune(table, { target: 'label', learners: [learner], seed: 1, timing: false });
    ms.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
    last = {
      ms: 0,
      cpuMs: 0,
      fits: report.search.fits,
      plain: report.search.plainLoopFits,
      estimate: report.outer.summary.accuracy!.mean,
      pick: report.recommendation.spec,
    };
  }
  return { ...last!, ms: median(ms), cpuMs: median(cpu) };
}

export const cases: BenchCase[] = [
  {
    name: 'tune-shared',
    doc: 'foldwise tune shared work: a 10-value k grid vs one k; a 4-value tree-count grid vs the largest forest',
    async run({ runs, log }) {
      const n = Math.min(runs, 5);
      const knnText = csvText(4_000, 10, 21);
      const forestText = csvText(1_500, 10, 22);
      log('warming up...');
      await timeTune(knnText, 'knn:k=1..19+2', 1);
      await timeTune(forestText, 'forest:trees=5|10', 1);
      const rows: (string | number)[][] = [];
      const time = async (label: string, text: string, learner: string): Promise<Timed> => {
        log(`${label}...`);
        const t = await timeTune(text, learner, n);
        rows.push([label, learner, fixed(t.ms / 1000, 3), fixed(t.cpuMs / 1000, 3), t.fits, t.plain, fixed(t.estimate, 4), t.pick]);
        return t;
      };
      const k19 = await time('kNN single k (largest)', knnText, 'knn:k=19');
      const k1 = await time('kNN single k (cheapest)', knnText, 'knn:k=1');
      const kGrid = await time('kNN 10-value grid', knnText, 'knn:k=1..19+2');
      const f200 = await time('forest largest alone', forestText, 'forest:trees=200');
      const fGrid = await time('forest 4-value grid', forestText, 'forest:trees=25|50|100|200');
      return [
        {
          title: 'foldwise tune, outer kfold:5 x inner kfold:3 (load + whole nested search)',
          columns: ['case', 'search', 'wall s', 'CPU s', 'fits', 'plain-loop fits', 'outer accuracy', 'recommended'],
          rows,
          notes: [
            `kNN grid / single k=19: wall ${fixed(kGrid.ms / k19.ms, 3)}, CPU ${fixed(kGrid.cpuMs / k19.cpuMs, 3)} (goal <= 1.3); grid / single k=1: wall ${fixed(kGrid.ms / k1.ms, 3)}, CPU ${fixed(kGrid.cpuMs / k1.cpuMs, 3)}`,
            `forest grid / trees=200 alone: wall ${fixed(fGrid.ms / f200.ms, 3)}, CPU ${fixed(fGrid.cpuMs / f200.cpuMs, 3)} (goal <= 1.2)`,
            `median of ${n} runs each; peak RSS ${fixed(peakRssMb(), 0)} MB`,
          ],
        },
      ];
    },
  },
];
