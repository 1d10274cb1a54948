/**
 * Canonical text of a plan spec, the inverse of `parsePlan`: `kfold:K` (or `kfold:KxR` when
 * R > 1), `loo`, `resplit:N@F`, `holdout:A/B/C`, `forward:K`. Fractions are written with
 * JavaScript's shortest round-trip number text (ECMA-262, Number::toString), so
 * `parsePlan(formatPlan(s))` gives back `s` field for field.
 */
import type { PlanSpec } from './types.js';

export function formatPlan(spec: PlanSpec): string {
  switch (spec.kind) {
    case 'kfold':
      return spec.repeats === 1 ? `kfold:${spec.k}` : `kfold:${spec.k}x${spec.repeats}`;
    case 'loo':
      return 'loo';
    case 'resplit':
      return `resplit:${spec.splits}@${String(spec.testFraction)}`;
    case 'holdout':
      return `holdout:${String(spec.train)}/${String(spec.validation)}/${String(spec.holdout)}`;
    case 'forward':
      return `forward:${spec.k}`;
  }
}
