/**
 * Learner specs as written on the command line: `NAME` or `NAME:key=value,key=value`.
 * Every option is checked against the learner's declared ParamSpec before any fit, so a typo
 * fails at once with a message naming the option and its limit.
 */
import { closeNames, UsageError } from '../errors.js';
import type { Learner, Params, ParamSpec, ParamValue, Task } from './types.js';

export interface LearnerSpec {
  /** the text as given (or the learner name alone) */
  readonly text: string;
  readonly name: string;
  /** the options the user wrote, as text, in the order written */
  readonly options: readonly (readonly [string, string])[];
}

/** Splits `NAME:key=value,...` into a name and raw options; checks the shape only. */
export function parseLearnerSpec(text: string): LearnerSpec {
  const t = text.trim();
  const colon = t.indexOf(':');
  const name = colon < 0 ? t : t.slice(0, colon);
  if (!/^[a-z][a-z0-9-]*$/.test(name)) {
    throw new UsageError(`--learner "${text}": expected NAME or NAME:key=value,key=value with a lower-case NAME`);
  }
  const options: [string, string][] = [];
  if (colon >= 0) {
    const rest = t.slice(colon + 1);
    if (rest.trim() === '') throw new UsageError(`--learner "${text}": nothing after ":"; write NAME alone or NAME:key=value`);
    for (const part of rest.split(',')) {
      const eq = part.indexOf('=');
      const key = eq < 0 ? part.trim() : part.slice(0, eq).trim();
      if (eq < 0 || key === '' || part.slice(eq + 1).trim() === '') {
        throw new UsageError(`--learner "${text}": "${part}" is not key=value`);
      }
      if (options.some(([k]) => k === key)) throw new UsageError(`--learner "${text}": option "${key}" is given twice`);
      options.push([key, part.slice(eq + 1).trim()]);
    }
  }
  return { text: t, name, options };
}

function parseValue(learner: string, spec: ParamSpec, raw: string): ParamValue {
  const where = `--learner ${learner}: ${spec.name}=${raw}`;
  switch (spec.kind) {
    case 'int':
    case 'number': {
      if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw)) throw new UsageError(`${where}: expected a number`);
      const v = Number(raw);
      if (spec.kind === 'int' && !Number.isInteger(v)) throw new UsageError(`${where}: expected a whole number`);
      if (spec.min !== undefined && (spec.minExclusive ? v <= spec.min : v < spec.min)) {
        throw new UsageError(`${where}: must be ${spec.minExclusive ? 'greater than' : 'at least'} ${spec.min}`);
      }
      if (spec.max !== undefined && v > spec.max) throw new UsageError(`${where}: must be at most ${spec.max}`);
      return v;
    }
    case 'choice':
      if (!spec.choices.includes(raw)) throw new UsageError(`${where}: expected one of ${spec.choices.join(', ')}`);
      return raw;
    case 'text':
      try {
        return spec.parse(raw);
      } catch (e) {
        throw new UsageError(`${where}: ${(e as Error).message}`);
      }
  }
}

/** The defaults of a learner, as a Params object with a fixed key order (the ParamSpec order). */
export function defaultParams(learner: Learner): Params {
  const out: Params = Object.create(null);
  for (const p of learner.params) out[p.name] = p.default;
  return out;
}

/** Resolves a spec against a learner: every option known and in range, defaults filled in. */
export function resolveParams(learner: Learner, spec: LearnerSpec, task: Task): Params {
  if (!learner.tasks.includes(task)) {
    throw new UsageError(`--learner ${spec.text}: "${learner.name}" does not do ${task} (it does ${learner.tasks.join(' and ')})`);
  }
  const params = defaultParams(learner);
  for (const [key, raw] of spec.options) {
    const p = learner.params.find((q) => q.name === key);
    if (!p) {
      const names = learner.params.map((q) => q.name);
      const hint = closeNames(key, names);
      throw new UsageError(
        `--learner ${spec.text}: unknown option "${key}" for ${learner.name}${hint ? `; ${hint}` : ''} (options: ${names.join(', ') || 'none'})`,
      );
    }
    params[key] = parseValue(learner.name, p, raw);
  }
  return params;
}

/** Canonical text of a learner with resolved params: options that differ from the defaults, in ParamSpec order. */
export function formatSpec(learner: Learner, params: Params): string {
  const parts = learner.params.filter((p) => params[p.name] !== p.default).map((p) => `${p.name}=${params[p.name]}`);
  return parts.length ? `${learner.name}:${parts.join(',')}` : learner.name;
}
