/**
 * Seeded random number generators. Only the runner creates generators; plans and learners
 * receive an `Rng` or a derived seed. A derived seed is a pure function of the run's seed and
 * a path of labels, so a task's randomness does not depend on the order tasks run in.
 */
import { createHash } from 'node:crypto';
import seedrandom from 'seedrandom';

export interface Rng {
  /** Uniform double in [0, 1). */
  next(): number;
  /** Uniform integer in [0, n). */
  int(n: number): number;
}

/** A generator from a 32-bit unsigned integer seed (Alea, from seedrandom). */
export function createRng(seed: number): Rng {
  const prng = seedrandom.alea(String(seed >>> 0));
  return {
    next: () => prng(),
    int: (n: number) => Math.floor(prng() * n),
  };
}

/**
 * A child seed: the first 32 bits of SHA-256 over the parent seed and the labels, joined with
 * a separator that cannot occur in a decimal number.
 */
export function deriveSeed(seed: number, ...labels: (string | number)[]): number {
  const h = createHash('sha256').update([String(seed), ...labels.map(String)].join('\u0000')).digest();
  return h.readUInt32BE(0);
}

/** Fisher-Yates shuffle in place (Knuth, TAOCP vol. 2, Algorithm P). */
export function shuffleInPlace<T extends { length: number; [i: number]: number }>(a: T, rng: Rng): T {
  for (let i = a.length - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    const t = a[i];
    a[i] = a[j];
    a[j] = t;
  }
  return a;
}
