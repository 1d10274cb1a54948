/**
 * Writing a command's reports where the flags say: `--json FILE|-` and `--markdown FILE|-`
 * (and `--html FILE|-` where a command has it), atomically for files; with none of them, the
 * Markdown report goes to standard output. Renderers are called only for what is written.
 */
import { writeFileAtomic } from '../report/atomic.js';
import type { Io } from './run.js';

export interface OutputFlags {
  json?: string;
  markdown?: string;
  html?: string;
}

export interface Renderers {
  json(): string;
  markdown(): string;
  html?(): string;
}

export function writeOutputs(io: Io, flags: OutputFlags, render: Renderers): void {
  const one = (path: string | undefined, option: string, text: (() => string) | undefined): void => {
    if (!path || !text) return;
    if (path === '-') io.stdout.write(text());
    else writeFileAtomic(path, text(), option);
  };
  one(flags.json, '--json', render.json);
  one(flags.markdown, '--markdown', render.markdown);
  one(flags.html, '--html', render.html);
  if (!flags.json && !flags.markdown && !(flags.html && render.html)) io.stdout.write(render.markdown());
}
