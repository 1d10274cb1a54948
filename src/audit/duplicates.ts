/**
 * Exact and conflicting duplicate rows, and how many would straddle folds under the plan.
 *
 * Two used rows are exact duplicates when they are equal on every feature (missing equals
 * missing) and on the target; conflicting duplicates are equal on every feature with
 * different targets. Straddling is counted over every fold of the intended plan (all repeats):
 * an exact duplicate straddles when some fold tests it while an exact copy is among that
 * fold's training rows (the learner has seen the answer); a conflicting one when some fold
 * tests it while a row with the same features and another target trains. Each row is counted
 * once however many folds it straddles in.
 *
 * Rows recorded at different times are not copies. When the table has a time stamp that is not a
 * feature (a dropped column or the --order column holding dates, or named like a date: see
 * `timeStamps`), exact duplicates are split by it: rows equal on every feature and the target
 * but stamped at different times are separate measurements that happen to agree (an hourly
 * reading repeating last week's, two flights of one route with the same delay), and a copied
 * record repeats its stamp. Measured on the corpus (README, "False alarms"): the three clean open
 * data sets that printed duplicate-rows before eval (flights, hourly weather normals, bird
 * strikes, each with its date dropped) are the case; no planted copy differs in a stamp.
 *
 * Printed before eval ("warn") only when the copies could move the score beyond fold noise:
 * - chance: rows of coarse data coincide by chance. Under independent columns two random rows
 *   agree on every feature with probability P = prod_f sum_v c_fv (c_fv - 1) / (n (n - 1)) (c_fv
 *   the rows holding value v of feature f, missing counted as a value), and also on the target
 *   with P_y, the same sum over the target's values
 *   (conflicting: 1 - P_y); a row has a chance copy with probability 1 - (1 - P P_y)^(n-1). The
 *   Columns are often dependent (a route fixes its distance), which that product misses, so a
 *   second estimate is taken too: of the pairs of rows equal on every feature, a share P_y would
 *   also agree on the target by chance (1 - P_y disagree), counting feature-equal pairs as
 *   chance only in proportion to how coarse the data are (the share of used rows that share
 *   their features with another row: in data of measured numbers a few equal rows are copies,
 *   in coarse data most rows have a twin); the duplicated rows expected by
 *   chance are the larger of the two estimates. The straddling rows expected by chance are that
 *   many rows times the observed straddling share.
 * - shift: the straddling rows beyond chance as a share of the n used rows: the most the score
 *   (accuracy, balanced accuracy or R^2 alike, on a 0..1 scale) can gain when each such test row
 *   is answered from its copy.
 * - fold noise: 0.5 / sqrt(n), the standard error of a score that is a proportion of n rows at
 *   its widest (p = 0.5); the spread of the cross-validated mean is of that order.
 * "warn" when the shift exceeds the fold noise, "note" otherwise. Conflicting duplicates are
 * reported for classification only: in regression, rows with equal features and different
 * numeric targets are ordinary noise, not label errors. The rule and its constant are our own
 * choice; the rates they give on our corpus are in the README ("False alarms").
 *
 * Cost: two 32-bit hashes per row, made one feature at a time, and rows chained by hash bucket
 * (rows of one bucket are compared exactly; no sort of the rows), then per fold a binary search of the (ascending) training rows
 * for the other members of each duplicate set of a test row: only duplicated rows cost anything.
 */
import type { Problem } from '../data/problem.js';
import type { Target } from '../learning.js';
import type { Fold } from '../plans/types.js';
import type { FeatureData } from './feature-data.js';
import type { DuplicateSummary, Suspect } from './types.js';
import { count, fig, nameTokens } from './wording.js';

export interface DuplicateSets {
  readonly summary: DuplicateSummary;
  /** sets of used rows (two or more each), in order of first row */
  readonly exact: readonly Int32Array[];
  readonly conflicting: readonly Int32Array[];
  /** pairs of used rows equal on every feature (whatever their targets), and the rows in them */
  readonly featurePairs: number;
  readonly featureRows: number;
  /** pairs of used rows equal on every feature and the target, whatever their time stamps */
  readonly targetPairs: number;
}

const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);

/** Multiplies and rotates a 32-bit state by one 32-bit word (a simple multiplicative mix). */
function mix(h: number, w: number): number {
  h = Math.imul(h ^ w, 0x9e3779b1);
  return (h << 13) | (h >>> 19);
}

/**
 * Two 32-bit hashes per row of its features (missing hashed as one fixed word, -0 as 0), made
 * column by column (one pass over each feature's array): equal rows have equal hashes, and rows
 * with equal hashes are compared exactly afterwards.
 */
function rowHashes(features: readonly FeatureData[], n: number): { a: Int32Array; b: Int32Array } {
  const a = new Int32Array(n).fill(0x811c9dc5 | 0);
  const b = new Int32Array(n).fill(0x01000193);
  for (const f of features) {
    if (f.kind === 'numeric') {
      const values = f.values;
      for (let i = 0; i < n; i++) {
        const v = values[i];
        if (v !== v) {
          a[i] = mix(a[i], 0x7ff80001);
          b[i] = mix(b[i], 0x13572468);
        } else {
          bits[0] = v === 0 ? 0 : v;
          const ai = mix(a[i], words[0]);
          a[i] = ai;
          b[i] = mix(b[i], words[1] ^ ai);
        }
      }
    } else {
      const codes = f.codes;
      for (let i = 0; i < n; i++) {
        a[i] = mix(a[i], codes[i] + 0x2545f491);
        b[i] = mix(b[i], codes[i] ^ 0x6a09e667);
      }
    }
  }
  return { a, b };
}

/**
 * The sets of two or more used rows equal on every feature, each in ascending row order: rows
 * are chained by bucket of their hashes (a table of at least n buckets, each chain ascending),
 * and each chain of two or more rows is split into sets of exactly equal rows. No sort of the
 * rows: only rows that share a bucket are compared.
 */
function featureSets(features: readonly FeatureData[], n: number): number[][] {
  const { a, b } = rowHashes(features, n);
  let size = 1;
  while (size < n) size *= 2;
  const mask = size - 1;
  const bucketOf = (i: number): number => (Math.imul(a[i] ^ Math.imul(b[i], 0x27d4eb2d), 0x9e3779b1) >>> 7) & mask;
  const heads = new Int32Array(size).fill(-1);
  const next = new Int32Array(n);
  for (let i = n - 1; i >= 0; i--) {
    const k = bucketOf(i);
    next[i] = heads[k];
    heads[k] = i;
  }
  const out: number[][] = [];
  for (let i = 0; i < n; i++) {
    // i heads its chain when it is the first row of its bucket and has a follower
    if (next[i] < 0 || heads[bucketOf(i)] !== i) continue;
    const sets: number[][] = [];
    for (let j = i; j >= 0; j = next[j]) {
      const home = sets.find((set) => a[set[0]] === a[j] && b[set[0]] === b[j] && sameFeatures(features, set[0], j));
      if (home) home.push(j);
      else sets.push([j]);
    }
    for (const set of sets) if (set.length >= 2) out.push(set);
  }
  return out;
}

/** True when rows i and j are equal on every feature (missing equals missing). */
function sameFeatures(features: readonly FeatureData[], i: number, j: number): boolean {
  for (const f of features) {
    if (f.kind === 'numeric') {
      const x = f.values[i];
      const y = f.values[j];
      if (x !== y && !(Number.isNaN(x) && Number.isNaN(y))) return false;
    } else if (f.codes[i] !== f.codes[j]) return false;
  }
  return true;
}

function contains(sorted: Int32Array, x: number): boolean {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo < sorted.length && sorted[lo] === x;
}

/** Rows of sets that some fold tests while a partner (accepted by `partner`) trains. */
function straddling(sets: readonly Int32Array[], n: number, folds: readonly Fold[], partner: (a: number, b: number) => boolean): number {
  const setOf = new Int32Array(n).fill(-1);
  sets.forEach((s, k) => s.forEach((i) => (setOf[i] = k)));
  const marked = new Uint8Array(n);
  for (const fold of folds) {
    for (const i of fold.test) {
      const k = setOf[i];
      if (k < 0 || marked[i]) continue;
      for (const j of sets[k]) {
        if (j !== i && partner(i, j) && contains(fold.train, j)) {
          marked[i] = 1;
          break;
        }
      }
    }
  }
  let c = 0;
  for (const m of marked) c += m;
  return c;
}

/**
 * The time stamps of the used rows that are not features: the dropped columns and the --order
 * column that hold dates (read as dates by the loader, or named with a date word such as
 * "date" or "time"), each as one number per used row (NaN where missing).
 */
export function timeStamps(problem: Problem, dateWords: ReadonlySet<string>): Float64Array[] {
  const names = new Set([...problem.dropped, ...(problem.orderName !== undefined ? [problem.orderName] : [])]);
  names.delete(problem.targetName);
  for (const f of problem.features) names.delete(f.name);
  const out: Float64Array[] = [];
  for (const name of names) {
    const col = problem.table.byName.get(name);
    if (!col) continue;
    const named = nameTokens(col.name).some((t) => dateWords.has(t));
    if (!(col.kind === 'numeric' && col.dates) && !named) continue;
    const v = new Float64Array(problem.rows.length);
    problem.rows.forEach((r, i) => (v[i] = col.kind === 'numeric' ? col.values[r] : col.codes[r] < 0 ? NaN : col.codes[r]));
    out.push(v);
  }
  return out;
}

export function findDuplicates(features: readonly FeatureData[], y: Target, folds: readonly Fold[], stamps: readonly Float64Array[] = []): DuplicateSets {
  const n = y.task === 'classification' ? y.codes.length : y.values.length;
  const targetOf = (i: number): number => (y.task === 'classification' ? y.codes[i] : y.values[i]);
  // the key of an exact copy: the target and every time stamp (missing equals missing)
  const stampOf = (i: number): string => stamps.map((v) => (Number.isNaN(v[i]) ? 'NaN' : String(v[i]))).join(' ');
  // one hashing pass per feature, rows chained by hash bucket, then each chain split into sets
  // of exactly equal rows (featureSets); the sets are sorted by first row below
  const byFeatures = featureSets(features, n);
  const exact: Int32Array[] = [];
  const conflicting: Int32Array[] = [];
  let targetPairs = 0;
  for (const rows of byFeatures) {
    const byTarget = new Map<number, number[]>();
    for (const i of rows) {
      const t = targetOf(i);
      const list = byTarget.get(t);
      if (list) list.push(i);
      else byTarget.set(t, [i]);
    }
    for (const same of byTarget.values()) {
      if (same.length < 2) continue;
      targetPairs += (same.length * (same.length - 1)) / 2;
      if (stamps.length === 0) {
        exact.push(Int32Array.from(same));
        continue;
      }
      const byStamp = new Map<string, number[]>();
      for (const i of same) {
        const k = stampOf(i);
        const list = byStamp.get(k);
        if (list) list.push(i);
        else byStamp.set(k, [i]);
      }
      for (const copies of byStamp.values()) if (copies.length >= 2) exact.push(Int32Array.from(copies));
    }
    if (byTarget.size > 1) conflicting.push(Int32Array.from(rows));
  }
  exact.sort((a, b) => a[0] - b[0]);
  conflicting.sort((a, b) => a[0] - b[0]);
  const rowsIn = (sets: readonly Int32Array[]): number => sets.reduce((s, x) => s + x.length, 0);
  const pairs = (sets: readonly { length: number }[]): number => sets.reduce((t, x) => t + (x.length * (x.length - 1)) / 2, 0);
  return {
    exact,
    conflicting,
    featurePairs: pairs(byFeatures),
    featureRows: byFeatures.reduce((t, x) => t + x.length, 0),
    targetPairs,
    summary: {
      exactSets: exact.length,
      exactRows: rowsIn(exact),
      exactStraddling: straddling(exact, n, folds, () => true),
      conflictingSets: conflicting.length,
      conflictingRows: rowsIn(conflicting),
      conflictingStraddling: straddling(conflicting, n, folds, (a, b) => targetOf(a) !== targetOf(b)),
    },
  };
}

/** Up to three sets as file line lists: "lines 4 and 9; lines 12, 13 and 40". */
function examples(sets: readonly Int32Array[], lineOf: (i: number) => number): string {
  return sets
    .slice(0, 3)
    .map((s) => {
      const lines = Array.from(s.slice(0, 4), lineOf);
      const more = s.length > 4 ? ` and ${s.length - 4} more` : '';
      return `lines ${lines.slice(0, -1).join(', ')}${lines.length > 1 ? ' and ' : ''}${lines[lines.length - 1]}${more}`;
    })
    .join('; ');
}

/** Chance that two distinct rows share a value, from value counts: sum c (c - 1) / (n (n - 1)). */
function pairShare(counts: Iterable<number>, n: number): number {
  let s = 0;
  for (const c of counts) s += c * (c - 1);
  return n > 1 ? s / (n * (n - 1)) : 1;
}

/** Chance that two distinct used rows agree on a feature (missing counted as a value). */
function collision(f: FeatureData, n: number): number {
  const counts: number[] = [f.missing];
  if (f.kind === 'categorical') for (const c of f.counts) counts.push(c);
  else for (const c of f.runs) counts.push(c);
  return pairShare(counts, n);
}

/** Chance that two distinct used rows agree on the target. */
function targetCollision(y: Target): number {
  const n = y.task === 'classification' ? y.codes.length : y.values.length;
  const counts = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const t = y.task === 'classification' ? y.codes[i] : y.values[i];
    counts.set(t, (counts.get(t) ?? 0) + 1);
  }
  return pairShare(counts.values(), n);
}

/** How far the copies across folds could move the score, against fold noise (see the head comment). */
export interface DuplicateImpact {
  /** straddling rows expected by chance (independent columns) */
  readonly chanceStraddling: number;
  /** straddling rows beyond chance over the used rows */
  readonly shift: number;
  /** 0.5 / sqrt(n) */
  readonly foldNoise: number;
}

function impact(straddling: number, rows: number, n: number, pRow: number, observedPairs: number, chancePairs: number): DuplicateImpact {
  const independent = n * (1 - (1 - pRow) ** Math.max(0, n - 1));
  const conditional = observedPairs > 0 ? rows * Math.min(1, chancePairs / observedPairs) : 0;
  const chanceRows = Math.max(independent, conditional);
  const chanceStraddling = rows > 0 ? Math.min(straddling, chanceRows * (straddling / rows)) : 0;
  return { chanceStraddling, shift: Math.max(0, straddling - chanceStraddling) / Math.max(1, n), foldNoise: 0.5 / Math.sqrt(Math.max(1, n)) };
}

export function duplicateImpacts(features: readonly FeatureData[], y: Target, d: DuplicateSets): { exact: DuplicateImpact; conflicting: DuplicateImpact } {
  const s = d.summary;
  const n = y.task === 'classification' ? y.codes.length : y.values.length;
  let p = 1;
  for (const f of features) p *= collision(f, n);
  const py = targetCollision(y);
  const pairs = (sets: readonly Int32Array[]): number => sets.reduce((t, x) => t + (x.length * (x.length - 1)) / 2, 0);
  const exactPairs = pairs(d.exact);
  // feature-equal pairs plausible by chance: weighted by how coarse the data are, the share of
  // used rows that share their features with another row
  const chanceFeaturePairs = d.featurePairs * (d.featureRows / Math.max(1, n));
  return {
    exact: impact(s.exactStraddling, s.exactRows, n, p * py, exactPairs, chanceFeaturePairs * py),
    // pairs that differ in the target: rows equal on the target but stamped at other times are not among them
    conflicting: impact(s.conflictingStraddling, s.conflictingRows, n, p * (1 - py), d.featurePairs - d.targetPairs, chanceFeaturePairs * (1 - py)),
  };
}

export function duplicateSuspects(d: DuplicateSets, planText: string, lineOf: (i: number) => number, features: readonly FeatureData[], y: Target): Suspect[] {
  const s = d.summary;
  const out: Suspect[] = [];
  const { exact, conflicting } = duplicateImpacts(features, y, d);
  const moves = (m: DuplicateImpact): boolean => m.shift > m.foldNoise;
  const weighed = (m: DuplicateImpact, what: string): string =>
    `; beyond the ${fig(m.chanceStraddling, 1)} expected by chance in data this coarse, they could move the score by up to ${fig(m.shift)}, ${moves(m) ? 'more' : 'less'} than the fold noise ${fig(m.foldNoise)} (0.5/sqrt(n))${moves(m) ? '' : `, so ${what}`}`;
  if (s.exactSets > 0) {
    const printed = s.exactStraddling > 0 && moves(exact);
    out.push({
      kind: 'duplicate-rows',
      severity: printed ? 'warn' : 'note',
      columns: [],
      reasons: s.exactStraddling > 0 ? (printed ? ['straddling'] : ['straddling', 'within-noise']) : ['within-folds'],
      evidence: `${count(s.exactRows, 'used row')} in ${count(s.exactSets, 'set')} are equal on every feature and the target (${examples(d.exact, lineOf)}); under the plan ${planText}, ${count(s.exactStraddling, 'of them is', 'of them are')} tested in a fold while a copy trains${s.exactStraddling > 0 ? weighed(exact, 'they are not printed before eval') : ''}`,
      action: 'copies on both sides of a split make the score optimistic: remove repeated records, or give copies a shared key and pass it with --group',
      figures: { sets: s.exactSets, rows: s.exactRows, straddling: s.exactStraddling, chanceStraddling: exact.chanceStraddling, scoreShift: exact.shift, foldNoise: exact.foldNoise },
    });
  }
  if (s.conflictingSets > 0 && y.task === 'classification') {
    const printed = s.conflictingStraddling > 0 && moves(conflicting);
    out.push({
      kind: 'conflicting-duplicates',
      severity: printed ? 'warn' : 'note',
      columns: [],
      reasons: s.conflictingStraddling > 0 ? (printed ? ['straddling'] : ['straddling', 'within-noise']) : ['within-folds'],
      evidence: `${count(s.conflictingRows, 'used row')} in ${count(s.conflictingSets, 'set')} are equal on every feature but differ in the target (${examples(d.conflicting, lineOf)}); under the plan ${planText}, ${count(s.conflictingStraddling, 'of them is', 'of them are')} tested while a row with the same features and another target trains${s.conflictingStraddling > 0 ? weighed(conflicting, 'they are not printed before eval') : ''}`,
      action: 'check the labels of these rows: no learner can tell them apart, so they cap the best reachable score, and they may mark a missing feature',
      figures: { sets: s.conflictingSets, rows: s.conflictingRows, straddling: s.conflictingStraddling, chanceStraddling: conflicting.chanceStraddling, scoreShift: conflicting.shift, foldNoise: conflicting.foldNoise },
    });
  }
  return out;
}
