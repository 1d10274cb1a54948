/**
 * Writing a command's reports where the flags say: `--json FILE|-` and `--markdown FILE|-`
 * (and `--html FILE|-` where a command has it); with none of them, the Markdown report goes to
 * standard output. Renderers are called only for what is written. The files are written as one
 * step (`writeFilesAtomic`): all of them or, when one cannot be written, none; standard output
 * comes after the files.
 */
import { writeFilesAtomic, type FileWrite } from '../report/atomic.js';
import type { Io } from './io.js';

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

export function writeOutputs(io: Io, flags: OutputFlags, render: Renderers, extra: readonly FileWrite[] = []): void {
  const files: FileWrite[] = [...extra];
  const toStdout: string[] = [];
  const one = (path: string | undefined, option: string, text: (() => string) | undefined): void => {
    if (path === undefined || !text) return;
    if (path === '-') toStdout.push(text());
    else files.push({ path, text: text(), option });
  };
  one(flags.json, '--json', render.json);
  one(flags.markdown, '--markdown', render.markdown);
  one(flags.html, '--html', render.html);
  if (flags.json === undefined && flags.markdown === undefined && !(flags.html !== undefined && render.html)) toStdout.push(render.markdown());
  writeFilesAtomic(files);
  for (const t of toStdout) io.stdout.write(t);
}
