/**
 * Logistic benchmark (issue 25, item 1): logistic regression on one-hot-heavy data against the
 * default forest on the same rows, both timed in the same run.
 * Data: bench/synthetic.ts oneHotProblem, 10,000 training rows x 300 columns (10 numeric, 29
 * categorical columns of 10 levels one-hot encoded), 5 classes, seed 31; 5,000 hold-out rows of
 * the same process (seed 32). Goal: a default logistic fit within 5x the default forest's fit.
 */
import { forest } from '../../src/learners/forest.js';
import { fitLogistic, logistic } from '../../src/learners/logistic.js';
import type { Learner, Model, Params, Target } from '../../src/learning.js';
import { createRng } from '../../src/rng.js';
import { type BenchCase, fixed, timeMedian } from '../case.js';
import { oneHotProblem } from '../synthetic.js';

const SEED = 7;

/** The learner's declared defaults (the runner fills them in before fit; a direct fit must too). */
function defaults(l: Learner): Params {
  return Object.fromEntries(l.params.map((s) => [s.name, s.default]));
}

function accuracy(pred: ArrayLike<number>, y: Target): number {
  if (y.task !== 'classification') throw new Error('accuracy needs classes');
  let right = 0;
  for (let i = 0; i < pred.length; i++) if (pred[i] === y.codes[i]) right++;
  return right / pred.length;
}

const oneHot: BenchCase = {
  name: 'logistic-onehot',
  doc: 'logistic vs the default forest, 10,000 x 300 one-hot-heavy, 5 classes, fit times in one run',
  run({ runs, log }) {
    const train = oneHotProblem(10_000, 10, 29, 10, 5, 31);
    const test = oneHotProblem(5_000, 10, 29, 10, 5, 32);
    const ctx = { rng: createRng(SEED), seed: SEED };
    const rows: (string | number)[][] = [];
    const times = new Map<string, number>();
    const cpu = new Map<string, number>();
    const fits: [string, () => Model][] = [
      ['forest (defaults)', () => forest.fit(train.X, train.y, defaults(forest), ctx)],
      ['logistic (defaults)', () => logistic.fit(train.X, train.y, defaults(logistic), ctx)],
    ];
    for (const [name, fit] of fits) {
      log(`${name}: ${runs} runs`);
      const r = timeMedian(runs, fit);
      times.set(name, r.time.wallMs);
      cpu.set(name, r.time.cpuMs);
      rows.push([name, fixed(r.time.wallMs / 1000, 3), fixed(r.time.cpuMs / 1000, 3), fixed(accuracy(r.value.predict(test.X), test.y), 4)]);
    }
    const y = train.y.task === 'classification' ? train.y.codes : new Int32Array(0);
    const detail = fitLogistic(train.X, y, 5, 1, 100);
    const ratio = (times.get('logistic (defaults)') ?? NaN) / (times.get('forest (defaults)') ?? NaN);
    const cpuRatio = (cpu.get('logistic (defaults)') ?? NaN) / (cpu.get('forest (defaults)') ?? NaN);
    return [
      {
        title: 'logistic on one-hot-heavy data, 10,000 x 300 (10 numeric + 29 x 10 one-hot), 5 classes',
        columns: ['learner', 'fit wall s', 'fit cpu s', 'hold-out accuracy (5,000 rows)'],
        rows,
        notes: [
          `median of ${runs} runs each, same rows; logistic: ${detail.iterations} Newton steps, converged ${detail.converged}, objective ${fixed(detail.objective, 6)}`,
          `goal: logistic fit <= 5x the forest fit: ${ratio <= 5 ? 'met' : 'NOT met'} (logistic / forest = ${fixed(ratio, 2)} wall, ${fixed(cpuRatio, 2)} CPU)`,
        ],
      },
    ];
  },
};

export const cases: readonly BenchCase[] = [oneHot];
