import { expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { VERSION } from '../src/version.js';

it('keeps the tool version equal to package.json', () => {
  expect(VERSION).toBe(JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')).version);
});
