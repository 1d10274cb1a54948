/**
 * Dates in several shapes, cells that break a column's type, and the delimiter hint (issue 25,
 * items 6, 7, 13 and 15). Day counts are checked against ECMAScript's Date.UTC (the reference
 * for the proleptic Gregorian calendar in UTC), never against the loader's own arithmetic.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { parseDateOrder } from '../../src/data/dates.js';
import { dataSection, defineProblem } from '../../src/data/problem.js';
import { InputError, UsageError } from '../../src/errors.js';

const text = (t: string) => ({ text: t, name: 'mem.csv' });
const DAY = 86_400_000;
const utcDays = (y: number, mo: number, d: number, h = 0, mi = 0, s = 0) => Date.UTC(y, mo - 1, d, h, mi, s) / DAY;

describe('date shapes (issue 25, item 15)', () => {
  it('reads year/month/day, day.month.year and ISO with T or a space as dates, and says how', async () => {
    const t = await loadCsv(
      text('a,b,c,y\n2001/01/01 00:47,31.01.2001 08:15,2001-01-31T08:15,p\n2001/1/2,1.2.2001,2001-02-01 12:00,q\n,29.02.2000 23:59:30,2001-02-02,p\n'),
    );
    const col = (n: string) => t.byName.get(n)!;
    const a = col('a');
    expect(a.kind === 'numeric' && a.dates && a.dateReading).toBe('year/month/day');
    expect(a.kind === 'numeric' && Array.from(a.values)).toEqual([utcDays(2001, 1, 1, 0, 47), utcDays(2001, 1, 2), NaN]);
    const b = col('b');
    expect(b.kind === 'numeric' && b.dateReading).toBe('day.month.year');
    expect(b.kind === 'numeric' && Array.from(b.values)).toEqual([utcDays(2001, 1, 31, 8, 15), utcDays(2001, 2, 1), utcDays(2000, 2, 29, 23, 59, 30)]);
    const c = col('c');
    expect(c.kind === 'numeric' && c.dateReading).toBe('ISO 8601 (year-month-day)');
    expect(c.kind === 'numeric' && Array.from(c.values)).toEqual([utcDays(2001, 1, 31, 8, 15), utcDays(2001, 2, 1, 12), utcDays(2001, 2, 2)]);
    const problem = defineProblem(t, { target: 'y' });
    expect(dataSection(problem).dates).toEqual([
      { column: 'a', read: 'year/month/day' },
      { column: 'b', read: 'day.month.year' },
      { column: 'c', read: 'ISO 8601 (year-month-day)' },
    ]);
  });

  it('N/N/YYYY dates need --date-format; without it they stay text with a warning that names the option', async () => {
    const csv = 'd,y\n01/31/2001,p\n02/01/2001 08:15,q\n12/25/2001,p\n';
    const plain = await loadCsv(text(csv));
    expect(plain.byName.get('d')!.kind).toBe('categorical');
    expect(plain.warnings.join('\n')).toMatch(/column "d" holds dates such as "01\/31\/2001" whose day and month order the file does not say: read as categorical; give --date-format d\/m\/y or m\/d\/y to read them as dates; every value fits only m\/d\/y/);
    const md = await loadCsv(text(csv), { dateFormat: 'm/d/y' });
    const d = md.byName.get('d')!;
    expect(d.kind === 'numeric' && d.dateReading).toBe('month/day/year (--date-format m/d/y)');
    expect(d.kind === 'numeric' && Array.from(d.values)).toEqual([utcDays(2001, 1, 31), utcDays(2001, 2, 1, 8, 15), utcDays(2001, 12, 25)]);
    // read day first, 01/31/2001 is the first day of a 31st month: named as a cell that breaks the dates
    const dm = await loadCsv(text(csv), { dateFormat: 'd/m/y' });
    expect(dm.byName.get('d')!.kind).toBe('categorical');
    expect(dm.warnings.join('\n')).toMatch(/column "d" holds dates \(day\/month\/year \(--date-format d\/m\/y\)\) but for 2 cells such as "01\/31\/2001" \(line 2\)/);
    expect(() => parseDateOrder('dd/mm/yyyy')).toThrow(UsageError);
    expect(parseDateOrder('M-D-Y')).toBe('m-d-y');
  });
});

describe('the first cell that breaks a type is named (issue 25, items 6 and 7)', () => {
  const dates = Array.from({ length: 120 }, (_, i) => new Date(Date.UTC(2023, 0, 1) + i * DAY).toISOString().slice(0, 10));
  dates[98] = '2023-02-30'; // data row 99 is on file line 100
  const csv = `t,x,y\n${dates.map((d, i) => `${d},${i},${i % 2 ? 'a' : 'b'}`).join('\n')}\n`;

  it('an impossible date on line 100 of an --order column names line 100, not line 2', async () => {
    const t = await loadCsv(text(csv));
    expect(() => defineProblem(t, { target: 'y', order: 't' })).toThrow(InputError);
    expect(() => defineProblem(t, { target: 'y', order: 't' })).toThrow(/mem\.csv: line 100: --order column "t" holds "2023-02-30", which is not a date that exists \(the other cells are dates\)/);
  });

  it('without --order the same cell is named in a warning', async () => {
    const t = await loadCsv(text(csv));
    expect(t.warnings.join('\n')).toMatch(/column "t" holds dates \(ISO 8601 \(year-month-day\)\) but for 1 cell such as "2023-02-30" \(line 100\), which is not a date that exists: read as categorical/);
  });

  it('a numeric target with a few text cells stops, naming them and --missing / --task', async () => {
    const rows = Array.from({ length: 62 }, (_, i) => `${i},${(i * 1.7).toFixed(1)}`);
    rows[31] = '31,oops';
    const t = await loadCsv(text(`x,y\n${rows.join('\n')}\n`));
    expect(() => defineProblem(t, { target: 'y' })).toThrow(
      /mem\.csv: target "y" is numeric but for 1 cell \(line 33: "oops"\); list such texts with --missing to leave those rows out, or give --task classification/,
    );
    // the ways out: --missing makes it a regression target, --task classification reads labels
    const missing = await loadCsv(text(`x,y\n${rows.join('\n')}\n`), { missing: ['', 'oops'] });
    expect(defineProblem(missing, { target: 'y' }).task).toBe('regression');
    expect(defineProblem(t, { target: 'y', task: 'classification' }).task).toBe('classification');
  });
});

describe('a header split with the wrong delimiter (issue 25, item 13)', () => {
  it('says to set --delimiter instead of suggesting the whole header as a name', async () => {
    const t = await loadCsv(text('a;b;label\n1;2;x\n3;4;y\n'));
    expect(() => defineProblem(t, { target: 'label' })).toThrow(/--target "label": no such column in mem\.csv; the header looks separated by ";" \("a;b;label"\); set --delimiter ";"/);
    const tabs = await loadCsv(text('a\tb\tlabel\n1\t2\tx\n'));
    expect(() => defineProblem(tabs, { target: 'label' })).toThrow(/separated by "\\t" \(tab\).*set --delimiter tab/);
  });
});
