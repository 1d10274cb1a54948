/**
 * Macro F1: the unweighted mean of per-class F1 over the classes present in `actual` or
 * `predicted`, where F1 of class k = 2 * correct_k / (actual_k + predicted_k), the harmonic
 * mean of its precision and recall (0 when the class has no correct rows). Range [0, 1],
 * higher is better. Conventions: src/metrics/per-class.ts.
 *
 * This is the mean of the per-class F1 values, not the harmonic mean of macro precision and
 * macro recall; the two differ in general (Opitz & Burst 2019, "Macro F1 and Macro F1",
 * arXiv:1911.03347, compare the two).
 *
 * Source: van Rijsbergen (1979), Information Retrieval, 2nd ed., ch. 7 (the F measure);
 * Opitz & Burst (2019), arXiv:1911.03347 (the averaged form).
 */
import { meanOverPresent, perClassScores } from './per-class.js';
import type { ClassificationInput } from './types.js';

export function macroF1(input: ClassificationInput): number {
  const s = perClassScores(input, 'macro-f1');
  return meanOverPresent(s.f1, s.present, s.presentCount);
}
