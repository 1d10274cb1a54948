/**
 * The runner tells a learner when it will only predict the fold's test rows
 * (FitContext.predictOnly): on every fold without --importance, never with it (permutation
 * importance predicts shuffled copies of the rows). A module: learner written here predicts
 * class 1 for every row when the flag is set and class 0 when not, so the pooled accuracy tells
 * which it saw: the share of Chinstrap (class 1, 68 of 344 rows) or of Adelie (class 0, 152). Then forest, which predicts tree by tree under the flag, gives the same
 * fold scores as with --importance (where it keeps the whole forest). Data: the Palmer penguins
 * file shipped in vega-datasets (CC0; Gorman, Williams & Fraser 2014).
 */
import { describe, expect, it } from 'vitest';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import type { Report } from '../../src/model/report.js';

const tmp = tempFolder();
const data = tmp.file('penguins.csv', penguinsCsv());
const spy = tmp.file(
  'flag-learner.mjs',
  `export default {
  tasks: ['classification'],
  params: [],
  fit(X, y, params, ctx) {
    const flag = ctx.predictOnly === true ? 1 : 0;
    return { predict: (T) => new Int32Array(T.rows).fill(flag), toJSON: () => ({}) };
  },
  load() { throw new Error('not saved'); },
};
`,
);
const BASE = ['eval', data, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--plan', 'kfold:3', '--no-audit', '--no-timing', '--json', '-'];

describe('predictOnly from the runner', () => {
  it('is set on every fold without --importance and on none with it', async () => {
    for (const [extra, flag] of [[[], 1], [['--importance'], 0]] as const) {
      const r = await cli([...BASE, '--learner', `module:${spy}`, ...extra]);
      expect(r.code).toBe(0);
      const report = JSON.parse(r.stdout) as Report;
      const mine = report.learners.find((l) => l.name.startsWith('module:'))!;
      expect(mine.folds).toHaveLength(3);
      expect(report.data.rowsUsed).toBe(344);
      expect(report.data.classes!.slice(0, 2)).toEqual(['Adelie', 'Chinstrap']);
      // every fold predicted the one class its flag names: pooled accuracy is that class's share
      expect(mine.pooled.accuracy).toBe((flag === 1 ? 68 : 152) / 344);
    }
  });

  it('forest gives the same fold scores predicting tree by tree as with the whole forest (--importance)', async () => {
    const plain = JSON.parse((await cli([...BASE, '--learner', 'forest:trees=40'])).stdout) as Report;
    const whole = JSON.parse((await cli([...BASE, '--learner', 'forest:trees=40', '--importance'])).stdout) as Report;
    const a = plain.learners.find((l) => l.name === 'forest')!;
    const b = whole.learners.find((l) => l.name === 'forest')!;
    expect(a.folds).toHaveLength(3);
    expect(a.folds.map((f) => f.scores)).toEqual(b.folds.map((f) => f.scores));
    expect(a.pooled).toEqual(b.pooled);
  });
});
