/**
 * Names that foldwise 0.1 used and that were replaced (issue #19): learner options and values,
 * metrics, a plan kind and a gate flag. None is read as an alias: each old name fails with one
 * line (a UsageError, exit 2) that gives the new one, so a script written for the old names
 * stops at once instead of silently meaning something else. README "Renamed in report format 2"
 * lists them all.
 *
 * The old spellings are kept here in kebab-case pieces, the way the messages print them.
 */
import { InputError, UsageError } from './errors.js';

interface RenamedOption {
  /** the new option name */
  readonly to: string;
  /** old value -> new value, when the values were renamed too */
  readonly values?: ReadonlyMap<string, string>;
}

/** learner -> old option -> the new option (and values). */
const OPTIONS: ReadonlyMap<string, ReadonlyMap<string, RenamedOption>> = new Map([
  [
    'knn',
    new Map<string, RenamedOption>([
      ['weights', { to: 'vote', values: new Map([['uniform', 'equal'], ['distance', 'inverse']]) }],
    ]),
  ],
  ['forest', new Map<string, RenamedOption>([['criterion', { to: 'impurity' }], ['minLeaf', { to: 'min-leaf' }]])],
  ['tree', new Map<string, RenamedOption>([['criterion', { to: 'impurity' }], ['minLeaf', { to: 'min-leaf' }]])],
]);

/** learner -> option -> old value -> new value, for values renamed under an unchanged option. */
const VALUES: ReadonlyMap<string, ReadonlyMap<string, ReadonlyMap<string, string>>> = new Map([
  ['forest', new Map([['features', new Map([['auto', 'breiman']])]])],
]);

/**
 * The message for an old option name of a built-in learner (`raw` is the value as written), or
 * undefined when the option was not renamed.
 */
export function renamedOptionMessage(learner: string, key: string, raw: string, where: string): string | undefined {
  const r = OPTIONS.get(learner)?.get(key);
  if (!r) return undefined;
  const value = raw.split('|').map((v) => r.values?.get(v.trim()) ?? v.trim()).join('|');
  const values = r.values ? ` and its values ${[...r.values.keys()].join('/')} are now ${[...r.values.values()].join('/')}` : '';
  return `${where}: option "${key}" is now "${r.to}"${values}; write ${r.to}=${value}`;
}

/** The message for an old value of an option that kept its name, or undefined. */
export function renamedValueMessage(learner: string, key: string, raw: string, where: string): string | undefined {
  const renames = VALUES.get(learner)?.get(key);
  const items = raw.split('|').map((v) => v.trim());
  if (!renames || !items.some((v) => renames.has(v.toLowerCase()))) return undefined;
  return `${where}: ${key}=${raw} is now ${key}=${items.map((v) => renames.get(v.toLowerCase()) ?? v).join('|')}`;
}

/** Old metric names, in kebab-case, and their new names. */
const METRICS: ReadonlyMap<string, string> = new Map([['median-absolute-error', 'medae']]);

/**
 * Throws for a metric name of foldwise 0.1: the snake_case names (now kebab-case) and the ones
 * renamed outright. `known` is the list of current names.
 */
export function refuseOldMetric(name: string, known: readonly string[]): void {
  const kebab = name.trim().toLowerCase().replace(/_/g, '-');
  const to = METRICS.get(kebab) ?? (kebab !== name && known.includes(kebab) ? kebab : undefined);
  if (to !== undefined) throw new UsageError(`--metric ${name}: metric names are kebab-case and short now: write --metric ${to}`);
}

/** Old plan kinds and their new names. */
const PLAN_KINDS: ReadonlyMap<string, string> = new Map([['shuffle', 'resplit']]);

/** The new name of an old plan kind, or undefined. */
export function renamedPlanKind(kind: string): string | undefined {
  return PLAN_KINDS.get(kind);
}

/**
 * Throws when `found` (a file's format field) is the format 1 of the same kind as `current`
 * (`foldwise-report/1` for `foldwise-report/2`): files of foldwise 0.1 name metrics, options and
 * plans by the old names, so they are refused with one line saying what to do, not misread.
 */
export function refuseOldFormat(where: string, found: unknown, current: string, redo: string): void {
  const family = current.slice(0, current.lastIndexOf('/') + 1);
  if (typeof found === 'string' && found.startsWith(family) && found !== current && /\/1$/.test(found)) {
    throw new InputError(
      `${where}: format ${found} is from foldwise 0.1, before metrics, learner options and plan kinds were renamed; this foldwise reads ${current}: ${redo}`,
    );
  }
}
