/**
 * Learner specs as written on the command line:
 * - built-in: `NAME` or `NAME:key=value,key=value` (NAME lower-case letters, digits, '-');
 * - an ES module: `module:PATH` or `module:PATH;key=value,key=value`, PATH explicit (starting with
 *   `./`, `../` or `/`; never a bare package name), options after the first ';';
 * - an external program: `command:NAME` or `command:NAME;key=value,...`, NAME defined with
 *   `--command NAME=PROGRAM` (src/learners/command/); options after the first ';'.
 * The learner name of a module or command spec is everything before the ';' (`module:./x.js`),
 * and that is the name `getLearner` resolves once the module is loaded (loadExternalLearners).
 * Every option is checked against the learner's declared ParamSpec before any fit, so a typo
 * fails at once with a message naming the option and its limit.
 */
import { closeNames, UsageError } from '../errors.js';
import { renamedOptionMessage, renamedValueMessage } from '../renamed.js';
import type { Learner, Params, ParamSpec, ParamValue, Task } from '../learning.js';

export interface LearnerSpec {
  /** the text as given (or the learner name alone) */
  readonly text: string;
  readonly name: string;
  /** the options the user wrote, as text, in the order written */
  readonly options: readonly (readonly [string, string])[];
}

/** The prefixes of learners from outside foldwise. */
export const EXTERNAL_KINDS = ['module', 'command'] as const;
export type ExternalKind = (typeof EXTERNAL_KINDS)[number];

/** 'module' or 'command' for a learner name such as `module:./x.js`, else undefined. */
export function externalKind(name: string): ExternalKind | undefined {
  return EXTERNAL_KINDS.find((k) => name.startsWith(`${k}:`));
}

function parseOptions(text: string, rest: string, sep: string): [string, string][] {
  if (rest.trim() === '') throw new UsageError(`--learner "${text}": nothing after "${sep}"; write NAME alone or NAME${sep}key=value`);
  const options: [string, string][] = [];
  for (const part of rest.split(',')) {
    const eq = part.indexOf('=');
    const key = eq < 0 ? part.trim() : part.slice(0, eq).trim();
    if (eq < 0 || key === '' || part.slice(eq + 1).trim() === '') {
      throw new UsageError(`--learner "${text}": "${part}" is not key=value`);
    }
    if (options.some(([k]) => k === key)) throw new UsageError(`--learner "${text}": option "${key}" is given twice`);
    options.push([key, part.slice(eq + 1).trim()]);
  }
  return options;
}

function parseExternal(text: string, t: string, kind: ExternalKind): LearnerSpec {
  const semi = t.indexOf(';');
  const head = semi < 0 ? t : t.slice(0, semi);
  const target = head.slice(kind.length + 1);
  if (kind === 'module' && !/^(\.\.?\/|\/)/.test(target)) {
    throw new UsageError(`--learner "${text}": expected module:PATH with an explicit path starting with ./, ../ or /`);
  }
  if (kind === 'command' && !/^[a-z][a-z0-9-]*$/.test(target)) {
    throw new UsageError(`--learner "${text}": expected command:NAME with a lower-case NAME`);
  }
  const again = semi < 0 ? -1 : t.indexOf(';', semi + 1);
  if (again >= 0) {
    // a second ";" would otherwise be read into a value (`pids=X;k=1|2` as the value `X;k=1|2`)
    throw new UsageError(`--learner "${text}": a second ";" at "${t.slice(again)}"; the options after the first ";" are separated by ",": ${head};a=1,b=2`);
  }
  return { text: t, name: head, options: semi < 0 ? [] : parseOptions(text, t.slice(semi + 1), ';') };
}

/** Splits `NAME:key=value,...` (or `module:PATH;...`, `command:NAME;...`) into a name and raw options; checks the shape only. */
export function parseLearnerSpec(text: string): LearnerSpec {
  const t = text.trim();
  const kind = externalKind(t);
  if (kind) return parseExternal(text, t, kind);
  const colon = t.indexOf(':');
  const name = colon < 0 ? t : t.slice(0, colon);
  if (!/^[a-z][a-z0-9-]*$/.test(name)) {
    throw new UsageError(`--learner "${text}": expected NAME or NAME:key=value,key=value with a lower-case NAME`);
  }
  const options = colon >= 0 ? parseOptions(text, t.slice(colon + 1), ':') : [];
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
    if (!p && learner.openOptions) {
      if (!/^[a-z][a-z0-9-]*$/.test(key)) throw new UsageError(`--learner ${spec.text}: option "${key}": names are lower-case letters, digits and -`);
      params[key] = raw;
      continue;
    }
    if (!p) {
      const renamed = renamedOptionMessage(learner.name, key, raw, `--learner ${spec.text}`);
      if (renamed) throw new UsageError(renamed);
      const names = learner.params.map((q) => q.name);
      const hint = closeNames(key, names);
      throw new UsageError(
        `--learner ${spec.text}: unknown option "${key}" for ${learner.name}${hint ? `; ${hint}` : ''} (options: ${names.join(', ') || 'none'})`,
      );
    }
    const renamed = renamedValueMessage(learner.name, key, raw, `--learner ${spec.text}`);
    if (renamed) throw new UsageError(renamed);
    params[key] = parseValue(learner.name, p, raw);
  }
  const refusal = learner.checkParams?.(params, task);
  if (refusal) throw new UsageError(`--learner ${spec.text}: ${refusal}`);
  return params;
}

/**
 * Canonical text of a learner with resolved params: options that differ from the defaults, in
 * ParamSpec order (then, for learners with open options, the free ones in sorted order).
 */
export function formatSpec(learner: Learner, params: Params): string {
  const parts = learner.params.filter((p) => params[p.name] !== p.default).map((p) => `${p.name}=${params[p.name]}`);
  if (learner.openOptions) {
    // free options after the declared ones, sorted, so the same options give the same spec
    const declared = new Set(learner.params.map((p) => p.name));
    for (const key of Object.keys(params).filter((k) => !declared.has(k)).sort()) parts.push(`${key}=${params[key]}`);
  }
  return parts.length ? `${learner.name}${externalKind(learner.name) ? ';' : ':'}${parts.join(',')}` : learner.name;
}
