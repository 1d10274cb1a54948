/**
 * eval --importance (issue 22): permutation importance on seeded synthetic processes with a
 * known structure, so the right answer is known by construction:
 * - regression y = 3 strong + 0.5 weak + 1.5 [grade = c] + e, with noise features that play no
 *   part: importance ranks strong > weak > every noise feature, the noise features' corrected
 *   intervals cover zero, and the categorical grade is one input (its one-hot columns move together);
 * - two classes separated by one signal carried by two identical columns: a forest reads either
 *   copy (on some folds one, on others the other), so shuffling one copy alone is not shown to
 *   matter (its corrected interval covers zero), while shuffling the pair (the audit's correlated
 *   cluster) takes accuracy to about chance on every fold (the masking Strobl et al. 2008, "Conditional
 *   variable importance for random forests", BMC Bioinformatics 9:307, describe for correlated
 *   predictors).
 * And the guarantee of issue 8 kept: the same bytes from --jobs 1 and 2, shards + merge, and a
 * journal resume.
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { createRng } from '../../src/rng.js';
import { cli } from '../helpers/cli.js';
import { schemaCheck } from '../helpers/schema.js';
import { tempFolder } from '../helpers/tmp.js';

const tmp = tempFolder();
const expectReport = schemaCheck('report.schema.json');

function gauss(rng: { next(): number }): number {
  // Box-Muller
  const u = 1 - rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

function regressionCsv(n: number): string {
  const rng = createRng(2201);
  const lines = ['strong,weak,grade,noise1,noise2,noise3,y'];
  for (let i = 0; i < n; i++) {
    const s = gauss(rng);
    const w = gauss(rng);
    const g = ['a', 'b', 'c'][rng.int(3)];
    const noise = [gauss(rng), gauss(rng), gauss(rng)];
    const y = 3 * s + 0.5 * w + (g === 'c' ? 1.5 : 0) + gauss(rng);
    lines.push([s, w, g, ...noise, y].map((v) => (typeof v === 'number' ? v.toFixed(6) : v)).join(','));
  }
  return `${lines.join('\n')}\n`;
}

function copiesCsv(n: number): string {
  const rng = createRng(2202);
  const lines = ['signal,copy,noise1,noise2,noise3,label'];
  for (let i = 0; i < n; i++) {
    const up = i % 2 === 0;
    const s = (up ? 2 : -2) + 0.5 * gauss(rng);
    lines.push([s.toFixed(6), s.toFixed(6), gauss(rng).toFixed(6), gauss(rng).toFixed(6), gauss(rng).toFixed(6), up ? 'up' : 'down'].join(','));
  }
  return `${lines.join('\n')}\n`;
}

const regression = tmp.file('regression.csv', regressionCsv(400));
const copies = tmp.file('copies.csv', copiesCsv(300));

interface Input {
  name: string;
  folds: (number | null)[];
  summary: { mean: number; ci95: [number, number] | null } | null;
}
type Learner = { spec: string; name: string; importance?: { inputs: Input[]; own?: { kind: string; features: { name: string; mean: number }[] } } };

function inputsOf(report: { learners: Learner[] }, spec: string): Map<string, Input> {
  const l = report.learners.find((x) => x.spec === spec)!;
  expect(l.importance).toBeDefined();
  return new Map(l.importance!.inputs.map((i) => [i.name, i]));
}

describe('permutation importance on a known structure', () => {
  it('ranks strong > weak > noise, noise intervals cover zero, a categorical feature is one input', async () => {
    const r = await cli(['eval', regression, '--target', 'y', '--learner', 'linear', '--plan', 'kfold:10', '--importance', '--json', '-', '--no-timing', '--quiet', '--no-audit']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expectReport(report);
    expect(report.importance.metric).toBe('rmse');
    expect(report.importance.repeats).toBe(5);
    // one input per feature: grade's one-hot columns are shuffled together
    expect(report.importance.inputs.map((i: { name: string }) => i.name)).toEqual(['strong', 'weak', 'grade', 'noise1', 'noise2', 'noise3']);
    const imp = inputsOf(report, 'linear');
    const mean = (name: string): number => imp.get(name)!.summary!.mean;
    for (const [name, i] of imp) expect(i.folds.length, name).toBe(10);
    expect(mean('strong')).toBeGreaterThan(mean('weak'));
    expect(mean('weak')).toBeGreaterThan(0);
    for (const name of ['strong', 'weak', 'grade']) expect(imp.get(name)!.summary!.ci95![0], name).toBeGreaterThan(0);
    for (const name of ['noise1', 'noise2', 'noise3']) {
      const ci = imp.get(name)!.summary!.ci95!;
      expect(mean('weak'), name).toBeGreaterThan(mean(name));
      expect(ci[0], name).toBeLessThanOrEqual(0);
      expect(ci[1], name).toBeGreaterThanOrEqual(0);
    }
    // the baseline ignores its inputs: every drop is exactly zero
    const base = inputsOf(report, 'baseline');
    expect([...base.values()].every((i) => i.summary!.mean === 0)).toBe(true);
  });

  it('two copies of one signal: each alone looks unimportant, the pair as a cluster is important', async () => {
    const r = await cli(['eval', copies, '--target', 'label', '--learner', 'forest:trees=60', '--plan', 'kfold:5', '--importance', '--importance-clusters', '--json', '-', '--no-timing', '--quiet', '--no-audit']);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expectReport(report);
    expect(report.importance.metric).toBe('accuracy');
    const cluster = report.importance.inputs.find((i: { kind: string }) => i.kind === 'cluster');
    expect(cluster).toEqual({ name: 'cluster(signal+copy)', kind: 'cluster', members: ['signal', 'copy'] });
    const spec = report.learners[1].spec;
    const imp = inputsOf(report, spec);
    const pair = imp.get('cluster(signal+copy)')!.summary!;
    // near-perfect separation (means +-2, sd 0.5): shuffling both copies leaves about chance
    expect(pair.mean).toBeGreaterThan(0.3);
    expect(pair.ci95![0]).toBeGreaterThan(0);
    expect(pair.ci95![0]).toBeGreaterThan(0.3);
    for (const name of ['signal', 'copy']) {
      // alone: on some folds the forest reads the other copy, so the corrected interval covers 0
      const alone = imp.get(name)!.summary!;
      expect(alone.ci95![0], name).toBeLessThanOrEqual(0);
      expect(alone.mean, name).toBeLessThan(pair.mean);
    }
    // the forest's own impurity importance, per feature, shares summing to 1
    const own = report.learners[1].importance.own;
    expect(own.kind).toBe('impurity');
    expect(own.features.length).toBe(5);
    expect(Math.abs(own.features.reduce((s: number, f: { mean: number }) => s + f.mean, 0) - 1)).toBeLessThan(1e-9);
  });

  it('shows a Markdown table and an HTML chart, with boost gain beside the drops', async () => {
    const args = ['eval', copies, '--target', 'label', '--learner', 'boost:rounds=20', '--plan', 'kfold:3', '--importance', '--importance-repeats', '2', '--no-timing', '--quiet'];
    const md = await cli([...args, '--markdown', '-']);
    expect(md.code).toBe(0);
    expect(md.stdout).toContain('## Permutation importance: drop of accuracy when an input is shuffled');
    expect(md.stdout).toMatch(/\| input \| mean drop \| sd \| 95% interval \(corrected\) \| own \(gain, share\) \|/);
    expect(md.stdout).not.toContain('### baseline');
    const html = await cli([...args, '--html', '-']);
    expect(html.code).toBe(0);
    expect(html.stdout).toContain('id="importance-2"');
    expect(html.stdout).toMatch(/own gain share/);
    expect((html.stdout.match(/class="input"/g) ?? []).length).toBe(5);
  });

  it('refuses bad settings with exit 2 and one line naming the option', async () => {
    const zero = await cli(['eval', copies, '--target', 'label', '--importance', '--importance-repeats', '0', '--quiet']);
    expect(zero.code).toBe(2);
    expect(zero.stderr).toMatch(/^foldwise: --importance-repeats 0: expected a whole number from 1 to 1000\n$/);
    const alone = await cli(['eval', copies, '--target', 'label', '--importance-clusters', '--quiet']);
    expect(alone.code).toBe(2);
    expect(alone.stderr).toMatch(/--importance-clusters: give --importance too/);
  });
});

describe('permutation importance, every way of running', () => {
  const base = ['eval', copies, '--target', 'label', '--learner', 'forest:trees=10', '--learner', 'knn', '--plan', 'kfold:3x2', '--importance', '--importance-clusters', '--importance-repeats', '3', '--no-timing', '--quiet'];
  it('gives the same bytes for --jobs 1 and 2, shards + merge, and a journal resume', async () => {
    const one = await cli([...base, '--jobs', '1', '--json', '-']);
    expect(one.code).toBe(0);
    expect(JSON.parse(one.stdout).learners[1].importance.inputs.length).toBe(6);
    const two = await cli([...base, '--jobs', '2', '--json', '-']);
    expect(two.stdout).toBe(one.stdout);
    const parts = [];
    for (const i of [1, 2]) {
      const out = join(tmp.dir, `imp-part-${i}.json`);
      expect((await cli([...base, '--jobs', '1', '--shard', `${i}/2`, '--json', out])).code).toBe(0);
      parts.push(out);
    }
    const merged = await cli(['merge', ...parts, '--json', '-', '--no-timing']);
    expect(merged.code).toBe(0);
    expect(merged.stdout).toBe(one.stdout);
    const journal = join(tmp.dir, 'imp.journal');
    expect((await cli([...base, '--jobs', '1', '--journal', journal, '--json', join(tmp.dir, 'first.json')])).code).toBe(0);
    const resumed = await cli([...base, '--jobs', '1', '--journal', journal, '--json', '-']);
    expect(resumed.stdout).toBe(one.stdout);
    // a journal of the run without --importance is another run
    const other = await cli([...base.filter((a) => !a.startsWith('--importance') && a !== '3'), '--journal', journal, '--json', '-']);
    expect(other.code).toBe(2);
    expect(other.stderr).toMatch(/differs in importance/);
  });
});
