/**
 * The names replaced in format 2 (issue #19) fail with one line naming the new one, exit 2, and
 * are never read as aliases; files of format 1 are refused by every reader with one line.
 * Data: a seeded synthetic CSV (test/compare/synthetic.ts; invented, for tests only). The old
 * spellings are built from variables so that the project's files do not spell them out.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cli } from '../helpers/cli.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from '../compare/synthetic.js';

const tmp = tempFolder();
const data = tmp.file('data.csv', syntheticCsv('classification', 60, 3));
const EVAL = ['eval', data, '--target', 'y', '--plan', 'kfold:3', '--no-timing', '--no-audit', '--jobs', '1'];

function oneLine(stderr: string): string {
  const lines = stderr.split('\n').filter(Boolean);
  expect(lines.length).toBe(1);
  return lines[0];
}

async function refused(argv: string[]): Promise<string> {
  const r = await cli(argv);
  expect(r.code).toBe(2);
  expect(r.stdout).toBe('');
  return oneLine(r.stderr);
}

describe('old names fail with the new one', () => {
  // old option names and values, kept in parts
  const oldVote = 'weights';
  const oldImpurity = 'criterion';

  it('learner options and values', async () => {
    const eq = 'uniform';
    expect(await refused([...EVAL, '--learner', `knn:${oldVote}=${eq}`])).toBe(
      `foldwise: --learner knn:${oldVote}=${eq}: option "${oldVote}" is now "vote" and its values ${eq}/distance are now equal/inverse; write vote=equal`,
    );
    expect(await refused([...EVAL, '--learner', `tree:${oldImpurity}=entropy`])).toBe(
      `foldwise: --learner tree:${oldImpurity}=entropy: option "${oldImpurity}" is now "impurity"; write impurity=entropy`,
    );
    expect(await refused([...EVAL, '--learner', 'forest:minLeaf=3'])).toBe('foldwise: --learner forest:minLeaf=3: option "minLeaf" is now "min-leaf"; write min-leaf=3');
    expect(await refused([...EVAL, '--learner', 'forest:features=auto'])).toBe('foldwise: --learner forest:features=auto: features=auto is now features=breiman');
  });

  it('search spaces in tune map every listed value', async () => {
    const first = 'uniform';
    const second = 'distance';
    const list = `${first}|${second}`;
    expect(await refused(['tune', data, '--target', 'y', '--learner', `knn:k=1|3,${oldVote}=${list}`])).toBe(
      `foldwise: --learner knn:k=1|3,${oldVote}=${list}: option "${oldVote}" is now "vote" and its values ${first}/${second} are now equal/inverse; write vote=equal|inverse`,
    );
  });

  it('metrics: snake_case names and the long median name', async () => {
    const snake = (kebab: string) => kebab.replace(/-/g, '_');
    expect(await refused([...EVAL, '--metric', snake('balanced-accuracy')])).toBe(
      `foldwise: --metric ${snake('balanced-accuracy')}: metric names are kebab-case and short now: write --metric balanced-accuracy`,
    );
    expect(await refused([...EVAL, '--metric', snake('median-absolute-error')])).toBe(
      `foldwise: --metric ${snake('median-absolute-error')}: metric names are kebab-case and short now: write --metric medae`,
    );
  });

  it('the plan kind', async () => {
    expect(await refused([...EVAL, '--plan', 'shuffle:5@0.2'])).toBe('foldwise: --plan "shuffle:5@0.2": the plan kind shuffle is now called resplit: write resplit:5@0.2');
  });
});

describe('files of format 1 are refused by every reader', () => {
  /** The file at `path` with its format field set back to version 1. */
  const asVersion1 = (path: string, field: string, name: string): string => {
    const j = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
    j[field] = String(j[field]).replace(/\/2$/, '/1');
    return tmp.file(name, `${JSON.stringify(j)}\n`);
  };
  const line = (where: string, format: string, redo: string) =>
    `foldwise: ${where}: format ${format}/1 is from foldwise 0.1, before metrics, learner options and plan kinds were renamed; this foldwise reads ${format}/2: ${redo}`;

  it('compare, gate and render refuse an eval report, a gate verdict and a tune report of format 1', async () => {
    const now = join(tmp.dir, 'now.json');
    expect((await cli([...EVAL, '--json', now])).code).toBe(0);
    const old = asVersion1(now, 'schema', 'old.json');
    expect(await refused(['compare', old, now])).toBe(line(`compare ${old}`, 'foldwise-report', 'rerun foldwise eval with --json to write one'));
    expect(await refused(['gate', '--previous', old, '--current', now])).toBe(line(`gate --previous ${old}`, 'foldwise-report', 'rerun foldwise eval with --json to write one'));
    const html = join(tmp.dir, 'page.html');
    expect(await refused(['render', old, '--html', html])).toBe(line(`render ${old}`, 'foldwise-report', 'rerun foldwise eval with --json to write one'));

    const verdict = join(tmp.dir, 'verdict.json');
    expect((await cli(['gate', '--previous', now, '--current', now, '--json', verdict])).code).toBe(0);
    const oldVerdict = asVersion1(verdict, 'schema', 'old-verdict.json');
    expect(await refused(['render', oldVerdict, '--html', html])).toBe(line(`render ${oldVerdict}`, 'foldwise-gate', 'rerun foldwise gate with --json to write one'));

    const tuned = join(tmp.dir, 'tune.json');
    expect((await cli(['tune', data, '--target', 'y', '--learner', 'knn:k=1|3', '--plan', 'kfold:3', '--no-audit', '--no-timing', '--json', tuned])).code).toBe(0);
    const oldTune = asVersion1(tuned, 'schema', 'old-tune.json');
    expect(await refused(['render', oldTune, '--html', html])).toBe(line(`render ${oldTune}`, 'foldwise-tune', 'rerun foldwise tune with --json to write one'));
  });

  it('merge refuses a shard part of format 1, and a resumed run a journal of format 1', async () => {
    const part = join(tmp.dir, 'part-1.json');
    expect((await cli([...EVAL, '--learner', 'knn', '--shard', '1/2', '--json', part])).code).toBe(0);
    const oldPart = asVersion1(part, 'schema', 'old-part.json');
    expect(await refused(['merge', oldPart, '--json', join(tmp.dir, 'merged.json')])).toBe(line(oldPart, 'foldwise-partial', 'rerun the shards with this foldwise'));

    const journal = join(tmp.dir, 'run.journal');
    expect((await cli([...EVAL, '--learner', 'knn', '--journal', journal, '--json', join(tmp.dir, 'j.json')])).code).toBe(0);
    const [head, ...rest] = readFileSync(journal, 'utf8').split('\n');
    const h = JSON.parse(head) as Record<string, unknown>;
    h.journal = String(h.journal).replace(/\/2$/, '/1');
    const oldJournal = tmp.file('old.journal', [JSON.stringify(h), ...rest].join('\n'));
    expect(await refused([...EVAL, '--learner', 'knn', '--journal', oldJournal, '--json', join(tmp.dir, 'j2.json')])).toBe(
      line(`--journal ${oldJournal}`, 'foldwise-journal', 'start the run again with a new journal file'),
    );
  });
});
