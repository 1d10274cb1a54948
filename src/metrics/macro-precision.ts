/**
 * Macro precision: the unweighted mean of per-class precision over the classes present in
 * `actual` or `predicted`. Precision of class k = (rows predicted k that are k) / (rows
 * predicted k); a class that occurs in `actual` but is never predicted has precision 0.
 * Range [0, 1], higher is better. Conventions: src/metrics/per-class.ts.
 *
 * Sources: Opitz & Burst (2019), "Macro F1 and Macro F1", arXiv:1911.03347 (free);
 * Sokolova & Lapalme (2009), Information Processing & Management 45:427-437 (Precision_M).
 */
import { meanOverPresent, perClassScores } from './per-class.js';
import type { ClassificationInput } from './types.js';

export function macroPrecision(input: ClassificationInput): number {
  const s = perClassScores(input, 'macro-precision');
  return meanOverPresent(s.precision, s.present, s.presentCount);
}
