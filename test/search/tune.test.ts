import { Ajv } from 'ajv';
import { readFileSync } from 'node:fs';
import { mean, quantile, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { UsageError } from '../../src/errors.js';
import type { TuneReport } from '../../src/model/tune.js';
import { renderTuneMarkdown } from '../../src/report/tune-markdown.js';
import { evaluate } from '../../src/run/evaluate.js';
import { getLearner } from '../../src/learners/index.js';
import { formatSpec, parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import { edgeWarnings } from '../../src/search/edges.js';
import { tune, type TuneOptions } from '../../src/search/tune.js';
import { penguinsCsv } from '../helpers/penguins.js';

const schema = JSON.parse(readFileSync(new URL('../../schema/tune.schema.json', import.meta.url), 'utf8'));
const validate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(schema);
function expectValid(report: unknown): void {
  const ok = validate(JSON.parse(JSON.stringify(report)));
  expect(validate.errors ?? []).toEqual([]);
  expect(ok).toBe(true);
}

// The Palmer penguins file shipped by vega-datasets (CC0; Gorman, Williams & Fraser 2014).
const table = await loadCsv({ text: penguinsCsv(), name: 'penguins.csv' });
const base: TuneOptions = { target: 'Species', drop: ['Island', 'Sex'], timing: false };
const run = (o: Partial<TuneOptions>): TuneReport => tune(table, { ...base, ...o });

/** Invariants every report must satisfy, whatever the options. */
function checkInvariants(r: TuneReport): void {
  expectValid(r);
  const folds = r.outer.folds;
  expect(folds.length).toBeGreaterThan(0);
  expect(r.candidates.reduce((s, c) => s + c.wins, 0)).toBe(folds.length);
  expect(r.stability.winners.reduce((s, w) => s + w.folds, 0)).toBe(folds.length);
  folds.forEach((f, oi) => {
    const c = r.candidates[f.pick];
    expect(c.spec).toBe(f.pickSpec);
    expect(c.inner[oi].mean).toBe(f.innerMean);
  });
  expect(r.candidates[r.recommendation.id].all.mean).toBe(r.recommendation.innerMean);
  expect(r.search.fits).toBeLessThanOrEqual(r.search.plainLoopFits);
  expect(r.search.tried).toBe(r.candidates.length);
  expect(renderTuneMarkdown(r).startsWith(`# foldwise tune: ${r.data.target}`)).toBe(true);
}

describe('tune on the Palmer penguins file', () => {
  const r = run({ learners: ['knn:k=1|3|5|9|15,vote=equal|inverse'], seed: 3 });

  it('reports a schema-valid nested search with an outer estimate, a recommendation and stability', () => {
    checkInvariants(r);
    expect(r.schema).toBe('foldwise-tune/2');
    expect(r.plan.outer).toEqual({ kind: 'kfold', text: 'kfold:5', folds: 5, repeats: 1, stratified: true });
    expect(r.plan.inner).toEqual({ kind: 'kfold', text: 'kfold:3', folds: 3, repeats: 1, stratified: true });
    expect(r.plan.searchRows).toBe(344);
    expect(r.search).toMatchObject({ gridSize: 10, tried: 10, sampled: false, limit: 200 });
    // 10 candidates x (5 outer x 3 inner + 3 final inner) + 5 outer refits, one neighbour search per split
    expect(r.search.plainLoopFits).toBe(10 * 18 + 5);
    expect(r.search.fits).toBe(18 + 5);
    expect(r.candidates.every((c) => c.inner.length === 5 && c.inner.every((s) => s.n === 3))).toBe(true);
    // kNN separates the species from the four measurements well (eval's test shows > 0.9 too)
    expect(r.outer.summary.accuracy!.mean).toBeGreaterThan(0.9);
    expect(r.selection).toMatchObject({ metric: 'accuracy', higherIsBetter: true, rule: 'best' });
  });

  it('summarises the outer scores exactly as simple-statistics does (mean, sd, type-7 quartiles)', () => {
    const xs = r.outer.folds.map((f) => f.scores.accuracy!);
    const s = r.outer.summary.accuracy!;
    expect(s.n).toBe(5);
    expect(Math.abs(s.mean - mean(xs))).toBeLessThan(1e-12);
    expect(Math.abs(s.sd! - sampleStandardDeviation(xs))).toBeLessThan(1e-12);
    expect(Math.abs(s.q1 - quantile(xs, 0.25))).toBeLessThan(1e-12);
    expect(Math.abs(s.q3 - quantile(xs, 0.75))).toBeLessThan(1e-12);
    expect(s.ci95![0]).toBeLessThan(s.mean);
  });

  it('is deterministic for a seed, and uses eval\'s outer folds (same sizes, same single-candidate scores)', () => {
    expect(JSON.stringify(run({ learners: ['knn:k=1|3|5|9|15,vote=equal|inverse'], seed: 3 }))).toBe(JSON.stringify(r));
    // with one candidate the nested search must refit exactly that model on each outer fold:
    // eval with plan kfold:5 and the same seed has the same folds, so the same fold scores
    const one = run({ learners: ['knn:k=7'], seed: 3 });
    const ev = evaluate(table, { ...base, plan: 'kfold:5', learners: ['knn:k=7'], baseline: false, seed: 3 });
    expect(one.outer.folds.map((f) => f.testRows)).toEqual(ev.learners[0].folds.map((f) => f.testRows));
    expect(one.outer.folds.map((f) => f.scores.accuracy)).toEqual(ev.learners[0].folds.map((f) => f.scores.accuracy));
  });

  it('one-se never recommends a more complex candidate than best, and is the same with one candidate', () => {
    const best = run({ learners: ['knn:k=1..41+4'], pick: 'best', seed: 2 });
    const onese = run({ learners: ['knn:k=1..41+4'], pick: 'one-se', seed: 2 });
    checkInvariants(onese);
    expect(Number(onese.recommendation.params.k)).toBeGreaterThanOrEqual(Number(best.recommendation.params.k));
    expect(onese.recommendation.best).toBe(best.recommendation.id);
    onese.outer.folds.forEach((f, i) => expect(Number(onese.candidates[f.pick].params.k)).toBeGreaterThanOrEqual(Number(best.candidates[best.outer.folds[i].pick].params.k)));
    const single = run({ learners: ['knn:k=9'], pick: 'one-se' });
    expect(single.recommendation.spec).toBe(run({ learners: ['knn:k=9'], pick: 'best' }).recommendation.spec);
  });

  it('--holdout sets rows aside before any selection and scores the recommendation once', () => {
    const h = run({ learners: ['knn:k=3|9'], holdout: 0.2 });
    checkInvariants(h);
    expect(h.plan.holdout).toEqual({ rows: 69, from: 'option', fraction: 0.2 });
    expect(h.plan.searchRows).toBe(275);
    expect(h.outer.folds.reduce((s, f) => s + f.testRows, 0)).toBe(275);
    expect(h.holdout).toMatchObject({ trainRows: 275, testRows: 69, spec: h.recommendation.spec });
    expect(h.holdout!.scores.accuracy).toBeGreaterThan(0.85);
  });

  it('a holdout outer plan keeps its holdout part out of the search; --holdout with it is refused', () => {
    const h = run({ learners: ['knn:k=3|9'], plan: 'holdout:0.6/0.2/0.2' });
    checkInvariants(h);
    expect(h.plan.holdout?.from).toBe('plan');
    expect(h.outer.folds.length).toBe(1);
    expect(h.plan.searchRows + h.plan.holdout!.rows).toBe(344);
    expect(() => run({ plan: 'holdout:0.6/0.2/0.2', holdout: 0.1 })).toThrow('--holdout 0.1: the plan holdout:0.6/0.2/0.2 already sets a holdout part aside; use one or the other');
  });

  it('searches several learners together, sharing forest fits across tree counts', () => {
    const m = run({ learners: ['knn:k=5|15', 'forest:trees=5|10|20,depth=3'], metrics: ['balanced-accuracy', 'accuracy'], inner: 'kfold:2' });
    checkInvariants(m);
    expect(m.candidates.length).toBe(5);
    // per split: one neighbour search and one forest (for 3 tree counts) = 2 fits
    expect(m.search.fits).toBe(2 * (5 * 2 + 2) + 5);
    expect(m.selection.complexity).toEqual([
      'knn: k (higher simpler), vote (equal < inverse)',
      'forest: depth (lower simpler), min-leaf (higher simpler), trees (lower simpler), bins (lower simpler)',
    ]);
    expect(Object.keys(m.outer.summary)).toEqual(['balanced-accuracy', 'accuracy']);
  });

  it('random search reports the grid size and the number tried', () => {
    const s = run({ learners: ['knn:k=1..60,vote=equal|inverse'], sample: 8, seed: 4 });
    checkInvariants(s);
    expect(s.search).toMatchObject({ gridSize: 120, tried: 8, sampled: true });
  });

  it('warns when the recommendation sits on an edge of the searched range (not at the option\'s own limit)', () => {
    const inside = run({ learners: ['knn:k=30|40|50'], seed: 1 });
    expect(inside.recommendation.spec).toBe('knn:k=40');
    expect(inside.warnings.filter((w) => w.includes('edge'))).toEqual([]);
    const edge = run({ learners: ['knn:k=20|40|60'], seed: 1 });
    expect(edge.recommendation.spec).toBe('knn:k=20');
    expect(edge.warnings).toContain('the recommended knn:k=20 has k=20, the lower edge of the searched k (20 to 60); a smaller k might be better, so widen the range');
    // k = 1 is knn's own lower limit: nothing lies below it, so no warning
    const cands = ['knn:k=1', 'knn:k=5'].map((text, id) => {
      const learner = getLearner('knn');
      const params = resolveParams(learner, parseLearnerSpec(text), 'classification');
      return { id, learner, spec: formatSpec(learner, params), params };
    });
    expect(edgeWarnings(cands[0], cands, 'the recommended')).toEqual([]);
    expect(edgeWarnings(cands[1], cands, 'the recommended')).toEqual([
      'the recommended knn has k=5, the upper edge of the searched k (1 to 5); a larger k might be better, so widen the range',
    ]);
  });

  it('refuses an inner plan with a holdout part, and renames plan errors of the inner plan', () => {
    expect(() => run({ inner: 'holdout:0.6/0.2/0.2' })).toThrow(UsageError);
    expect(() => run({ inner: 'kfold:1' })).toThrow(/^--inner /);
    expect(() => run({ inner: 'kfold:300' })).toThrow(/--inner kfold:300 .*\(inner plan on the training rows of outer fold 1, 275 rows\)/);
  });
});

describe('tune on regression, groups and time order', () => {
  it('regression with a lower-is-better headline (rmse) picks the lowest inner mean', () => {
    const r = tune(table, { target: 'Body Mass (g)', drop: ['Species', 'Island', 'Sex'], learners: ['knn:k=1|5|25'], metrics: ['rmse', 'mae'], timing: false });
    checkInvariants(r);
    expect(r.selection).toMatchObject({ metric: 'rmse', higherIsBetter: false });
    const means = r.candidates.map((c) => c.all.mean!);
    expect(r.recommendation.innerMean).toBe(Math.min(...means));
    expect(r.plan.outer.stratified).toBe(false);
  });

  it('grouped: no outer test group appears in the training rows (checked through per-fold sizes)', () => {
    const r = tune(table, { ...base, group: 'Island', plan: 'kfold:3', inner: 'kfold:2', learners: ['knn:k=3|9'] });
    checkInvariants(r);
    expect(r.plan.group).toBe('Island');
    // the three islands hold 52, 124 and 168 birds (counted from the file): whole groups per fold
    expect(r.outer.folds.map((f) => f.testRows).sort((a, b) => a - b)).toEqual([52, 124, 168]);
  });

  it('time order: forward outer and inner plans over an order column; a shuffled inner plan is warned about', async () => {
    // seeded synthetic rows with a known process: y = x0 + noise, t = row number
    const lines = ['t,x0,x1,y'];
    let state = 7;
    const next = () => ((state = (state * 1103515245 + 12345) % 2147483648) / 2147483648);
    for (let i = 0; i < 120; i++) {
      const x0 = next();
      lines.push(`${i},${x0.toFixed(4)},${next().toFixed(4)},${(3 * x0 + 0.1 * next()).toFixed(4)}`);
    }
    const ordered = await loadCsv({ text: `${lines.join('\n')}\n`, name: 'ordered.csv' });
    const r = tune(ordered, { target: 'y', order: 't', plan: 'forward:3', inner: 'forward:2', learners: ['knn:k=1|3|9'], timing: false });
    checkInvariants(r);
    expect(r.plan.order).toBe('t');
    expect(r.plan.outer).toMatchObject({ kind: 'forward', folds: 3, stratified: false });
    // forward:3 over 4 blocks of 30 rows: training grows by a block each fold
    expect(r.outer.folds.map((f) => [f.trainRows, f.testRows])).toEqual([[30, 30], [60, 30], [90, 30]]);
    expect(r.warnings.some((w) => w.includes('time-ordered'))).toBe(false);
    const mixed = tune(ordered, { target: 'y', order: 't', plan: 'forward:3', learners: ['knn:k=1|3'], timing: false });
    expect(mixed.warnings).toContain('the outer plan is time-ordered but the inner plan kfold:3 is not: inner folds train on later rows than they test; use --inner forward:K');
  });
});
