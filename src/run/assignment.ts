/**
 * The fold assignment fingerprint: which data rows each fold tests, as one SHA-256. Two runs
 * with the same fingerprint scored the same rows in the same folds, whatever produced them: a
 * foldwise eval, or predictions made elsewhere on foldwise's folds (`split --assign`) and read
 * back by `foldwise score`. `compare` and `gate` pair such runs fold by fold.
 *
 * The hashed text is one line per fold, in (repeat, fold) order: "r{repeat}.f{fold}:" and the
 * fold's test rows (0-based data rows of the input file) ascending, comma-separated.
 */
import { createHash } from 'node:crypto';

export interface FoldRows {
  readonly repeat: number;
  readonly fold: number;
  /** 0-based data rows of the input file tested in this fold, in any order */
  readonly rows: ArrayLike<number>;
}

/** Rows written to the hash at a time: the same bytes as one joined line, without a 10^6-row string. */
export const HASH_CHUNK = 4096;

export function assignmentOf(folds: readonly FoldRows[]): string {
  const sorted = [...folds].sort((a, b) => a.repeat - b.repeat || a.fold - b.fold);
  const h = createHash('sha256');
  for (const f of sorted) {
    const rows = Float64Array.from(f.rows).sort();
    h.update(`r${f.repeat}.f${f.fold}:`);
    for (let i = 0; i < rows.length; i += HASH_CHUNK) {
      if (i > 0) h.update(',');
      h.update(rows.subarray(i, i + HASH_CHUNK).join(','));
    }
    h.update('\n');
  }
  return h.digest('hex');
}
