/**
 * What the charts of a tune report read from its candidates: for each learner searched, the
 * options that took more than one value (numeric when every value is a finite number, else
 * categorical), the candidate the one-option views hold the other options at (the
 * recommendation for its own learner; for any other learner, that learner's best candidate by
 * inner mean on all search rows), and the slice of candidates that differ from it in one
 * option only. Candidates' options are read with `own`, and values are keyed in Maps, so an
 * option named like an inherited property (`__proto__`) is just another name.
 */
import { own } from './context.js';
import type { ParamValue } from '../../learning.js';
import type { TuneCandidate, TuneReport } from '../../model/tune.js';

export interface OptionAxis {
  readonly name: string;
  /** every value is a finite number */
  readonly numeric: boolean;
  /** the distinct values: ascending for numbers, in order of first appearance otherwise */
  readonly values: readonly ParamValue[];
}

export interface LearnerSpace {
  /** the learner's name as in the candidates (`knn`, `module:./x.mjs`) */
  readonly learner: string;
  readonly candidates: readonly TuneCandidate[];
  /** options with more than one distinct value among this learner's candidates, in option order */
  readonly varying: readonly OptionAxis[];
  /** the candidate whose values the one-option views hold the other options at */
  readonly anchor: TuneCandidate;
  readonly anchorIsRecommendation: boolean;
}

/** The identity of an option value: its type and text, so 1 and "1" stay apart. */
export const valueKey = (v: ParamValue | undefined): string => (v === undefined ? 'undefined' : `${typeof v}:${String(v)}`);

/** The text of an option value as the page writes it (numbers in their shortest exact form). */
export const valueText = (v: ParamValue | undefined): string => (v === undefined ? '–' : typeof v === 'number' ? String(v).replace('-', '−') : String(v));

export function optionOf(c: TuneCandidate, name: string): ParamValue | undefined {
  return own(c.params, name);
}

/** Better first by inner mean on all search rows (undefined means last), ties by id. */
export function byInnerMean(higherIsBetter: boolean): (a: TuneCandidate, b: TuneCandidate) => number {
  const sign = higherIsBetter ? -1 : 1;
  return (a, b) => {
    const x = a.all.mean;
    const y = b.all.mean;
    if (x === null || y === null || !Number.isFinite(x) || !Number.isFinite(y)) {
      const xa = x !== null && Number.isFinite(x);
      const ya = y !== null && Number.isFinite(y);
      return xa === ya ? a.id - b.id : xa ? -1 : 1;
    }
    return sign * (x - y) || a.id - b.id;
  };
}

export function candidateById(report: TuneReport, id: number): TuneCandidate | undefined {
  return report.candidates.find((c) => c.id === id);
}

export function learnerSpaces(report: TuneReport): LearnerSpace[] {
  const groups = new Map<string, TuneCandidate[]>();
  for (const c of report.candidates) {
    const g = groups.get(c.name);
    if (g) g.push(c);
    else groups.set(c.name, [c]);
  }
  const rec = candidateById(report, report.recommendation.id);
  const out: LearnerSpace[] = [];
  for (const [learner, candidates] of groups) {
    const names: string[] = [];
    const seen = new Set<string>();
    for (const c of candidates) {
      for (const k of Object.keys(c.params)) {
        if (!seen.has(k)) {
          seen.add(k);
          names.push(k);
        }
      }
    }
    const varying: OptionAxis[] = [];
    for (const name of names) {
      const distinct = new Map<string, ParamValue | undefined>();
      for (const c of candidates) {
        const v = optionOf(c, name);
        if (!distinct.has(valueKey(v))) distinct.set(valueKey(v), v);
      }
      if (distinct.size < 2) continue;
      const values = [...distinct.values()];
      const numeric = values.every((v) => typeof v === 'number' && Number.isFinite(v));
      const defined = values.filter((v): v is ParamValue => v !== undefined);
      varying.push({ name, numeric, values: numeric ? [...(defined as number[])].sort((a, b) => a - b) : defined });
    }
    const own = rec !== undefined && rec.name === learner;
    const anchor = own ? rec : [...candidates].sort(byInnerMean(report.selection.higherIsBetter))[0];
    out.push({ learner, candidates, varying, anchor, anchorIsRecommendation: own });
  }
  return out;
}

/** The candidates equal to the anchor on every option but `axis`, in the axis's value order. */
export function sliceOf(space: LearnerSpace, axis: OptionAxis): TuneCandidate[] {
  const others = space.varying.filter((a) => a.name !== axis.name);
  const order = new Map(axis.values.map((v, i) => [valueKey(v), i] as const));
  return space.candidates
    .filter((c) => others.every((a) => valueKey(optionOf(c, a.name)) === valueKey(optionOf(space.anchor, a.name))))
    .sort((a, b) => (order.get(valueKey(optionOf(a, axis.name))) ?? 0) - (order.get(valueKey(optionOf(b, axis.name))) ?? 0) || a.id - b.id);
}
