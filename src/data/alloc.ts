/**
 * Where the loaders put a column's numbers and a table's line numbers: ordinary memory, or
 * SharedArrayBuffers when the table will go to worker threads (`LoadOptions.shared`). Loading
 * straight into shared memory spares the copy that moving the columns there afterwards makes
 * (src/run/share.ts): at 10^6 x 20 that copy left 168 MB of old columns to the garbage
 * collector, and while it had not run the run's memory held the table twice.
 */
export interface Alloc {
  f64(n: number): Float64Array;
  i32(n: number): Int32Array;
}

export const PLAIN: Alloc = {
  f64: (n) => new Float64Array(n),
  i32: (n) => new Int32Array(n),
};

export const SHARED: Alloc = {
  f64: (n) => new Float64Array(new SharedArrayBuffer(n * Float64Array.BYTES_PER_ELEMENT)),
  i32: (n) => new Int32Array(new SharedArrayBuffer(n * Int32Array.BYTES_PER_ELEMENT)),
};

export function allocFor(shared: boolean | undefined): Alloc {
  return shared ? SHARED : PLAIN;
}

/** The first `n` values of `a` in memory of `alloc`: a view when `a` is already there and at most 1/16 longer, else a copy. */
export function trimmedF64(alloc: Alloc, a: Float64Array, n: number): Float64Array {
  const inPlace = (a.buffer instanceof SharedArrayBuffer) === (alloc === SHARED);
  if (inPlace && a.length === n) return a;
  if (inPlace && a.length - n <= n / 16) return a.subarray(0, n);
  const out = alloc.f64(n);
  out.set(a.subarray(0, n));
  return out;
}

export function trimmedI32(alloc: Alloc, a: Int32Array, n: number): Int32Array {
  const inPlace = (a.buffer instanceof SharedArrayBuffer) === (alloc === SHARED);
  if (inPlace && a.length === n) return a;
  if (inPlace && a.length - n <= n / 16) return a.subarray(0, n);
  const out = alloc.i32(n);
  out.set(a.subarray(0, n));
  return out;
}
