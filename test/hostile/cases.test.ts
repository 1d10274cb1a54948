/**
 * Hostile inputs through the in-process CLI (issue 4), one fixture or generator per case. Every
 * case runs `foldwise eval` with `--json OUT --markdown OUT` in a fresh folder and is checked
 * against the exit-code contract in contract.ts (exit 0 with a valid report, or exit 2 with one
 * line naming the file, line, column or option; no stack trace; nothing written on failure; the
 * input untouched). On top of that each case says what correct is: the exact error, or what the
 * report must show.
 *
 * Outside references: SHA-256 from node:crypto; IEEE 754 rounding of 2^53 + 1 to 2^53 (ties to
 * even, checked with the JavaScript Number parser); everything else is a property of the input
 * (row and column counts, class counts) or the decision recorded in the issue.
 */
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { caseFolder, runContract, sha256, type Outcome } from './contract.js';
import { baseFrame, csvText, smallFrame, withCell, type Frame } from './fixtures.js';

const root = tempFolder();

/**
 * The usual quick run: 3 stratified folds, 1-nearest neighbour beside the baseline, in this
 * thread (`--jobs 1`: starting worker threads costs more than these tiny runs; one case below
 * runs with workers).
 */
const RUN = ['--target', 'y', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'] as const;

type Input = string | Buffer | { readonly make: (dir: string) => string };

interface Case {
  readonly name: string;
  /** the data: file content, or a function making the path (which need not exist) */
  readonly input: Input;
  /** arguments after `eval PATH` (or the whole argv when `argv` is given) */
  readonly args?: readonly string[];
  readonly argv?: (path: string) => string[];
  /** add --json OUT --markdown OUT (default true) */
  readonly outputs?: boolean;
  /** exit 2 with a message matching this, or exit 0 and this check of the outcome */
  readonly expect: RegExp | ((o: Outcome, path: string) => void | Promise<void>);
  /**
   * A known gap, with the fix it waits for: the case runs as `it.fails`, so it turns red (and
   * must become a plain case) once the fix is in.
   */
  readonly pending?: string;
}

const small = smallFrame();
const smallCsv = csvText(small);
const numericCells = (f: Frame, col: number): number[] => f.rows.map((r) => Number(r[col]));
const classCount = (f: Frame, name: string): number => f.rows.filter((r) => r[r.length - 1] === name).length;

/** The scores of a report without the parts that depend on the file's path and bytes. */
function scoresOf(report: Report): unknown {
  return { learners: report.learners, plan: report.plan, features: report.data.features, classes: report.data.classes };
}

let reference: Report | undefined;
/** The report of the plain comma-separated small frame with RUN (computed once). */
async function referenceReport(): Promise<Report> {
  if (reference) return reference;
  const { dir, out } = caseFolder(root.dir);
  const path = join(dir, 'plain.csv');
  writeFileSync(path, smallCsv);
  const o = await runContract(['eval', path, ...RUN], path, out);
  expect(o.code).toBe(0);
  reference = o.report!;
  return reference;
}

function worksLike(o: Outcome, extra: (r: Report) => void = () => {}): void {
  expect(o.code).toBe(0);
  extra(o.report!);
}

const proto = ['__proto__', 'constructor', 'hasOwnProperty', 'toString'];
const protoFrame: Frame = {
  header: [...proto, 'y'],
  rows: small.rows.map((r, i) => [r[0], r[1], String(i % 4), `t${i % 5}`, r[2]]),
};

const wideColumns = 2000;
const wideFrame: Frame = {
  header: [...Array.from({ length: wideColumns }, (_, j) => `c${j}`), 'y'],
  rows: Array.from({ length: 40 }, (_, i) => [...Array.from({ length: wideColumns }, (_, j) => String(((i * 31 + j * 17) % 97) / 10)), i % 2 ? 'p' : 'q']),
};

const FIVE_MB = 5 * 1024 * 1024;

const cases: Case[] = [
  // ---- files that cannot be read
  { name: 'missing file', input: { make: (dir) => join(dir, 'nope.csv') }, args: RUN, expect: /nope\.csv: no such file; check the path$/ },
  {
    name: 'directory instead of a file',
    input: { make: (dir) => (mkdirSync(join(dir, 'data.csv')), join(dir, 'data.csv')) },
    args: RUN,
    expect: /data\.csv: is a directory, not a CSV file; give the path of a file$/,
  },
  { name: 'empty file', input: '', args: RUN, expect: /: the file is empty; expected a header row and data rows$/ },
  { name: 'header only', input: 'a,b,y\n', args: RUN, expect: /: has a header but no data rows$/ },
  { name: 'blank lines only after the header', input: 'a,b,y\n\n\n\n', args: RUN, expect: /: has a header but no data rows$/ },
  { name: 'non-UTF-8 bytes (Latin-1 é on line 4)', input: Buffer.concat([Buffer.from(csvText(small).split('\n').slice(0, 3).join('\n') + '\n'), Buffer.from([0x63, 0x61, 0x66, 0xe9, 0x2c]), Buffer.from('1,p\n')]), args: RUN, expect: /: is not valid UTF-8 \(line 4, byte \d+\); save the file as UTF-8$/ },
  {
    name: 'random binary',
    input: Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 2654435761) >>> 24)),
    args: RUN,
    expect: /: byte \d+ is a NUL byte \(line \d+\); this looks like a binary file/,
  },

  // ---- shapes and encodings that must work
  {
    name: 'BOM and CRLF line endings',
    input: `\uFEFF${csvText(small, ',', '\r\n')}`,
    args: RUN,
    expect: async (o, path) => {
      // correct: the same scores as the plain LF file without BOM; the first column is "a", not "\uFEFFa"
      worksLike(o, (r) => expect(r.data.features).toEqual(['a', 'b']));
      expect(scoresOf(o.report!)).toEqual(scoresOf(await referenceReport()));
      expect(o.report!.data.sha256).toBe(sha256(readFileSync(path)));
    },
  },
  {
    name: 'quoted line breaks and doubled quotes',
    input: csvText({ header: small.header, rows: small.rows.map((r, i) => [r[0], `say "${r[1]}"\nline ${i % 2}`, r[2]]) }),
    args: RUN,
    expect: async (o, path) => {
      // correct: 30 rows (line breaks inside quotes do not end a row) and the cell text kept exactly
      worksLike(o, (r) => expect(r.data.rows).toBe(30));
      const t = await loadCsv({ path });
      const b = t.byName.get('b')!;
      expect(b.kind === 'categorical' && [...b.levels].sort()).toEqual(['say "u"\nline 0', 'say "u"\nline 1', 'say "v"\nline 0', 'say "v"\nline 1', 'say "w"\nline 0', 'say "w"\nline 1']);
      // line numbers count the line breaks inside quotes: row 3 starts on file line 1 + 2 * 2 + 1
      expect(t.lines[2]).toBe(6);
    },
  },
  {
    name: 'a ragged row after quoted line breaks names its file line',
    input: csvText({ header: small.header, rows: small.rows.map((r, i) => (i === 4 ? [r[0], r[1]] : [r[0], `x\ny`, r[2]])) }),
    args: RUN,
    // rows 1-4 take two lines each (lines 2-9), so the fifth row is on line 10
    expect: /: line 10 has 2 fields, the header has 3; fix the row or check --delimiter$/,
  },
  {
    name: 'semicolon delimiter with --delimiter ;',
    input: csvText(small, ';'),
    args: [...RUN, '--delimiter', ';'],
    expect: async (o) => {
      worksLike(o);
      expect(scoresOf(o.report!)).toEqual(scoresOf(await referenceReport()));
    },
  },
  {
    name: 'tab delimiter with --delimiter tab',
    input: csvText(small, '\t'),
    args: [...RUN, '--delimiter', 'tab'],
    expect: async (o) => {
      worksLike(o);
      expect(scoresOf(o.report!)).toEqual(scoresOf(await referenceReport()));
    },
  },
  {
    name: 'tab delimiter with --delimiter "\\t"',
    input: csvText(small, '\t'),
    args: [...RUN, '--delimiter', '\\t'],
    expect: async (o) => {
      worksLike(o);
      expect(scoresOf(o.report!)).toEqual(scoresOf(await referenceReport()));
    },
  },
  {
    name: 'semicolon file read with the default comma',
    input: csvText(small, ';'),
    args: RUN,
    // the whole header is one column "a;b;y", so the target is unknown: the hint names the
    // delimiter the header holds (issue 25, item 13: suggesting "a;b;y" as the name was wrong advice)
    expect: /--target "y": no such column in .*; the header looks separated by ";" \("a;b;y"\); set --delimiter ";"$/,
  },
  { name: 'delimiter of two characters', input: smallCsv, args: [...RUN, '--delimiter', ';;'], expect: /^--delimiter ";;": expected one character other than a quote or a line break/ },
  { name: 'delimiter that is a quote', input: smallCsv, args: [...RUN, '--delimiter', '"'], expect: /^--delimiter "\\"": expected one character other than a quote/ },
  { name: 'ragged row: short', input: csvText(small).replace(`\n${small.rows[3].join(',')}\n`, `\n${small.rows[3].slice(0, 2).join(',')}\n`), args: RUN, expect: /: line 5 has 2 fields, the header has 3; fix the row or check --delimiter$/ },
  { name: 'ragged row: long', input: csvText(small).replace(`\n${small.rows[3].join(',')}\n`, `\n${small.rows[3].join(',')},extra\n`), args: RUN, expect: /: line 5 has 4 fields, the header has 3; fix the row or check --delimiter$/ },
  {
    name: 'blank lines between rows are skipped',
    input: csvText(small).replace(/\n/g, '\n\n'),
    args: RUN,
    expect: async (o) => {
      worksLike(o, (r) => expect(r.data.rows).toBe(30));
      expect(scoresOf(o.report!)).toEqual(scoresOf(await referenceReport()));
    },
  },
  {
    name: 'duplicate header names',
    input: csvText({ header: ['a', 'b', 'a', 'y'], rows: small.rows.map((r) => [r[0], r[1], r[0], r[2]]) }),
    args: RUN,
    expect: /: column name "a" appears twice in the header \(columns 1 and 3\); rename one$/,
  },
  { name: 'a header cell with no name', input: smallCsv.replace('a,b,y', 'a,,y'), args: RUN, expect: /: column 2 of the header has no name; give every column a name$/ },

  {
    name: 'worker threads (--jobs 2) give the same report and warnings as one thread',
    input: csvText(withCell(small, 3, 2, '')),
    args: ['--target', 'y', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '2'],
    expect: async (o) => {
      worksLike(o, (r) => expect(r.data.excludedRows).toBe(1));
      const one = await cli(['eval', join(o.out, '..', 'data.csv'), '--target', 'y', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1', '--json', '-']);
      expect(one.code).toBe(0);
      expect(scoresOf(JSON.parse(one.stdout) as Report)).toEqual(scoresOf(o.report!));
      expect(one.stderr).toBe(o.stderr);
    },
  },

  // ---- names that look like code or options
  {
    name: '__proto__, constructor, hasOwnProperty and toString as feature names',
    input: csvText(protoFrame),
    args: RUN,
    expect: (o) => {
      worksLike(o, (r) => {
        expect(r.data.features).toEqual(proto);
        expect(r.data.columns).toBe(5);
      });
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
      expect(Object.getPrototypeOf({})).toBe(Object.prototype);
    },
  },
  {
    name: '__proto__ as the target, constructor dropped, toString as the group',
    input: csvText({ header: ['hasOwnProperty', 'constructor', 'toString', '__proto__'], rows: protoFrame.rows.map((r) => [r[0], r[1], r[3], r[4]]) }),
    args: ['--target', '__proto__', '--drop', 'constructor', '--group', 'toString', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'],
    expect: (o) =>
      worksLike(o, (r) => {
        expect(r.data.target).toBe('__proto__');
        expect(r.data.classes).toEqual(['p', 'q']);
        expect(r.data.features).toEqual(['hasOwnProperty']);
        expect(r.data.dropped).toEqual(['constructor']);
        expect(r.plan.group).toBe('toString');
      }),
  },
  {
    name: 'a column named like an option (--verbose) used as --target and --drop',
    input: csvText({ header: ['--verbose', '--target', 'y'], rows: small.rows }),
    args: ['--target', 'y', '--drop', '--verbose', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'],
    expect: (o) => worksLike(o, (r) => expect([r.data.features, r.data.dropped]).toEqual([['--target'], ['--verbose']])),
  },
  {
    name: 'a column named --verbose given as an option value does not turn on stack traces',
    input: csvText({ header: ['--verbose', 'b', 'y'], rows: small.rows }),
    args: ['--target', 'y', '--drop', '--verbose', '--plan', 'kfold:3', '--learner', 'knm'],
    expect: /^--learner "knm": unknown learner; did you mean "knn"\?/,
  },

  {
    name: 'a column name with a line break, quoted in an error message, stays one line',
    input: csvText({ header: ['a', 'b', 'y\nz'], rows: small.rows }),
    args: ['--target', 'y\nz', '--drop', 'y\nz', '--plan', 'kfold:3'],
    expect: /^--drop "y\\nz": that is the target column; drop other columns$/,
  },
  {
    name: 'a target name with a line break and missing targets: the warning stays one line',
    input: csvText({ header: ['a', 'b', 'y\nz'], rows: withCell(small, 3, 2, '').rows }),
    args: ['--target', 'y\nz', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'],
    expect: (o) => worksLike(o, (r) => expect(r.data.excludedRows).toBe(1)),
  },

  // ---- the target
  {
    name: 'target missing in some rows',
    input: csvText(withCell(withCell(small, 3, 2, ''), 7, 2, 'NA')),
    args: RUN,
    expect: (o) => {
      // correct: the two rows are left out and said so; the rest is used
      worksLike(o, (r) => expect([r.data.rows, r.data.rowsUsed, r.data.excludedRows]).toEqual([30, 28, 2]));
      expect(o.stderr).toContain('foldwise: warning: 2 rows with a missing target ("y") left out');
    },
  },
  { name: 'target missing in every row', input: csvText({ header: small.header, rows: small.rows.map((r) => [r[0], r[1], '']) }), args: RUN, expect: /: target "y" is missing in every row$/ },
  { name: 'target with one class', input: csvText({ header: small.header, rows: small.rows.map((r) => [r[0], r[1], 'p']) }), args: RUN, expect: /: target "y" has only one class \("p"\) in the usable rows; classification needs at least two$/ },
  {
    name: 'regression target with text',
    input: smallCsv,
    args: [...RUN, '--task', 'regression'],
    expect: new RegExp(`: target "y" is not numeric \\(line 2: "${small.rows[0][2]}"\\); regression needs numbers \\(use --task classification for labels\\)$`),
  },
  {
    name: 'a class with fewer rows than folds',
    input: csvText(withCell(small, 5, 2, 'r')),
    args: ['--target', 'y', '--plan', 'kfold:5', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'],
    expect: (o) => {
      // correct: it runs (common practice: warn, since stratification cannot put r in every fold)
      worksLike(o, (r) => {
        expect(r.data.classes).toEqual(['p', 'q', 'r']);
        expect(r.learners[1].folds.length).toBe(5);
        expect(r.warnings.join('\n')).toMatch(/class "r" has 1 row, fewer than the 5 folds/);
      });
    },
  },
  { name: 'unknown target column', input: smallCsv, args: ['--target', 'Y', '--plan', 'kfold:3'], expect: /^--target "Y": no such column in .*; did you mean "y"/ },
  { name: 'no --target', input: smallCsv, args: ['--plan', 'kfold:3'], expect: /^required option '--target <column>' not specified$/ },

  // ---- numbers
  {
    name: 'NaN cells are missing values',
    input: csvText(withCell(withCell(small, 2, 0, 'NaN'), 9, 0, 'NaN')),
    args: RUN,
    expect: async (o, path) => {
      worksLike(o);
      const a = (await loadCsv({ path })).byName.get('a')!;
      expect(a.kind === 'numeric' && [a.missing, Number.isNaN(a.values[2]), a.values[3]]).toEqual([2, true, numericCells(small, 0)[3]]);
    },
  },
  { name: 'Infinity in a numeric column', input: csvText(withCell(small, 6, 0, 'Infinity')), args: RUN, expect: /: line 8, column "a": "Infinity" is not a finite number; fix it or list it with --missing$/ },
  { name: '-inf in a numeric column', input: csvText(withCell(small, 6, 0, '-inf')), args: RUN, expect: /: line 8, column "a": "-inf" is not a finite number/ },
  { name: '1e309 in a numeric column', input: csvText(withCell(small, 6, 0, '1e309')), args: RUN, expect: /: line 8, column "a": "1e309" is too large for a double; fix the value or list it with --missing$/ },
  {
    name: '-0 is the number zero',
    input: csvText(withCell(small, 6, 0, '-0')),
    args: RUN,
    expect: async (o, path) => {
      worksLike(o);
      const a = (await loadCsv({ path })).byName.get('a')!;
      expect(a.kind === 'numeric' && a.values[6] === 0 && a.missing === 0).toBe(true);
    },
  },
  {
    name: 'integers beyond 2^53 warn and read as the nearest double',
    input: csvText(withCell(small, 6, 0, '9007199254740993')),
    args: RUN,
    expect: async (o, path) => {
      worksLike(o);
      expect(o.stderr).toContain('foldwise: warning: column "a" has integers beyond 2^53');
      const a = (await loadCsv({ path })).byName.get('a')!;
      // IEEE 754 round half to even: 2^53 + 1 is exactly between 2^53 and 2^53 + 2 and goes to 2^53
      expect(a.kind === 'numeric' && a.values[6]).toBe(2 ** 53);
    },
  },
  {
    name: 'a mostly numeric column with one text cell becomes categorical with a warning',
    input: csvText(withCell(small, 6, 0, 'n/a')),
    args: RUN,
    expect: (o) => {
      worksLike(o);
      expect(o.stderr).toMatch(/foldwise: warning: column "a" is numeric but for 1 cell such as "n\/a" \(line 8\): read as categorical; if that text means missing, add it with --missing/);
    },
  },
  {
    name: '--missing adds tokens: the text cell becomes missing and the column stays numeric',
    input: csvText(withCell(small, 6, 0, 'n/a')),
    args: [...RUN, '--missing', 'n/a', '--no-audit'], // the audit's own findings are tested in test/audit
    expect: (o) => {
      worksLike(o);
      expect(o.stderr).toBe('');
    },
  },
  {
    name: 'TRUE and FALSE make a categorical column',
    input: csvText({ header: small.header, rows: small.rows.map((r, i) => [i % 4 ? 'TRUE' : 'FALSE', r[1], r[2]]) }),
    args: RUN,
    expect: async (o, path) => {
      worksLike(o);
      const a = (await loadCsv({ path })).byName.get('a')!;
      expect(a.kind === 'categorical' && a.levels).toEqual(['FALSE', 'TRUE']);
    },
  },
  {
    name: 'ISO dates read as days since 1970',
    input: csvText(baseFrame()),
    args: [...RUN, '--drop', 'z'],
    expect: async (o, path) => {
      worksLike(o, (r) => expect(r.data.features).toEqual(['a', 'b', 'd']));
      const d = (await loadCsv({ path })).byName.get('d')!;
      // 2024-01-01 is 19723 days after 1970-01-01 (Date.UTC(2024, 0, 1) / 86400000)
      expect(d.kind === 'numeric' && [d.values[0], d.values[29]]).toEqual([Date.UTC(2024, 0, 1) / 86_400_000, 19723 + 29]);
    },
  },

  // ---- size
  {
    name: 'a 5 MB single field is a categorical cell',
    input: csvText(withCell(small, 3, 1, 'x'.repeat(FIVE_MB))),
    args: RUN,
    expect: async (o, path) => {
      worksLike(o, (r) => expect(r.data.rows).toBe(30));
      const b = (await loadCsv({ path })).byName.get('b')!;
      expect(b.kind === 'categorical' && b.levels.map((l) => l.length).sort((x, y) => y - x)[0]).toBe(FIVE_MB);
    },
  },
  {
    name: 'a 5 MB class name as the target cell',
    input: csvText(withCell(withCell(small, 3, 2, 'y'.repeat(FIVE_MB)), 4, 2, 'y'.repeat(FIVE_MB))),
    args: ['--target', 'y', '--plan', 'kfold:2', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'],
    expect: (o) => worksLike(o, (r) => expect(r.data.classes!.map((c) => c.length).sort((x, y) => y - x)[0]).toBe(FIVE_MB)),
  },
  {
    name: `a CSV with ${wideColumns} columns`,
    input: csvText(wideFrame),
    args: ['--target', 'y', '--plan', 'kfold:3', '--learner', 'knn:k=1', '--no-timing', '--jobs', '1'],
    expect: (o) => worksLike(o, (r) => expect([r.data.columns, r.data.features.length, r.data.rows]).toEqual([wideColumns + 1, wideColumns, 40])),
  },

  // ---- learners, metrics, plans
  { name: 'unknown learner', input: smallCsv, args: [...RUN, '--learner', 'knm'], expect: /^--learner "knm": unknown learner; did you mean "knn"\? \(known: / },
  {
    name: 'unknown metric',
    input: smallCsv,
    args: [...RUN, '--metric', 'acuracy'],
    expect: /^--metric "acuracy": unknown metric.*did you mean "accuracy"\?/,
  },
  { name: 'a metric of the other task', input: smallCsv, args: [...RUN, '--metric', 'rmse'], expect: /^--metric rmse: a regression metric, but the task is classification$/ },
  { name: 'learner spec without a value', input: smallCsv, args: [...RUN, '--learner', 'knn:k'], expect: /^--learner "knn:k": "k" is not key=value$/ },
  { name: 'learner spec with nothing after the colon', input: smallCsv, args: [...RUN, '--learner', 'knn:'], expect: /^--learner "knn:": nothing after ":"/ },
  { name: 'learner spec in upper case', input: smallCsv, args: [...RUN, '--learner', 'KNN'], expect: /^--learner "KNN": expected NAME or NAME:key=value,key=value with a lower-case NAME$/ },
  { name: 'learner option unknown', input: smallCsv, args: [...RUN, '--learner', 'knn:kk=2'], expect: /^--learner knn:kk=2: unknown option "kk" for knn; did you mean "k"\?/ },
  { name: 'learner option out of range (k=0)', input: smallCsv, args: [...RUN, '--learner', 'knn:k=0'], expect: /^--learner knn: k=0: must be at least 1$/ },
  { name: 'learner option not whole (k=2.5)', input: smallCsv, args: [...RUN, '--learner', 'knn:k=2.5'], expect: /^--learner knn: k=2.5: expected a whole number$/ },
  { name: 'learner option overflowing (k=1e400)', input: smallCsv, args: [...RUN, '--learner', 'knn:k=1e400'], expect: /^--learner knn: k=1e400: / },
  { name: 'learner option not a choice', input: smallCsv, args: [...RUN, '--learner', 'knn:vote=heavy'], expect: /^--learner knn: vote=heavy: expected one of / },
  { name: 'the same learner twice', input: smallCsv, args: [...RUN, '--learner', 'knn:k=1'], expect: /^--learner knn:k=1: the same learner and options are given twice/ },
  { name: 'malformed plan: unknown kind', input: smallCsv, args: [...RUN, '--plan', 'kfld:3'], expect: /^--plan "kfld:3": unknown plan "kfld"; expected one of kfold, loo, resplit, holdout, forward; did you mean "kfold"\?$/ },
  { name: 'malformed plan: kfold:1', input: smallCsv, args: [...RUN, '--plan', 'kfold:1'], expect: /^--plan "kfold:1": expected kfold:K or kfold:KxR with whole numbers K >= 2, R >= 1$/ },
  // two shares are train/test since issue 25 item 19 (holdout:A/B = holdout:A/B/0); two that do not sum to 1 stay malformed
  { name: 'malformed plan: holdout with two shares that do not sum to 1', input: smallCsv, args: [...RUN, '--plan', 'holdout:0.5/0.6'], expect: /^--plan "holdout:0.5\/0.6": expected holdout:A\/B\/C .*\(or holdout:A\/B, the same as holdout:A\/B\/0\)$/ },
  { name: 'malformed plan: shuffle fraction 1.5', input: smallCsv, args: [...RUN, '--plan', 'resplit:5@1.5'], expect: /^--plan "resplit:5@1.5": expected resplit:N@F/ },
  { name: 'plan with more folds than rows', input: smallCsv, args: [...RUN, '--plan', 'kfold:31'], expect: /^--plan kfold:31 needs at least 31 rows; the data has 30 usable rows$/ },
  { name: 'plan with a billion splits', input: smallCsv, args: [...RUN, '--plan', 'resplit:1000000000@0.5'], expect: /^--plan resplit:1000000000@0\.5 would make 1000000000 folds; at most 100000 are allowed; use fewer splits$/ },
  { name: 'plan with a billion repeats', input: smallCsv, args: [...RUN, '--plan', 'kfold:2x1000000000'], expect: /^--plan kfold:2x1000000000 would make 2000000000 folds; at most 100000 are allowed; use fewer folds or repeats$/ },
  { name: 'forward plan without --order', input: smallCsv, args: [...RUN, '--plan', 'forward:3'], expect: /^forward plans need --order COL$/ },
  { name: '--order on a text column', input: smallCsv, args: [...RUN, '--plan', 'forward:3', '--order', 'b'], expect: /: line 2: --order column "b" is "u"; order values must be numbers or ISO dates/ },
  { name: '--final without a holdout plan', input: smallCsv, args: [...RUN, '--final'], expect: /^--final: only a holdout plan has a final part \(the plan is kfold:3\)$/ },
  { name: '--impute out of its choices', input: smallCsv, args: [...RUN, '--impute', 'zero'], expect: /^option '--impute <how>' argument 'zero' is invalid\. Allowed choices are median, mean\.$/ },
  { name: '--task out of its choices', input: smallCsv, args: [...RUN, '--task', 'ranking'], expect: /^option '--task <task>' argument 'ranking' is invalid/ },
  { name: '--drop of an unknown column', input: smallCsv, args: [...RUN, '--drop', 'zz'], expect: /^--drop "zz": no such column in / },
  { name: '--categorical of an unknown column', input: smallCsv, args: [...RUN, '--categorical', 'zz'], expect: /^--categorical "zz": no such column in / },
  { name: 'every feature dropped', input: smallCsv, args: [...RUN, '--drop', 'a', '--drop', 'b'], expect: /: no feature columns are left after the target, --drop, --group and --order$/ },

  // ---- seeds
  { name: 'negative seed', input: smallCsv, args: [...RUN, '--seed', '-1'], expect: /^--seed -1: expected a whole number from 0 to 4294967295$/ },
  { name: 'non-integer seed', input: smallCsv, args: [...RUN, '--seed', '1.5'], expect: /^--seed 1\.5: expected a whole number from 0 to 4294967295$/ },
  { name: 'seed beyond 2^32 - 1', input: smallCsv, args: [...RUN, '--seed', '4294967296'], expect: /^--seed 4294967296: expected a whole number/ },
  { name: 'seed in hexadecimal', input: smallCsv, args: [...RUN, '--seed', '0x10'], expect: /^--seed 0x10: expected a whole number/ },
  { name: 'empty seed', input: smallCsv, args: [...RUN, '--seed', ''], expect: /^--seed : expected a whole number/ },
  {
    name: 'the largest seed works',
    input: smallCsv,
    args: [...RUN, '--seed', '4294967295'],
    expect: (o) => worksLike(o, (r) => expect(r.plan.seed).toBe(4294967295)),
  },

  // ---- output paths (these cases give their own outputs)
  {
    name: '--json in a missing folder',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', join(path, '..', 'out', 'nodir', 'r.json'), '--markdown', join(path, '..', 'out', 'r.md')],
    expect: /^--json .*nodir\/r\.json: the folder .*nodir does not exist; create it first$/,
  },
  {
    name: '--markdown in a missing folder',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', join(path, '..', 'out', 'r.json'), '--markdown', join(path, '..', 'out', 'nodir', 'r.md')],
    expect: /^--markdown .*nodir\/r\.md: the folder .*nodir does not exist; create it first$/,
  },
  {
    name: '--json that is a folder',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', join(path, '..'), '--markdown', join(path, '..', 'out', 'r.md')],
    expect: /^--json .*: is a folder; give a file name$/,
  },
  {
    name: '--markdown that is a folder',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', join(path, '..', 'out', 'r.json'), '--markdown', join(path, '..', 'out')],
    expect: /^--markdown .*out: is a folder; give a file name$/,
  },
  {
    name: '--markdown ending with a folder separator (the JSON is not written either)',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', join(path, '..', 'out', 'r.json'), '--markdown', `${join(path, '..', 'out', 'nodir')}/`],
    expect: /^--markdown .*nodir\/: ends with a folder separator; give a file name$/,
  },
  {
    name: '--json naming the input file itself',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', path],
    expect: /^--json .*data\.csv: is the input file; give another name$/,
  },
  {
    name: '--json and --markdown naming the same file',
    input: smallCsv,
    outputs: false,
    argv: (path) => ['eval', path, ...RUN, '--json', join(path, '..', 'out', 'r.txt'), '--markdown', join(path, '..', 'out', 'r.txt')],
    expect: /^--json .* and --markdown .*: the same file; give two names$/,
  },
  {
    name: '--json and --markdown both to standard output',
    input: smallCsv,
    outputs: false,
    args: [...RUN, '--json', '-', '--markdown', '-'],
    expect: /^--json -, --markdown - and --html -: only one of them can go to standard output$/,
  },
  {
    name: '--json - writes the report to standard output only',
    input: smallCsv,
    outputs: false,
    args: [...RUN, '--json', '-'],
    expect: async (o) => {
      expect(o.code).toBe(0);
      expect(scoresOf(JSON.parse(o.stdout) as Report)).toEqual(scoresOf(await referenceReport()));
      expect(readdirSync(o.out)).toEqual([]);
    },
  },

  // ---- the command line itself
  {
    name: 'unknown option',
    input: smallCsv,
    args: [...RUN, '--lerner', 'knn'],
    expect: /^unknown option '--lerner' \(Did you mean --learner\?\)$/,
  },
  {
    name: 'unknown command',
    input: smallCsv,
    argv: (path) => ['evl', path, '--target', 'y'],
    expect: /^unknown command 'evl' \(Did you mean eval\?\)$/,
  },
];

describe('hostile inputs through the CLI: exit 0 and correct, or exit 2 with one line', () => {
  it('has a case for everything issue 4 lists', () => {
    expect(cases.length).toBeGreaterThanOrEqual(60);
    expect(new Set(cases.map((c) => c.name)).size).toBe(cases.length);
  });

  for (const c of cases) {
    (c.pending ? it.fails : it)(c.name, async () => {
      const { dir, out } = caseFolder(root.dir);
      let path: string;
      if (typeof c.input === 'string' || Buffer.isBuffer(c.input)) {
        path = join(dir, 'data.csv');
        writeFileSync(path, c.input);
      } else path = c.input.make(dir);
      const argv = c.argv ? c.argv(path) : ['eval', path, ...(c.args ?? [])];
      const o = await runContract(argv, path, out, { outputs: c.outputs !== false && !c.argv });
      if (c.expect instanceof RegExp) {
        expect(o.code, o.stderr).toBe(2);
        expect(o.message).toMatch(c.expect);
      } else {
        expect(o.code, o.stderr).toBe(0);
        await c.expect(o, path);
      }
    });
  }

  it('prints the stack trace with --verbose, and only then', async () => {
    const { dir } = caseFolder(root.dir);
    const path = join(dir, 'data.csv');
    writeFileSync(path, smallCsv);
    const quiet = await cli(['eval', path, ...RUN, '--learner', 'knm']);
    const loud = await cli(['eval', path, ...RUN, '--learner', 'knm', '--verbose']);
    expect([quiet.code, loud.code]).toEqual([2, 2]);
    expect(quiet.stderr.split('\n').filter(Boolean).length).toBe(1);
    expect(loud.stderr.startsWith(quiet.stderr)).toBe(true);
    expect(loud.stderr).toMatch(/\n\s+at .+:\d+:\d+/);
  });
});
