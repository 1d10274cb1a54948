/**
 * Which of two candidates of one learner is the simpler model, for the one-standard-error rule
 * (Breiman, Friedman, Olshen & Stone 1984, Classification and Regression Trees, sec. 3.4.3;
 * Hastie, Tibshirani & Friedman, The Elements of Statistical Learning, 2nd ed., sec. 7.10,
 * free at https://hastie.su.domains/ElemStatLearn/).
 *
 * The order is lexicographic over a ranked list of options per learner: the first option in
 * which two candidates differ decides, in the direction the learner declares for it
 * (ParamSpec.simpler: 'higher' when a larger value is simpler, 'lower' when a smaller one is),
 * or by a fixed order of choices. The ranks (foldwise's own choice, most important first):
 *
 *   knn        k (higher is simpler: more neighbours, a smoother rule), then vote
 *              (equal before inverse: 1/d votes let the nearest rows dominate)
 *   knn-ref    k (higher is simpler)
 *   tree       depth (lower), min-leaf (higher), bins (lower)
 *   forest     depth (lower), min-leaf (higher), trees (lower), bins (lower)
 *   forest-ref depth (lower), trees (lower)
 *   any other  its numeric options that declare `simpler`, in the order it declares them
 *
 * Options outside the list (forest `features`, `impurity`, ...) do not count: two candidates
 * that differ only there are equally complex. Candidates of different learners are not
 * compared (null): there is no common scale between, say, a neighbour count and a tree depth.
 */
import type { Learner, ParamSpec, Params } from '../learning.js';

interface Rank {
  readonly name: string;
  /** for numeric options: the direction that is simpler (from the ParamSpec when not given) */
  readonly simpler?: 'lower' | 'higher';
  /** for choice options: the choices from simplest to most complex */
  readonly order?: readonly string[];
}

const RANKS: ReadonlyMap<string, readonly Rank[]> = new Map<string, readonly Rank[]>([
  ['knn', [{ name: 'k' }, { name: 'vote', order: ['equal', 'inverse'] }]],
  ['knn-ref', [{ name: 'k' }]],
  ['tree', [{ name: 'depth' }, { name: 'min-leaf' }, { name: 'bins' }]],
  ['forest', [{ name: 'depth' }, { name: 'min-leaf' }, { name: 'trees' }, { name: 'bins' }]],
  ['forest-ref', [{ name: 'depth' }, { name: 'trees' }]],
]);

/** The ranked options that decide complexity for a learner, with their directions. */
export function complexityRanks(learner: Learner): readonly Rank[] {
  const spec = (name: string): ParamSpec | undefined => learner.params.find((p) => p.name === name);
  const fixed = RANKS.get(learner.name);
  const ranks: Rank[] = fixed
    ? fixed.map((r) => {
        const p = spec(r.name);
        return r.order ? r : { name: r.name, simpler: r.simpler ?? (p && p.kind !== 'choice' && p.kind !== 'text' ? p.simpler : undefined) };
      })
    : learner.params.flatMap((p) => ((p.kind === 'int' || p.kind === 'number') && p.simpler ? [{ name: p.name, simpler: p.simpler }] : []));
  return ranks.filter((r) => spec(r.name) && (r.order || r.simpler));
}

/** A human-readable line of the ranks, for reports: "k (higher simpler), vote (equal < inverse)". */
export function describeRanks(learner: Learner): string {
  const ranks = complexityRanks(learner);
  if (ranks.length === 0) return `${learner.name}: no option ranked`;
  return `${learner.name}: ${ranks.map((r) => (r.order ? `${r.name} (${r.order.join(' < ')})` : `${r.name} (${r.simpler} simpler)`)).join(', ')}`;
}

/**
 * Negative when `a` is simpler than `b`, positive when more complex, 0 when equally complex;
 * null when they are models of different learners.
 */
export function compareComplexity(learnerA: Learner, a: Params, learnerB: Learner, b: Params): number | null {
  if (learnerA !== learnerB) return null;
  for (const r of complexityRanks(learnerA)) {
    const va = a[r.name];
    const vb = b[r.name];
    if (va === vb) continue;
    if (r.order) {
      const d = r.order.indexOf(String(va)) - r.order.indexOf(String(vb));
      if (d !== 0) return d;
      continue;
    }
    const d = Number(va) - Number(vb);
    if (d !== 0 && Number.isFinite(d)) return r.simpler === 'lower' ? d : -d;
  }
  return 0;
}
