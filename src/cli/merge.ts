/** `foldwise merge PARTS... --json OUT`: parts of a sharded run into the report of the whole run. */
import { writeOutputs } from './output.js';
import type { Command } from 'commander';
import { readFileSync } from 'node:fs';
import { EXIT_OK, InputError } from '../errors.js';
import { getMetric } from '../metrics/index.js';
import { guardPaths } from './guard.js';
import { renderJson } from '../report/json.js';
import { renderMarkdown } from '../report/markdown.js';
import { mergeParts, parsePartial } from '../run/partial.js';
import type { Io } from './run.js';

interface MergeFlags {
  json?: string;
  markdown?: string;
  timing: boolean;
}

function readPart(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(`${path}: ${code === 'ENOENT' ? 'no such file; check the path' : `cannot be read (${code})`}`);
  }
}

export function registerMerge(prog: Command, io: Io, setCode: (code: number) => void): void {
  prog
    .command('merge')
    .description('merge the parts of a sharded run (eval --shard) into one report')
    .argument('<parts...>', 'part files written by foldwise eval --shard I/N --json FILE')
    .option('--json <file>', 'write the JSON report to a file, or - for standard output')
    .option('--markdown <file>', 'write the Markdown report to a file, or - for standard output')
    .option('--no-timing', 'leave timings out (byte-identical to a single run with --no-timing)')
    .option('--verbose', 'print stack traces of errors')
    .action((paths: string[], flags: MergeFlags) => {
      guardPaths(paths.map((path) => ({ option: 'merge', path })), [{ option: '--json', path: flags.json }, { option: '--markdown', path: flags.markdown }]);
      const parts = paths.map((p) => parsePartial(readPart(p), p));
      const report = mergeParts(parts, paths, flags.timing);
      writeOutputs(io, flags, { json: () => renderJson(report), markdown: () => renderMarkdown(report, (m) => getMetric(m).higherIsBetter) });
      setCode(EXIT_OK);
    });
}
