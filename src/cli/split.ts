/** `foldwise split`: argv flags to splitTable, then the files written atomically. */
import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { loadCsv } from '../data/load-csv.js';
import { EXIT_OK, InputError, UsageError } from '../errors.js';
import { writeFilesAtomic, type FileWrite } from '../report/atomic.js';
import { guardPaths } from './guard.js';
import { splitTable } from '../run/split.js';
import { checkOutputs, loadOptionsOf, parseDelimiter, parseSeed, type DataFlags, problemOptionsOf } from './data-options.js';
import type { Io } from './io.js';

interface SplitFlags extends DataFlags {
  plan: string;
  stratify: boolean;
  seed: string;
  out?: string;
  assign?: string;
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
  let table;
  let text: string;
  if (data === '-') {
    if (!io.stdin) throw new UsageError('data "-": no standard input available');
    text = (await readAll(io.stdin)).toString('utf8');
    table = await loadCsv({ text, name: 'stdin' }, loadOptionsOf(flags));
  } else {
    // the loader checks the file (and gives the precise error); then its text is read once more
    table = await loadCsv({ path: data }, loadOptionsOf(flags));
    text = readFileSync(data, 'utf8');
  }
  const result = splitTable(table, text, {
    ...problemOptionsOf(flags),
    plan: flags.plan,
    stratify: flags.stratify,
    seed,
    delimiter: parseDelimiter(flags.delimiter ?? ','),
    parts: Boolean(flags.out),
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
  if (flags.out) io.stderr.write(`foldwise: wrote ${result.files.size} part files for ${result.planText} to ${flags.out}\n`);
  return EXIT_OK;
}
