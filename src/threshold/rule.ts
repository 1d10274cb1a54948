/**
 * Threshold rules for two-class targets (`--threshold RULE`): how to pick the probability of the
 * positive class at or above which a row is called positive, from (score, outcome) pairs.
 *
 *   max-f1            the threshold with the highest F1 of the positive class
 *   youden            the threshold with the highest TPR - FPR (Youden 1950, "Index for rating
 *                     diagnostic tests", Cancer 3:32-35)
 *   precision>=P      the lowest threshold whose precision is at least P (so recall is as high
 *                     as it can be while precision holds), P in (0, 1]
 *   recall>=R         the highest threshold whose recall is at least R (so precision and the
 *                     false-alarm rate are as low as they can be while recall holds), R in (0, 1]
 *   cost:FP=a,FN=b    the threshold with the lowest a * FP + b * FN (a, b >= 0, not both 0)
 *
 * Candidates are the distinct scores (every row scoring at least the threshold is positive)
 * plus +Infinity (call nothing positive); ties go to the higher threshold. A rule no threshold
 * meets (precision>=P never reached) returns the candidate closest to meeting it, and says so.
 */
import { UsageError } from '../errors.js';
import { operatingPoints } from '../curves/points.js';

export type ThresholdRule =
  | { readonly kind: 'max-f1' }
  | { readonly kind: 'youden' }
  | { readonly kind: 'precision'; readonly atLeast: number }
  | { readonly kind: 'recall'; readonly atLeast: number }
  | { readonly kind: 'cost'; readonly fp: number; readonly fn: number };

const FORMS = 'max-f1, youden, precision>=P, recall>=R, cost:FP=a,FN=b';

function share(text: string, what: string, rule: string): number {
  const v = Number(text);
  if (text.trim() === '' || !(v > 0 && v <= 1)) throw new UsageError(`--threshold ${JSON.stringify(rule)}: ${what} must be a number in (0, 1], got ${JSON.stringify(text)}`);
  return v;
}

export function parseThresholdRule(text: string): ThresholdRule {
  const t = text.trim();
  if (t === 'max-f1') return { kind: 'max-f1' };
  if (t === 'youden') return { kind: 'youden' };
  if (t.startsWith('precision>=')) return { kind: 'precision', atLeast: share(t.slice(11), 'P', text) };
  if (t.startsWith('recall>=')) return { kind: 'recall', atLeast: share(t.slice(8), 'R', text) };
  const m = /^cost:FP=([^,]*),FN=(.*)$/.exec(t);
  if (m) {
    const [fp, fn] = [Number(m[1]), Number(m[2])];
    if (m[1].trim() === '' || m[2].trim() === '' || !(fp >= 0) || !(fn >= 0) || !Number.isFinite(fp) || !Number.isFinite(fn) || fp + fn === 0) {
      throw new UsageError(`--threshold ${JSON.stringify(text)}: FP and FN costs must be finite numbers >= 0, not both 0`);
    }
    return { kind: 'cost', fp, fn };
  }
  throw new UsageError(`--threshold ${JSON.stringify(text)}: unknown rule; use one of ${FORMS}`);
}

export interface ChosenThreshold {
  readonly threshold: number;
  /** false when no threshold meets a precision>= or recall>= rule and the closest one is returned */
  readonly met: boolean;
}

/** The threshold `rule` picks on these pairs; needs at least one positive and one negative outcome. */
export function chooseThreshold(score: Float64Array, outcome: Uint8Array, rule: ThresholdRule): ChosenThreshold {
  const p = operatingPoints(score, outcome);
  if (p.positives === 0 || p.negatives === 0) throw new RangeError('chooseThreshold: needs both positive and negative rows');
  const m = p.tp.length;
  // value of each candidate (higher is better); candidates are visited from the highest threshold
  let best = 0;
  let bestValue = -Infinity;
  let met = true;
  const value = (j: number): number => {
    const tp = p.tp[j];
    const fp = p.fp[j];
    const fn = p.positives - tp;
    switch (rule.kind) {
      case 'max-f1':
        return tp === 0 ? 0 : (2 * tp) / (2 * tp + fp + fn);
      case 'youden':
        return tp / p.positives - fp / p.negatives;
      case 'cost':
        return -(rule.fp * fp + rule.fn * fn);
      default:
        return NaN;
    }
  };
  if (rule.kind === 'precision' || rule.kind === 'recall') {
    // precision>=P: the lowest threshold meeting it (most recall); recall>=R: the highest meeting it
    let found = -1;
    for (let j = 1; j < m; j++) {
      const ok = rule.kind === 'precision' ? p.tp[j] / (p.tp[j] + p.fp[j]) >= rule.atLeast - 1e-12 : p.tp[j] / p.positives >= rule.atLeast - 1e-12;
      if (!ok) continue;
      found = j;
      if (rule.kind === 'recall') break;
    }
    if (found >= 0) return { threshold: p.threshold[found], met: true };
    met = false;
    // not met: the candidate with the highest precision (recall>=R is always met at the lowest threshold)
    for (let j = 1; j < m; j++) {
      const v = p.tp[j] / (p.tp[j] + p.fp[j]);
      if (v > bestValue) (bestValue = v), (best = j);
    }
    return { threshold: p.threshold[best], met };
  }
  for (let j = 0; j < m; j++) {
    const v = value(j);
    if (v > bestValue + 1e-12) (bestValue = v), (best = j);
  }
  return { threshold: p.threshold[best], met };
}
