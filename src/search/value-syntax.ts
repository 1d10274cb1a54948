/**
 * The values one learner option takes in a search, as written after `key=` in a `--learner`
 * spec of `foldwise tune` (the syntax is foldwise's own):
 *
 *   5              one value
 *   1|3|5          a list; every item is a value or a range, and the items are joined
 *   A..B           whole-number options: every whole number from A to B;
 *                  real-number options: the continuous interval [A, B] (only with --sample)
 *   A..B+S         from A up to B in steps of S > 0: A, A+S, A+2S, ... (B is kept when a step
 *                  lands on it within 1e-9 of S)
 *   A..B*F         from A > 0, multiplying by F > 1 while the value stays <= B (within 1e-9
 *                  relative): 25..200*2 is 25, 50, 100, 200. For whole-number options each
 *                  value is rounded to the nearest whole number and repeats are dropped, so
 *                  1..100*1.5 gives 1, 2, 3, 5, 8, 11, 17, 26, 38, 58, 86.
 *
 * Items combine: `k=1..9+2|15|25` is 1, 3, 5, 7, 9, 15, 25. A continuous interval must be the
 * option's only item. Ranges are for numeric options only; choice and text options take lists.
 * Arithmetic values are A + i*S rounded to 12 significant digits (so 0.1..0.5+0.1 gives 0.3,
 * not 0.30000000000000004). Whole-number ranges need whole A and S. A value listed twice is an
 * error (`k=1..5|3`), as is an option with more than MAX_AXIS_VALUES values.
 *
 * Every value is checked against the learner's declared option (kind, minimum, maximum) with
 * the same messages as a plain `--learner` spec; for a range its two ends are checked.
 */
import { UsageError } from '../errors.js';
import { resolveParams } from '../learners/spec.js';
import type { Learner, ParamSpec, ParamValue } from '../learning.js';

/** Most values one option may take in a search (a wider space needs --sample over a continuous range). */
export const MAX_AXIS_VALUES = 100_000;

/** The values of one option: a finite list in the order written, or a continuous interval. */
export type Axis =
  | {
      readonly name: string;
      readonly kind: 'finite';
      /** the values as option text (what resolveParams reads) */
      readonly texts: readonly string[];
      /** the same values parsed (numbers for numeric options) */
      readonly values: readonly ParamValue[];
      readonly numeric: boolean;
    }
  | { readonly name: string; readonly kind: 'continuous'; readonly from: number; readonly to: number; readonly numeric: true };

const NUM = '[+-]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][+-]?\\d+)?';
const RANGE = new RegExp(`^(${NUM})\\.\\.(${NUM})(?:([+*])(${NUM}))?$`);

/** A number rounded to 12 significant digits (removes binary drift from A + i*S). */
export function tidy(v: number): number {
  return Number(v.toPrecision(12));
}

/** Checks one value text against the learner's option, with resolveParams' messages. */
function check(learner: Learner, specText: string, name: string, text: string): ParamValue {
  const params = resolveParams(learner, { text: specText, name: learner.name, options: [[name, text]] }, learner.tasks[0]);
  return params[name];
}

function rangeValues(learner: Learner, specText: string, p: ParamSpec, item: string, m: RegExpExecArray): number[] | { from: number; to: number } {
  const where = `--learner ${specText}: ${p.name}=${item}`;
  if (p.kind !== 'int' && p.kind !== 'number') {
    throw new UsageError(`${where}: a range needs a numeric option; ${p.name} is a ${p.kind} option, list its values with |`);
  }
  const end = (text: string): number => {
    try {
      return Number(check(learner, specText, p.name, text));
    } catch (e) {
      if (e instanceof UsageError) throw new UsageError(`--learner ${specText}: ${e.message.replace(/^--learner \S+: /, '')}`);
      throw e;
    }
  };
  const from = end(m[1]);
  const to = end(m[2]);
  if (!(to >= from)) throw new UsageError(`${where}: the range ends below its start`);
  const op = m[3];
  const step = op ? Number(m[4]) : p.kind === 'int' ? 1 : NaN;
  if (!op && p.kind === 'number') return { from, to };
  const tooMany = (): never => {
    throw new UsageError(`${where}: more than ${MAX_AXIS_VALUES} values; use a larger step or --sample over a continuous range`);
  };
  const out: number[] = [];
  if (op === '*') {
    if (!(from > 0)) throw new UsageError(`${where}: a multiplying range needs a start above 0`);
    if (!(step > 1)) throw new UsageError(`${where}: the factor after * must be greater than 1`);
    let last = NaN;
    for (let v = from; v <= to * (1 + 1e-9); v *= step) {
      const x = p.kind === 'int' ? Math.round(v) : Math.min(tidy(v), to);
      if (x !== last) out.push(x);
      last = x;
      if (out.length > MAX_AXIS_VALUES) tooMany();
    }
    return out;
  }
  if (!(step > 0)) throw new UsageError(`${where}: the step after + must be greater than 0`);
  if (p.kind === 'int' && !(Number.isInteger(from) && Number.isInteger(step))) {
    throw new UsageError(`${where}: a range of a whole-number option needs a whole start and step`);
  }
  const count = Math.floor((to - from) / step + 1e-9) + 1;
  if (count > MAX_AXIS_VALUES) tooMany();
  for (let i = 0; i < count; i++) out.push(p.kind === 'int' ? from + i * step : Math.min(tidy(from + i * step), to));
  return out;
}

/** Parses the value text of option `name` of `learner` into an Axis. */
export function parseAxis(learner: Learner, specText: string, name: string, raw: string): Axis {
  const p = learner.params.find((q) => q.name === name);
  if (!p && learner.openOptions && /^[a-z][a-z0-9-]*$/.test(name)) {
    // a free option of a learner from outside: a list of texts, passed on as written
    const items = raw.split('|').map((s) => s.trim());
    if (items.some((s) => s === '')) throw new UsageError(`--learner ${specText}: ${name}=${raw}: an empty item in the list`);
    if (new Set(items).size !== items.length) throw new UsageError(`--learner ${specText}: ${name}=${raw}: a value appears twice`);
    if (items.length > MAX_AXIS_VALUES) throw new UsageError(`--learner ${specText}: ${name}=${raw}: more than ${MAX_AXIS_VALUES} values`);
    return { name, kind: 'finite', texts: items, values: items, numeric: false };
  }
  if (!p) {
    check(learner, specText, name, raw); // throws the unknown-option message with its hints
    throw new UsageError(`--learner ${specText}: unknown option "${name}"`);
  }
  const items = raw.split('|').map((s) => s.trim());
  if (items.some((s) => s === '')) throw new UsageError(`--learner ${specText}: ${name}=${raw}: an empty item in the list`);
  const numeric = p.kind === 'int' || p.kind === 'number';
  const texts: string[] = [];
  const values: ParamValue[] = [];
  const seen = new Set<ParamValue>();
  const add = (text: string, value: ParamValue): void => {
    if (seen.has(value)) throw new UsageError(`--learner ${specText}: ${name}=${raw}: the value ${text} appears twice`);
    seen.add(value);
    texts.push(text);
    values.push(value);
    if (values.length > MAX_AXIS_VALUES) {
      throw new UsageError(`--learner ${specText}: ${name}=${raw}: more than ${MAX_AXIS_VALUES} values; use a larger step or --sample over a continuous range`);
    }
  };
  for (const item of items) {
    const m = RANGE.exec(item);
    if (!m) {
      add(item, check(learner, specText, name, item));
      continue;
    }
    const r = rangeValues(learner, specText, p, item, m);
    if (!Array.isArray(r)) {
      if (items.length > 1) throw new UsageError(`--learner ${specText}: ${name}=${raw}: a continuous range must be the only item; give it a step (A..B+S) to combine it`);
      return { name, kind: 'continuous', from: r.from, to: r.to, numeric: true };
    }
    for (const v of r) add(String(v), v);
  }
  return { name, kind: 'finite', texts, values, numeric };
}

/** Number of values of an axis (Infinity for a continuous interval). */
export function axisSize(axis: Axis): number {
  return axis.kind === 'finite' ? axis.values.length : Infinity;
}
