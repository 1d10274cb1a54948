/**
 * The fold assignment fingerprint (src/run/assignment.ts) against its definition in that file's
 * header, recomputed here by an independent path: the whole text built as one string and hashed
 * by node:crypto in one call. Folds longer than the hash's chunk check that writing the rows in
 * chunks gives the same bytes (the comma between chunks, no comma after the last row).
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { HASH_CHUNK, assignmentOf } from '../../src/run/assignment.js';
import { createRng } from '../../src/rng.js';

function byDefinition(folds: { repeat: number; fold: number; rows: number[] }[]): string {
  const lines = [...folds]
    .sort((a, b) => a.repeat - b.repeat || a.fold - b.fold)
    .map((f) => `r${f.repeat}.f${f.fold}:${[...f.rows].sort((x, y) => x - y).join(',')}\n`);
  return createHash('sha256').update(lines.join('')).digest('hex');
}

describe('assignmentOf', () => {
  it('hashes one line per fold, in (repeat, fold) order, test rows ascending', () => {
    const folds = [
      { repeat: 1, fold: 0, rows: [5, 1] },
      { repeat: 0, fold: 1, rows: [3, 0, 2] },
      { repeat: 0, fold: 0, rows: [4] },
    ];
    const want = createHash('sha256').update('r0.f0:4\nr0.f1:0,2,3\nr1.f0:1,5\n').digest('hex');
    expect(assignmentOf(folds)).toBe(want);
    expect(byDefinition(folds)).toBe(want);
  });

  it('gives the same bytes when a fold is longer than the hash chunk', () => {
    const rng = createRng(31);
    for (const size of [HASH_CHUNK - 1, HASH_CHUNK, HASH_CHUNK + 1, 3 * HASH_CHUNK + 17]) {
      const all = Array.from({ length: 2 * size }, (_, i) => i);
      for (let i = all.length - 1; i > 0; i--) {
        const j = rng.int(i + 1);
        [all[i], all[j]] = [all[j], all[i]];
      }
      const folds = [
        { repeat: 0, fold: 0, rows: all.slice(0, size) },
        { repeat: 0, fold: 1, rows: all.slice(size) },
      ];
      expect(assignmentOf(folds.map((f) => ({ ...f, rows: Float64Array.from(f.rows) })))).toBe(byDefinition(folds));
    }
  });
});
