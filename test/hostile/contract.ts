/**
 * The exit-code contract of issue 4, checked on one CLI run:
 * - exit 0: every stderr line is a warning, the JSON report (when written) validates against
 *   schema/report.schema.json and ends in a newline, the Markdown report exists;
 * - exit 2: stderr is exactly one line `foldwise: <message>` with no stack trace, the message
 *   names the file, a line, a column or an option, and no output file (nor a temporary file
 *   of the atomic writer) exists;
 * - any exit: the input file's bytes are unchanged (SHA-256 before and after, node:crypto).
 * Any other exit code is a bug.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import { expect } from 'vitest';
import type { Report } from '../../src/model/report.js';
import { cli, type CliResult } from '../helpers/cli.js';

const schema = JSON.parse(readFileSync(new URL('../../schema/report.schema.json', import.meta.url), 'utf8'));
export const validateReport = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(schema);

export function sha256(bytes: Buffer | string): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** What a path holds: the hash of a file, the sorted listing of a folder, or "absent". */
function snapshot(path: string): string {
  if (!existsSync(path)) return 'absent';
  if (statSync(path).isDirectory()) return `dir:${readdirSync(path).sort().join('/')}`;
  return `file:${sha256(readFileSync(path))}`;
}

export interface Outcome extends CliResult {
  /** the parsed JSON report (exit 0 with outputs) */
  readonly report?: Report;
  readonly markdown?: string;
  /** the one error line without the "foldwise: " prefix (exit 2) */
  readonly message?: string;
  readonly out: string;
}

export interface RunOptions {
  /** add `--json OUT --markdown OUT` in a fresh output folder (default true) */
  readonly outputs?: boolean;
}

/** A fresh folder under `root`, with an empty `out` folder for the reports. */
export function caseFolder(root: string): { dir: string; out: string } {
  const dir = mkdtempSync(join(root, 'case-'));
  const out = join(dir, 'out');
  mkdirSync(out);
  return { dir, out };
}

/**
 * Runs `foldwise eval INPUT ...args` (or `argv` as given when `input` is undefined) and checks
 * the contract. `input` is the data path, which need not exist.
 */
export async function runContract(argv: readonly string[], input: string | undefined, out: string, options: RunOptions = {}): Promise<Outcome> {
  const json = join(out, 'report.json');
  const md = join(out, 'report.md');
  const withOutputs = options.outputs !== false;
  const before = input === undefined ? '' : snapshot(input);
  const outBefore = snapshot(out);
  const r = await cli([...argv, ...(withOutputs ? ['--json', json, '--markdown', md] : [])]);
  if (input !== undefined) expect(snapshot(input), 'the input is untouched').toBe(before);
  expect([0, 2], `exit code 0 or 2, got ${r.code}; stderr: ${r.stderr}`).toContain(r.code);
  if (r.code === 0) {
    for (const line of r.stderr.split('\n').filter(Boolean)) expect(line).toMatch(/^foldwise: warning: /);
    if (!withOutputs) return { ...r, out };
    expect(r.stdout).toBe('');
    const text = readFileSync(json, 'utf8');
    expect(text.endsWith('}\n')).toBe(true);
    const report = JSON.parse(text) as Report;
    const valid = validateReport(report);
    expect(validateReport.errors ?? []).toEqual([]);
    expect(valid).toBe(true);
    const markdown = readFileSync(md, 'utf8');
    expect(markdown.startsWith('# foldwise eval: ')).toBe(true);
    expect(readdirSync(out).sort()).toEqual(['report.json', 'report.md']);
    return { ...r, out, report, markdown };
  }
  // exit 2: exactly one line, no stack trace, nothing written
  expect(r.stderr, 'exactly one line on stderr').toMatch(/^foldwise: [^\n]+\n$/);
  expect(r.stderr).not.toMatch(/\bat .+:\d+:\d+/);
  const message = r.stderr.slice('foldwise: '.length, -1);
  // the message names the file, a line, a column or an option (or the unknown command)
  const names = (input !== undefined && message.includes(input)) || /--[a-z]/.test(message) || /\bline \d+|\bcolumn\b|\bcommand\b/.test(message);
  expect(names, `the message names the file, line, column or option: ${message}`).toBe(true);
  expect(snapshot(out), 'no output file is created').toBe(outBefore);
  expect(r.stdout).toBe('');
  return { ...r, out, message };
}
