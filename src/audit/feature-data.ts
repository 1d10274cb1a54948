/**
 * The features of a problem restricted to its used rows (target present), prepared once for
 * every check: numeric values with their distinct present values and the rows holding each
 * (one hashing pass, valueRuns), or categorical codes with level counts. Index i everywhere in
 * src/audit is a used row of the problem.
 *
 * At scale (issue #14) the exact checks read every row, so a feature holds what one pass over
 * its column gives: counts of each value, not a sort of all rows. The rows sorted by value
 * (`order`), which only the scored checks read (on the sample above the row limit: sample.ts),
 * are sorted on first read and kept; read it once into a local before a loop.
 */
import type { Problem } from '../data/problem.js';
import type { Column } from '../data/types.js';

export type FeatureData =
  | {
      readonly kind: 'numeric';
      readonly name: string;
      readonly column: Column;
      /** value per used row, NaN when missing */
      readonly values: Float64Array;
      /** the distinct present values, ascending (-0 read as 0) */
      readonly uniques: Float64Array;
      /** used rows holding each of `uniques` (same index) */
      readonly runs: Int32Array;
      /** used rows with a present value, sorted by value (ties by row); made on first read */
      readonly order: Int32Array;
      readonly missing: number;
      readonly distinct: number;
      readonly dates: boolean;
    }
  | {
      readonly kind: 'categorical';
      readonly name: string;
      readonly column: Column;
      /** level code per used row, -1 when missing */
      readonly codes: Int32Array;
      readonly levels: readonly string[];
      /** used rows per level */
      readonly counts: Int32Array;
      readonly missing: number;
      readonly distinct: number;
    };

/** The distinct present values of a numeric column, ascending, and the rows holding each. */
export interface ValueRuns {
  /** distinct present values, ascending; -0 is counted as 0 */
  readonly uniques: Float64Array;
  /** rows per value, same index as `uniques` */
  readonly runs: Int32Array;
  /** rows with a present (non-NaN) value: the sum of `runs` */
  readonly present: number;
}

const hashBits = new Float64Array(1);
const hashWords = new Uint32Array(hashBits.buffer);

/** A 32-bit hash of the two 32-bit words of a double (low word first in memory order). */
function hashWordPair(w0: number, w1: number): number {
  let h = Math.imul(w0 ^ Math.imul(w1, 0x9e3779b1), 0x85ebca6b);
  h ^= h >>> 15;
  h = Math.imul(h, 0xc2b2ae35);
  return h ^ (h >>> 16);
}

/** The same hash of a double's bits (the caller maps -0 to 0). */
function hashDouble(v: number): number {
  hashBits[0] = v;
  return hashWordPair(hashWords[0], hashWords[1]);
}

/**
 * One pass over the values: an open-addressing hash table (linear probing; key and count side
 * by side in one Float64Array so a probe reads one cache line; NaN marks an empty slot; doubled
 * at half full) counts the rows of each present value; then only the distinct values are
 * sorted (natively, no callback). O(n) for the pass plus O(d log d) for d distinct values,
 * against four radix passes or O(n log n) for a sort of every row; the result is what a sort
 * would give (the runs of equal values of the sorted column). The words of each value are read
 * through a Uint32Array view of the column, not copied.
 */
export function valueRuns(values: Float64Array): ValueRuns {
  const n = values.length;
  const words = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  const zeroHash = hashDouble(0);
  let cap = 1024;
  let mask = cap - 1;
  // slot s: key at 2s, count at 2s + 1
  let table = new Float64Array(2 * cap).fill(NaN);
  let size = 0;
  let present = 0;
  for (let i = 0; i < n; i++) {
    let v = values[i];
    if (v !== v) continue;
    present++;
    let h: number;
    if (v === 0) {
      v = 0;
      h = zeroHash & mask;
    } else h = hashWordPair(words[2 * i], words[2 * i + 1]) & mask;
    for (;;) {
      const k = table[2 * h];
      if (k === v) {
        table[2 * h + 1]++;
        break;
      }
      if (k !== k) {
        table[2 * h] = v;
        table[2 * h + 1] = 1;
        size++;
        break;
      }
      h = (h + 1) & mask;
    }
    if (2 * size > cap) {
      const old = table;
      cap *= 2;
      mask = cap - 1;
      table = new Float64Array(2 * cap).fill(NaN);
      for (let s = 0; s < old.length; s += 2) {
        const k = old[s];
        if (k !== k) continue;
        let g = hashDouble(k) & mask;
        while (table[2 * g] === table[2 * g]) g = (g + 1) & mask;
        table[2 * g] = k;
        table[2 * g + 1] = old[s + 1];
      }
    }
  }
  const uniques = new Float64Array(size);
  let d = 0;
  for (let s = 0; s < cap; s++) if (table[2 * s] === table[2 * s]) uniques[d++] = table[2 * s];
  uniques.sort();
  const runs = new Int32Array(size);
  for (let j = 0; j < size; j++) {
    const v = uniques[j];
    let h = hashDouble(v) & mask;
    while (table[2 * h] !== v) h = (h + 1) & mask;
    runs[j] = table[2 * h + 1];
  }
  return { uniques, runs, present };
}

/** The present values sorted ascending, written out from their runs (a value repeated per row). */
export function sortedFromRuns(r: ValueRuns): Float64Array {
  const out = new Float64Array(r.present);
  let at = 0;
  for (let j = 0; j < r.uniques.length; j++) {
    out.fill(r.uniques[j], at, at + r.runs[j]);
    at += r.runs[j];
  }
  return out;
}

/**
 * The rows with a present value, sorted by value, ties by row: the values are sorted natively
 * (no comparison callback), then each row is placed at the first sorted position of its value
 * (binary search) plus the number of earlier rows with that value.
 */
export function argsortPresent(values: Float64Array): Int32Array {
  return values.length >= RADIX_FROM ? radixArgsort(values) : searchArgsort(values);
}

/** Sizes from which argsortPresent uses the radix sort (below it the search placement is cheaper). */
const RADIX_FROM = 4096;

const radixBits = new Float64Array(1);
const radixWords = new Uint32Array(radixBits.buffer);

/**
 * The same order by a least-significant-digit radix sort on the 64 bits of each value, mapped
 * so that unsigned order is numeric order (sign bit set: all bits flipped; else the sign bit
 * set; -0 read as 0), in four stable passes of 16 bits (a pass whose digit is the same for all
 * rows is skipped). Stable, so ties stay in row order. O(n) per pass; see D. E. Knuth, The Art
 * of Computer Programming vol. 3, section 5.2.5 (radix sorting).
 */
function radixArgsort(values: Float64Array): Int32Array {
  const n = values.length;
  let m = 0;
  for (let i = 0; i < n; i++) if (!Number.isNaN(values[i])) m++;
  // keys travel with the rows, so every pass reads its arrays in order
  let hi = new Uint32Array(m);
  let lo = new Uint32Array(m);
  let order = new Int32Array(m);
  m = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (Number.isNaN(v)) continue;
    radixBits[0] = v === 0 ? 0 : v;
    let h = radixWords[1];
    let l = radixWords[0];
    if (h & 0x80000000) {
      h = ~h >>> 0;
      l = ~l >>> 0;
    } else h = (h | 0x80000000) >>> 0;
    hi[m] = h;
    lo[m] = l;
    order[m++] = i;
  }
  let hi2 = new Uint32Array(m);
  let lo2 = new Uint32Array(m);
  let order2 = new Int32Array(m);
  const counts = new Int32Array(65536);
  for (const [high, shift] of [[false, 0], [false, 16], [true, 0], [true, 16]] as const) {
    const words = high ? hi : lo;
    counts.fill(0);
    for (let j = 0; j < m; j++) counts[(words[j] >>> shift) & 0xffff]++;
    if (m > 0 && counts[(words[0] >>> shift) & 0xffff] === m) continue;
    let at = 0;
    for (let d = 0; d < 65536; d++) {
      const c = counts[d];
      counts[d] = at;
      at += c;
    }
    for (let j = 0; j < m; j++) {
      const to = counts[(words[j] >>> shift) & 0xffff]++;
      hi2[to] = hi[j];
      lo2[to] = lo[j];
      order2[to] = order[j];
    }
    [hi, hi2] = [hi2, hi];
    [lo, lo2] = [lo2, lo];
    [order, order2] = [order2, order];
  }
  return order;
}

function searchArgsort(values: Float64Array): Int32Array {
  const n = values.length;
  let m = 0;
  for (let i = 0; i < n; i++) if (!Number.isNaN(values[i])) m++;
  const sorted = new Float64Array(m);
  m = 0;
  for (let i = 0; i < n; i++) if (!Number.isNaN(values[i])) sorted[m++] = values[i];
  sorted.sort();
  const order = new Int32Array(m);
  const taken = new Int32Array(m);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (Number.isNaN(v)) continue;
    let lo = 0;
    let hi = m;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (sorted[mid] < v) lo = mid + 1;
      else hi = mid;
    }
    order[lo + taken[lo]++] = i;
  }
  return order;
}

/** True when the used rows are the table's rows 0..n-1 in order (then used row i is table row i). */
function usesEveryRow(problem: Problem): boolean {
  const rows = problem.rows;
  if (rows.length !== problem.table.rows) return false;
  for (let i = 0; i < rows.length; i++) if (rows[i] !== i) return false;
  return true;
}

export function featureData(problem: Problem, col: Column): FeatureData {
  const rows = problem.rows;
  const n = rows.length;
  const every = usesEveryRow(problem);
  if (col.kind === 'numeric') {
    // every row used (no missing target): the column itself, read only, not a copy
    const values = every ? col.values.subarray(0, n) : new Float64Array(n);
    if (!every) for (let i = 0; i < n; i++) values[i] = col.values[rows[i]];
    const r = valueRuns(values);
    let order: Int32Array | undefined;
    return {
      kind: 'numeric',
      name: col.name,
      column: col,
      values,
      uniques: r.uniques,
      runs: r.runs,
      get order(): Int32Array {
        return (order ??= argsortPresent(values));
      },
      missing: n - r.present,
      distinct: r.uniques.length,
      dates: col.dates === true,
    };
  }
  const codes = every ? col.codes.subarray(0, n) : new Int32Array(n);
  if (!every) for (let i = 0; i < n; i++) codes[i] = col.codes[rows[i]];
  const counts = new Int32Array(col.levels.length);
  let missing = 0;
  for (let i = 0; i < n; i++) {
    if (codes[i] < 0) missing++;
    else counts[codes[i]]++;
  }
  let distinct = 0;
  for (const c of counts) if (c > 0) distinct++;
  return { kind: 'categorical', name: col.name, column: col, codes, levels: col.levels, counts, missing, distinct };
}

/** Feature data of every feature of the problem, in feature order. */
export function featuresOf(problem: Problem): FeatureData[] {
  return problem.features.map((c) => featureData(problem, c));
}

/** True when used row i has a value for the feature. */
export function isPresent(f: FeatureData, i: number): boolean {
  return f.kind === 'numeric' ? !Number.isNaN(f.values[i]) : f.codes[i] >= 0;
}

/**
 * True when a categorical feature has at most one level per 5 present rows: only then is a
 * chi-square based association (Cramer's V) not inflated by sparse levels (a column with a
 * level per row has V = 1 against anything). Rule of thumb in the spirit of Cochran (1954),
 * "expected counts of about 5"; see chi-square.ts.
 */
export function fewLevels(f: FeatureData, n: number): boolean {
  return f.kind === 'categorical' && f.distinct >= 2 && f.distinct <= (n - f.missing) / 5;
}
