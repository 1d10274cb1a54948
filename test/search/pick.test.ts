import fc from 'fast-check';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { getLearner } from '../../src/learners/index.js';
import { formatSpec, parseLearnerSpec, resolveParams } from '../../src/learners/spec.js';
import { compareComplexity, describeRanks } from '../../src/search/complexity.js';
import { type InnerStat, innerStat, pickCandidate } from '../../src/search/pick.js';
import type { SearchCandidate } from '../../src/search/space.js';

function cands(specs: string[]): SearchCandidate[] {
  return specs.map((text, id) => {
    const parsed = parseLearnerSpec(text);
    const learner = getLearner(parsed.name);
    const params = resolveParams(learner, parsed, 'classification');
    return { id, learner, spec: formatSpec(learner, params), params };
  });
}

const cmp = (a: SearchCandidate, b: SearchCandidate) => compareComplexity(a.learner, a.params, b.learner, b.params);

describe('complexity order (documented in complexity.ts)', () => {
  it('follows each learner\'s declared direction, most important option first', () => {
    const [k3, k9, k9d, f1, f2, f3, t] = cands(['knn:k=3', 'knn:k=9', 'knn:k=9,vote=inverse', 'forest:depth=3,trees=500', 'forest:depth=5,trees=10', 'forest:depth=3,trees=20', 'tree']);
    expect(cmp(k9, k3)).toBeLessThan(0); // more neighbours is simpler (ParamSpec simpler: higher)
    expect(cmp(k9, k9d)).toBeLessThan(0); // equal before inverse votes at equal k
    expect(cmp(k3, k9d)).toBeGreaterThan(0); // k decides before vote
    expect(cmp(f1, f2)).toBeLessThan(0); // depth decides before trees
    expect(cmp(f3, f1)).toBeLessThan(0); // fewer trees simpler at equal depth
    expect(cmp(k3, k3)).toBe(0);
    expect(cmp(k3, t)).toBeNull(); // different learners are not compared
    expect(describeRanks(getLearner('knn'))).toBe('knn: k (higher simpler), vote (equal < inverse)');
    expect(describeRanks(getLearner('forest'))).toBe('forest: depth (lower simpler), min-leaf (higher simpler), trees (lower simpler), bins (lower simpler)');
  });
});

describe('innerStat', () => {
  it('matches simple-statistics mean and sample standard deviation, skipping undefined scores', () => {
    const xs = [0.81, 0.77, null, 0.9, 0.84];
    const s = innerStat(xs);
    const defined = [0.81, 0.77, 0.9, 0.84];
    expect(s.n).toBe(4);
    expect(Math.abs(s.mean! - mean(defined))).toBeLessThan(1e-15);
    expect(Math.abs(s.sd! - sampleStandardDeviation(defined))).toBeLessThan(1e-15);
    expect(innerStat([0.5])).toEqual({ n: 1, mean: 0.5, sd: null });
    expect(innerStat([null, null])).toEqual({ n: 0, mean: null, sd: null });
  });
});

describe('pickCandidate: best and the one-standard-error rule', () => {
  const grid = cands(['knn:k=1', 'knn:k=3', 'knn:k=5', 'knn:k=9', 'knn:k=15']);
  // a worked example of the rule as Hastie, Tibshirani & Friedman (ESL 2nd ed., sec. 7.10) state
  // it: take the most parsimonious model whose CV estimate is within one SE of the best one.
  // Best mean 0.86 (k=5) with sd 0.04 over 4 folds: SE = 0.04 / sqrt(4) = 0.02, so any mean
  // >= 0.84 qualifies: k=9 (0.845) does, k=15 (0.83) does not; the simplest qualifying is k=9.
  const stats: InnerStat[] = [
    { n: 4, mean: 0.8, sd: 0.05 },
    { n: 4, mean: 0.85, sd: 0.03 },
    { n: 4, mean: 0.86, sd: 0.04 },
    { n: 4, mean: 0.845, sd: 0.02 },
    { n: 4, mean: 0.83, sd: 0.02 },
  ];

  it('best takes the highest mean; one-se the simplest within one SE', () => {
    expect(pickCandidate(grid, stats, 'best', true)).toEqual({ pick: 2, best: 2, se: null, fellBack: false });
    const p = pickCandidate(grid, stats, 'one-se', true);
    expect(p.best).toBe(2);
    expect(p.pick).toBe(3);
    expect(Math.abs(p.se! - 0.02)).toBeLessThan(1e-15);
  });

  it('turns around for a metric where lower is better', () => {
    const loss = stats.map((s) => ({ ...s, mean: 1 - s.mean! }));
    expect(pickCandidate(grid, loss, 'best', false).pick).toBe(2);
    expect(pickCandidate(grid, loss, 'one-se', false).pick).toBe(3);
  });

  it('breaks an exact tie of means towards the simpler candidate', () => {
    const tied = stats.map((s, i) => (i === 4 ? { ...s, mean: 0.86 } : s));
    expect(pickCandidate(grid, tied, 'best', true).pick).toBe(4);
  });

  it('falls back to best without a standard error, and skips undefined means', () => {
    const one = stats.map((s) => ({ n: 1, mean: s.mean, sd: null }));
    expect(pickCandidate(grid, one, 'one-se', true)).toEqual({ pick: 2, best: 2, se: null, fellBack: true });
    const none = stats.map(() => ({ n: 0, mean: null, sd: null }));
    expect(pickCandidate(grid, none, 'best', true).pick).toBe(-1);
    const some = stats.map((s, i) => (i === 2 ? { n: 0, mean: null, sd: null } : s));
    expect(pickCandidate(grid, some, 'best', true).pick).toBe(1);
  });

  it('property: one-se is never more complex than best, and equals it with one candidate (fast-check)', () => {
    const ks = [1, 2, 3, 5, 8, 13, 21, 34];
    const all = cands(ks.flatMap((k) => [`knn:k=${k}`, `knn:k=${k},vote=inverse`]));
    const stat = fc.record({ mean: fc.double({ min: 0, max: 1, noNaN: true }), sd: fc.double({ min: 0, max: 0.3, noNaN: true }) });
    fc.assert(
      fc.property(fc.array(stat, { minLength: all.length, maxLength: all.length }), fc.boolean(), (raw, higher) => {
        const s: InnerStat[] = raw.map((r) => ({ n: 5, mean: r.mean, sd: r.sd }));
        const best = pickCandidate(all, s, 'best', higher);
        const one = pickCandidate(all, s, 'one-se', higher);
        expect(one.best).toBe(best.pick);
        expect(cmp(all[one.pick], all[best.pick])!).toBeLessThanOrEqual(0);
        // the pick is within one SE of the best mean
        const se = s[best.pick].sd! / Math.sqrt(5);
        const gap = higher ? s[best.pick].mean! - s[one.pick].mean! : s[one.pick].mean! - s[best.pick].mean!;
        expect(gap).toBeLessThanOrEqual(se + 1e-9);
      }),
      { numRuns: 300, seed: 42 },
    );
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (m, sd) => {
        const single = [all[5]];
        const s = [{ n: 3, mean: m, sd }];
        expect(pickCandidate(single, s, 'one-se', true).pick).toBe(pickCandidate(single, s, 'best', true).pick);
      }),
      { numRuns: 100, seed: 7 },
    );
  });
});
