/**
 * Macro recall: the unweighted mean of per-class recall over the classes present in `actual`
 * or `predicted`. Recall of class k = (rows predicted k that are k) / (rows that are k); a class
 * that is predicted but never occurs in `actual` has recall 0. (balanced-accuracy is the same
 * mean taken over the classes of `actual` only.) Range [0, 1], higher is better. Conventions:
 * src/metrics/per-class.ts.
 *
 * Sources: Opitz & Burst (2019), "Macro F1 and Macro F1", arXiv:1911.03347 (free);
 * Sokolova & Lapalme (2009), Information Processing & Management 45:427-437 (Recall_M).
 */
import { meanOverPresent, perClassScores } from './per-class.js';
import type { ClassificationInput } from './types.js';

export function macroRecall(input: ClassificationInput): number {
  const s = perClassScores(input, 'macro-recall');
  return meanOverPresent(s.recall, s.present, s.presentCount);
}
