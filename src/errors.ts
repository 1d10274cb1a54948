/**
 * Typed errors of foldwise. Every error the core throws on purpose is a FoldwiseError with
 * an exit code; the CLI prints its one-line message and sets the process exit code.
 *
 * Exit codes: 0 ok, 1 gate or threshold failed (a regression), 2 bad input or usage.
 * Anything else is a bug.
 */
export const EXIT_OK = 0;
export const EXIT_REGRESSION = 1;
export const EXIT_BAD_INPUT = 2;

export class FoldwiseError extends Error {
  readonly exitCode: number;
  constructor(message: string, exitCode: number) {
    super(message);
    this.name = new.target.name;
    this.exitCode = exitCode;
  }
}

/** Bad command line or API options: an unknown name, a malformed spec, a value out of range. */
export class UsageError extends FoldwiseError {
  constructor(message: string) {
    super(message, EXIT_BAD_INPUT);
  }
}

/** Bad input data: unreadable file, ragged row, unusable target, and the like. */
export class InputError extends FoldwiseError {
  constructor(message: string) {
    super(message, EXIT_BAD_INPUT);
  }
}

/** A gate or threshold failed: the only error that exits 1. */
export class RegressionError extends FoldwiseError {
  constructor(message: string) {
    super(message, EXIT_REGRESSION);
  }
}

/** Levenshtein distance, for "did you mean" lists in error messages. */
export function editDistance(a: string, b: string): number {
  const prev = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0];
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = prev[j];
      prev[j] = Math.min(prev[j] + 1, prev[j - 1] + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = tmp;
    }
  }
  return prev[b.length];
}

/** Up to three known names close to `name`, formatted for an error message ("" when none). */
export function closeNames(name: string, known: readonly string[]): string {
  const lower = name.toLowerCase();
  const scored = known
    .map((k) => ({ k, d: editDistance(lower, k.toLowerCase()) }))
    .filter(({ k, d }) => d <= Math.max(2, Math.floor(name.length / 3)) || k.toLowerCase().includes(lower))
    .sort((x, y) => x.d - y.d || (x.k < y.k ? -1 : 1))
    .slice(0, 3)
    .map(({ k }) => JSON.stringify(k));
  return scored.length ? `did you mean ${scored.join(', ')}?` : '';
}
