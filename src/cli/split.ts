/** `foldwise split`: argv flags to splitTable, then the files written atomically. */
import { mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { loadCsv } from '../data/load-csv.js';
import { DATA_FORMATS, loadTable, sniffFormat, type DataFormat } from '../data/load-table.js';
import { EXIT_OK, InputError, UsageError } from '../errors.js';
import { writeFilesAtomic, type FileWrite } from '../report/atomic.js';
import { guardPaths } from './guard.js';
import { leftoverParts, splitTable } from '../run/split.js';
import { loadColumnarWriters } from '../io/write-columnar.js';
import { checkOutputs, loadOptionsOf, parseDelimiter, parseSeed, type DataFlags, problemOptionsOf } from './data-options.js';
import type { Io } from './io.js';

/** Leftover part files named in the warning; more are counted. */
const LEFTOVERS_SHOWN = 10;

interface SplitFlags extends DataFlags {
  plan: string;
  stratify: boolean;
  seed: string;
  out?: string;
  assign?: string;
  format?: string;
}

async function readAll(stream: Readable): Promise<Buffer> {
  const parts: Buffer[] = [];
  for await (const c of stream) parts.push(Buffer.isBuffer(c) ? c : Buffer.from(c));
  return Buffer.concat(parts);
}

export async function runSplit(data: string, flags: SplitFlags, io: Io): Promise<number> {
  if (!flags.out && !flags.assign) throw new UsageError('split: give --out DIR for part files, --assign FILE for the assignment, or both');
  const seed = parseSeed(flags.seed);
  checkOutputs(data, [['--assign', flags.assign]]);
  if (flags.format !== undefined && !(DATA_FORMATS as readonly string[]).includes(flags.format)) {
    throw new UsageError(`--format ${JSON.stringify(flags.format)}: expected one of ${DATA_FORMATS.join(', ')}`);
  }
  let table;
  let text: string | undefined;
  let input: DataFormat = 'csv';
  if (data === '-') {
    if (!io.stdin) throw new UsageError('data "-": no standard input available');
    text = (await readAll(io.stdin)).toString('utf8');
    table = await loadCsv({ text, name: 'stdin' }, loadOptionsOf(flags));
  } else {
    input = await sniffFormat(data);
    // the loader checks the file (and gives the precise error); then a CSV's text is read once more
    table = await loadTable({ path: data }, loadOptionsOf(flags));
    if (input === 'csv') text = readFileSync(data, 'utf8');
  }
  const format = (flags.format as DataFormat | undefined) ?? input;
  if (format !== 'csv') await loadColumnarWriters();
  const result = splitTable(table, text, {
    ...problemOptionsOf(flags),
    plan: flags.plan,
    stratify: flags.stratify,
    seed,
    delimiter: parseDelimiter(flags.delimiter ?? ','),
    parts: Boolean(flags.out),
    // parts in the input's format unless --format says otherwise
    format,
  });
  const writes: FileWrite[] = [];
  if (flags.out) for (const [file, csv] of result.files) writes.push({ path: join(flags.out, file), text: csv, option: '--out' });
  if (flags.assign) writes.push({ path: flags.assign, text: result.assignment, option: '--assign' });
  // no part file may replace the data file (a part named like it, in its folder) or --assign
  guardPaths([{ option: 'the data file', path: data }], writes, false);
  if (flags.out) {
    try {
      mkdirSync(flags.out, { recursive: true });
    } catch (e) {
      throw new InputError(`--out ${flags.out}: cannot create the folder (${(e as NodeJS.ErrnoException).code}); check the path`);
    }
  }
  writeFilesAtomic(writes);
  if (flags.out) {
    io.stderr.write(`foldwise: wrote ${result.files.size} part files for ${result.planText} to ${flags.out}\n`);
    // part files of an earlier split into the same folder are left alone (never deleted), but named
    const left = leftoverParts(readdirSync(flags.out), result.files.keys());
    if (left.length) {
      const shown = left.slice(0, LEFTOVERS_SHOWN).join(', ') + (left.length > LEFTOVERS_SHOWN ? ` and ${left.length - LEFTOVERS_SHOWN} more` : '');
      io.stderr.write(`foldwise: warning: --out ${flags.out} also holds ${left.length} part ${left.length === 1 ? 'file' : 'files'} this split did not write, from an earlier split: ${shown}; remove ${left.length === 1 ? 'it' : 'them'}, or split into an empty folder\n`);
    }
  }
  return EXIT_OK;
}
