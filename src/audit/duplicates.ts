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
 * Cost: one 53-bit hash per row (equal hashes are compared exactly), then per fold a binary search of the (ascending) training rows
 * for the other members of each duplicate set of a test row: only duplicated rows cost anything.
 */
import type { Target } from '../learning.js';
import type { Fold } from '../plans/types.js';
import type { FeatureData } from './feature-data.js';
import type { DuplicateSummary, Suspect } from './types.js';
import { count } from './wording.js';

export interface DuplicateSets {
  readonly summary: DuplicateSummary;
  /** sets of used rows (two or more each), in order of first row */
  readonly exact: readonly Int32Array[];
  readonly conflicting: readonly Int32Array[];
}

const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);

/** Multiplies and rotates a 32-bit state by one 32-bit word (a simple multiplicative mix). */
function mix(h: number, w: number): number {
  h = Math.imul(h ^ w, 0x9e3779b1);
  return (h << 13) | (h >>> 19);
}

/**
 * A 53-bit hash of a row's features (missing hashed as one fixed word, -0 as 0); equal rows
 * have equal hashes, and rows with equal hashes are compared exactly afterwards.
 */
function rowHash(features: readonly FeatureData[], i: number): number {
  let a = 0x811c9dc5;
  let b = 0x01000193;
  for (const f of features) {
    if (f.kind === 'numeric') {
      const v = f.values[i];
      if (Number.isNaN(v)) {
        a = mix(a, 0x7ff80001);
        b = mix(b, 0x13572468);
      } else {
        bits[0] = v === 0 ? 0 : v;
        a = mix(a, words[0]);
        b = mix(b, words[1] ^ a);
      }
    } else {
      a = mix(a, f.codes[i] + 0x2545f491);
      b = mix(b, f.codes[i] ^ 0x6a09e667);
    }
  }
  return (a >>> 0) * 0x200000 + ((b >>> 0) & 0x1fffff);
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

export function findDuplicates(features: readonly FeatureData[], y: Target, folds: readonly Fold[]): DuplicateSets {
  const n = y.task === 'classification' ? y.codes.length : y.values.length;
  const targetOf = (i: number): number => (y.task === 'classification' ? y.codes[i] : y.values[i]);
  // rows bucketed by hash, then each bucket split into sets of exactly equal rows
  const buckets = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const h = rowHash(features, i);
    const list = buckets.get(h);
    if (list) list.push(i);
    else buckets.set(h, [i]);
  }
  const byFeatures: number[][] = [];
  for (const list of buckets.values()) {
    if (list.length < 2) continue;
    const sets: number[][] = [];
    for (const i of list) {
      const home = sets.find((set) => sameFeatures(features, set[0], i));
      if (home) home.push(i);
      else sets.push([i]);
    }
    for (const set of sets) if (set.length >= 2) byFeatures.push(set);
  }
  const exact: Int32Array[] = [];
  const conflicting: Int32Array[] = [];
  for (const rows of byFeatures) {
    const byTarget = new Map<number, number[]>();
    for (const i of rows) {
      const t = targetOf(i);
      const list = byTarget.get(t);
      if (list) list.push(i);
      else byTarget.set(t, [i]);
    }
    for (const same of byTarget.values()) if (same.length >= 2) exact.push(Int32Array.from(same));
    if (byTarget.size > 1) conflicting.push(Int32Array.from(rows));
  }
  exact.sort((a, b) => a[0] - b[0]);
  conflicting.sort((a, b) => a[0] - b[0]);
  const rowsIn = (sets: readonly Int32Array[]): number => sets.reduce((s, x) => s + x.length, 0);
  return {
    exact,
    conflicting,
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

export function duplicateSuspects(d: DuplicateSets, planText: string, lineOf: (i: number) => number): Suspect[] {
  const s = d.summary;
  const out: Suspect[] = [];
  if (s.exactSets > 0) {
    out.push({
      kind: 'duplicate-rows',
      severity: s.exactStraddling > 0 ? 'warn' : 'note',
      columns: [],
      reasons: s.exactStraddling > 0 ? ['straddling'] : ['within-folds'],
      evidence: `${count(s.exactRows, 'used row')} in ${count(s.exactSets, 'set')} are equal on every feature and the target (${examples(d.exact, lineOf)}); under the plan ${planText}, ${count(s.exactStraddling, 'of them is', 'of them are')} tested in a fold while a copy trains`,
      action: 'copies on both sides of a split make the score optimistic: remove repeated records, or give copies a shared key and pass it with --group',
      figures: { sets: s.exactSets, rows: s.exactRows, straddling: s.exactStraddling },
    });
  }
  if (s.conflictingSets > 0) {
    out.push({
      kind: 'conflicting-duplicates',
      severity: 'warn',
      columns: [],
      reasons: s.conflictingStraddling > 0 ? ['straddling'] : ['within-folds'],
      evidence: `${count(s.conflictingRows, 'used row')} in ${count(s.conflictingSets, 'set')} are equal on every feature but differ in the target (${examples(d.conflicting, lineOf)}); under the plan ${planText}, ${count(s.conflictingStraddling, 'of them is', 'of them are')} tested while a row with the same features and another target trains`,
      action: 'check the labels of these rows: no learner can tell them apart, so they cap the best reachable score, and they may mark a missing feature',
      figures: { sets: s.conflictingSets, rows: s.conflictingRows, straddling: s.conflictingStraddling },
    });
  }
  return out;
}
