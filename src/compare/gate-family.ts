/**
 * The gate over a family of tests: several --metric at once, and with --slices every level of
 * every slice column the two reports share, for every such metric. Each test is the gate rule
 * of gate-rule.ts (paired on the same folds, the labelled unpaired rule otherwise) on that
 * metric and slice, giving its one-sided p of H0 "drop <= max-drop"; Holm's step-down method
 * (src/stats/holm.ts) over all their p-values keeps the chance that any test fails a change
 * with no true drop beyond max-drop at most alpha (the family-wise error). A test fails when its
 * Holm-adjusted p is at most alpha. With one test this is the plain gate.
 *
 * A slice is tested over the folds scored in it on both sides (at least 2; a fold with fewer
 * than the slice minimum of test rows is not scored); a slice or metric that cannot be tested is
 * listed under notGated, with why, and does not count in the family.
 */
import type { FamilyTest, GateFamily } from '../model/compare.js';
import { getMetric } from '../metrics/index.js';
import type { LearnerReport, Report, SliceLearner } from '../model/report.js';
import { holm } from '../stats/holm.js';
import { foldScore, pairFolds } from './pair-folds.js';
import { pairedGateTest, unpairedGateTest, type GateTest } from './gate-rule.js';
import { InputError } from '../errors.js';

export type { FamilyTest, GateFamily };

export const familyName = (t: { metric: string; column?: string; level?: string }): string =>
  t.column === undefined ? t.metric : `${t.metric} in ${t.column} = ${t.level}`;

function meanRows(folds: readonly { testRows: number; trainRows: number }[]): { testRows: number; trainRows: number } {
  const n = folds.length;
  return { testRows: folds.reduce((s, f) => s + f.testRows, 0) / n, trainRows: folds.reduce((s, f) => s + f.trainRows, 0) / n };
}

/** The gate rule on two learners' folds (whole-report or one slice); null with fewer than 2 usable folds. */
export function ruleOn(
  b: Pick<LearnerReport, 'folds'>,
  c: Pick<LearnerReport, 'folds'>,
  metric: string,
  paired: boolean,
  o: { higherIsBetter: boolean; maxDrop: number; alpha: number },
): GateTest | null {
  if (paired) {
    const p = pairFolds(b as LearnerReport, c as LearnerReport, metric);
    if (p.unmatched === 0 && !p.sizeMismatch && p.correction && p.a.length >= 2) return pairedGateTest(p.a, p.b, p.correction, o);
  }
  const bf = b.folds.filter((f) => foldScore(f, metric) !== null);
  const cf = c.folds.filter((f) => foldScore(f, metric) !== null);
  if (bf.length < 2 || cf.length < 2) return null;
  return unpairedGateTest(
    bf.map((f) => foldScore(f, metric) as number),
    meanRows(bf),
    cf.map((f) => foldScore(f, metric) as number),
    meanRows(cf),
    o,
  );
}

export interface FamilyInput {
  readonly previous: Report;
  readonly current: Report;
  readonly previousLearner: string;
  readonly currentLearner: string;
  readonly metrics: readonly string[];
  /** the whole-report test of each metric, in `metrics` order (computed by gate.ts) */
  readonly overall: readonly GateTest[];
  readonly slices: boolean;
  readonly paired: boolean;
  readonly maxDrop: number;
  readonly alpha: number;
}

/** The family of tests, Holm-adjusted. */
export function gateFamily(x: FamilyInput): GateFamily {
  const raw: (Omit<FamilyTest, 'adjustedP' | 'regression'>)[] = x.metrics.map((metric, i) => ({
    metric,
    rule: x.overall[i].rule,
    folds: x.overall[i].currentFolds,
    drop: x.overall[i].drop,
    dropBound: x.overall[i].dropBound,
    p: x.overall[i].p,
  }));
  const notGated: string[] = [];
  if (x.slices) {
    const bs = x.previous.slices ?? [];
    const cs = x.current.slices ?? [];
    if (!bs.length) throw new InputError('gate --slices: the previous report has no slices; run eval with --slice COL for both reports');
    if (!cs.length) throw new InputError('gate --slices: the current report has no slices; run eval with --slice COL for both reports');
    for (const s of bs) {
      const other = cs.find((t) => t.column === s.column);
      if (!other) {
        notGated.push(`${s.column}: the current report has no slices of this column`);
        continue;
      }
      if (JSON.stringify(s.edges ?? null) !== JSON.stringify(other.edges ?? null)) {
        notGated.push(`${s.column}: the bins differ between the reports (other --slice-bins or data)`);
        continue;
      }
      for (const lv of s.levels) {
        const olv = other.levels.find((t) => t.level === lv.level);
        const bl: SliceLearner | undefined = lv.learners.find((l) => l.spec === x.previousLearner);
        const cl: SliceLearner | undefined = olv?.learners.find((l) => l.spec === x.currentLearner);
        if (!olv || !bl || !cl) {
          notGated.push(`${s.column} = ${lv.level}: not in the current report`);
          continue;
        }
        for (const metric of x.metrics) {
          const o = { higherIsBetter: getMetric(metric).higherIsBetter, maxDrop: x.maxDrop, alpha: x.alpha };
          const t = ruleOn(bl, cl, metric, x.paired, o);
          if (!t) {
            notGated.push(`${metric} in ${s.column} = ${lv.level}: fewer than 2 folds scored on a side (a fold needs ${s.minRows} test rows in the slice)`);
            continue;
          }
          raw.push({ metric, column: s.column, level: lv.level, rule: t.rule, folds: t.currentFolds, drop: t.drop, dropBound: t.dropBound, p: t.p });
        }
      }
    }
  }
  const h = holm(raw.map((t) => t.p), x.alpha);
  const tests = raw.map((t, i) => ({ ...t, adjustedP: h.adjusted[i], regression: h.rejected[i] }));
  return { method: 'holm', tests, failing: tests.filter((t) => t.regression).map(familyName), notGated };
}
