/**
 * Balanced accuracy: the mean, over the classes that occur in `actual`, of each class's recall
 * (the share of that class's rows predicted correctly). Classes that occur only in `predicted`
 * do not count: they have no rows to recall. With two classes this is the mean of sensitivity
 * and specificity. Range [0, 1], higher is better; a constant prediction scores 1 / (classes
 * present in actual).
 *
 * Sources: Chicco, Toetsch & Jurman (2021), "The Matthews correlation coefficient (MCC) is more
 * reliable than balanced accuracy, bookmaker informedness, and markedness in two-class
 * confusion matrix evaluation", BioData Mining 14:13 (open access; two-class form);
 * Brodersen, Ong, Stephan & Buhmann (2010), Proc. 20th ICPR, 3121-3124. The k-class form is
 * the same mean taken over more classes.
 */
import { checkClassification } from './checks.js';
import { classTallies } from './tally.js';
import type { ClassificationInput } from './types.js';

export function balancedAccuracy(input: ClassificationInput): number {
  checkClassification('balanced-accuracy', input);
  const t = classTallies(input.actual, input.predicted, input.classes);
  let sum = 0;
  let classes = 0;
  for (let c = 0; c < input.classes; c++) {
    if (t.actualCount[c] === 0) continue;
    sum += t.correct[c] / t.actualCount[c];
    classes++;
  }
  return sum / classes;
}
