/**
 * The house rule of DEVELOPERS.md ("The floors"): every file imports only files of its own stage
 * or of a lower floor, and no file reaches itself through its imports. The drawing is read from
 * the source: every relative import and re-export of every file under src/.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

/** Floors from the bottom. A file directly in src/ is of the stage "core", except index.ts, the public API at the top. */
export const FLOORS: readonly (readonly string[])[] = [
  ['core'],
  ['data', 'metrics'],
  ['io', 'stats'],
  ['model', 'plans', 'prep'],
  ['learners'],
  ['audit', 'compare', 'slices', 'curves', 'threshold'],
  ['run'],
  ['search', 'score', 'growth'],
  ['report'],
  ['cli', 'api'],
];

const SRC = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'src');

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? files(p) : f.endsWith('.ts') ? [p] : [];
  });
}

function stageOf(file: string): string {
  const rel = relative(SRC, file);
  if (!rel.includes('/')) return rel === 'index.ts' ? 'api' : 'core';
  return rel.split('/')[0];
}

function floorOf(stage: string): number {
  return FLOORS.findIndex((f) => f.includes(stage));
}

/** Every relative module a file imports or re-exports, as absolute .ts paths. */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const out: string[] = [];
  for (const m of text.matchAll(/(?:from|import)\s*\(?\s*['"](\.{1,2}\/[^'"]+)['"]/g)) {
    out.push(normalize(join(dirname(file), m[1])).replace(/\.js$/, '.ts'));
  }
  return out;
}

const all = files(SRC);
const graph = new Map(all.map((f) => [f, importsOf(f)]));

describe('the floors of the house', () => {
  it('reads the source', () => {
    expect(all.length).toBeGreaterThan(100);
    expect([...graph.values()].flat().length).toBeGreaterThan(300);
  });

  it('knows every stage', () => {
    const unknown = [...new Set(all.map(stageOf))].filter((s) => floorOf(s) < 0);
    expect(unknown, `src/${unknown[0]}/ is on no floor: add it to FLOORS in test/house/layers.test.ts and to DEVELOPERS.md`).toEqual([]);
  });

  it('no file imports a file of a higher floor', () => {
    const wrong: string[] = [];
    for (const [file, deps] of graph) {
      const from = stageOf(file);
      for (const d of deps) {
        const to = stageOf(d);
        if (to !== from && floorOf(to) > floorOf(from)) wrong.push(`${relative(SRC, file)} (${from}, floor ${floorOf(from)}) imports ${relative(SRC, d)} (${to}, floor ${floorOf(to)})`);
      }
    }
    expect(wrong, `imports that go up a floor:\n${wrong.join('\n')}`).toEqual([]);
  });

  it('no import circle', () => {
    const state = new Map<string, 1 | 2>();
    const circles: string[] = [];
    const visit = (f: string, path: string[]): void => {
      state.set(f, 1);
      for (const d of graph.get(f) ?? []) {
        if (!graph.has(d)) continue;
        if (state.get(d) === 1) circles.push([...path.slice(path.indexOf(d)), d].map((x) => relative(SRC, x)).join(' -> '));
        else if (!state.has(d)) visit(d, [...path, d]);
      }
      state.set(f, 2);
    };
    for (const f of all) if (!state.has(f)) visit(f, [f]);
    expect(circles, `import circles:\n${circles.join('\n')}`).toEqual([]);
  });
});
