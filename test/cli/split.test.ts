import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
// invented rows for a mechanical check: quoted fields must come back with their text intact
const rows = Array.from({ length: 40 }, (_, i) => `${i},"note, ${i}",${i % 4 === 0 ? 'b' : 'a'}`);
const data = tmp.file('d.csv', `id,note,y\n${rows.join('\n')}\n`);

const read = (dir: string) => Object.fromEntries(readdirSync(dir).sort().map((f) => [f, readFileSync(join(dir, f), 'utf8')]));

describe('foldwise split', () => {
  it('writes train/validation/holdout files that partition the rows, identically for the same seed', async () => {
    for (const out of ['h1', 'h2']) {
      const r = await cli(['split', data, '--target', 'y', '--plan', 'holdout:0.5/0.25/0.25', '--out', join(tmp.dir, out)]);
      expect(r.code).toBe(0);
    }
    const a = read(join(tmp.dir, 'h1'));
    expect(Object.keys(a)).toEqual(['holdout.csv', 'train.csv', 'validation.csv']);
    expect(a).toEqual(read(join(tmp.dir, 'h2')));
    const body = (t: string) => t.trim().split('\n').slice(1);
    const all = [...body(a['train.csv']), ...body(a['validation.csv']), ...body(a['holdout.csv'])].sort();
    expect(all).toEqual([...rows].sort());
    expect(body(a['train.csv']).length).toBe(20);
    // stratified: 10 "b" rows of 40 -> 5 in train, 2 or 3 in validation and holdout
    expect(body(a['train.csv']).filter((l) => l.endsWith(',b')).length).toBe(5);
  });

  it('writes one file per k-fold test part and an assignment CSV', async () => {
    const out = join(tmp.dir, 'k');
    const r = await cli(['split', data, '--target', 'y', '--plan', 'kfold:4x2', '--out', out, '--assign', join(tmp.dir, 'k.csv')]);
    expect(r.code).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['r1-fold-01.csv', 'r1-fold-02.csv', 'r1-fold-03.csv', 'r1-fold-04.csv', 'r2-fold-01.csv', 'r2-fold-02.csv', 'r2-fold-03.csv', 'r2-fold-04.csv']); // every repeat named the same way (#19)
    const lines = readFileSync(join(tmp.dir, 'k.csv'), 'utf8').trim().split('\n');
    // 40 rows x 4 folds x 2 repeats memberships (each row is test once and train three times a repeat)
    expect(lines.length - 1).toBe(40 * 4 * 2);
    expect(lines[1]).toMatch(/^\d+,\d+,1,1,train$/);
    // one repeat: no repeat prefix
    const one = join(tmp.dir, 'k1');
    expect((await cli(['split', data, '--target', 'y', '--plan', 'kfold:3', '--out', one])).code).toBe(0);
    expect(readdirSync(one).sort()).toEqual(['fold-01.csv', 'fold-02.csv', 'fold-03.csv']);
  });

  it('refuses leave-one-out part files and asks for --out or --assign', async () => {
    expect((await cli(['split', data, '--target', 'y', '--plan', 'loo', '--out', join(tmp.dir, 'l')])).stderr).toMatch(/use --assign for leave-one-out/);
    const r = await cli(['split', data, '--target', 'y']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/give --out DIR/);
  });
});
