/**
 * Pairs two learners' fold scores by (repeat, fold).
 *
 * In words: a fold of A and a fold of B are a pair when their repeat and fold numbers are equal.
 * Pairs where either score of the metric is null (undefined for that fold, e.g. ROC AUC on a
 * one-class fold) are skipped and counted. Folds present on one side only are counted as
 * unmatched, and the first pair whose training or test sizes differ is reported: both mean the
 * two learners did not see the same splits, so a paired test would be wrong. The correction of
 * Nadeau & Bengio (2003) uses the mean test and training rows over the paired folds of A.
 *
 * Within one report every learner sees the same folds; across reports the folds are the same
 * only when data, plan, seed, stratification, group and order are (see match-reports.ts).
 */
import type { FoldScores, LearnerReport } from '../model/report.js';
import type { ResampleCorrection } from '../stats/index.js';

export interface FoldKey {
  readonly repeat: number;
  readonly fold: number;
}

export interface FoldPairing {
  /** A's and B's scores of the paired folds, in A's fold order */
  readonly a: number[];
  readonly b: number[];
  readonly keys: FoldKey[];
  /** pairs left out because a score was null (or absent) on either side */
  readonly skipped: number;
  /** folds found on one side only */
  readonly unmatched: number;
  /** the first pair whose trainRows or testRows differ, with both sizes */
  readonly sizeMismatch?: { readonly key: FoldKey; readonly a: string; readonly b: string };
  /** mean rows of A's paired folds; null when nothing paired */
  readonly correction: ResampleCorrection | null;
}

const keyOf = (f: FoldKey): string => `${f.repeat}/${f.fold}`;

/** The score of a metric on a fold, or null when missing (read safely from parsed JSON). */
export function foldScore(fold: FoldScores, metric: string): number | null {
  if (!Object.hasOwn(fold.scores, metric)) return null;
  const v = fold.scores[metric];
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

export function pairFolds(a: LearnerReport, b: LearnerReport, metric: string): FoldPairing {
  const byKey = new Map<string, FoldScores>();
  for (const f of b.folds) byKey.set(keyOf(f), f);
  const out = { a: [] as number[], b: [] as number[], keys: [] as FoldKey[] };
  let skipped = 0;
  let matched = 0;
  let sizeMismatch: FoldPairing['sizeMismatch'];
  let testSum = 0;
  let trainSum = 0;
  for (const fa of a.folds) {
    const fb = byKey.get(keyOf(fa));
    if (!fb) continue;
    matched++;
    if (!sizeMismatch && (fa.trainRows !== fb.trainRows || fa.testRows !== fb.testRows)) {
      sizeMismatch = {
        key: { repeat: fa.repeat, fold: fa.fold },
        a: `${fa.trainRows}/${fa.testRows}`,
        b: `${fb.trainRows}/${fb.testRows}`,
      };
    }
    const sa = foldScore(fa, metric);
    const sb = foldScore(fb, metric);
    if (sa === null || sb === null) {
      skipped++;
      continue;
    }
    out.a.push(sa);
    out.b.push(sb);
    out.keys.push({ repeat: fa.repeat, fold: fa.fold });
    testSum += fa.testRows;
    trainSum += fa.trainRows;
  }
  const n = out.a.length;
  return {
    ...out,
    skipped,
    unmatched: a.folds.length - matched + (b.folds.length - matched),
    ...(sizeMismatch ? { sizeMismatch } : {}),
    correction: n ? { testRows: testSum / n, trainRows: trainSum / n } : null,
  };
}
