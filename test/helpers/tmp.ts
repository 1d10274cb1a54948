import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';

/** A private temporary folder removed after the test file; `file(name, text)` writes into it. */
export function tempFolder(): { dir: string; file(name: string, content: string | Buffer): string } {
  const dir = mkdtempSync(join(tmpdir(), 'foldwise-test-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return {
    dir,
    file(name, content) {
      const p = join(dir, name);
      writeFileSync(p, content);
      return p;
    },
  };
}
