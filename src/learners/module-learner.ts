/**
 * `module:PATH` learners: an ES module that exports (as its default export, or as a named
 * export `learner`) an object with the learner interface of foldwise:
 *   { tasks: ['classification' | 'regression', ...],
 *     params?: ParamSpec[]       (name, kind int|number|choice, limits, default, simpler, doc),
 *     needsScaling?: boolean     (true: foldwise standardises numeric features per fold),
 *     doc?: string,
 *     fit(X, y, params, ctx) -> { predict(X), probabilities?(X), toJSON?() },
 *     load?(json) -> model }
 * X is { rows, cols, data: Float64Array } row-major; y is { task, codes, classes } or
 * { task, values }; ctx is { rng, seed }. fit and predict are synchronous.
 * Only explicit paths are loaded (./, ../ or /, resolved against the given base folder); a
 * module is loaded once per absolute path. Everything the module returns is checked: class
 * codes in range, finite values, probability rows in [0, 1] summing to 1 (within 1e-6), so a
 * faulty module fails with a message naming it rather than corrupting a report.
 */
import { statSync } from 'node:fs';
import { isAbsolute, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { InputError, UsageError } from '../errors.js';
import { TASKS, type Learner, type Matrix, type Model, type ParamSpec, type Task } from '../learning.js';

const PROBA_TOL = 1e-6;

function checkParams(where: string, raw: unknown): ParamSpec[] {
  if (raw === undefined) return [];
  if (!Array.isArray(raw)) throw new UsageError(`${where}: "params" must be an array`);
  const seen = new Set<string>();
  return raw.map((p: Record<string, unknown>, i) => {
    const at = `${where}: params[${i}]`;
    if (typeof p?.name !== 'string' || !/^[a-z][a-z0-9-]*$/.test(p.name)) throw new UsageError(`${at}: "name" must be lower-case letters, digits and -`);
    if (seen.has(p.name)) throw new UsageError(`${at}: "${p.name}" is declared twice`);
    seen.add(p.name);
    const doc = typeof p.doc === 'string' ? p.doc : '';
    if (p.kind === 'int' || p.kind === 'number') {
      const d = p.default;
      if (typeof d !== 'number' || !Number.isFinite(d) || (p.kind === 'int' && !Number.isInteger(d))) throw new UsageError(`${at}: "default" must be a${p.kind === 'int' ? ' whole' : ''} number`);
      for (const k of ['min', 'max'] as const) if (p[k] !== undefined && (typeof p[k] !== 'number' || !Number.isFinite(p[k]))) throw new UsageError(`${at}: "${k}" must be a number`);
      const min = p.min as number | undefined;
      const max = p.max as number | undefined;
      if ((min !== undefined && (p.minExclusive ? d <= min : d < min)) || (max !== undefined && d > max)) throw new UsageError(`${at}: default ${d} is outside its limits`);
      if (p.simpler !== undefined && p.simpler !== 'lower' && p.simpler !== 'higher') throw new UsageError(`${at}: "simpler" must be "lower" or "higher"`);
      return { name: p.name, kind: p.kind, min, max, minExclusive: p.minExclusive === true, default: d, simpler: p.simpler as 'lower' | 'higher' | undefined, doc };
    }
    if (p.kind === 'choice') {
      if (!Array.isArray(p.choices) || p.choices.length === 0 || !p.choices.every((c) => typeof c === 'string')) throw new UsageError(`${at}: "choices" must be a non-empty array of strings`);
      if (!(p.choices as string[]).includes(p.default as string)) throw new UsageError(`${at}: default must be one of the choices`);
      return { name: p.name, kind: 'choice', choices: [...(p.choices as string[])], default: p.default as string, doc };
    }
    throw new UsageError(`${at}: "kind" must be int, number or choice`);
  });
}

/** The names of an object's function properties, its prototypes' included (not Object's). */
function methodNames(o: object): string[] {
  const out: string[] = [];
  for (let p: object | null = o; p && p !== Object.prototype; p = Object.getPrototypeOf(p)) {
    for (const k of Object.getOwnPropertyNames(p)) if (typeof (o as Record<string, unknown>)[k] === 'function') out.push(k);
  }
  return out;
}

/** Wraps a model of the module so every output is checked and typed. */
function checkedModel(name: string, inner: unknown, task: Task, classes: number): Model {
  const m = inner as { predict?: unknown; probabilities?: unknown; toJSON?: unknown; then?: unknown };
  if (m && typeof m.then === 'function') throw new InputError(`${name}: fit returned a Promise; fit must be synchronous`);
  if (!m || typeof m.predict !== 'function') throw new InputError(`${name}: fit must return an object with a predict(X) function`);
  if (typeof m.probabilities !== 'function') {
    // foldwise 0.1 read class probabilities from a differently named predict... method: say so
    // rather than silently scoring without probabilities
    const old = methodNames(m).find((k) => /^predict.+/.test(k));
    if (old) throw new InputError(`${name}: the model has ${old}(X) but no probabilities(X); foldwise reads class probabilities from probabilities(X): rename the method`);
  }
  const predict = (X: Matrix): Int32Array | Float64Array => {
    const out = (m.predict as (X: Matrix) => ArrayLike<number>)(X);
    if (!out || typeof out.length !== 'number' || out.length !== X.rows) throw new InputError(`${name}: predict returned ${out?.length ?? 'no'} values for ${X.rows} rows`);
    if (task === 'classification') {
      const codes = Int32Array.from(out);
      for (let i = 0; i < X.rows; i++) {
        if (codes[i] !== out[i] || codes[i] < 0 || codes[i] >= classes) throw new InputError(`${name}: predict row ${i + 1}: ${out[i]} is not a class code 0..${classes - 1}`);
      }
      return codes;
    }
    const values = Float64Array.from(out);
    for (let i = 0; i < X.rows; i++) if (!Number.isFinite(values[i])) throw new InputError(`${name}: predict row ${i + 1}: ${out[i]} is not a finite number`);
    return values;
  };
  const model: Model = {
    predict,
    toJSON: () => ({ learner: name, model: typeof m.toJSON === 'function' ? (m.toJSON as () => unknown)() : null }),
  };
  if (task === 'classification' && typeof m.probabilities === 'function') {
    model.probabilities = (X: Matrix) => {
      const out = (m.probabilities as (X: Matrix) => ArrayLike<number>)(X);
      if (!out || out.length !== X.rows * classes) throw new InputError(`${name}: probabilities returned ${out?.length ?? 'no'} values for ${X.rows} rows x ${classes} classes`);
      const p = Float64Array.from(out);
      for (let i = 0; i < X.rows; i++) {
        let s = 0;
        for (let c = 0; c < classes; c++) {
          const v = p[i * classes + c];
          if (!(v >= 0 && v <= 1)) throw new InputError(`${name}: probabilities row ${i + 1}: ${v} is not a probability`);
          s += v;
        }
        if (Math.abs(s - 1) > PROBA_TOL) throw new InputError(`${name}: probabilities row ${i + 1} sums to ${s}, not 1`);
      }
      return p;
    };
  }
  return model;
}

/** Turns the exported object into a checked Learner named `module:PATH` (PATH as written). */
export function moduleLearner(name: string, exported: unknown): Learner {
  const e = exported as Record<string, unknown> | undefined;
  if (!e || typeof e !== 'object') throw new UsageError(`${name}: the module must export (default or "learner") an object with fit`);
  if (typeof e.fit !== 'function') throw new UsageError(`${name}: the exported object has no fit function`);
  const tasks = e.tasks;
  if (!Array.isArray(tasks) || tasks.length === 0 || !tasks.every((t) => (TASKS as readonly string[]).includes(t))) {
    throw new UsageError(`${name}: "tasks" must be a non-empty array of ${TASKS.join(', ')}`);
  }
  const params = checkParams(name, e.params);
  const fit = e.fit as (...a: unknown[]) => unknown;
  const load = e.load as ((json: unknown) => unknown) | undefined;
  // remembered from the last fit, for load (task and class count are not in the module's JSON)
  return {
    name,
    tasks: [...(tasks as Task[])],
    params,
    needsScaling: e.needsScaling === true,
    doc: typeof e.doc === 'string' ? e.doc : `ES module ${name.slice('module:'.length)}`,
    fit(X, y, p, ctx) {
      const classes = y.task === 'classification' ? y.classes.length : 0;
      const inner = checkedModel(name, fit.call(e, X, y, { ...p }, ctx), y.task, classes);
      const json = inner.toJSON;
      return { ...inner, toJSON: () => ({ ...(json() as object), task: y.task, classes }) };
    },
    load(json) {
      const j = json as { learner?: unknown; model?: unknown; task?: Task; classes?: number };
      if (j?.learner !== name) throw new InputError(`${name}: not a saved model of this module`);
      if (typeof load !== 'function') throw new InputError(`${name}: the module exports no load(json) function`);
      const inner = checkedModel(name, load.call(e, j.model), j.task ?? 'regression', j.classes ?? 0);
      return { ...inner, toJSON: () => j };
    },
  };
}

const loaded = new Map<string, unknown>();

/**
 * Imports the module of a `module:PATH` learner name, PATH resolved against `baseDir` (the
 * caller's working folder; the core never reads it from the process).
 */
export async function loadModuleLearner(name: string, baseDir: string): Promise<Learner> {
  const path = name.slice('module:'.length);
  if (!/^(\.\.?\/|\/)/.test(path)) throw new UsageError(`--learner ${name}: expected an explicit path starting with ./, ../ or /`);
  if (!isAbsolute(baseDir)) throw new UsageError(`module learners: base folder "${baseDir}" is not absolute`);
  const abs = resolve(baseDir, path);
  try {
    if (!statSync(abs).isFile()) throw new Error('not a file');
  } catch {
    throw new UsageError(`--learner ${name}: cannot read ${abs}`);
  }
  let mod = loaded.get(abs);
  if (!mod) {
    try {
      mod = await import(pathToFileURL(abs).href);
    } catch (err) {
      throw new UsageError(`--learner ${name}: importing ${abs} failed: ${(err as Error).message}`);
    }
    loaded.set(abs, mod);
  }
  const m = mod as { default?: unknown; learner?: unknown };
  return moduleLearner(name, m.default ?? m.learner);
}
