/**
 * Seeded fuzz run (issue 4): random mutations of a valid CSV (mutate.ts) must keep the exit-code
 * contract: a valid report (exit 0) or one InputError/UsageError line (exit 2), never any other
 * exit code and never an uncaught exception. Most cases call the loader and `evaluate` directly
 * (the same calls as `foldwise eval`) and map an outcome to the exit code the CLI would give:
 * a FoldwiseError gives its exitCode, anything else is the internal-error exit 70. Every
 * CLI_EVERY-th case goes through the in-process CLI with --json and --markdown files instead and
 * is checked with the full contract (contract.ts: one stderr line, no stack, no output file on
 * failure, the input untouched).
 *
 * Each case is a function of (FUZZ_SEED, case number) alone; a failure prints both, the
 * mutations applied and the bytes, so it can be replayed. Checks on success: the report
 * validates against schema/report.schema.json (ajv) and its SHA-256 is that of the mutated bytes
 * (node:crypto), and the JSON and Markdown renderings do not throw.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { FoldwiseError } from '../../src/errors.js';
import { getMetric } from '../../src/metrics/index.js';
import { renderJson } from '../../src/report/json.js';
import { renderMarkdown } from '../../src/report/markdown.js';
import { evaluate, type EvaluateOptions } from '../../src/run/evaluate.js';
import { createRng, deriveSeed, type Rng } from '../../src/rng.js';
import { tempFolder } from '../helpers/tmp.js';
import { caseFolder, runContract, sha256, validateReport } from './contract.js';
import { baseFrame, csvText } from './fixtures.js';
import { mutate } from './mutate.js';

/** The seed and case count; FOLDWISE_FUZZ_SEED and FOLDWISE_FUZZ_CASES override them for a longer local run. */
export const FUZZ_SEED = Number(process.env.FOLDWISE_FUZZ_SEED ?? 0xf01d5eed);
export const FUZZ_CASES = Number(process.env.FOLDWISE_FUZZ_CASES ?? 3000);
const CLI_EVERY = 25;

const root = tempFolder();
const BASES = [Buffer.from(csvText(baseFrame(30))), Buffer.from(csvText(baseFrame(12))), Buffer.from(csvText(baseFrame(30), ',', '\r\n'))];

interface Setup {
  readonly target: string;
  readonly extra: Partial<EvaluateOptions>;
  readonly args: readonly string[];
}

/** What to run on a case: a cheap learner and plan, sometimes a group, order or regression target. */
function setupFor(rng: Rng): Setup {
  const pickFrom = rng.int(10);
  if (pickFrom < 5) return { target: 'y', extra: { plan: 'kfold:2' }, args: ['--plan', 'kfold:2'] };
  if (pickFrom < 7) return { target: 'z', extra: { plan: 'kfold:2' }, args: ['--plan', 'kfold:2'] };
  if (pickFrom === 7) return { target: 'y', extra: { plan: 'kfold:2', group: 'b' }, args: ['--plan', 'kfold:2', '--group', 'b'] };
  if (pickFrom === 8) return { target: 'y', extra: { plan: 'forward:2', order: 'd' }, args: ['--plan', 'forward:2', '--order', 'd'] };
  return { target: 'y', extra: { plan: 'holdout:0.5/0.3/0.2', final: true }, args: ['--plan', 'holdout:0.5/0.3/0.2', '--final'] };
}

interface Failure {
  readonly caseNo: number;
  readonly applied: readonly string[];
  readonly problem: string;
  readonly bytes: string;
}

/** The exit code the CLI would give and the message, for a direct (loader + evaluate) run. */
async function direct(bytes: Buffer, name: string, setup: Setup): Promise<{ code: number; message: string }> {
  try {
    const table = await loadCsv({ stream: Readable.from([bytes]), name });
    const report = evaluate(table, { target: setup.target, learners: ['knn:k=1'], seed: 7, timing: false, ...setup.extra });
    const valid = validateReport(JSON.parse(renderJson(report)));
    if (!valid) return { code: -1, message: `invalid report: ${JSON.stringify(validateReport.errors)}` };
    if (report.data.sha256 !== sha256(bytes)) return { code: -1, message: 'report sha256 is not that of the input bytes' };
    renderMarkdown(report, (m) => getMetric(m).higherIsBetter);
    return { code: 0, message: '' };
  } catch (e) {
    if (e instanceof FoldwiseError) return { code: e.exitCode, message: e.message };
    return { code: 70, message: `uncaught ${(e as Error)?.stack ?? String(e)}` };
  }
}

describe('fuzz: mutated CSVs keep the exit-code contract', () => {
  it(`${FUZZ_CASES} seeded cases: exit 0 with a valid report or exit 2 with one line`, async () => {
    const failures: Failure[] = [];
    const tally = new Map<number, number>();
    let viaCli = 0;
    let cliMs = 0;
    const started = performance.now();
    for (let caseNo = 0; caseNo < FUZZ_CASES; caseNo++) {
      const rng = createRng(deriveSeed(FUZZ_SEED, 'case', caseNo));
      const base = BASES[rng.int(BASES.length)];
      const { bytes, applied } = mutate(base, rng);
      const setup = setupFor(rng);
      const fail = (problem: string): void => {
        failures.push({ caseNo, applied, problem, bytes: bytes.toString('base64') });
      };
      if (caseNo % CLI_EVERY === 0) {
        viaCli++;
        const cliStarted = performance.now();
        const { dir, out } = caseFolder(root.dir);
        const path = join(dir, 'data.csv');
        writeFileSync(path, bytes);
        try {
          // one thread, except for a few cases (worker threads cost more to start than these tiny runs)
          const jobs = caseNo % (CLI_EVERY * 20) === 0 ? '2' : '1';
          const o = await runContract(['eval', path, '--target', setup.target, ...setup.args, '--learner', 'knn:k=1', '--seed', '7', '--no-timing', '--jobs', jobs], path, out);
          tally.set(o.code, (tally.get(o.code) ?? 0) + 1);
          if (o.code === 0 && o.report!.data.sha256 !== sha256(bytes)) fail('report sha256 is not that of the input bytes');
        } catch (e) {
          fail(`CLI contract: ${(e as Error).message}`);
        }
        cliMs += performance.now() - cliStarted;
        continue;
      }
      const { code, message } = await direct(bytes, 'fuzz.csv', setup);
      tally.set(code, (tally.get(code) ?? 0) + 1);
      if (code !== 0 && code !== 2) fail(`exit ${code}: ${message}`);
      else if (code === 2) {
        if (/[\r\n]/.test(message)) fail(`message has a line break: ${JSON.stringify(message)}`);
        else if (!/fuzz\.csv|--[a-z]|\bline \d+|\bcolumn\b/.test(message)) fail(`message names no file, line, column or option: ${message}`);
      }
    }
    const seconds = (performance.now() - started) / 1000;
    // the figures of the run, for the record (no timing assertion: speed belongs in benchmarks)
    console.log(`fuzz: ${FUZZ_CASES} cases (${viaCli} through the CLI, ${(cliMs / 1000).toFixed(1)} s of it) in ${seconds.toFixed(1)} s; exit codes ${JSON.stringify([...tally].sort((p, q) => p[0] - q[0]))}`);
    expect(failures.slice(0, 8)).toEqual([]);
    expect(failures.length).toBe(0);
    // the run explores both outcomes, so neither side of the contract is checked on nothing
    expect(tally.get(0) ?? 0).toBeGreaterThan(FUZZ_CASES / 10);
    expect(tally.get(2) ?? 0).toBeGreaterThan(FUZZ_CASES / 10);
  });
});
