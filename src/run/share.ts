/**
 * A table's typed columns moved into SharedArrayBuffers, so worker threads read the same memory
 * instead of a copy (structured clone passes a SharedArrayBuffer by reference). Level tables and
 * names are small and are copied.
 */
import type { Column, Table } from '../data/types.js';

/** The array itself when it already lives in shared memory, else a copy that does. */
export function shared<T extends Float64Array | Int32Array>(a: T): T {
  const Ctor = a.constructor as { new (buf: SharedArrayBuffer): T; BYTES_PER_ELEMENT: number };
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const out = new Ctor(new SharedArrayBuffer(a.length * Ctor.BYTES_PER_ELEMENT));
  out.set(a as never);
  return out;
}

/** The table without its Map, with every typed array in shared memory. */
export interface SharedTable {
  readonly source: string;
  readonly rows: number;
  readonly columns: readonly Column[];
  readonly fingerprint: Table['fingerprint'];
  readonly lines: Int32Array;
  readonly warnings: readonly string[];
}

export function shareTable(table: Table): SharedTable {
  return {
    source: table.source,
    rows: table.rows,
    fingerprint: table.fingerprint,
    warnings: table.warnings,
    lines: shared(table.lines),
    columns: table.columns.map((c) => (c.kind === 'numeric' ? { ...c, values: shared(c.values) } : { ...c, codes: shared(c.codes) })),
  };
}

/**
 * Moves a table's typed columns into shared memory in place, one column at a time, so the
 * worker threads and this thread read one copy (shareTable then copies nothing). For a table
 * that will go to workers: without it the table is held twice, once as loaded and once shared.
 * Returns the same table object.
 */
export function shareTableInPlace(table: Table): Table {
  const columns = table.columns as Column[];
  for (let j = 0; j < columns.length; j++) {
    const c = columns[j];
    const moved: Column = c.kind === 'numeric' ? { ...c, values: shared(c.values) } : { ...c, codes: shared(c.codes) };
    columns[j] = moved;
    (table.byName as Map<string, Column>).set(c.name, moved);
  }
  (table as { lines: Int32Array }).lines = shared(table.lines);
  return table;
}

export function tableFromShared(s: SharedTable): Table {
  return { ...s, byName: new Map(s.columns.map((c) => [c.name, c])) };
}
