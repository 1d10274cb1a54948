/**
 * Boosting benchmarks.
 * boost-large: 200 rounds of depth-6 trees (leaves=64, so every tree may fill depth 6) on
 *   20,000 x 20 of the seeded synthetic problem, classification and regression, one thread.
 *   Goal: a fit in at most 3 s on one core. The default forest (100 trees) is timed in the
 *   same run on the same data, for a ratio that the shared machine's load does not move.
 * boost-vs-forest: held-out accuracy (classification) or RMSE (regression) of boost (default
 *   options) against the default forest, both in one `evaluate` call so they get the same
 *   folds (kfold:5, seed 1), on the synthetic problem (2,000 x 10) and two open data sets that
 *   npm packages ship: the Palmer penguins (vega-datasets, CC0; Gorman, Williams & Fraser 2014;
 *   target species) and Seattle daily weather 2012-2015 (vega-datasets, NOAA National Climatic
 *   Data Center, a U.S. Government work; target the day's maximum temperature from its minimum,
 *   precipitation, wind, weather type and month). Goal: boost at least as good as forest.
 * boost-tune: the whole nested `tune` (outer kfold:5, inner kfold:3) over rounds=50|100|200|400
 *   against rounds=400 alone, on 1,500 x 10 synthetic rows. Goal: the grid costs about one fit
 *   of the largest (candidates differing only in rounds share one model, scored per prefix).
 */
import { readFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadCsv } from '../../src/data/load-csv.js';
import { boost } from '../../src/learners/boost/learner.js';
import { forest } from '../../src/learners/forest.js';
import type { Matrix, Model, Target } from '../../src/learning.js';
import { evaluate } from '../../src/run/evaluate.js';
import { createRng } from '../../src/rng.js';
import { tune } from '../../src/search/tune.js';
import { type BenchCase, fixed, median, timeMedian, timeOnce } from '../case.js';
import { syntheticProblem } from '../synthetic.js';

const SEED = 7;
const LARGE = { rounds: 200, depth: 6, leaves: 64 };

/** node_modules/vega-datasets/data, found from this file (bench/cases or dist/bench/cases). */
function vegaData(file: string): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let up = 0; up < 5; up++) {
    const p = join(dir, 'node_modules', 'vega-datasets', 'data', file);
    try {
      return readFileSync(p, 'utf8');
    } catch {
      dir = dirname(dir);
    }
  }
  throw new Error(`bench: node_modules/vega-datasets/data/${file} not found; run npm ci`);
}

const quote = (s: string) => (/[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

function penguinsCsv(): string {
  const rows = JSON.parse(vegaData('penguins.json')) as Record<string, string | number | null>[];
  const header = Object.keys(rows[0]);
  const lines = [header.map(quote).join(',')];
  for (const r of rows) lines.push(header.map((h) => (r[h] === null ? '' : quote(String(r[h])))).join(','));
  return `${lines.join('\n')}\n`;
}

/** seattle-weather.csv with the date replaced by its month (1-12). */
function weatherCsv(): string {
  const [head, ...rest] = vegaData('seattle-weather.csv').trim().split(/\r?\n/);
  const cols = head.split(',');
  const d = cols.indexOf('date');
  if (d < 0) throw new Error('bench: seattle-weather.csv has no date column');
  const lines = [['month', ...cols.filter((_, j) => j !== d)].join(',')];
  for (const line of rest) {
    const cells = line.split(',');
    lines.push([String(Number(cells[d].slice(5, 7))), ...cells.filter((_, j) => j !== d)].join(','));
  }
  return `${lines.join('\n')}\n`;
}

function syntheticCsv(task: 'classification' | 'regression', rows: number, cols: number): string {
  const { X, y } = syntheticProblem(task, rows, cols, 11);
  const lines = [[...Array.from({ length: cols }, (_, j) => `x${j}`), 'y'].join(',')];
  for (let i = 0; i < rows; i++) {
    const cells = Array.from(X.data.subarray(i * cols, (i + 1) * cols), (v) => v.toFixed(5));
    lines.push(`${cells.join(',')},${y.task === 'classification' ? (y.codes[i] ? 'yes' : 'no') : y.values[i].toFixed(5)}`);
  }
  return `${lines.join('\n')}\n`;
}

function score(model: Model, X: Matrix, y: Target): string {
  const pred = model.predict(X);
  if (y.task === 'classification') {
    let right = 0;
    for (let i = 0; i < pred.length; i++) if (pred[i] === y.codes[i]) right++;
    return `accuracy ${fixed(right / pred.length, 4)}`;
  }
  let s = 0;
  for (let i = 0; i < pred.length; i++) s += (pred[i] - y.values[i]) ** 2;
  return `RMSE ${fixed(Math.sqrt(s / pred.length), 4)}`;
}

const large: BenchCase = {
  name: 'boost-large',
  doc: 'boost, 200 rounds of depth-6 trees on 20,000 x 20, classification and regression; default forest timed beside it',
  run({ runs, log }) {
    const rows: (string | number)[][] = [];
    const notes: string[] = [
      `boost options ${JSON.stringify(LARGE)} (other options default); median of ${runs} fits; forest = default options (100 trees), one fit in the same run;`,
      'hold-out = 20,000 fresh rows of the same seeded problem; goal: boost fit <= 3 s on one core.',
    ];
    for (const task of ['classification', 'regression'] as const) {
      const train = syntheticProblem(task, 20000, 20, 5);
      const test = syntheticProblem(task, 20000, 20, 6);
      log(`${task}: boost, ${runs} runs`);
      const b = timeMedian(runs, () => boost.fit(train.X, train.y, LARGE, { rng: createRng(SEED), seed: SEED }));
      log(`${task}: forest, one run`);
      const f = timeOnce(() => forest.fit(train.X, train.y, {}, { rng: createRng(SEED), seed: SEED }));
      const wallS = b.time.wallMs / 1000;
      rows.push([task, 'boost', fixed(wallS, 3), fixed(b.time.cpuMs / 1000, 3), score(b.value, test.X, test.y), fixed(b.time.wallMs / f.time.wallMs, 2)]);
      rows.push([task, 'forest (default)', fixed(f.time.wallMs / 1000, 3), fixed(f.time.cpuMs / 1000, 3), score(f.value, test.X, test.y), '1.00']);
      const cpuS = b.time.cpuMs / 1000;
      notes.push(
        `${task}: boost fit <= 3 s: wall ${wallS <= 3 ? 'met' : 'NOT met'} (${fixed(wallS, 2)} s), CPU ${cpuS <= 3 ? 'met' : 'NOT met'} (${fixed(cpuS, 2)} s); ` +
          `load average ${fixed(loadavg()[0], 1)} on ${availableParallelism()} cores (wall far above CPU means the process waited for a core)`,
      );
    }
    return [
      {
        title: 'boost, 200 rounds x depth 6, 20,000 x 20, one thread',
        columns: ['task', 'learner', 'fit wall s', 'fit cpu s', 'hold-out', 'wall / forest'],
        rows,
        notes,
      },
    ];
  },
};

interface Dataset {
  readonly name: string;
  readonly csv: () => string;
  readonly target: string;
  readonly drop?: readonly string[];
}

const DATASETS: readonly Dataset[] = [
  { name: 'synthetic classification 2,000 x 10', csv: () => syntheticCsv('classification', 2000, 10), target: 'y' },
  { name: 'synthetic regression 2,000 x 10', csv: () => syntheticCsv('regression', 2000, 10), target: 'y' },
  { name: 'Palmer penguins (species)', csv: penguinsCsv, target: 'Species' },
  { name: 'Seattle weather (temp_max)', csv: weatherCsv, target: 'temp_max' },
];

const versusForest: BenchCase = {
  name: 'boost-vs-forest',
  doc: 'held-out accuracy / RMSE of default boost vs default forest, same folds (kfold:5), synthetic + penguins + Seattle weather',
  async run({ log }) {
    const rows: (string | number)[][] = [];
    const notes: string[] = ['one evaluate call per data set: forest and boost (both default options) on the same folds, kfold:5, seed 1, median imputation; mean over folds (sd);',
      'the difference and its interval are the report\'s paired comparison on the same folds (Nadeau-Bengio corrected t); "met" compares the means only'];
    for (const d of DATASETS) {
      log(d.name);
      const table = await loadCsv({ text: d.csv(), name: `${d.name}.csv` });
      const report = evaluate(table, { target: d.target, ...(d.drop ? { drop: [...d.drop] } : {}), learners: ['forest', 'boost'], plan: 'kfold:5', seed: 1, audit: false, timing: false });
      const metric = report.data.task === 'classification' ? 'accuracy' : 'rmse';
      const higher = metric === 'accuracy';
      const of = (name: string) => report.learners.find((l) => l.name === name)!.summary[metric]!;
      const f = of('forest');
      const b = of('boost');
      const ok = higher ? b.mean >= f.mean : b.mean <= f.mean;
      // the report's paired comparison on the same folds (Nadeau-Bengio corrected interval)
      const pair = report.comparisons?.metric === metric ? report.comparisons.pairs.find((e) => [e.learner, e.reference].sort().join(' ') === 'boost forest') : undefined;
      const sign = pair?.learner === 'boost' ? 1 : -1;
      const ci = pair?.ci95 ? `[${fixed(sign * (sign > 0 ? pair.ci95[0] : pair.ci95[1]), 4)}, ${fixed(sign * (sign > 0 ? pair.ci95[1] : pair.ci95[0]), 4)}]` : 'n/a';
      rows.push([
        d.name,
        `${report.data.rowsUsed} x ${report.data.features.length}`,
        metric,
        `${fixed(f.mean, 4)} (${fixed(f.sd ?? NaN, 4)})`,
        `${fixed(b.mean, 4)} (${fixed(b.sd ?? NaN, 4)})`,
        pair ? `${fixed(sign * pair.diff, 4)} ${ci}` : 'n/a',
        ok ? 'met' : 'NOT met',
      ]);
    }
    return [
      {
        title: 'boost vs forest, default options, same folds (kfold:5, seed 1)',
        columns: ['data', 'rows x features', 'metric', 'forest', 'boost', 'boost - forest [corrected 95% interval]', 'boost at least as good'],
        rows,
        notes,
      },
    ];
  },
};

/** One whole nested tune (outer kfold:5, inner kfold:3, the defaults) of `learner`; wall and CPU ms. */
async function timeTune(text: string, learner: string, runs: number): Promise<{ ms: number; cpuMs: number; fits: number; plain: number; pick: string }> {
  const ms: number[] = [];
  const cpu: number[] = [];
  let fits = 0;
  let plain = 0;
  let pick = '';
  for (let r = 0; r < runs; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const table = await loadCsv({ text, name: 'bench.csv' });
    const report = tune(table, { target: 'y', learners: [learner], seed: 1, timing: false, audit: false });
    ms.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
    fits = report.search.fits;
    plain = report.search.plainLoopFits;
    pick = report.recommendation.spec;
  }
  return { ms: median(ms), cpuMs: median(cpu), fits, plain, pick };
}

const tuneRounds: BenchCase = {
  name: 'boost-tune',
  doc: 'foldwise tune over boost rounds=50|100|200|400 vs rounds=400 alone (prefix scoring), 1,500 x 10',
  async run({ runs, log }) {
    const n = Math.min(runs, 3);
    const text = syntheticCsv('classification', 1500, 10);
    log('warming up...');
    await timeTune(text, 'boost:rounds=5|10', 1);
    log(`rounds=400 alone, ${n} runs`);
    const one = await timeTune(text, 'boost:rounds=400', n);
    log(`rounds grid, ${n} runs`);
    const grid = await timeTune(text, 'boost:rounds=50|100|200|400', n);
    const row = (label: string, spec: string, t: Awaited<ReturnType<typeof timeTune>>) => [label, spec, fixed(t.ms / 1000, 3), fixed(t.cpuMs / 1000, 3), t.fits, t.plain, t.pick];
    return [
      {
        title: 'foldwise tune, outer kfold:5 x inner kfold:3 (load + whole nested search), boost rounds',
        columns: ['case', 'search', 'wall s', 'CPU s', 'fits', 'plain-loop fits', 'recommended'],
        rows: [row('largest alone', 'boost:rounds=400', one), row('4-value grid', 'boost:rounds=50|100|200|400', grid)],
        notes: [
          `grid / largest alone: wall ${fixed(grid.ms / one.ms, 3)}, CPU ${fixed(grid.cpuMs / one.cpuMs, 3)} (goal: about 1); median of ${n} runs after a warm-up`,
        ],
      },
    ];
  },
};

export const cases: readonly BenchCase[] = [large, versusForest, tuneRounds];
