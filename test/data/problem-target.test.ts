/**
 * The classification target's classes and codes (src/data/problem.ts), checked against a plain
 * recomputation in this file: the class names are the distinct texts of the used rows, numbers
 * in numeric order and labels in code-point order (the rule the README gives), and each row's
 * code is its text's place in that list. The rows with a missing target are left out.
 */
import { describe, expect, it } from 'vitest';
import { loadCsv } from '../../src/data/load-csv.js';
import { defineProblem } from '../../src/data/problem.js';
import { createRng } from '../../src/rng.js';

const text = (t: string) => ({ text: t, name: 'mem.csv' });

/** The reference: names sorted by the given order, codes by name lookup. */
function reference(cells: readonly string[], numeric: boolean): { classes: string[]; codes: number[] } {
  const used = cells.filter((c) => c !== '');
  const keyed = numeric ? used.map((c) => String(Number(c))) : used;
  const distinct = [...new Set(keyed)];
  distinct.sort(numeric ? (a, b) => Number(a) - Number(b) : (a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return { classes: distinct, codes: keyed.map((k) => distinct.indexOf(k)) };
}

describe('classification target', () => {
  it('orders numeric classes by value and codes every used row (missing rows left out)', async () => {
    const rng = createRng(7);
    const pool = ['10', '2', '-3', '0', '2', '', '7'];
    const cells = Array.from({ length: 400 }, () => pool[rng.int(pool.length)]);
    const t = await loadCsv(text(`x,y\n${cells.map((c, i) => `${i},${c}`).join('\n')}\n`));
    const p = defineProblem(t, { target: 'y', task: 'classification' });
    const want = reference(cells, true);
    expect(want.classes).toEqual(['-3', '0', '2', '7', '10']);
    expect(p.target.task === 'classification' && p.target.classes).toEqual(want.classes);
    expect(p.rows.length).toBe(cells.filter((c) => c !== '').length);
    expect(p.target.task === 'classification' && Array.from(p.target.codes)).toEqual(want.codes);
  });

  it('reads -0 and 0 as one class "0", as their text is one', async () => {
    const t = await loadCsv(text('x,y\n1,-0\n2,0\n3,1\n4,-0\n'));
    const p = defineProblem(t, { target: 'y', task: 'classification' });
    expect(p.target.task === 'classification' && p.target.classes).toEqual(['0', '1']);
    expect(p.target.task === 'classification' && Array.from(p.target.codes)).toEqual([0, 0, 1, 0]);
  });

  it('orders label classes by code point, whatever order the file meets them in', async () => {
    const rng = createRng(11);
    const pool = ['pear', 'Apple', 'apple', 'fig', '', 'Zed'];
    const cells = Array.from({ length: 300 }, () => pool[rng.int(pool.length)]);
    const t = await loadCsv(text(`x,y\n${cells.map((c, i) => `${i},${c}`).join('\n')}\n`));
    const p = defineProblem(t, { target: 'y' });
    const want = reference(cells, false);
    expect(want.classes).toEqual(['Apple', 'Zed', 'apple', 'fig', 'pear']);
    expect(p.target.task === 'classification' && p.target.classes).toEqual(want.classes);
    expect(p.target.task === 'classification' && Array.from(p.target.codes)).toEqual(want.codes);
  });
});
