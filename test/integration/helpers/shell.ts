/**
 * Small process helpers for the integration tests: run a command to its end, find processes by
 * their command line and working folder (from /proc), and a work folder laid out the way the
 * README's recipes expect (dist/ of this checkout, data.csv in the current folder).
 */
import { spawn, type SpawnOptions } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, readlinkSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { penguinsCsv } from '../../helpers/penguins.js';

export const REPO = fileURLToPath(new URL('../../../', import.meta.url)).replace(/\/$/, '');

export interface Ran {
  readonly code: number | null;
  readonly signal: NodeJS.Signals | null;
  readonly stdout: string;
  readonly stderr: string;
}

/** Runs a program to its end and collects both streams (standard input is empty). */
export function runProgram(cmd: string, args: readonly string[], options: SpawnOptions = {}): Promise<Ran> {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { ...options, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout!.on('data', (b: Buffer) => (stdout += b));
    child.stderr!.on('data', (b: Buffer) => (stderr += b));
    child.on('error', reject);
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}

export interface ProcInfo {
  readonly pid: number;
  readonly argv: readonly string[];
  readonly cwd: string;
}

/** Processes whose working folder is `cwd` (read from /proc; processes that vanish mid-read are left out). */
export function processesIn(cwd: string): ProcInfo[] {
  const out: ProcInfo[] = [];
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const dir = readlinkSync(`/proc/${name}/cwd`);
      if (dir !== cwd && !dir.startsWith(`${cwd}/`)) continue;
      const argv = readFileSync(`/proc/${name}/cmdline`, 'utf8').split('\0').filter(Boolean);
      out.push({ pid: Number(name), argv, cwd: dir });
    } catch {
      // gone, or not ours to read
    }
  }
  return out;
}

/** The foldwise shard processes (`node .../bin.js eval ... --shard I/N ...`) running in `cwd`, by shard text. */
export function shardProcesses(cwd: string): Map<string, number> {
  const found = new Map<string, number>();
  for (const p of processesIn(cwd)) {
    const at = p.argv.indexOf('--shard');
    if (at > 0 && /(^|\/)node$/.test(p.argv[0]) && p.argv[1]?.endsWith('bin.js') && p.argv[2] === 'eval') found.set(p.argv[at + 1], p.pid);
  }
  return found;
}

/**
 * A folder to run README recipes in, as written: `dist` links to this checkout's build and
 * `data.csv` is the Palmer penguins file (vega-datasets, CC0; Gorman et al. 2014) with its
 * Species column named `y`, the recipes' target.
 */
export function recipeFolder(dir: string): string {
  mkdirSync(dir, { recursive: true });
  symlinkSync(join(REPO, 'dist'), join(dir, 'dist'));
  writeFileSync(join(dir, 'data.csv'), penguinsCsv().replace(/^Species,/, 'y,'));
  return dir;
}

export const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

/** The report's JSON without its wall-clock `timing`, for comparing runs that kept timings. */
export function withoutTiming(text: string): unknown {
  const j = JSON.parse(text) as Record<string, unknown>;
  delete j.timing;
  return j;
}
