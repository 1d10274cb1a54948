/**
 * The journal of a resumable run: a text file of JSON lines. The first line names the run (its
 * identity); each further line is one finished task's result, written with one write call and
 * flushed to disk (fsync) before the next task is counted as done. Rerunning the same command
 * with the same journal skips the tasks it holds; a journal of another run is refused with
 * what differs. A last line cut short by a kill is ignored (that task simply runs again), and a
 * failed task (--on-fold-error skip) is not written, so resuming tries it again.
 */
import { closeSync, existsSync, fsyncSync, openSync, readFileSync, writeSync } from 'node:fs';
import { InputError, UsageError } from '../errors.js';
import { refuseOldFormat } from '../renamed.js';
import { identityDiff, type RunIdentity } from './identity.js';
import { resultFromJSON, resultToJSON } from './result-json.js';
import type { TaskResult } from './tasks.js';

export const JOURNAL_FORMAT = 'foldwise-journal/2';

export interface Journal {
  readonly path: string;
  /** results already in the journal when it was opened */
  readonly done: ReadonlyMap<string, TaskResult>;
  append(r: TaskResult): void;
  close(): void;
}

function readJournal(path: string, identity: RunIdentity, classification: boolean): Map<string, TaskResult> {
  const lines = readFileSync(path, 'utf8').split('\n');
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
  const done = new Map<string, TaskResult>();
  const last = lines.length - 1;
  for (let i = 1; i < lines.length; i++) {
    if (lines[i] === '') continue;
    let j: unknown;
    try {
      j = JSON.parse(lines[i]);
    } catch {
      if (i === last) break; // cut short by a kill: the task runs again
      throw new InputError(`--journal ${path}: line ${i + 1} is broken; the journal was changed by hand`);
    }
    const r = resultFromJSON(j, classification, `--journal ${path}: line ${i + 1}`);
    done.set(r.id, r);
  }
  return done;
}

export function openJournal(path: string, identity: RunIdentity, classification: boolean): Journal {
  const exists = existsSync(path) && readFileSync(path, 'utf8').length > 0;
  const done = exists ? readJournal(path, identity, classification) : new Map<string, TaskResult>();
  let fd: number;
  try {
    fd = openSync(path, 'a');
  } catch (e) {
    throw new InputError(`--journal ${path}: cannot be opened (${(e as NodeJS.ErrnoException).code}); check the path`);
  }
  const line = (obj: unknown): void => {
    writeSync(fd, `${JSON.stringify(obj)}\n`);
    fsyncSync(fd);
  };
  if (!exists) line({ journal: JOURNAL_FORMAT, identity });
  else {
    // make sure a line cut short by a kill does not swallow the next one
    const text = readFileSync(path, 'utf8');
    if (!text.endsWith('\n')) writeSync(fd, '\n');
  }
  return {
    path,
    done,
    // a failed task is not journaled: a resumed run tries it again
    append: (r) => {
      if (!r.failed) line(resultToJSON(r));
    },
    close: () => closeSync(fd),
  };
}
