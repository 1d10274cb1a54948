/**
 * Both pools start their workers with a capped young generation (WORKER_LIMITS in
 * src/run/pool.ts), read back inside the worker from node:worker_threads' `resourceLimits`.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { runPool, WORKER_LIMITS } from '../../src/run/pool.js';
import { runThreads } from '../../src/run/thread-pool.js';

const script = new URL('./fixtures/limits-worker.mjs', import.meta.url);
type Answer = { limits: { maxYoungGenerationSizeMb: number } };

describe('worker resource limits', () => {
  it('cap the young generation at 16 MB', () => expect(WORKER_LIMITS.maxYoungGenerationSizeMb).toBe(16));

  it("runPool's workers are started with them", async () => {
    const table = await loadCsv({ text: 'a,b\n1,2\n3,4\n', name: 't.csv' });
    const tasks = [0, 1].map((i) => ({ id: `t${i}`, foldIndex: i, candidateIndex: 0, cost: 1 }));
    const out = await runPool<{ id: string } & Answer>(table, { target: 'b' }, tasks, 2, undefined, undefined, '/', undefined, undefined, undefined, script);
    expect(out).toHaveLength(2);
    for (const r of out) expect(r.limits.maxYoungGenerationSizeMb).toBe(16);
  });

  it("runThreads' workers are started with them", async () => {
    const got: Answer[] = [];
    await runThreads<number, Answer>({ url: script, workerData: null, pieces: [1, 2, 3], jobs: 2, onResult: (r) => got.push(r) });
    expect(got).toHaveLength(3);
    for (const r of got) expect(r.limits.maxYoungGenerationSizeMb).toBe(16);
  });
});
