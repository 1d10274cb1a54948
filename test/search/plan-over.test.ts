import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem } from '../../src/data/problem.js';
import { parsePlan } from '../../src/plans/index.js';
import { planFor } from '../../src/plans/plan-for.js';
import { createRng, deriveSeed } from '../../src/rng.js';
import { splitHoldout } from '../../src/search/holdout-split.js';
import { allRows, planOver } from '../../src/search/plan-over.js';
import { penguinsCsv } from '../helpers/penguins.js';

// The Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014):
// 344 rows, species counts Adelie 152, Chinstrap 68, Gentoo 124 (counted from the file).
const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
const problem = defineProblem(table, { target: 'Species', drop: ['Sex'] });
const grouped = defineProblem(table, { target: 'Species', drop: ['Sex'], group: 'Island' });
// invented rows for the order rule: 20 rows, order values 0,0,1,1,...,9,9
const orderedText = ['t,x,y', ...Array.from({ length: 20 }, (_, i) => `${Math.floor(i / 2)},${i},${i % 2}`)].join('\n');
const ordered = defineProblem(await loadCsv({ text: orderedText, name: 'ordered.csv' }), { target: 'y', order: 't' });

const count = (codes: Int32Array, idx: Int32Array, c: number) => Array.from(idx).filter((i) => codes[i] === c).length;

describe('planOver: plans built on a subset of the rows', () => {
  it('over all rows with the plan generator gives exactly planFor\'s folds (tune and eval share outer folds)', () => {
    const spec = parsePlan('kfold:5');
    const a = planFor(problem, spec, undefined, 9).plan;
    const b = planOver(problem, spec, allRows(problem.rows.length), undefined, createRng(deriveSeed(9, 'plan'))).plan;
    expect(b.folds.length).toBe(5);
    b.folds.forEach((f, i) => {
      expect(Array.from(f.train)).toEqual(Array.from(a.folds[i].train));
      expect(Array.from(f.test)).toEqual(Array.from(a.folds[i].test));
    });
  });

  it('inner folds use only the outer training rows, stratified within them', () => {
    const y = problem.target;
    if (y.task !== 'classification') throw new Error('classification expected');
    const outer = planFor(problem, parsePlan('kfold:5'), undefined, 1).plan;
    expect(outer.folds.length).toBe(5);
    for (const of of outer.folds) {
      const inner = planOver(problem, parsePlan('kfold:3'), of.train, undefined, createRng(2)).plan;
      expect(inner.folds.length).toBe(3);
      const outerTrain = new Set(of.train);
      const tested = new Set<number>();
      for (const f of inner.folds) {
        for (const i of [...f.train, ...f.test]) expect(outerTrain.has(i)).toBe(true);
        for (const i of f.test) tested.add(i);
        // stratified: each class within one row of its share of the fold (common practice)
        for (let c = 0; c < 3; c++) {
          const share = (count(y.codes, of.train, c) * f.test.length) / of.train.length;
          expect(Math.abs(count(y.codes, f.test, c) - share)).toBeLessThan(1.5);
        }
      }
      expect(tested.size).toBe(of.train.length); // every outer training row is tested once
    }
  });

  it('keeps groups whole inside the subset', () => {
    const outer = planFor(grouped, parsePlan('kfold:3'), undefined, 1).plan;
    const of = outer.folds[0];
    const inner = planOver(grouped, parsePlan('kfold:2'), of.train, undefined, createRng(3)).plan;
    for (const f of inner.folds) {
      const testGroups = new Set(Array.from(f.test, (i) => grouped.groups![i]));
      for (const i of f.train) expect(testGroups.has(grouped.groups![i])).toBe(false);
    }
  });
});

describe('splitHoldout (--holdout F)', () => {
  it('sets aside about F of every class, disjoint from the search rows', () => {
    const y = problem.target;
    if (y.task !== 'classification') throw new Error('classification expected');
    const { search, holdout } = splitHoldout(problem, 0.25, parsePlan('kfold:5'), undefined, 1);
    expect(search.length + holdout.length).toBe(344);
    expect(new Set([...search, ...holdout]).size).toBe(344);
    // 25% of 152, 68, 124 = 38, 17, 31 (floor or ceil of F n_c, as for shuffle plans)
    expect([0, 1, 2].map((c) => count(y.codes, holdout, c))).toEqual([38, 17, 31]);
  });

  it('is seeded: the same seed gives the same part, another seed another', () => {
    const a = splitHoldout(problem, 0.2, parsePlan('kfold:5'), undefined, 1).holdout;
    const b = splitHoldout(problem, 0.2, parsePlan('kfold:5'), undefined, 1).holdout;
    const c = splitHoldout(problem, 0.2, parsePlan('kfold:5'), undefined, 2).holdout;
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(Array.from(a)).not.toEqual(Array.from(c));
  });

  it('for a forward plan takes the latest rows by order, keeping equal order values together', () => {
 const { search, holdout } = splitHoldout(ordered, 0.25, parsePlan('forward:3'), undefined, 1);
    // 25% of 20 rows is 5 rows; the cut moves to keep the pair of 7s
    // together, so the holdout is the rows with order 8 and 9
    expect(Array.from(holdout)).toEqual([16, 17, 18, 19]);
    expect(search.length).toBe(16);
  });

  it('refuses a fraction outside (0, 1)', () => {
    expect(() => splitHoldout(problem, 1, parsePlan('kfold:5'), undefined, 1)).toThrow('--holdout 1: expected a fraction above 0 and below 1 (such as 0.2)');
  });
});
