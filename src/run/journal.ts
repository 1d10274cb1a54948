/**
 * The journal of a resumable run: a text file of JSON lines. The first line names the run (its
 * identity); each further line is one finished task's result, written with one write call and
 * flushed to disk (fsync) before the next task is counted as done. Rerunning the same command
 * with the same journal skips the tasks it holds; a journal of another run is refused with
 * what differs. A failed task (--on-fold-error skip) is not written, so resuming tries it again.
 *
 * Each task line is the result's JSON object with a checksum added as its last field,
 * `{...RESULT,"sha":"<16 hex>"}`: the first 16 hex digits of the SHA-256 of the exact text of
 * `{...RESULT}`, so a changed digit is never read as a result. A line that fails its check with good lines after it is refused, naming the journal
 * and the line; lines failing at the end (a write cut short by a kill, a disk that filled) are
 * cut off and those tasks run again. Only regular files are journals, of at most
 * `journalLimit()` bytes.
 */
import { createHash } from 'node:crypto';
import { closeSync, fsyncSync, ftruncateSync, openSync, readFileSync, statSync, writeSync } from 'node:fs';
import { totalmem } from 'node:os';
import { InputError, UsageError } from '../errors.js';
import { refuseOldFormat } from '../renamed.js';
import { identityDiff, type RunIdentity } from './identity.js';
import { resultFromJSON, resultToJSON } from './result-json.js';
import type { TaskResult } from './tasks.js';

export const JOURNAL_FORMAT = 'foldwise-journal/2';

/** The largest journal read back: a quarter of the machine's memory. */
export function journalLimit(): number {
  return Math.floor(totalmem() / 4);
}

export interface Journal<R = TaskResult> {
  readonly path: string;
  /** results already in the journal when it was opened */
  readonly done: ReadonlyMap<string, R>;
  /** set when lines failing their checksum were cut off the end: the first such line */
  readonly cutAt?: number;
  append(r: R): void;
  close(): void;
}

/** A result as the JSON object of its journal line, and back (throwing InputError when it is not one). */
export interface ResultCodec<R> {
  toJSON(r: R): object;
  fromJSON(j: unknown, where: string): R;
}

/** The kind of result a journal holds: eval's task results unless a command built on the runner gives its own. */
type Journaled = { readonly id: string; readonly failed?: string };

const taskCodec = (classification: boolean): ResultCodec<TaskResult> => ({
  toJSON: resultToJSON,
  fromJSON: (j, where) => resultFromJSON(j, classification, where),
});

const sha16 = (text: string): string => createHash('sha256').update(text).digest('hex').slice(0, 16);
const TASK_LINE = /^(\{.*),"sha":"([0-9a-f]{16})"\}$/;

/** The journal line of a result, with its checksum. */
export function journalLine(r: TaskResult): string {
  return lineOf(resultToJSON(r));
}

function lineOf(json: object): string {
  const payload = JSON.stringify(json);
  return `${payload.slice(0, -1)},"sha":"${sha16(payload)}"}`;
}

function writeFailure(path: string, e: unknown): InputError {
  const code = (e as NodeJS.ErrnoException).code ?? String(e);
  const hint = code === 'ENOSPC' ? 'the disk is full; free some space and rerun the same command to resume' : 'check the path and permissions';
  return new InputError(`--journal ${path}: cannot be written (${code}); ${hint}`);
}

interface Read<R> {
  readonly done: Map<string, R>;
  /** byte length of the good part, and the 1-based line where a failing tail starts */
  readonly cut?: { readonly bytes: number; readonly line: number };
}

function readJournal<R extends Journaled>(path: string, text: string, identity: RunIdentity, codec: ResultCodec<R>): Read<R> {
  const lines = text.split('\n');
  let head: { journal?: string; identity?: RunIdentity };
  try {
    head = JSON.parse(lines[0]);
  } catch {
    throw new InputError(`--journal ${path}: line 1 is not a journal header; give a new file or the journal of this run`);
  }
  refuseOldFormat(`--journal ${path}`, head.journal, JOURNAL_FORMAT, 'start the run again with a new journal file');
  if (head.journal !== JOURNAL_FORMAT || !head.identity) throw new InputError(`--journal ${path}: not a foldwise journal (${JOURNAL_FORMAT})`);
  const diff = identityDiff(head.identity, identity);
  if (diff.length) throw new UsageError(`--journal ${path}: it belongs to another run, which differs in ${diff.join(', ')}; use a new journal file`);
  const done = new Map<string, R>();
  let bytes = Buffer.byteLength(lines[0]) + 1;
  let firstBad: { line: number; bytes: number } | undefined;
  for (let i = 1; i < lines.length; i++) {
    const line = lines[i];
    const end = bytes + Buffer.byteLength(line) + (i < lines.length - 1 ? 1 : 0);
    if (line === '' && i === lines.length - 1) break;
    const m = TASK_LINE.exec(line);
    let r: R | undefined;
    if (m && sha16(`${m[1]}}`) === m[2]) {
      try {
        r = codec.fromJSON(JSON.parse(`${m[1]}}`), `--journal ${path}: line ${i + 1}`);
      } catch (e) {
        if (e instanceof InputError) throw e;
        r = undefined;
      }
    }
    if (r) {
      if (firstBad) {
        throw new InputError(
          `--journal ${path}: line ${firstBad.line} fails its checksum (the journal was changed); use a new journal file, or delete line ${firstBad.line} to run that task again`,
        );
      }
      done.set(r.id, r);
    } else if (!firstBad) {
      firstBad = { line: i + 1, bytes };
    }
    bytes = end;
  }
  return { done, ...(firstBad ? { cut: { bytes: firstBad.bytes, line: firstBad.line } } : {}) };
}

/**
 * Opens (or starts) the journal at `path` for the run `identity`. `codec` turns the results into
 * journal lines and back: eval's task results by default (`classification` says how to read
 * predictions), another kind for a command built on the runner (growth's scores).
 */
export function openJournal(path: string, identity: RunIdentity, classification: boolean): Journal;
export function openJournal<R extends Journaled>(path: string, identity: RunIdentity, classification: boolean, codec: ResultCodec<R>): Journal<R>;
export function openJournal<R extends Journaled>(path: string, identity: RunIdentity, classification: boolean, given?: ResultCodec<R>): Journal<R> {
  const codec = given ?? (taskCodec(classification) as unknown as ResultCodec<R>);
  let size = -1;
  try {
    const st = statSync(path);
    if (!st.isFile()) throw new InputError(`--journal ${path}: is ${st.isDirectory() ? 'a folder' : 'not a regular file'}; give a file name for the journal`);
    size = st.size;
  } catch (e) {
    if (e instanceof InputError) throw e;
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw new InputError(`--journal ${path}: cannot be read (${(e as NodeJS.ErrnoException).code})`);
  }
  const limit = journalLimit();
  if (size > limit) throw new InputError(`--journal ${path}: has ${size} bytes, more than the ${limit} (a quarter of this machine's memory) a journal may have; use a new journal file`);
  const exists = size > 0;
  const read: Read<R> = exists ? readJournal(path, readFileSync(path, 'utf8'), identity, codec) : { done: new Map() };
  let fd: number;
  try {
    fd = openSync(path, exists ? 'r+' : 'w');
  } catch (e) {
    throw new InputError(`--journal ${path}: cannot be opened (${(e as NodeJS.ErrnoException).code}); check the path`);
  }
  let position = 0;
  const write = (text: string): void => {
    try {
      const buf = Buffer.from(text);
      let off = 0;
      while (off < buf.length) {
        const n = writeSync(fd, buf, off, buf.length - off, position);
        off += n;
        position += n;
      }
      fsyncSync(fd);
    } catch (e) {
      throw writeFailure(path, e);
    }
  };
  if (!exists) write(`${JSON.stringify({ journal: JOURNAL_FORMAT, identity })}\n`);
  else {
    const text = readFileSync(path);
    position = read.cut ? read.cut.bytes : text.length;
    if (read.cut) {
      try {
        ftruncateSync(fd, position);
      } catch (e) {
        throw writeFailure(path, e);
      }
    }
    // make sure a line cut short by a kill does not swallow the next one
    if (position > 0 && text[position - 1] !== 0x0a) write('\n');
  }
  return {
    path,
    done: read.done,
    ...(read.cut ? { cutAt: read.cut.line } : {}),
    // a failed task is not journaled: a resumed run tries it again
    append: (r) => {
      if (!r.failed) write(`${lineOf(codec.toJSON(r))}\n`);
    },
    close: () => closeSync(fd),
  };
}
