import { Readable } from 'node:stream';
import { run } from '../../src/cli/run.js';

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs the CLI in-process, capturing both streams; `stdin` text is given as standard input. */
export async function cli(argv: string[], stdin?: string): Promise<CliResult> {
  let stdout = '';
  let stderr = '';
  const code = await run(argv, {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    stdin: Readable.from(stdin === undefined ? [] : [Buffer.from(stdin)]),
    env: {},
  });
  return { code, stdout, stderr };
}
