/**
 * Correlated clusters: groups of features that carry one source of information. Two numeric
 * features are linked when |Pearson r| >= threshold (pearson.ts, pairwise-complete rows), two
 * categorical features when Cramer's V >= threshold (cramers-v.ts); the clusters are the
 * connected components of these links (union-find.ts), so a chain a-b, b-c is one cluster
 * even when a and c are less associated. Constant and id-like features are left out (their
 * association is undefined or, for a near-unique categorical, trivially 1), and so are
 * categorical features with more than one level per 5 present rows (fewLevels in
 * feature-data.ts), whose V is inflated by sparse levels. The cluster's
 * representative, named as the source the members seem to share, is the member with the
 * highest mean association with the other members (the first in feature order on a tie).
 *
 * Why it matters: a learner (distance-based ones above all) counts the shared source once per
 * copy, and importance is split among the copies so that each looks unimportant.
 * Cost: O(p^2 n) for p numeric features, one dot product per pair of complete columns.
 */
import { contingency, cramersVOf } from './cramers-v.js';
import { chiSquareTest } from './chi-square.js';
import { fewLevels, type FeatureData } from './feature-data.js';
import { correlationMatrix } from './pearson.js';
import type { Cluster, Suspect } from './types.js';
import { UnionFind } from './union-find.js';
import { fig, names, q } from './wording.js';

/** Largest r x c table Cramer's V is computed for; bigger pairs are skipped with a warning. */
export const MAX_TABLE_CELLS = 1_000_000;

function clustersOf(kind: Cluster['kind'], members: readonly FeatureData[], assoc: Float64Array, threshold: number): Cluster[] {
  const p = members.length;
  const uf = new UnionFind(p);
  for (let a = 0; a < p; a++) for (let b = a + 1; b < p; b++) if (Math.abs(assoc[a * p + b]) >= threshold) uf.union(a, b);
  return uf.components(2).map((comp) => {
    let links = 0;
    let minLink = Infinity;
    let maxLink = -Infinity;
    let best = comp[0];
    let bestMean = -1;
    for (const a of comp) {
      let sum = 0;
      for (const b of comp) {
        if (a === b) continue;
        const v = Math.abs(assoc[a * p + b]);
        sum += Number.isNaN(v) ? 0 : v;
        if (a < b && v >= threshold) {
          links++;
          minLink = Math.min(minLink, v);
          maxLink = Math.max(maxLink, v);
        }
      }
      const mean = sum / (comp.length - 1);
      if (mean > bestMean) {
        bestMean = mean;
        best = a;
      }
    }
    return { kind, members: comp.map((j) => members[j].name), representative: members[best].name, links, minLink, maxLink };
  });
}

export function findClusters(features: readonly FeatureData[], n: number, excluded: ReadonlySet<string>, threshold: number, warnings: string[]): Cluster[] {
  const usable = features.filter((f) => f.distinct >= 2 && !excluded.has(f.name) && (f.kind === 'numeric' || fewLevels(f, n)));
  const numeric = usable.filter((f): f is Extract<FeatureData, { kind: 'numeric' }> => f.kind === 'numeric');
  const categorical = usable.filter((f): f is Extract<FeatureData, { kind: 'categorical' }> => f.kind === 'categorical');
  const out = clustersOf('numeric', numeric, correlationMatrix(numeric.map((f) => f.values)), threshold);
  const c = categorical.length;
  const v = new Float64Array(c * c).fill(NaN);
  let skipped = 0;
  for (let a = 0; a < c; a++) {
    for (let b = a + 1; b < c; b++) {
      const fa = categorical[a];
      const fb = categorical[b];
      if (fa.levels.length * fb.levels.length > MAX_TABLE_CELLS) {
        skipped++;
        continue;
      }
      const t = chiSquareTest(contingency(fa.codes, fa.levels.length, fb.codes, fb.levels.length), fa.levels.length, fb.levels.length);
      v[a * c + b] = v[b * c + a] = cramersVOf(t) ?? NaN;
    }
  }
  if (skipped) warnings.push(`audit: ${skipped} pair${skipped === 1 ? '' : 's'} of categorical features with over ${MAX_TABLE_CELLS} level combinations left out of the clusters`);
  return [...out, ...clustersOf('categorical', categorical, v, threshold)];
}

export function clusterSuspects(clusters: readonly Cluster[], threshold: number): Suspect[] {
  return clusters.map((cl) => {
    const measure = cl.kind === 'numeric' ? '|Pearson r|' : "Cramer's V";
    const pairs = (cl.members.length * (cl.members.length - 1)) / 2;
    const range = cl.minLink === cl.maxLink ? fig(cl.minLink) : `${fig(cl.minLink)} to ${fig(cl.maxLink)}`;
    return {
      kind: 'correlated-cluster' as const,
      severity: cl.members.length >= 3 ? ('warn' as const) : ('note' as const),
      columns: cl.members,
      reasons: [cl.kind],
      evidence: `${cl.members.length} ${cl.kind} features move together (${measure} ${range} on ${cl.links} of ${pairs} pairs, threshold ${threshold}): ${names(cl.members)}; they seem to share one source, best represented by ${q(cl.representative)}`,
      action: `keep one of them (such as ${q(cl.representative)}) or judge the importance of the cluster as a whole: copies of one source weigh it several times and split its importance among them`,
      figures: { members: cl.members.length, links: cl.links, minLink: cl.minLink, maxLink: cl.maxLink },
    };
  });
}
