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

  it('names the part files of an earlier split left in the folder, in one warning line, and keeps them (issue 25, item 19)', async () => {
    const out = join(tmp.dir, 'again');
    const split = (plan: string, ...more: string[]) => cli(['split', data, '--target', 'y', '--plan', plan, '--out', out, ...more]);
    const first = await split('kfold:5');
    expect(first.code).toBe(0);
    expect(first.stderr).not.toMatch(/warning/);
    tmp.file('again/notes.txt', 'not a part file');
    // the same plan again: every part is rewritten, nothing is left over
    const same = await split('kfold:5');
    expect(same.stderr).toBe(`foldwise: wrote 5 part files for kfold:5 to ${out}\n`);
    // fewer folds: fold-04 and fold-05 stay from the first split
    const fewer = await split('kfold:3');
    expect(fewer.code).toBe(0);
    const lines = fewer.stderr.split('\n').filter(Boolean);
    expect(lines).toEqual([
      `foldwise: wrote 3 part files for kfold:3 to ${out}`,
      `foldwise: warning: --out ${out} also holds 2 part files this split did not write, from an earlier split: fold-04.csv, fold-05.csv; remove them, or split into an empty folder`,
    ]);
    expect(readdirSync(out).sort()).toEqual(['fold-01.csv', 'fold-02.csv', 'fold-03.csv', 'fold-04.csv', 'fold-05.csv', 'notes.txt']);
    // other names: a holdout split beside the five fold files, and a format change
    const other = await split('holdout:0.5/0.5', '--format', 'arrow');
    expect(other.stderr.split('\n').filter(Boolean)[1]).toBe(
      `foldwise: warning: --out ${out} also holds 5 part files this split did not write, from an earlier split: fold-01.csv, fold-02.csv, fold-03.csv, fold-04.csv, fold-05.csv; remove them, or split into an empty folder`,
    );
    const csvAgain = await split('holdout:0.5/0.5');
    expect(csvAgain.stderr).toMatch(/holds 7 part files this split did not write, from an earlier split: fold-01\.csv, .*, fold-05\.csv, train\.arrow, validation\.arrow; remove them/);
  });

  it('counts leftovers beyond the first ten instead of naming them', async () => {
    const out = join(tmp.dir, 'many');
    expect((await cli(['split', data, '--target', 'y', '--plan', 'kfold:4x3', '--out', out])).code).toBe(0);
    const r = await cli(['split', data, '--target', 'y', '--plan', 'kfold:4', '--out', out]);
    expect(r.stderr).toContain(': r1-fold-01.csv, r1-fold-02.csv, r1-fold-03.csv, r1-fold-04.csv, r2-fold-01.csv, r2-fold-02.csv, r2-fold-03.csv, r2-fold-04.csv, r3-fold-01.csv, r3-fold-02.csv and 2 more; remove them');
    expect(r.stderr).toContain('also holds 12 part files');
    expect(r.stderr.split('\n').filter(Boolean).length).toBe(2);
  });
});
