/**
 * `foldwise growth` the ways eval runs: on worker threads (`jobs`), as one shard of the tasks
 * (a part for `foldwise merge`), resuming from and appending to a journal. It is the runner's
 * own machinery (runTaskSet in src/run/execute.ts: shards, journal, pool; checkParts in
 * src/run/partial.ts) with growth's tasks, results and worker. Every way gives the same report
 * byte for byte: each task's result depends only on its fold, size and learner, and the report
 * is assembled from the frame and the results in the run's order.
 *
 * The run identity is eval's (data, read settings, problem, plan, seed, imputation, learners and
 * their programs, metrics, --on-fold-error) plus the sizes, so a journal or part of another
 * growth run, or of an eval run, is refused with what differs.
 */
import type { Table } from '../data/types.js';
import { InputError } from '../errors.js';
import { loadExternalLearners } from '../learners/index.js';
import { refuseOldFormat } from '../renamed.js';
import { runTaskSet, type ExecOptions } from '../run/execute.js';
import { identityOf, type ReadSettings, type RunIdentity } from '../run/identity.js';
import type { ResultCodec } from '../run/journal.js';
import { checkParts } from '../run/partial.js';
import type { ShardSpec } from '../run/shard.js';
import { VERSION } from '../version.js';
import { assembleGrowth, prepareGrowth, runGrowthTasks, type GrowthFrame, type GrowthOptions, type GrowthPrepared, type GrowthReport, type GrowthResult } from './growth.js';

export const GROWTH_PARTIAL_FORMAT = 'foldwise-growth-partial/1';

export interface GrowthPartial {
  readonly schema: typeof GROWTH_PARTIAL_FORMAT;
  readonly tool: { readonly name: 'foldwise'; readonly version: string };
  readonly shard: ShardSpec;
  readonly identity: RunIdentity;
  readonly frame: GrowthFrame;
  /** every task id of the whole run, in the run's order */
  readonly tasks: readonly string[];
  readonly records: readonly GrowthResult[];
}

export type GrowthExecResult = { readonly kind: 'report'; readonly report: GrowthReport } | { readonly kind: 'partial'; readonly partial: GrowthPartial };

const score = (v: unknown): v is number | null => v === null || (typeof v === 'number' && Number.isFinite(v));

/** Growth results in journal lines and parts: plain JSON (scores are finite doubles or null, exact through JSON). */
export const GROWTH_CODEC: ResultCodec<GrowthResult> = {
  toJSON: (r) => ({ id: r.id, rows: r.rows, test: r.test, train: r.train, ...(r.failed ? { failed: r.failed } : {}) }),
  fromJSON: (j, where) => {
    const o = j as Partial<GrowthResult> | null;
    if (!o || typeof o.id !== 'string' || !Number.isInteger(o.rows) || (o.rows as number) < 1 || !score(o.test) || !score(o.train) || (o.failed !== undefined && typeof o.failed !== 'string')) {
      throw new InputError(`${where}: not a growth task result`);
    }
    return { id: o.id, rows: o.rows as number, test: o.test, train: o.train, ...(o.failed ? { failed: o.failed } : {}) };
  },
};

export function growthIdentity(g: GrowthPrepared, read?: ReadSettings): RunIdentity {
  return { ...identityOf(g.prepared, read), growth: g.sizes.join(',') };
}

/** The worker thread of growth's tasks (next to this module). */
const WORKER = new URL('./worker.js', import.meta.url);

export async function executeGrowth(table: Table, options: GrowthOptions, exec: ExecOptions = {}): Promise<GrowthExecResult> {
  await loadExternalLearners(options.learners ?? [], exec.baseDir ?? '/', exec.commands);
  const g = prepareGrowth(table, options);
  const identity = growthIdentity(g, exec.read);
  const { mine, ordered } = await runTaskSet<GrowthResult>(
    table,
    options,
    {
      all: g.tasks,
      identity,
      classification: g.prepared.problem.target.task === 'classification',
      runHere: (tasks, done, stop) => runGrowthTasks(g, tasks, done, stop),
      codec: GROWTH_CODEC,
      worker: WORKER,
    },
    exec,
  );
  if (exec.shard) {
    return {
      kind: 'partial',
      partial: {
        schema: GROWTH_PARTIAL_FORMAT,
        tool: { name: 'foldwise', version: VERSION },
        shard: exec.shard,
        identity,
        frame: g.frame,
        tasks: g.tasks.map((t) => t.id),
        records: ordered.map((r) => GROWTH_CODEC.toJSON(r) as GrowthResult),
      },
    };
  }
  if (mine.length !== g.tasks.length) throw new Error('growth: a whole run ran only some of its tasks');
  return { kind: 'report', report: assembleGrowth(g.frame, ordered) };
}

/** Parses a growth part's text; names the file in every error. */
export function parseGrowthPartial(text: string, name: string): GrowthPartial {
  let j: Partial<GrowthPartial>;
  try {
    j = JSON.parse(text);
  } catch {
    throw new InputError(`${name}: not JSON; expected a part written by foldwise growth --shard`);
  }
  refuseOldFormat(name, j?.schema, GROWTH_PARTIAL_FORMAT, 'rerun the shards with this foldwise');
  if (j?.schema !== GROWTH_PARTIAL_FORMAT || !j.identity || !j.frame || !Array.isArray(j.tasks) || !Array.isArray(j.records) || !j.shard) {
    throw new InputError(`${name}: not a foldwise growth part (${GROWTH_PARTIAL_FORMAT}); expected a part written by foldwise growth --shard`);
  }
  return j as GrowthPartial;
}

/** Merges growth parts into the report of the whole run, with merge's checks for every kind of part. */
export function mergeGrowthParts(parts: readonly GrowthPartial[], names: readonly string[]): GrowthReport {
  const records = checkParts(parts, names);
  const first = parts[0];
  const ordered = first.tasks.map((id) => GROWTH_CODEC.fromJSON(records.get(id), `merge: ${id}`));
  return assembleGrowth(first.frame, ordered);
}
