/**
 * Sorts finite doubles in place into ascending numeric order, as Float64Array.prototype.sort does
 * (-0 before +0), by an LSD radix sort on their IEEE 754 bit patterns: four passes of 16 bits
 * over keys in which a positive number has its sign bit set and a negative one has every bit
 * flipped, so that unsigned key order is numeric order (the standard transform; e.g. Knuth, The
 * Art of Computer Programming vol. 3, 5.2.5, on radix sorting, from memory). A pass whose digit
 * is the same for every key is skipped. Binning sorts each training column of a forest fit once:
 * at 667,000 values this took about a third of the built-in sort's time (bench, measured beside
 * it in one process). NaN is not allowed (the caller has refused it).
 *
 * `scratch`, when given, must hold at least 2 * values.length 32-bit words; it is overwritten.
 */
const DIGIT = 16;
const BUCKETS = 1 << DIGIT;

export function sortFinite(values: Float64Array, scratch?: Uint32Array): Float64Array {
  const n = values.length;
  if (n < 2) return values;
  if (values.byteOffset % 8 !== 0) throw new RangeError('sortFinite: the array must start on an 8-byte boundary');
  if (scratch !== undefined && scratch.length < 2 * n) throw new RangeError(`sortFinite: scratch of ${scratch.length} words for ${n} values`);
  let a = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  let b = scratch ?? new Uint32Array(2 * n);
  // little-endian words: a[2i] is the low half, a[2i + 1] the high half with the sign bit
  for (let i = 0; i < n; i++) {
    const hi = a[2 * i + 1];
    if (hi & 0x80000000) {
      a[2 * i + 1] = ~hi >>> 0;
      a[2 * i] = ~a[2 * i] >>> 0;
    } else {
      a[2 * i + 1] = (hi | 0x80000000) >>> 0;
    }
  }
  const count = new Int32Array(BUCKETS);
  let inValues = true;
  for (let pass = 0; pass < 4; pass++) {
    const word = pass >> 1;
    const shift = (pass & 1) * DIGIT;
    count.fill(0);
    for (let i = 0; i < n; i++) count[(a[2 * i + word] >>> shift) & (BUCKETS - 1)]++;
    if (count[(a[word] >>> shift) & (BUCKETS - 1)] === n) continue;
    let sum = 0;
    for (let d = 0; d < BUCKETS; d++) {
      const c = count[d];
      count[d] = sum;
      sum += c;
    }
    for (let i = 0; i < n; i++) {
      const lo = a[2 * i];
      const hi = a[2 * i + 1];
      const at = 2 * count[((word === 0 ? lo : hi) >>> shift) & (BUCKETS - 1)]++;
      b[at] = lo;
      b[at + 1] = hi;
    }
    const t = a;
    a = b;
    b = t;
    inValues = !inValues;
  }
  if (!inValues) new Uint32Array(values.buffer, values.byteOffset, 2 * n).set(a.subarray(0, 2 * n));
  const out = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  for (let i = 0; i < n; i++) {
    const hi = out[2 * i + 1];
    if (hi & 0x80000000) {
      out[2 * i + 1] = (hi & 0x7fffffff) >>> 0;
    } else {
      out[2 * i + 1] = ~hi >>> 0;
      out[2 * i] = ~out[2 * i] >>> 0;
    }
  }
  return values;
}
