/**
 * Run identity, journal checksums, the errors of the user's code and conditions, and the
 * messages of merge and tune (issues #26 and #25). Data: the bundled invented packhouse example
 * and seeded synthetic rows (test/compare/synthetic.ts); the checks are on files and messages.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { plainText } from '../../src/learners/command/invoke.js';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from '../compare/synthetic.js';

const tmp = tempFolder();
const data = tmp.file('d.csv', syntheticCsv('classification', 150, 3).replace(/\n(.*?),/g, (m, a, o) => (o % 7 === 0 ? `\nNA,` : m)));
const base = ['eval', data, '--target', 'y', '--learner', 'knn', '--plan', 'kfold:3', '--no-timing', '--no-audit', '--jobs', '1'];

describe('journal lines carry a checksum', () => {
  it('a changed digit in the middle is refused naming the journal and line; a broken tail is cut and recomputed', async () => {
    const journal = join(tmp.dir, 'sum.journal');
    const whole = await cli([...base, '--journal', journal, '--json', '-']);
    expect(whole.code).toBe(0);
    const lines = readFileSync(journal, 'utf8').split('\n');
    expect(lines.filter(Boolean).length).toBe(7); // header + 2 learners x 3 folds
    // flip one digit of the predictions on line 3
    const flipped = lines.slice();
    flipped[2] = flipped[2].replace(/"predicted":\[(\d)/, (_, d) => `"predicted":[${d === '0' ? '1' : '0'}`);
    expect(flipped[2]).not.toBe(lines[2]);
    writeFileSync(journal, flipped.join('\n'));
    const bad = await cli([...base, '--journal', journal, '--json', '-']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/^foldwise: --journal .*sum\.journal: line 3 fails its checksum/);
    // the same damage on the last line: cut there, that task runs again, the report is the same
    const tail = lines.slice();
    tail[6] = tail[6].replace(/"predicted":\[(\d)/, (_, d) => `"predicted":[${d === '0' ? '1' : '0'}`);
    expect(tail[6]).not.toBe(lines[6]);
    writeFileSync(journal, tail.join('\n'));
    const cut = await cli([...base, '--journal', journal, '--json', '-']);
    expect(cut.code).toBe(0);
    expect(cut.stderr).toMatch(/line 7 on, the lines fail their checksum .* cut off there/);
    expect(cut.stdout).toBe(whole.stdout);
    const again = readFileSync(journal, 'utf8').split('\n');
    expect(again.length).toBe(lines.length);
    expect(again.slice(0, 6)).toEqual(lines.slice(0, 6));
    expect(JSON.parse(again[6]).id).toBe(JSON.parse(lines[6]).id);
  });

  it('--journal naming a folder or a device is exit 2 naming it', async () => {
    const dir = join(tmp.dir, 'jdir');
    mkdirSync(dir);
    const r = await cli([...base, '--journal', dir, '--json', '-']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--journal .*jdir: is a folder/);
    const z = await cli([...base, '--journal', '/dev/zero', '--json', '-']);
    expect(z.code).toBe(2);
    expect(z.stderr).toMatch(/--journal \/dev\/zero: is not a regular file/);
  });
});

describe('everything that changes a result is part of the run identity', () => {
  it('a resume with another --missing or --categorical is refused; both are in the report settings', async () => {
    const journal = join(tmp.dir, 'id.journal');
    const first = await cli([...base, '--journal', journal, '--json', '-']);
    expect(first.code).toBe(0);
    expect(JSON.parse(first.stdout).settings).toEqual({ impute: 'median', missing: ['?', 'N/A', 'NA', 'NaN', 'n/a', 'na', 'nan', 'null'].filter((t) => JSON.parse(first.stdout).settings.missing.includes(t)), categorical: [], delimiter: ',' });
    const r = await cli([...base, '--missing', 'NA,?', '--journal', journal, '--json', '-']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/it belongs to another run, which differs in missing/);
    const c = await cli([...base, '--categorical', 'x2', '--journal', journal, '--json', '-']);
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/differs in categorical \(\[\] vs \["x2"\]\), kinds/);
  });

  it('merge refuses parts read with different --categorical, and names a part given twice', async () => {
    const p1 = join(tmp.dir, 'p1.json');
    const p2 = join(tmp.dir, 'p2.json');
    expect((await cli([...base, '--shard', '1/2', '--json', p1])).code).toBe(0);
    expect((await cli([...base, '--categorical', 'x2', '--shard', '2/2', '--json', p2])).code).toBe(0);
    const m = await cli(['merge', p1, p2, '--json', '-']);
    expect(m.code).toBe(2);
    expect(m.stderr).toMatch(/p2\.json belongs to another run than .*p1\.json: it differs in categorical \(.*p2\.json: \["x2"\], .*p1\.json: \[\]\)/);
    const twice = await cli(['merge', p1, p1, '--json', '-']);
    expect(twice.code).toBe(2);
    expect(twice.stderr).toMatch(/p1\.json and .*p1\.json are both shard 1\/2 \(doubled\); give each part once/);
  });
});

describe("the user's code and conditions are exit 2, naming the cause", () => {
  const throwing = tmp.file('throws.mjs', `export default { tasks: ['classification'], params: [], needsScaling: false, doc: 'throws', fit() { throw new Error('my fit broke'); }, load() { throw new Error('no'); } };\n`);
  it('a module: learner whose fit throws names the module and fold; --on-fold-error skip records it', async () => {
    const r = await cli([...base.filter((a) => a !== 'knn' && a !== '--learner'), '--learner', `module:${throwing}`, '--json', '-']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^foldwise: module:.*throws\.mjs fold r1\.f1: the learner threw: my fit broke/);
    const s = await cli([...base.filter((a) => a !== 'knn' && a !== '--learner'), '--learner', `module:${throwing}`, '--on-fold-error', 'skip', '--json', '-']);
    expect(s.code).toBe(0);
    expect(JSON.stringify(JSON.parse(s.stdout))).toMatch(/my fit broke/);
  });

  it('tune prints exactly one stderr line when it refuses its input', async () => {
    const r = await cli(['tune', data, '--target', 'nope', '--learner', 'knn:k=1|3', '--plan', 'kfold:3', '--inner', 'kfold:2']);
    expect(r.code).toBe(2);
    expect(r.stderr.split('\n').filter(Boolean)).toHaveLength(1);
    expect(r.stderr).toMatch(/nope/);
  });

  it("a program's escape sequences and control characters are not copied into an error line", () => {
    expect(plainText('\u001b[31mred\u001b[0m fail\u0007\u0000 \u001b]0;title\u0007done')).toBe('red fail done');
  });
});
