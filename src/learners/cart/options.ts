/**
 * Reading a learner's options against its ParamSpec list.
 *
 * The caller validates options from the specs before `fit`; this is the defensive second check
 * that `fit` runs itself. Every value is checked against its spec (kind, integer-ness, bounds,
 * choices, the `parse` of a text option) and missing ones take the spec's default. An unknown
 * option name is rejected with a "did you mean" list. Messages have one fixed format:
 *   `<learner>: option "<name>" must be <rule>, got <value>`
 * Values are returned in a Map, never a plain object keyed by user-supplied names.
 */
import { UsageError, closeNames } from '../../errors.js';
import type { ParamSpec, ParamValue, Params } from '../../learning.js';

/** "an integer >= 1", "a number > 0 and <= 1", "an integer between 2 and 255" */
export function describeLimit(spec: ParamSpec & { kind: 'int' | 'number' }): string {
  const what = spec.kind === 'int' ? 'an integer' : 'a number';
  const lo = spec.min;
  const hi = spec.max;
  if (lo !== undefined && hi !== undefined) {
    return spec.minExclusive ? `${what} > ${lo} and <= ${hi}` : `${what} between ${lo} and ${hi}`;
  }
  if (lo !== undefined) return `${what} ${spec.minExclusive ? '>' : '>='} ${lo}`;
  if (hi !== undefined) return `${what} <= ${hi}`;
  return what;
}

function shown(value: unknown): string {
  return typeof value === 'string' ? JSON.stringify(value) : String(value);
}

/** Checks one value against its spec and returns the canonical value; throws UsageError. */
export function checkOption(learner: string, spec: ParamSpec, value: ParamValue): ParamValue {
  const head = `${learner}: option "${spec.name}" must be`;
  switch (spec.kind) {
    case 'int':
    case 'number': {
      const ok =
        typeof value === 'number' &&
        Number.isFinite(value) &&
        (spec.kind === 'number' || Number.isInteger(value)) &&
        (spec.min === undefined || (spec.minExclusive ? value > spec.min : value >= spec.min)) &&
        (spec.max === undefined || value <= spec.max);
      if (!ok) throw new UsageError(`${head} ${describeLimit(spec)}, got ${shown(value)}`);
      return value;
    }
    case 'choice': {
      if (typeof value !== 'string' || !spec.choices.includes(value)) {
        throw new UsageError(`${head} one of ${spec.choices.join(', ')}, got ${shown(value)}`);
      }
      return value;
    }
    case 'text': {
      if (typeof value !== 'string') throw new UsageError(`${head} a string, got ${shown(value)}`);
      try {
        return spec.parse(value);
      } catch (e) {
        // a spec's parse names the option and its limits; prefix the learner
        if (e instanceof UsageError && !e.message.startsWith(`${learner}:`)) throw new UsageError(`${learner}: ${e.message}`);
        throw e;
      }
    }
  }
}

/** All options of a learner, checked and completed with defaults. */
export function readOptions(learner: string, specs: readonly ParamSpec[], params: Params): Map<string, ParamValue> {
  const known = specs.map((s) => s.name);
  for (const name of Object.keys(params)) {
    if (!known.includes(name)) {
      const hint = closeNames(name, known);
      throw new UsageError(
        `${learner}: unknown option ${JSON.stringify(name)}; known options are ${known.join(', ')}${hint ? `; ${hint}` : ''}`,
      );
    }
  }
  const out = new Map<string, ParamValue>();
  for (const spec of specs) {
    const given = Object.prototype.hasOwnProperty.call(params, spec.name) ? params[spec.name] : undefined;
    out.set(spec.name, checkOption(learner, spec, given === undefined ? spec.default : given));
  }
  return out;
}

/** The value of an int or number option from `readOptions`. */
export function numberOption(options: ReadonlyMap<string, ParamValue>, name: string): number {
  const v = options.get(name);
  if (typeof v !== 'number') throw new Error(`internal: option ${name} is not a number`);
  return v;
}

/** The value of a choice or text option from `readOptions`. */
export function stringOption(options: ReadonlyMap<string, ParamValue>, name: string): string {
  const v = options.get(name);
  if (typeof v !== 'string') throw new Error(`internal: option ${name} is not a string`);
  return v;
}
