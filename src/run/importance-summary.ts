/**
 * Permutation importance across folds, in report assembly: each input's fold drops (the mean
 * over the shuffles of that fold, src/run/importance.ts) summarised like a score, with the
 * Nadeau-Bengio corrected interval (src/stats), and the model's own importance averaged over
 * folds. Computed from task records only, so every way of running gives the same bytes.
 */
import { foldLabel } from '../model/fold-label.js';
import type { FoldScores, LearnerImportance } from '../model/report.js';
import { summarize } from '../stats/index.js';
import type { ResampleCorrection } from '../stats/corrected-interval.js';
import type { TaskRecord } from '../model/record.js';
import { ownImportanceKind, type ImportanceFrame } from './importance.js';

export function learnerImportance(
  frame: ImportanceFrame,
  learner: string,
  folds: readonly FoldScores[],
  records: readonly TaskRecord[],
  correction: ResampleCorrection,
  warnings: string[],
  spec: string,
): LearnerImportance {
  const byPlace = new Map(records.map((r) => [foldLabel(r), r]));
  const placed = folds.map((f) => byPlace.get(foldLabel(f)));
  const inputs = frame.inputs.map((input, k) => {
    const perFold = placed.map((r) => {
      const v = r?.drops?.[k];
      return v === undefined || !Number.isFinite(v) ? null : v;
    });
    const values = perFold.filter((v): v is number => v !== null);
    return { name: input.name, folds: perFold, summary: values.length ? summarize(values, correction) : null };
  });
  const missing = placed.filter((r) => r && !r.drops?.length).length;
  if (missing) warnings.push(`${spec}: ${missing} fold${missing === 1 ? '' : 's'} carry no importance (a part or journal of a run without --importance?)`);
  const undefinedFolds = placed.filter((r) => r?.drops && r.drops.some((v) => !Number.isFinite(v))).length;
  if (undefinedFolds) warnings.push(`${spec}: ${frame.metric} is undefined on ${undefinedFolds} fold${undefinedFolds === 1 ? '' : 's'} of the importance shuffles; the importance summaries use the other folds`);
  const kind = ownImportanceKind(learner);
  const owns = records.map((r) => r.own).filter((o): o is Float64Array => o !== undefined && o.length === frame.features.length);
  if (!kind || owns.length === 0) return { inputs };
  const features = frame.features.map((name, j) => ({ name, mean: owns.reduce((s, o) => s + o[j], 0) / owns.length }));
  return { inputs, own: { kind, features } };
}
