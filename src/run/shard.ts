/**
 * Shards: a stable split of a run's tasks into N parts for a scheduler the user already has.
 * Tasks are dealt largest expected cost first (training rows; ties by id) to the part with the
 * least cost so far (ties to the lower part), so every shard gets a fair share and the same run
 * always gives the same assignment.
 */
import { UsageError } from '../errors.js';
import type { TaskSpec } from './tasks.js';

export interface ShardSpec {
  /** 1-based */
  readonly index: number;
  readonly count: number;
}

export function parseShard(text: string): ShardSpec {
  const m = /^(\d+)\/(\d+)$/.exec(text.trim());
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!m || count < 1 || index < 1 || index > count) {
    throw new UsageError(`--shard "${text}": expected I/N with whole numbers 1 <= I <= N, e.g. 2/4`);
  }
  return { index, count };
}

/** The shard (1-based) of every task id. */
export function assignShards(tasks: readonly TaskSpec[], count: number): Map<string, number> {
  const order = [...tasks].sort((a, b) => b.cost - a.cost || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  const load = new Float64Array(count);
  const out = new Map<string, number>();
  for (const t of order) {
    let best = 0;
    for (let s = 1; s < count; s++) if (load[s] < load[best]) best = s;
    load[best] += t.cost;
    out.set(t.id, best + 1);
  }
  return out;
}

/** The tasks of one shard, in the run's order. */
export function shardTasks(tasks: readonly TaskSpec[], shard: ShardSpec): TaskSpec[] {
  const of = assignShards(tasks, shard.count);
  return tasks.filter((t) => of.get(t.id) === shard.index);
}
