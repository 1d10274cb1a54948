/**
 * --date-format through the CLI and the report's record of how each date column was read
 * (issue 25, item 15). Invented data: 40 rows of dates a day apart (the calendar
 * from ECMAScript's Date.UTC) and a class that alternates.
 */
import { describe, expect, it } from 'vitest';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { schemaCheck } from '../helpers/schema.js';
import type { Report } from '../../src/model/report.js';

const expectValid = schemaCheck('report.schema.json');
const tmp = tempFolder();
const day = (i: number) => new Date(Date.UTC(2001, 0, 1) + i * 86_400_000);
const pad = (n: number) => String(n).padStart(2, '0');
const rows = Array.from({ length: 40 }, (_, i) => {
  const d = day(i);
  return `${pad(d.getUTCMonth() + 1)}/${pad(d.getUTCDate())}/${d.getUTCFullYear()},${i % 5},${i % 2 ? 'p' : 'q'}`;
});
const file = tmp.file('dated.csv', `when,x,y\n${rows.join('\n')}\n`);

describe('--date-format', () => {
  it('reads month-first dates as a date column, and the JSON report says how (valid against the schema)', async () => {
    const r = await cli(['eval', file, '--target', 'y', '--date-format', 'm/d/y', '--plan', 'kfold:2', '--json', '-', '--no-timing', '--no-audit']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout) as Report;
    expectValid(report);
    expect(report.data.dates).toEqual([{ column: 'when', read: 'month/day/year (--date-format m/d/y)' }]);
    const md = await cli(['eval', file, '--target', 'y', '--date-format', 'm/d/y', '--plan', 'kfold:2', '--no-timing', '--no-audit']);
    expect(md.stdout).toMatch(/- Dates: when read as month\/day\/year \(--date-format m\/d\/y\)/);
  });

  it('without it the column stays categorical with a warning naming the option; a bad value is exit 2 with one line', async () => {
    const r = await cli(['eval', file, '--target', 'y', '--plan', 'kfold:2', '--json', '-', '--no-timing', '--no-audit']);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/column "when" holds dates such as "01\/01\/2001" whose day and month order the file does not say: read as categorical; give --date-format d\/m\/y or m\/d\/y/);
    expect((JSON.parse(r.stdout) as Report).data.dates).toBeUndefined();
    const bad = await cli(['eval', file, '--target', 'y', '--date-format', 'mm/dd/yyyy']);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
    expect(bad.stderr).toMatch(/--date-format "mm\/dd\/yyyy": expected one of d\/m\/y, m\/d\/y, d-m-y, m-d-y/);
  });
});
