/**
 * The README's recipes, as the tests run them: a fenced block is picked by a line it contains,
 * so a test breaks as soon as the README's recipe changes shape, and runs what a reader copies.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect } from 'vitest';
import { REPO } from './shell.js';

/** The one fenced block of README.md with a line that starts with `start` (after indentation). */
export function readmeBlock(start: string): string {
  const readme = readFileSync(join(REPO, 'README.md'), 'utf8');
  const blocks = [...readme.matchAll(/^```[a-z]*\n([\s\S]*?)^```$/gm)].map((m) => m[1]);
  const hits = blocks.filter((b) => b.split('\n').some((l) => l.trimStart().startsWith(start)));
  expect(hits, `README.md: exactly one fenced block with a line starting ${JSON.stringify(start)}`).toHaveLength(1);
  return hits[0];
}
