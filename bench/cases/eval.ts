/**
 * Whole-run benchmark (issue 3, case 4): `evaluate` with the default forest, 10-fold
 * stratified, on 20,000 x 20 rows of the seeded synthetic problem, loaded from CSV text through
 * the real loader. Reports the total (load + evaluate) and the share of time spent outside the
 * learners' fit and predict calls (harness overhead: loading, plans, preprocessing, metrics,
 * summaries). Goal: overhead <= 5%.
 */
import { loadCsv } from '../../src/data/load-csv.js';
import { evaluate } from '../../src/run/evaluate.js';
import { execute } from '../../src/run/execute.js';
import { type BenchCase, fixed, median, peakRssMb } from '../case.js';
import { syntheticProblem } from '../synthetic.js';

function csvText(rows: number, cols: number): string {
  const { X, y } = syntheticProblem('classification', rows, cols, 11);
  if (y.task !== 'classification') throw new Error('expected classes');
  const lines = [[...Array.from({ length: cols }, (_, j) => `x${j}`), 'label'].join(',')];
  for (let i = 0; i < rows; i++) {
    const cells = Array.from(X.data.subarray(i * cols, (i + 1) * cols), (v) => v.toFixed(5));
    lines.push(`${cells.join(',')},${y.codes[i] ? 'yes' : 'no'}`);
  }
  return `${lines.join('\n')}\n`;
}

export const cases: BenchCase[] = [
  {
    name: 'eval-forest',
    doc: 'a full 10-fold eval of the default forest on 20,000 x 20: total time and harness overhead',
    async run({ runs, log }) {
      const text = csvText(20_000, 20);
      const rows: (string | number)[][] = [];
      let accuracy = 0;
      for (const audit of [true, false]) {
        const totals: number[] = [];
        const loads: number[] = [];
        const inside: number[] = [];
        for (let r = 0; r < Math.min(runs, 3); r++) {
          log(`audit ${audit ? 'on' : 'off'}, run ${r + 1}...`);
          const t0 = performance.now();
          const table = await loadCsv({ text, name: 'bench.csv' });
          const t1 = performance.now();
          const report = evaluate(table, { target: 'label', learners: ['forest'], plan: 'kfold:10', seed: 1, audit });
          totals.push(performance.now() - t0);
          loads.push(t1 - t0);
          inside.push(report.timing!.learners.reduce((s, l) => s + l.fitMs + l.predictMs, 0));
          accuracy = report.learners[1].summary.accuracy!.mean;
        }
        const total = median(totals);
        const fit = median(inside);
        rows.push([audit ? 'on (default)' : 'off', fixed(total / 1000, 2), fixed(median(loads) / 1000, 2), fixed(fit / 1000, 2), `${fixed((100 * (total - fit)) / total, 1)}%`]);
      }
      return [
        {
          title: 'foldwise eval, default forest (100 trees) + baseline, kfold:10 on 20,000 x 20, from CSV text',
          columns: ['quick audit', 'total s', 'CSV load s', 'fit+predict s', 'harness overhead'],
          rows,
          notes: [`median of ${Math.min(runs, 3)} runs each; forest mean accuracy ${fixed(accuracy, 4)}; peak RSS ${fixed(peakRssMb(), 0)} MB; goal: overhead <= 5%`],
        },
      ];
    },
  },
  {
    name: 'eval-jobs',
    doc: 'the same 10-fold default-forest run on 20,000 x 20 with --jobs 1 and --jobs 2 (goal: speedup >= 1.8x)',
    async run({ log }) {
      const text = csvText(20_000, 20);
      const table = await loadCsv({ text, name: 'bench.csv' });
      const options = { target: 'label', learners: ['forest'], plan: 'kfold:10', seed: 1, timing: false } as const;
      const times: number[] = [];
      const outs: string[] = [];
      for (const jobs of [1, 2]) {
        log(`--jobs ${jobs}...`);
        const t0 = performance.now();
        const r = await execute(table, options, { jobs });
        times.push(performance.now() - t0);
        outs.push(JSON.stringify(r.kind === 'report' ? r.report : null));
      }
      return [
        {
          title: 'foldwise eval, default forest, kfold:10 on 20,000 x 20, by worker threads',
          columns: ['--jobs', 'seconds', 'speedup'],
          rows: [
            ['1', fixed(times[0] / 1000, 2), '1.00'],
            ['2', fixed(times[1] / 1000, 2), fixed(times[0] / times[1], 2)],
          ],
          notes: [`reports identical: ${outs[0] === outs[1]}; goal: speedup >= 1.8x on 2 cores`],
        },
      ];
    },
  },
];
