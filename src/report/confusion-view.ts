/**
 * The pooled confusion matrix of a learner as the Markdown and HTML pages show it: row (and
 * column) labels beside the square matrix. A whole matrix is labelled with the report's
 * classes; a folded one (more than CONFUSION_CLASS_LIMIT classes, src/metrics/folded-confusion.ts)
 * with its kept classes and, last, "(N other classes)", whose corner cell mixes right and
 * wrong predictions, so it is never read as a recall.
 */
import type { LearnerReport } from '../model/report.js';

export interface ConfusionView {
  /** labels of the rows, the same for the columns */
  readonly labels: readonly string[];
  readonly matrix: readonly (readonly number[])[];
  /** present for a folded matrix: the last label stands for this many classes */
  readonly folded?: { readonly otherClasses: number; readonly otherCorrect: number; readonly classes: number };
}

export function otherClassesLabel(n: number): string {
  return `(${n} other classes)`;
}

export function confusionView(l: LearnerReport, classes: readonly string[]): ConfusionView | undefined {
  if (l.confusion && l.confusion.length > 0) {
    if (l.confusion.length !== classes.length) throw new RangeError(`confusionView: ${l.confusion.length} rows for ${classes.length} classes in ${l.spec}`);
    return { labels: classes, matrix: l.confusion };
  }
  const f = l.confusionFolded;
  if (!f) return undefined;
  if (f.matrix.length !== f.classes.length + 1) throw new RangeError(`confusionView: ${f.matrix.length} rows for ${f.classes.length} kept classes and the others in ${l.spec}`);
  return {
    labels: [...f.classes, otherClassesLabel(f.otherClasses)],
    matrix: f.matrix,
    folded: { otherClasses: f.otherClasses, otherCorrect: f.otherCorrect, classes: classes.length },
  };
}

/** Whether cell (i, i) is a class's own diagonal (the folded corner is not). */
export function isOwnDiagonal(view: ConfusionView, i: number): boolean {
  return !view.folded || i < view.labels.length - 1;
}

/** One sentence on how the matrix was folded, for captions; empty for a whole matrix. */
export function foldedNote(view: ConfusionView): string {
  const f = view.folded;
  if (!f) return '';
  const corner = view.matrix[view.labels.length - 1][view.labels.length - 1];
  return (
    `The target has ${f.classes} classes: the ${view.labels.length - 1} with the most rows have their own row and column, ` +
    `and the last row and column hold the other ${f.otherClasses} together; ` +
    `of the ${corner} rows in their corner cell, ${f.otherCorrect} were predicted as their own class.`
  );
}
