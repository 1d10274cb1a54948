/**
 * A dictionary from byte strings to codes 0, 1, 2, ... in order of first insertion, keyed by
 * the bytes themselves, so a cell's code is found without making a JavaScript string (the
 * string of a level is made once, when it is first seen). Open addressing with linear probing
 * over a power-of-two table; keys live in one growing byte arena. For valid UTF-8, equal bytes
 * are equal texts, so the codes are those a Map from the decoded texts would give.
 */
export class ByteDict {
  size = 0;
  private table = new Int32Array(64);
  private mask = 63;
  private hashes: Int32Array<ArrayBuffer> = new Int32Array(16);
  private starts: Int32Array<ArrayBuffer> = new Int32Array(16);
  private lengths: Int32Array<ArrayBuffer> = new Int32Array(16);
  private arena = new Uint8Array(1024);
  private used = 0;

  /** The code of bytes [s, e) of buf with hash h, or -1. */
  get(buf: Uint8Array, s: number, e: number, h: number): number {
    const len = e - s;
    const arena = this.arena;
    for (let slot = h & this.mask; ; slot = (slot + 1) & this.mask) {
      const entry = this.table[slot];
      if (entry === 0) return -1;
      const code = entry - 1;
      if (this.hashes[code] !== h || this.lengths[code] !== len) continue;
      const at = this.starts[code];
      let k = 0;
      while (k < len && arena[at + k] === buf[s + k]) k++;
      if (k === len) return code;
    }
  }

  /** Adds bytes [s, e) (not present) with hash h; returns the new code. */
  add(buf: Uint8Array, s: number, e: number, h: number): number {
    const code = this.size++;
    if (code === this.hashes.length) {
      this.hashes = grow(this.hashes);
      this.starts = grow(this.starts);
      this.lengths = grow(this.lengths);
    }
    const len = e - s;
    if (this.used + len > this.arena.length) {
      const next = new Uint8Array(Math.max(this.arena.length * 2, this.used + len));
      next.set(this.arena.subarray(0, this.used));
      this.arena = next;
    }
    this.arena.set(buf.subarray(s, e), this.used);
    this.hashes[code] = h;
    this.starts[code] = this.used;
    this.lengths[code] = len;
    this.used += len;
    if (this.size * 2 > this.table.length) this.rehash();
    else this.place(code);
    return code;
  }

  private place(code: number): void {
    let slot = this.hashes[code] & this.mask;
    while (this.table[slot] !== 0) slot = (slot + 1) & this.mask;
    this.table[slot] = code + 1;
  }

  private rehash(): void {
    this.table = new Int32Array(this.table.length * 2);
    this.mask = this.table.length - 1;
    for (let code = 0; code < this.size; code++) this.place(code);
  }
}

function grow(a: Int32Array): Int32Array<ArrayBuffer> {
  const next = new Int32Array(a.length * 2);
  next.set(a);
  return next;
}

/** FNV-1a over bytes [s, e) (32-bit). */
export function hashBytes(buf: Uint8Array, s: number, e: number): number {
  let h = 0x811c9dc5;
  for (let i = s; i < e; i++) h = Math.imul(h ^ buf[i], 0x01000193);
  return h;
}
