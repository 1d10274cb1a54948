/**
 * Reads a plan spec from its text form:
 *
 *   kfold            K = 10 folds, one repeat
 *   kfold:K          K folds (K >= 2)
 *   kfold:KxR        K folds, R repeats with a fresh shuffle each (R >= 1)
 *   loo              leave one out
 *   resplit:N@F      N random splits, each testing on a fraction F of the rows (0 < F < 1)
 *   holdout:A/B/C    one split: train share A > 0, validation share B > 0, holdout share C >= 0,
 *                    A + B + C = 1 within 1e-9
 *   holdout:A/B      the same as holdout:A/B/0: train A, test (validation) B, no holdout part;
 *                    A + B = 1 within 1e-9 (two parts read as train/test)
 *   forward:K        K time-ordered folds over K + 1 blocks (K >= 1)
 *
 * Counts are plain decimal digits; fractions are decimal numbers (an exponent is allowed, as
 * `formatPlan` may write one). Surrounding white space is ignored; nothing else is.
 * Malformed text throws a UsageError naming the option and the accepted forms.
 */
import { closeNames, UsageError } from '../errors.js';
import { renamedPlanKind } from '../renamed.js';
import { checkPlanSpec, DEFAULT_KFOLD_K, MAX_COUNT, planFormError } from './spec.js';
import { PLAN_KINDS, type PlanKind, type PlanSpec } from './types.js';

const COUNT = /^[0-9]+$/;
const FRACTION = /^(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?$/;

function count(raw: string): number {
  if (!COUNT.test(raw)) return NaN;
  const v = Number(raw);
  return v <= MAX_COUNT ? v : NaN;
}

function fraction(raw: string): number {
  return FRACTION.test(raw) ? Number(raw) : NaN;
}

function isKind(name: string): name is PlanKind {
  return (PLAN_KINDS as readonly string[]).includes(name);
}

export function parsePlan(text: string): PlanSpec {
  const t = String(text).trim();
  const colon = t.indexOf(':');
  const name = colon < 0 ? t : t.slice(0, colon);
  const rest = colon < 0 ? undefined : t.slice(colon + 1);
  if (!isKind(name)) {
    const renamed = renamedPlanKind(name);
    if (renamed) throw new UsageError(`--plan ${JSON.stringify(text)}: the plan kind ${name} is now called ${renamed}: write ${renamed}${rest === undefined ? '' : `:${rest}`}`);
    const hint = name === '' ? '' : closeNames(name, PLAN_KINDS);
    throw new UsageError(
      `--plan ${JSON.stringify(text)}: unknown plan ${JSON.stringify(name)}; expected one of ${PLAN_KINDS.join(', ')}` +
        (hint ? `; ${hint}` : ''),
    );
  }
  const bad = () => planFormError(name, text);
  let spec: PlanSpec;
  switch (name) {
    case 'kfold': {
      if (rest === undefined) {
        spec = { kind: 'kfold', k: DEFAULT_KFOLD_K, repeats: 1 };
        break;
      }
      const x = rest.indexOf('x');
      const k = count(x < 0 ? rest : rest.slice(0, x));
      const repeats = x < 0 ? 1 : count(rest.slice(x + 1));
      spec = { kind: 'kfold', k, repeats };
      break;
    }
    case 'loo':
      if (rest !== undefined) throw bad();
      spec = { kind: 'loo' };
      break;
    case 'resplit': {
      if (rest === undefined) throw bad();
      const at = rest.indexOf('@');
      if (at < 0) throw bad();
      spec = { kind: 'resplit', splits: count(rest.slice(0, at)), testFraction: fraction(rest.slice(at + 1)) };
      break;
    }
    case 'holdout': {
      if (rest === undefined) throw bad();
      const parts = rest.split('/');
      if (parts.length !== 2 && parts.length !== 3) throw bad();
      // two parts are train/test: the validation part is the one eval scores, and nothing is held out
      spec = { kind: 'holdout', train: fraction(parts[0]), validation: fraction(parts[1]), holdout: parts.length === 2 ? 0 : fraction(parts[2]) };
      break;
    }
    case 'forward':
      if (rest === undefined) throw bad();
      spec = { kind: 'forward', k: count(rest) };
      break;
  }
  return checkPlanSpec(spec, text);
}
