/**
 * Fixtures of the HTML report tests: a CSV whose column names and class labels are hostile
 * markup (seeded synthetic rows, for the safety check only), and the check that a page holds no
 * executable markup. Shared by html-safety.test.ts and html-browser.test.ts.
 */
import Papa from 'papaparse';
import { expect } from 'vitest';

export const HOSTILE_FEATURES = ['<script>alert(1)</script>', 'a"b onmouseover="alert(2)', "x&y'z", '</svg><img src=x onerror=alert(3)>'];
export const HOSTILE_TARGET = 'kind</title><script>alert(4)</script>';
export const HOSTILE_GROUP = 'g"\'&<b>';
export const HOSTILE_CLASSES = ['<script>alert(5)</script>', '" onclick="alert(6)', '&amp;</svg>', '</table><svg onload=alert(7)>'];
/** The values of the option `mode` of test/report/hostile-learner.mjs (kept equal to its list). */
export const HOSTILE_MODES = ['<script>alert(8)</script>', 'a"b', 'x&y', '</svg><b>'];

/** 160 rows, 4 classes; the class is a function of the first two features plus a seeded wobble. */
export function hostileCsv(): string {
  let state = 12345;
  const next = (): number => {
    state = (Math.imul(state, 1103515245) + 12345) >>> 0; // a linear congruential generator (common practice)
    return state / 2 ** 32;
  };
  const rows: string[][] = [];
  for (let i = 0; i < 160; i++) {
    const a = next();
    const b = next();
    const k = (a > 0.5 ? 1 : 0) + (b > 0.5 ? 2 : 0);
    rows.push([(a + 0.1 * next()).toFixed(3), (b + 0.1 * next()).toFixed(3), next().toFixed(3), String(i % 7), `grp${i % 8}`, HOSTILE_CLASSES[k]]);
  }
  return `${Papa.unparse([[...HOSTILE_FEATURES, HOSTILE_GROUP, HOSTILE_TARGET], ...rows], { newline: '\n' })}\n`;
}

/** Asserts that `html` holds no executable markup. */
export function expectNoExecutableMarkup(html: string): void {
  expect(html).not.toMatch(/<script/i);
  expect(html).not.toMatch(/javascript:/i);
  const tagList = [...html.matchAll(/<[a-zA-Z!/][^>]*>/g)].map((m) => m[0]);
  expect(tagList.length).toBeGreaterThan(50);
  let attributes = 0;
  for (const t of tagList) {
    // attributes as an HTML parser reads them: name, then an optional quoted or bare value
    const body = t.replace(/^<\/?[^\s>/]+/, '').replace(/\/?>$/, '');
    const rest = body.replace(/\s*([^\s=/>"']+)(?:\s*=\s*("[^"]*"|'[^']*'|[^\s"'=<>`]+))?/g, (_m, name: string) => {
      attributes++;
      expect(name, `attribute ${name} in ${t}`).not.toMatch(/^on/i);
      return '';
    });
    expect(rest.trim(), `unparsed rest of ${t}`).toBe('');
  }
  expect(attributes).toBeGreaterThan(100);
  const open = html.match(/<svg\b/g)?.length ?? 0;
  expect(open).toBeGreaterThan(0);
  expect(html.match(/<\/svg>/g)?.length).toBe(open);
  expect(html).not.toMatch(/<(img|iframe|object|embed|link|base|form|meta http-equiv="refresh")\b/i);
}

