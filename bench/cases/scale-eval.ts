/**
 * Child process of the scale bench: one foldwise command run in-process through the CLI's
 * `run(argv, io)`, then one JSON line with the exit code, wall time, CPU time and peak RSS of
 * the whole process (worker threads included: `--jobs` runs threads, not processes). Run alone
 * so the peak RSS is the command's.
 *   node dist/bench/cases/scale-eval.js ARG ...
 * Standard output and error of the command are dropped; the report goes where its argv says.
 */
import { run } from '../../src/cli/run.js';

const c0 = process.cpuUsage();
const t0 = performance.now();
const sink = { write: () => true };
const code = await run(process.argv.slice(2), { stdout: sink, stderr: { write: (t: string) => process.stderr.write(t) }, env: process.env, cwd: process.cwd() });
const cpu = process.cpuUsage(c0);
process.stdout.write(`${JSON.stringify({ code, wallMs: performance.now() - t0, cpuMs: (cpu.user + cpu.system) / 1000, peakRssMb: process.resourceUsage().maxRSS / 1024 })}\n`);
process.exit(code);
