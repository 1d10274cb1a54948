/**
 * Date texts the loader reads as numbers (days since 1970-01-01 UTC, a time of day as the
 * fraction of a day). A column is a date column when every non-missing cell has the same one
 * of these shapes and is a day that exists:
 *
 * | shape | example | read as |
 * | --- | --- | --- |
 * | ISO 8601 | `2001-01-31`, `2001-01-31T08:15`, `2001-01-31 08:15:00Z`, `...+02:00` | year-month-day; UTC unless a zone is given |
 * | year/month/day | `2001/01/31`, `2001/1/31 08:15` | year/month/day, UTC |
 * | day.month.year | `31.01.2001`, `31.1.2001 08:15:30` | day.month.year, UTC |
 * | N/N/YYYY, N-N-YYYY | `01/31/2001`, `31-01-2001` | only with `--date-format`: the day and month order is not in the text |
 *
 * A time, when present, is `H:MM`, `HH:MM:SS` or `HH:MM:SS.fff` (24-hour) after a space or `T`.
 * `--date-format` names the order of the ambiguous shape with its separator: `d/m/y`, `m/d/y`,
 * `d-m-y` or `m-d-y`.
 */
import { UsageError } from '../errors.js';

const DAY_MS = 86_400_000;

export const DATE_ORDERS = ['d/m/y', 'm/d/y', 'd-m-y', 'm-d-y'] as const;
export type DateOrder = (typeof DATE_ORDERS)[number];

/** Parses --date-format. */
export function parseDateOrder(text: string): DateOrder {
  const t = text.trim().toLowerCase();
  if ((DATE_ORDERS as readonly string[]).includes(t)) return t as DateOrder;
  throw new UsageError(
    `--date-format ${JSON.stringify(text)}: expected one of ${DATE_ORDERS.join(', ')} (the order of day, month and year in dates such as 01/31/2001, with their separator)`,
  );
}

const TIME = '(?:[T ](\\d{1,2}):(\\d{2})(?::(\\d{2})(?:\\.(\\d+))?)?)?';
const ISO_SHAPE = /^\d{4}-\d{2}-\d{2}(?:[T ]\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/;
const ISO_PARTS = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?)?/;
const YMD_SLASH = new RegExp(`^(\\d{4})/(\\d{1,2})/(\\d{1,2})${TIME}$`);
const DMY_DOT = new RegExp(`^(\\d{1,2})\\.(\\d{1,2})\\.(\\d{4})${TIME}$`);
const YEAR_LAST_SLASH = new RegExp(`^(\\d{1,2})/(\\d{1,2})/(\\d{4})${TIME}$`);
const YEAR_LAST_DASH = new RegExp(`^(\\d{1,2})-(\\d{1,2})-(\\d{4})${TIME}$`);

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** Days since 1970-01-01 for the parts, or NaN when the day or time does not exist. */
function daysOf(y: number, mo: number, d: number, h = 0, mi = 0, s = 0, frac = ''): number {
  if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo) || h > 23 || mi > 59 || s > 59) return NaN;
  const ms = Date.UTC(y, mo - 1, d, h, mi, s) + (frac ? Number(`0.${frac}`) * 1000 : 0);
  // Date.UTC maps years 0-99 to 1900-1999; set the full year for them
  const fixed = y < 100 ? new Date(ms).setUTCFullYear(y) : ms;
  return fixed / DAY_MS;
}

/** Days since 1970-01-01 of an ISO date text, or NaN when it is not a valid date. */
export function isoDays(text: string): number {
  if (!ISO_SHAPE.test(text)) return NaN;
  const p = ISO_PARTS.exec(text)!;
  if (Number.isNaN(daysOf(+p[1], +p[2], +p[3], p[4] ? +p[4] : 0, p[5] ? +p[5] : 0, p[6] ? +p[6] : 0))) return NaN;
  const withZone = text.length === 10 ? `${text}T00:00:00Z` : /Z|[+-]\d{2}:?\d{2}$/.test(text) ? text.replace(' ', 'T') : `${text.replace(' ', 'T')}Z`;
  const ms = Date.parse(withZone);
  return Number.isNaN(ms) ? NaN : ms / DAY_MS;
}

/** One way of reading a date column. */
export interface DateShape {
  /** how the report describes it */
  readonly read: string;
  /** true when the text has this shape (a valid date or not) */
  test(text: string): boolean;
  /** days since 1970-01-01, NaN when the text does not have the shape or the date does not exist */
  days(text: string): number;
}

function partsShape(read: string, re: RegExp, order: 'ymd' | 'dmy' | 'mdy'): DateShape {
  return {
    read,
    test: (t) => re.test(t),
    days: (t) => {
      const m = re.exec(t);
      if (!m) return NaN;
      const [a, b, c] = [+m[1], +m[2], +m[3]];
      const [y, mo, d] = order === 'ymd' ? [a, b, c] : order === 'dmy' ? [c, b, a] : [c, a, b];
      return daysOf(y, mo, d, m[4] ? +m[4] : 0, m[5] ? +m[5] : 0, m[6] ? +m[6] : 0, m[7] ?? '');
    },
  };
}

const ISO: DateShape = { read: 'ISO 8601 (year-month-day)', test: (t) => ISO_SHAPE.test(t), days: isoDays };
const UNAMBIGUOUS: readonly DateShape[] = [
  ISO,
  partsShape('year/month/day', YMD_SLASH, 'ymd'),
  partsShape('day.month.year', DMY_DOT, 'dmy'),
];
const AMBIGUOUS: readonly { re: RegExp; sep: '/' | '-' }[] = [
  { re: YEAR_LAST_SLASH, sep: '/' },
  { re: YEAR_LAST_DASH, sep: '-' },
];

function orderShape(order: DateOrder): DateShape {
  const sep = order[1];
  const re = sep === '/' ? YEAR_LAST_SLASH : YEAR_LAST_DASH;
  const dayFirst = order[0] === 'd';
  const name = dayFirst ? `day${sep}month${sep}year` : `month${sep}day${sep}year`;
  return partsShape(`${name} (--date-format ${order})`, re, dayFirst ? 'dmy' : 'mdy');
}

/** What the date reading of one column found. */
export type DateVerdict =
  | { readonly kind: 'dates'; readonly shape: DateShape; readonly days: Float64Array }
  /** every level has one date shape, but some are not days that exist (or break the shape) */
  | { readonly kind: 'broken'; readonly shape: DateShape; readonly bad: readonly number[] }
  /** the ambiguous N/N/YYYY shape without --date-format; `fits` lists the orders every level fits */
  | { readonly kind: 'ambiguous'; readonly example: number; readonly fits: readonly DateOrder[] }
  | { readonly kind: 'none' };

/**
 * Reads the (trimmed) level texts of a column as dates. `fewBad` decides whether levels without
 * the shape are few enough to call them cells that break a date column (rather than a text
 * column that holds a date or two).
 */
export function readDates(levels: readonly string[], order: DateOrder | undefined, fewBad: (bad: readonly number[]) => boolean): DateVerdict {
  if (levels.length === 0) return { kind: 'none' };
  const candidates: DateShape[] = [...UNAMBIGUOUS];
  if (order) candidates.push(orderShape(order));
  // the shape of the first level that has one decides which shape the column is tried in
  let shape: DateShape | undefined;
  for (const t of levels) {
    shape = candidates.find((s) => s.test(t));
    if (shape) break;
    if (!order && AMBIGUOUS.some((a) => a.re.test(t))) return ambiguous(levels);
    break;
  }
  if (!shape) return { kind: 'none' };
  const days = new Float64Array(levels.length);
  const bad: number[] = [];
  let shaped = 0;
  for (let k = 0; k < levels.length; k++) {
    const t = levels[k];
    if (shape.test(t)) shaped++;
    days[k] = shape.days(t);
    if (Number.isNaN(days[k])) bad.push(k);
  }
  if (bad.length === 0) return { kind: 'dates', shape, days };
  // every level has the shape but some dates do not exist, or only a few levels break the shape
  if (shaped === levels.length || fewBad(bad)) return { kind: 'broken', shape, bad };
  return { kind: 'none' };
}

function ambiguous(levels: readonly string[]): DateVerdict {
  const first = levels.findIndex((t) => AMBIGUOUS.some((a) => a.re.test(t)));
  const sep = AMBIGUOUS.find((a) => a.re.test(levels[first]))!.sep;
  const fits: DateOrder[] = [];
  for (const order of DATE_ORDERS) {
    if (order[1] !== sep) continue;
    const s = orderShape(order);
    if (levels.every((t) => !Number.isNaN(s.days(t)))) fits.push(order);
  }
  // only a column whose every level has the shape is a date column waiting for its order
  if (!levels.every((t) => AMBIGUOUS.some((a) => a.sep === sep && a.re.test(t)))) return { kind: 'none' };
  return { kind: 'ambiguous', example: first, fits };
}
