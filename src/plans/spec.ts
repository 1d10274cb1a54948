/**
 * Plan specs: the accepted forms of each kind and the range check shared by `parsePlan` and
 * `buildPlan` (a spec built in code gets the same checks as one parsed from text).
 *
 * Ranges: kfold K >= 2, R >= 1; shuffle N >= 1, 0 < F < 1; holdout A > 0, B > 0, C >= 0 with
 * A + B + C = 1 within 1e-9; forward K >= 1 (K + 1 blocks). All counts are whole numbers.
 */
import { UsageError } from '../errors.js';
import type { PlanKind, PlanSpec } from './types.js';

/** Largest accepted count: the largest integer a double holds exactly. */
export const MAX_COUNT = Number.MAX_SAFE_INTEGER;

/** Tolerance on A + B + C = 1 for holdout plans. */
export const HOLDOUT_SUM_TOLERANCE = 1e-9;

/** K of a bare `kfold`. */
export const DEFAULT_KFOLD_K = 10;

/** The accepted forms of each kind, as they appear after "expected" in error messages. */
export const PLAN_FORMS: ReadonlyMap<PlanKind, string> = new Map<PlanKind, string>([
  ['kfold', 'kfold:K or kfold:KxR with whole numbers K >= 2, R >= 1'],
  ['loo', 'loo with nothing after it'],
  ['resplit', 'resplit:N@F with a whole number N >= 1 and a fraction 0 < F < 1'],
  ['holdout', 'holdout:A/B/C with fractions A > 0, B > 0, C >= 0 that sum to 1 (or holdout:A/B, the same as holdout:A/B/0)'],
  ['forward', 'forward:K with a whole number K >= 1'],
]);

/** The UsageError for a malformed or out-of-range spec of a known kind. */
export function planFormError(kind: PlanKind, text: string): UsageError {
  return new UsageError(`--plan ${JSON.stringify(text)}: expected ${PLAN_FORMS.get(kind)}`);
}

function isCount(v: number, min: number): boolean {
  return Number.isInteger(v) && v >= min && v <= MAX_COUNT;
}

/**
 * Throws the kind's UsageError unless every field of `spec` is in range. `text` is what the
 * user wrote (or the formatted spec) and is quoted in the message.
 */
export function checkPlanSpec(spec: PlanSpec, text: string): PlanSpec {
  let ok: boolean;
  switch (spec.kind) {
    case 'kfold':
      ok = isCount(spec.k, 2) && isCount(spec.repeats, 1);
      break;
    case 'loo':
      ok = true;
      break;
    case 'resplit':
      ok = isCount(spec.splits, 1) && spec.testFraction > 0 && spec.testFraction < 1;
      break;
    case 'holdout': {
      const { train, validation, holdout } = spec;
      ok =
        Number.isFinite(train) && Number.isFinite(validation) && Number.isFinite(holdout) &&
        train > 0 && validation > 0 && holdout >= 0 &&
        Math.abs(train + validation + holdout - 1) <= HOLDOUT_SUM_TOLERANCE;
      break;
    }
    case 'forward':
      ok = isCount(spec.k, 1);
      break;
    default: {
      const kind = (spec as { kind?: unknown }).kind;
      throw new UsageError(`--plan: unknown plan kind ${JSON.stringify(String(kind))}`);
    }
  }
  if (!ok) throw planFormError(spec.kind, text);
  return spec;
}
