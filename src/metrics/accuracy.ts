/**
 * Accuracy: the share of rows whose predicted class equals the actual class,
 * (number correct) / n. Range [0, 1], higher is better.
 *
 * Source: Fawcett (2006), "An introduction to ROC analysis", Pattern Recognition Letters
 * 27:861-874, Fig. 1 (accuracy = (TP + TN) / (P + N), here generalised to k classes).
 */
import { checkClassification } from './checks.js';
import type { ClassificationInput } from './types.js';

export function accuracy(input: ClassificationInput): number {
  checkClassification('accuracy', input);
  const { actual, predicted } = input;
  let correct = 0;
  for (let i = 0; i < actual.length; i++) if (actual[i] === predicted[i]) correct++;
  return correct / actual.length;
}
