/**
 * Indexes a code column (class codes or group codes): the distinct codes in ascending order,
 * a dense id 0..count-1 per row, and each id's member rows in ascending row order.
 * Codes are looked up through a Map, so sparse or large codes cost nothing extra.
 */
export interface CodeIndex {
  /** number of distinct codes present */
  readonly count: number;
  /** the original code of each dense id, ascending */
  readonly codes: Int32Array;
  /** dense id per row */
  readonly ids: Int32Array;
  /** rows per dense id */
  readonly sizes: Int32Array;
  /** member rows of each dense id, ascending */
  readonly members: readonly Int32Array[];
}

export function indexCodes(values: Int32Array): CodeIndex {
  const n = values.length;
  const distinct = Int32Array.from(new Set(values)).sort();
  const idOf = new Map<number, number>();
  distinct.forEach((code, id) => idOf.set(code, id));
  const ids = new Int32Array(n);
  const sizes = new Int32Array(distinct.length);
  for (let i = 0; i < n; i++) {
    const id = idOf.get(values[i]) as number;
    ids[i] = id;
    sizes[id]++;
  }
  const members = Array.from(sizes, (s) => new Int32Array(s));
  const fill = new Int32Array(distinct.length);
  for (let i = 0; i < n; i++) members[ids[i]][fill[ids[i]]++] = i;
  return { count: distinct.length, codes: distinct, ids, sizes, members };
}

/** All rows as one index (a single code), for plans that do not stratify. */
export function singleCode(n: number): CodeIndex {
  const rows = new Int32Array(n);
  for (let i = 0; i < n; i++) rows[i] = i;
  return {
    count: n > 0 ? 1 : 0,
    codes: new Int32Array(n > 0 ? 1 : 0),
    ids: new Int32Array(n),
    sizes: n > 0 ? Int32Array.of(n) : new Int32Array(0),
    members: n > 0 ? [rows] : [],
  };
}
