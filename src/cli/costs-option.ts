/**
 * `--costs FILE`, the cost matrix of the `cost` metric, as eval, tune, growth and score take it:
 * the file is read here (the core gets its name and text, src/metrics/cost-matrix.ts checks it
 * against the target).
 */
import { readFileSync } from 'node:fs';
import { UsageError } from '../errors.js';
import type { CostsText } from '../run/prepare.js';

export interface CostsFlags {
  costs?: string;
}

/** The help line of --costs. */
export const COSTS_HELP = 'cost matrix CSV for --metric cost: a header "actual\\predicted,CLASS,...", then one line per actual class with its costs (see README)';

/** The cost file's name and text, or undefined without --costs; a UsageError when it cannot be read. */
export function costsOf(flags: CostsFlags): CostsText | undefined {
  if (flags.costs === undefined) return undefined;
  if (flags.costs === '-') throw new UsageError('--costs -: give the cost matrix as a file (standard input may hold the data)');
  let text: string;
  try {
    text = readFileSync(flags.costs, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? 'unknown error';
    throw new UsageError(`--costs ${flags.costs}: cannot be read (${code}); give the path of a cost matrix CSV`);
  }
  return { file: flags.costs, text };
}
