/**
 * Per-class precision, recall and F1, with the zero-denominator conventions used by the macro
 * averages (macro-precision, macro-recall, macro-f1):
 *
 * - precision of class k = (rows predicted k that are k) / (rows predicted k);
 * - recall of class k    = (rows predicted k that are k) / (rows that are k);
 * - F1 of class k        = 2 * correct_k / (actual_k + predicted_k), the harmonic mean of the two.
 *
 * A class is *present* when it occurs in `actual` or in `predicted`. For a present class a
 * zero denominator counts as 0: a class never predicted has precision 0, a class predicted but
 * never actual has recall 0 (its F1 is then 0 as well, since it has no correct rows). A class
 * absent from both gets NaN in all three arrays and is left out of every macro average.
 *
 * Sources: Opitz & Burst (2019), "Macro F1 and Macro F1", arXiv:1911.03347 (free; macro
 * averages as unweighted means of per-class values); Sokolova & Lapalme (2009), "A systematic
 * analysis of performance measures for classification tasks", Information Processing &
 * Management 45:427-437.
 */
import { checkClassification } from './checks.js';
import { classTallies } from './tally.js';
import type { ClassificationInput } from './types.js';

export interface PerClassScores {
  readonly precision: Float64Array;
  readonly recall: Float64Array;
  readonly f1: Float64Array;
  /** rows whose actual class is k */
  readonly support: Float64Array;
  /** 1 where class k is present in actual or predicted, else 0 */
  readonly present: Uint8Array;
  /** number of present classes */
  readonly presentCount: number;
}

export function perClassScores(input: ClassificationInput, name = 'perClassScores'): PerClassScores {
  checkClassification(name, input);
  const k = input.classes;
  const t = classTallies(input.actual, input.predicted, k);
  const precision = new Float64Array(k);
  const recall = new Float64Array(k);
  const f1 = new Float64Array(k);
  const present = new Uint8Array(k);
  let presentCount = 0;
  for (let c = 0; c < k; c++) {
    const a = t.actualCount[c];
    const p = t.predictedCount[c];
    const tp = t.correct[c];
    if (a === 0 && p === 0) {
      precision[c] = recall[c] = f1[c] = NaN;
      continue;
    }
    present[c] = 1;
    presentCount++;
    precision[c] = p === 0 ? 0 : tp / p;
    recall[c] = a === 0 ? 0 : tp / a;
    f1[c] = (2 * tp) / (a + p);
  }
  return { precision, recall, f1, support: t.actualCount, present, presentCount };
}

/** Unweighted mean of `values` over the present classes. */
export function meanOverPresent(values: Float64Array, present: Uint8Array, presentCount: number): number {
  let sum = 0;
  for (let c = 0; c < values.length; c++) if (present[c]) sum += values[c];
  return sum / presentCount;
}
