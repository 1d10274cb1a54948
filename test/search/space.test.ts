import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors.js';
import { getLearner } from '../../src/learners/index.js';
import type { Learner } from '../../src/learning.js';
import { DEFAULT_MAX_CANDIDATES, parseSearchSpace, planSearch, searchCandidates, type SearchSpace } from '../../src/search/space.js';
import { parseAxis } from '../../src/search/value-syntax.js';

const knn = getLearner('knn');
const forest = getLearner('forest');

/** A stand-in learner with a real-valued option (the committed learners have none). */
const smooth: Learner = {
  name: 'smooth',
  tasks: ['classification'],
  params: [
    { name: 'alpha', kind: 'number', min: 0, max: 2, default: 1, simpler: 'higher', doc: 'a real option' },
    { name: 'mode', kind: 'choice', choices: ['a', 'b'], default: 'a', doc: 'a choice' },
  ],
  needsScaling: false,
  doc: 'test stand-in',
  fit: () => {
    throw new Error('not fitted in these tests');
  },
  load: () => {
    throw new Error('not loaded');
  },
};

const values = (l: Learner, name: string, raw: string): unknown[] => {
  const a = parseAxis(l, `${l.name}:${name}=${raw}`, name, raw);
  if (a.kind !== 'finite') throw new Error('expected a finite axis');
  return [...a.values];
};

describe('search value syntax (lists and ranges; our own syntax, documented in value-syntax.ts)', () => {
  it('reads lists, arithmetic and multiplying ranges, and combinations of them', () => {
    expect(values(knn, 'k', '1|3|5')).toEqual([1, 3, 5]);
    expect(values(knn, 'k', '1..5')).toEqual([1, 2, 3, 4, 5]);
    expect(values(knn, 'k', '1..21+5')).toEqual([1, 6, 11, 16, 21]);
    expect(values(knn, 'k', '1..9+2|15|25')).toEqual([1, 3, 5, 7, 9, 15, 25]);
    expect(values(forest, 'trees', '25..200*2')).toEqual([25, 50, 100, 200]);
    // whole-number option, factor 1.5: 1.5^i rounded (1, 1.5, 2.25, 3.375, 5.06, 7.59, 11.4,
    // 17.1, 25.6, 38.4, 57.7, 86.5 -> repeats dropped), computed by hand from the definition
    expect(values(knn, 'k', '1..100*1.5')).toEqual([1, 2, 3, 5, 8, 11, 17, 26, 38, 58, 86]);
    expect(values(knn, 'vote', 'equal|inverse')).toEqual(['equal', 'inverse']);
    expect(values(forest, 'features', 'sqrt|frac:0.5')).toEqual(['sqrt', 'frac:0.5']);
  });

  it('gives tidy decimals for real-valued steps, and a continuous interval without a step', () => {
    expect(values(smooth, 'alpha', '0.1..0.5+0.1')).toEqual([0.1, 0.2, 0.3, 0.4, 0.5]);
    expect(values(smooth, 'alpha', '0.01..1*10')).toEqual([0.01, 0.1, 1]);
    expect(parseAxis(smooth, 'smooth:alpha=0.5..1.5', 'alpha', '0.5..1.5')).toEqual({ name: 'alpha', kind: 'continuous', from: 0.5, to: 1.5, numeric: true });
  });

  it('refuses malformed or out-of-range values with one-line messages naming the option', () => {
    const bad = (l: Learner, name: string, raw: string) => () => parseAxis(l, `${l.name}:${name}=${raw}`, name, raw);
    expect(bad(knn, 'k', '0..5')).toThrow('--learner knn:k=0..5: k=0: must be at least 1');
    expect(bad(knn, 'k', '1..5|3')).toThrow('the value 3 appears twice');
    expect(bad(knn, 'k', '9..1')).toThrow('the range ends below its start');
    expect(bad(knn, 'k', '1..9+0')).toThrow('the step after + must be greater than 0');
    expect(bad(knn, 'k', '1..9*1')).toThrow('the factor after * must be greater than 1');
    expect(bad(knn, 'k', '1..9+1.5')).toThrow('needs a whole start and step');
    expect(bad(knn, 'vote', 'a..b')).toThrow(UsageError);
    expect(bad(forest, 'trees', '1..1000000')).toThrow('--learner forest:trees=1..1000000: trees=1..1000000: more than 100000 values; use a larger step or --sample over a continuous range');
    expect(bad(knn, 'k', '1|')).toThrow('an empty item in the list');
    expect(bad(smooth, 'alpha', '0.1|0.5..1')).toThrow('a continuous range must be the only item');
    expect(bad(knn, 'kk', '1|2')).toThrow('unknown option "kk" for knn; did you mean "k"?');
  });
});

describe('search space: grid size, limits, order, merging', () => {
  it('counts the grid as the product of the lists, summed over specs', () => {
    const s = parseSearchSpace(['knn:k=1..9+2,vote=equal|inverse', 'forest:trees=10|20,depth=2|4|8']);
    expect(s.size).toBe(5 * 2 + 2 * 3);
    const { candidates, plan } = searchCandidates(s, 'classification', {}, 1);
    expect(plan).toMatchObject({ gridSize: 16, tried: 16, sampled: false, limit: DEFAULT_MAX_CANDIDATES });
    expect(candidates.length).toBe(16);
    // first option varies slowest; default values leave the canonical spec
    expect(candidates.slice(0, 3).map((c) => c.spec)).toEqual(['knn:k=1', 'knn:k=1,vote=inverse', 'knn:k=3']);
    expect(candidates[4].spec).toBe('knn');
    expect(candidates.map((c) => c.id)).toEqual([...Array(16).keys()]);
  });

  it('refuses a grid over the limit unless --max-candidates raises it', () => {
    const s = parseSearchSpace(['knn:k=1..300']);
    expect(() => planSearch(s, {})).toThrow(`the grid has 300 candidates, more than the limit of ${DEFAULT_MAX_CANDIDATES}; narrow it, use --sample N, or raise --max-candidates`);
    expect(planSearch(s, { maxCandidates: 300 }).tried).toBe(300);
    expect(() => planSearch(s, { maxCandidates: 0 })).toThrow('--max-candidates 0: expected a whole number from 1 to 100000');
  });

  it('merges the same model reached from two specs into one candidate, with a warning', () => {
    const s = parseSearchSpace(['knn:k=3|5', 'knn:k=5|7']);
    const { candidates, plan } = searchCandidates(s, 'classification', {}, 1);
    expect(candidates.map((c) => c.spec)).toEqual(['knn:k=3', 'knn', 'knn:k=7']);
    expect(plan.warnings).toEqual(['--learner knn:k=5|7 and knn:k=3|5 both give knn; it is tried once']);
  });

  it('checks the task when candidates are resolved', () => {
    const s = parseSearchSpace(['baseline', 'knn:k=1|2']);
    expect(searchCandidates(s, 'regression', {}, 1).candidates.length).toBe(3);
  });
});

describe('random search (--sample N; Bergstra & Bengio 2012)', () => {
  const grid = parseSearchSpace(['knn:k=1..200', 'forest:trees=10..100+10,depth=1..10']);

  it('draws N distinct candidates, the same for the same seed and different for another', () => {
    const a = searchCandidates(grid, 'classification', { sample: 30 }, 7);
    const b = searchCandidates(grid, 'classification', { sample: 30 }, 7);
    const c = searchCandidates(grid, 'classification', { sample: 30 }, 8);
    expect(a.plan).toMatchObject({ gridSize: 300, tried: 30, sampled: true });
    expect(a.candidates.length).toBe(30);
    expect(new Set(a.candidates.map((x) => x.spec)).size).toBe(30);
    expect(a.candidates.map((x) => x.spec)).toEqual(b.candidates.map((x) => x.spec));
    expect(a.candidates.map((x) => x.spec)).not.toEqual(c.candidates.map((x) => x.spec));
  });

  it('takes the whole grid when N is at least its size, and refuses N above the limit', () => {
    const small = parseSearchSpace(['knn:k=1|2|3']);
    const r = searchCandidates(small, 'classification', { sample: 5 }, 1);
    expect(r.candidates.length).toBe(3);
    expect(r.plan.warnings).toEqual(['--sample 5 is at least the grid size (3); the whole grid is searched']);
    expect(() => planSearch(grid, { sample: 201 })).toThrow('--sample 201: more than the limit of 200 candidates; raise --max-candidates');
  });

  it('refuses a continuous range without --sample, and samples it with one', () => {
    const space: SearchSpace = { specs: [{ text: 'smooth:alpha=0..2', learner: smooth, axes: [parseAxis(smooth, 'smooth:alpha=0..2', 'alpha', '0..2')], size: Infinity }], size: Infinity };
    expect(() => planSearch(space, {})).toThrow('--learner smooth:alpha=0..2: alpha is a continuous range; give it a step (A..B+S) or use --sample N');
    const { candidates, plan } = searchCandidates(space, 'classification', { sample: 20 }, 3);
    expect(plan.gridSize).toBeNull();
    expect(candidates.length).toBe(20);
    for (const c of candidates) {
      const v = Number(c.params.alpha);
      expect(v >= 0 && v <= 2).toBe(true);
      expect(Number(v.toPrecision(6))).toBe(v);
    }
  });

  it('samples a finite grid uniformly: chi-square goodness of fit over many seeds (jStat)', () => {
    // one draw from a 10-point grid, for 2,000 seeds; under uniform sampling the counts follow a
    // multinomial(2000, 1/10), so sum (O - E)^2 / E is approximately chi-square with 9 df
    // (Pearson's test); p-value from jstat's chisquare.cdf
    const ten = parseSearchSpace(['knn:k=1..10']);
    const counts = new Map<string, number>();
    for (let seed = 0; seed < 2000; seed++) {
      const spec = searchCandidates(ten, 'classification', { sample: 1 }, seed).candidates[0].spec;
      counts.set(spec, (counts.get(spec) ?? 0) + 1);
    }
    expect(counts.size).toBe(10);
    const chi = [...counts.values()].reduce((s, o) => s + (o - 200) ** 2 / 200, 0);
    const p = 1 - jStat.chisquare.cdf(chi, 9);
    expect(p).toBeGreaterThan(0.001);
  });
});
