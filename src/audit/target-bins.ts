/**
 * The target as categories for the association tests: the class codes for classification; for
 * regression the quarter of the target's distribution each row falls in (cut at the sample
 * quartiles, type 7 as in numeric-summary.ts; a value equal to a cut goes to the lower bin, so
 * heavy ties can leave a bin empty, which the tests then drop).
 */
import type { Target } from '../learning.js';
import { quantileSorted } from './numeric-summary.js';
import { fig } from './wording.js';

export interface TargetBins {
  readonly bins: Int32Array;
  readonly count: number;
  readonly names: readonly string[];
}

export function targetBins(y: Target): TargetBins {
  if (y.task === 'classification') return { bins: y.codes, count: y.classes.length, names: y.classes };
  const sorted = Float64Array.from(y.values).sort();
  const cuts = [0.25, 0.5, 0.75].map((p) => quantileSorted(sorted, p));
  const bins = Int32Array.from(y.values, (v) => (v <= cuts[0] ? 0 : v <= cuts[1] ? 1 : v <= cuts[2] ? 2 : 3));
  const names = [`target <= ${fig(cuts[0])}`, `target in (${fig(cuts[0])}, ${fig(cuts[1])}]`, `target in (${fig(cuts[1])}, ${fig(cuts[2])}]`, `target > ${fig(cuts[2])}`];
  return { bins, count: 4, names };
}
