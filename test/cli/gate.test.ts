import { Ajv } from 'ajv';
import jStat from 'jstat';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { mean, sampleVariance } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/run.js';
import type { GateVerdict } from '../../src/model/compare.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { syntheticCsv } from '../compare/synthetic.js';

const gateSchema = JSON.parse(readFileSync(new URL('../../schema/gate.schema.json', import.meta.url), 'utf8'));
const validateGate = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true }).compile(gateSchema);
function expectValidVerdict(v: unknown): void {
  const ok = validateGate(v);
  expect(validateGate.errors ?? []).toEqual([]);
  expect(ok).toBe(true);
}

// Seeded synthetic data (test/compare/synthetic.ts): the class depends mostly on x1, so a run
// that drops x1 is a real regression of the same learner on the same data and folds.
const tmp = tempFolder();
const cls = tmp.file('cls.csv', syntheticCsv('classification', 300, 21));
const reg = tmp.file('reg.csv', syntheticCsv('regression', 200, 22));
const penguins = tmp.file('penguins.csv', penguinsCsv());
const CLS = [cls, '--target', 'y', '--learner', 'knn', '--plan', 'kfold:5x2', '--no-timing'];
const REG = [reg, '--target', 'y', '--learner', 'knn', '--metric', 'rmse', '--plan', 'kfold:5x2', '--no-timing'];

async function report(name: string, args: string[]): Promise<string> {
  const path = join(tmp.dir, name);
  const r = await cli(['eval', ...args, '--json', path]);
  expect(r.code).toBe(0);
  return path;
}

let made: Promise<Record<string, string>> | undefined;
const reports = (): Promise<Record<string, string>> =>
  (made ??= (async () => ({
    good: await report('good.json', CLS),
    same: await report('same.json', CLS),
    timed: await report('timed.json', CLS.filter((a) => a !== '--no-timing')),
    worse: await report('worse.json', [...CLS, '--drop', 'x1']),
    seed2: await report('seed2.json', [...CLS, '--seed', '2']),
    worseSeed2: await report('worse-seed2.json', [...CLS, '--drop', 'x1', '--seed', '2']),
    k15: await report('k15.json', [cls, '--target', 'y', '--learner', 'knn:k=15', '--plan', 'kfold:5x2', '--no-timing']),
    kappa: await report('kappa.json', [...CLS, '--metric', 'accuracy', '--metric', 'kappa']),
    regGood: await report('reg-good.json', REG),
    regWorse: await report('reg-worse.json', [...REG, '--drop', 'x1']),
    penguins: await report('penguins.json', [penguins, '--target', 'Species', '--drop', 'Island', '--drop', 'Sex', '--learner', 'knn', '--no-timing']),
  }))());

const gate = (baseline: string, current: string, ...extra: string[]) => cli(['gate', '--previous', baseline, '--current', current, ...extra]);

async function verdictOf(baseline: string, current: string, ...extra: string[]): Promise<{ code: number; v: GateVerdict }> {
  const r = await gate(baseline, current, ...extra, '--json', '-');
  const v = JSON.parse(r.stdout) as GateVerdict;
  expectValidVerdict(v);
  return { code: r.code, v };
}

function oneLine(stderr: string): string {
  const lines = stderr.split('\n').filter(Boolean);
  expect(lines.length).toBe(1);
  return lines[0];
}

describe('foldwise gate: exit 0 pass, 1 fail, 2 not comparable', () => {
  it('passes the same run (exit 0) and leaves the baseline byte for byte as it was', async () => {
    const { good, same } = await reports();
    const before = readFileSync(good);
    const mtime = statSync(good).mtimeMs;
    const r = await gate(good, same);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('### foldwise gate: PASS');
    expect(r.stdout).toContain('10 folds paired by repeat and fold');
    expect(r.stdout).toContain('change 0.0000');
    expect(r.stdout).toContain('- **Verdict:** pass: no drop beyond the allowed 0');
    expect(readFileSync(good).equals(before)).toBe(true);
    expect(statSync(good).mtimeMs).toBe(mtime);
  });

  it('fails a real regression (x1 dropped) with exit 1; the figures match a hand computation with jstat', async () => {
    const { good, worse } = await reports();
    const r = await gate(good, worse);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('### foldwise gate: FAIL');
    expect(r.stdout).toMatch(/- \*\*Verdict:\*\* fail: accuracy dropped by 0\.\d{4} \(at least 0\.\d{4} with 95% confidence\), more than the allowed 0/);
    const { code, v } = await verdictOf(good, worse);
    expect(code).toBe(1);
    expect(v).toMatchObject({ verdict: 'fail', reasons: ['regression'], rule: 'paired', metric: 'accuracy', higherIsBetter: true, maxDrop: 0, alpha: 0.05, df: 9 });
    expect(v.previous.learner).toBe('knn');
    // recompute from the two reports: d_j = baseline_j - current_j (accuracy, higher is better)
    const b = (JSON.parse(readFileSync(good, 'utf8')) as Report).learners.find((l) => l.spec === 'knn')!;
    const c = (JSON.parse(readFileSync(worse, 'utf8')) as Report).learners.find((l) => l.spec === 'knn')!;
    const d = b.folds.map((f, i) => f.scores.accuracy! - c.folds[i].scores.accuracy!);
    const ratio = mean(b.folds.map((f) => f.testRows)) / mean(b.folds.map((f) => f.trainRows));
    const se = Math.sqrt((1 / d.length + ratio) * sampleVariance(d));
    // Nadeau & Bengio (2003) corrected t; one-sided p and bound from jstat's Student t
    expect(Math.abs(v.drop - mean(d))).toBeLessThan(1e-12);
    expect(Math.abs(v.t! - mean(d) / se)).toBeLessThan(1e-9);
    expect(Math.abs(v.p - (1 - jStat.studentt.cdf(mean(d) / se, 9)))).toBeLessThan(1e-9);
    expect(Math.abs(v.dropBound - (mean(d) - jStat.studentt.inv(0.95, 9) * se))).toBeLessThan(1e-9);
    expect(v.drop).toBeGreaterThan(0.1); // x1 carries most of the signal
  });

  it('passes a drop smaller than --max-drop, and reports an improvement the other way round', async () => {
    const { good, worse } = await reports();
    const big = await gate(good, worse, '--max-drop', '0.9');
    expect(big.code).toBe(0);
    expect(big.stdout).toContain('fail only when the drop exceeds 0.9 beyond fold noise');
    const { code, v } = await verdictOf(worse, good);
    expect(code).toBe(0);
    expect(v.improvement).toBe(true);
    expect(v.change).toBeGreaterThan(0);
    const md = await gate(worse, good);
    expect(md.stdout).toContain('- **Verdict:** pass: accuracy improved beyond fold noise (one-sided, alpha 0.05)');
  });

  it('fails below --worst-allowed whatever the baseline (exit 1)', async () => {
    const { good, same } = await reports();
    const { code, v } = await verdictOf(good, same, '--worst-allowed', '0.99');
    expect(code).toBe(1);
    expect(v.reasons).toEqual(['worst-allowed']);
    expect(v.worstAllowed).toBe(0.99);
    const md = await gate(good, same, '--worst-allowed', '0.99');
    expect(md.stdout).toContain('must be at least 0.99 (--worst-allowed)');
    expect(md.stdout).toContain('NOT met');
    expect((await gate(good, same, '--worst-allowed', '0.5')).code).toBe(0);
  });

  it('gates a lower-is-better metric in its own direction (rmse up = drop)', async () => {
    const { regGood, regWorse } = await reports();
    const { code, v } = await verdictOf(regGood, regWorse);
    expect(code).toBe(1);
    expect(v.higherIsBetter).toBe(false);
    expect(v.change).toBeGreaterThan(0);
    expect(v.drop).toBeGreaterThan(0);
    expect((await gate(regWorse, regGood)).code).toBe(0);
    // for rmse the limit is a ceiling
    const ceiling = await verdictOf(regGood, regGood, '--worst-allowed', '0.01');
    expect(ceiling.code).toBe(1);
    expect(ceiling.v.reasons).toEqual(['worst-allowed']);
  });

  it('falls back to the labelled unpaired rule for another seed', async () => {
    const { good, seed2, worseSeed2 } = await reports();
    const r = await gate(good, seed2);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('NOT paired');
    expect(r.stdout).toContain('- **Rule (unpaired):** the runs used different folds (they differ in plan.seed (1 vs 2))');
    const { v } = await verdictOf(good, seed2);
    expect(v.rule).toBe('unpaired');
    expect(v.unpairedBecause).toEqual(['plan.seed (1 vs 2)']);
    // a drop of this size is beyond noise even unpaired
    const w = await verdictOf(good, worseSeed2);
    expect(w.code).toBe(1);
    expect(w.v.rule).toBe('unpaired');
  });

  it('gates a renamed learner with --current-learner and refuses an unknown one', async () => {
    const { good, k15 } = await reports();
    const { v } = await verdictOf(good, k15, '--current-learner', 'knn:k=15');
    expect([v.previous.learner, v.current.learner]).toEqual(['knn', 'knn:k=15']);
    expect(v.rule).toBe('paired');
    const r = await gate(good, k15);
    expect(r.code).toBe(2);
    expect(oneLine(r.stderr)).toBe(`foldwise: --learner knn: the current report ${k15} has no such learner; did you mean "knn:k=15"? (it has "baseline", "knn:k=15")`);
  });
});

describe('foldwise gate refuses what it cannot compare (exit 2)', () => {
  it('names what differs for another data file, and still prints a NOT COMPARABLE verdict', async () => {
    const { good, penguins: p } = await reports();
    const r = await gate(good, p);
    expect(r.code).toBe(2);
    const line = oneLine(r.stderr);
    expect(line.startsWith('foldwise: gate: the runs differ in data.sha256 (')).toBe(true);
    expect(line).toContain('data.rowsUsed (300 vs 344)');
    expect(line).toContain('data.target (y vs Species)');
    expect(line.endsWith('; they are not comparable')).toBe(true);
    expect(r.stdout).toContain('### foldwise gate: NOT COMPARABLE');
  });

  it('refuses another metric set', async () => {
    const { good, kappa } = await reports();
    const r = await gate(good, kappa);
    expect(r.code).toBe(2);
    expect(oneLine(r.stderr)).toBe(
      'foldwise: gate: the runs differ in metrics (accuracy,balanced-accuracy,log-loss,macro-f1 vs accuracy,kappa); they are not comparable',
    );
  });

  it('refuses a report with a null headline fold score (a failed or undefined fold)', async () => {
    const { good, same } = await reports();
    const r0 = JSON.parse(readFileSync(same, 'utf8')) as { learners: { spec: string; folds: { scores: Record<string, number | null> }[] }[] };
    r0.learners.find((l) => l.spec === 'knn')!.folds[0].scores.accuracy = null;
    const holed = tmp.file('holed.json', JSON.stringify(r0));
    const r = await gate(good, holed);
    expect(r.code).toBe(2);
    expect(oneLine(r.stderr)).toBe(
      `foldwise: gate: ${holed}: knn has no accuracy score in 1 of 10 folds (repeat 1 fold 1); a report with failed or undefined folds is not comparable`,
    );
  });

  it('refuses missing and malformed files and bad options with one line', async () => {
    const { good } = await reports();
    const missing = join(tmp.dir, 'nope.json');
    const m = await gate(missing, good);
    expect(m.code).toBe(2);
    expect(oneLine(m.stderr)).toBe(`foldwise: gate --previous ${missing}: cannot be read (ENOENT); give the path of a JSON report written by foldwise eval --json`);
    const junk = tmp.file('junk.json', '[1, 2');
    const j = await gate(good, junk);
    expect(j.code).toBe(2);
    expect(oneLine(j.stderr).startsWith(`foldwise: gate --current ${junk}: not JSON (`)).toBe(true);
    const bad: [string[], string][] = [
      [['--alpha', '0.5'], 'foldwise: --alpha 0.5: expected a number above 0 and below 0.5 (such as 0.05)'],
      [['--alpha', 'abc'], 'foldwise: --alpha abc: expected a number above 0 and below 0.5 (such as 0.05)'],
      [['--max-drop', '-0.1'], "foldwise: --max-drop -0.1: expected a number >= 0, in the metric's units"],
      [['--worst-allowed', 'x'], "foldwise: --worst-allowed x: expected a number, in the metric's units"],
      // issue 25 item 14: the old name is refused with one line naming the new one
      [['--absolute-min', '0.5'], 'foldwise: --absolute-min is now --worst-allowed (the worst mean score allowed: a floor when higher is better, a ceiling when lower is better)'],
      [['--metric', 'kappa'], 'foldwise: --metric kappa: the reports do not score it (they score accuracy, balanced-accuracy, macro-f1, log-loss)'],
    ];
    for (const [extra, message] of bad) {
      const r = await gate(good, good, ...extra);
      expect(r.code).toBe(2);
      expect(oneLine(r.stderr)).toBe(message);
    }
    const noCurrent = await cli(['gate', '--previous', good]);
    expect(noCurrent.code).toBe(2);
    expect(noCurrent.stderr).toContain("--current <file>' not specified");
    // the flag's name before format 2 fails with one line naming the new one (no alias)
    const old = await cli(['gate', '--baseline', good, '--current', good]);
    expect(old.code).toBe(2);
    expect(old.stdout).toBe('');
    expect(oneLine(old.stderr)).toBe(`foldwise: gate --baseline is now --previous (the committed report; "baseline" names the majority/mean learner): write --previous ${good}`);
    const noPrevious = await cli(['gate', '--current', good]);
    expect(noPrevious.code).toBe(2);
    expect(oneLine(noPrevious.stderr)).toBe("foldwise: gate: required option '--previous <file>' not specified: the committed report to gate against");
  });
});

describe('foldwise gate: GITHUB_STEP_SUMMARY and --accept', () => {
  async function withEnv(argv: string[], env: Record<string, string>): Promise<{ code: number; stdout: string; stderr: string }> {
    let stdout = '';
    let stderr = '';
    const code = await run(argv, { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) }, env });
    return { code, stdout, stderr };
  }

  it('appends every verdict to the file named by GITHUB_STEP_SUMMARY (read from io.env)', async () => {
    const { good, same, worse, penguins: p } = await reports();
    const summary = tmp.file('summary.md', '# earlier step\n');
    const env = { GITHUB_STEP_SUMMARY: summary };
    const pass = await withEnv(['gate', '--previous', good, '--current', same], env);
    const fail = await withEnv(['gate', '--previous', good, '--current', worse], env);
    const apart = await withEnv(['gate', '--previous', good, '--current', p], env);
    expect([pass.code, fail.code, apart.code]).toEqual([0, 1, 2]);
    const text = readFileSync(summary, 'utf8');
    expect(text.startsWith('# earlier step\n')).toBe(true);
    expect(text).toBe(`# earlier step\n${pass.stdout}\n${fail.stdout}\n${apart.stdout}\n`);
    // a summary file that cannot be written is a warning, not a changed verdict
    const lost = await withEnv(['gate', '--previous', good, '--current', same], { GITHUB_STEP_SUMMARY: join(tmp.dir, 'no-such-folder', 's.md') });
    expect(lost.code).toBe(0);
    expect(lost.stderr).toMatch(/^foldwise: warning: GITHUB_STEP_SUMMARY .*: cannot be appended \(ENOENT\); the verdict is on standard output only\n$/);
    // the cli() helper passes an empty environment: no summary is written anywhere
    expect((await gate(good, same)).code).toBe(0);
  });

  it('--accept replaces the baseline atomically by the current report when the gate passes', async () => {
    const { good, timed } = await reports();
    const dir = join(tmp.dir, 'accept');
    const { mkdirSync } = await import('node:fs');
    mkdirSync(dir);
    const baseline = join(dir, 'baseline.json');
    writeFileSync(baseline, readFileSync(good));
    const r = await gate(baseline, timed, '--accept');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('- **Previous report:** replaced by the current report (--accept)');
    expect(readFileSync(baseline).equals(readFileSync(timed))).toBe(true);
    expect(readdirSync(dir)).toEqual(['baseline.json']); // no temporary file left behind
  });

  it('--accept keeps the baseline untouched when the gate fails', async () => {
    const { good, worse } = await reports();
    const baseline = tmp.file('kept.json', readFileSync(good));
    const before = readFileSync(baseline);
    const mtime = statSync(baseline).mtimeMs;
    const r = await gate(baseline, worse, '--accept');
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('- **Previous report:** kept; --accept replaces it only when the gate passes');
    expect(readFileSync(baseline).equals(before)).toBe(true);
    expect(statSync(baseline).mtimeMs).toBe(mtime);
    const { v } = await verdictOf(baseline, worse, '--accept');
    expect(v.accepted).toBe(false);
    expect(existsSync(baseline)).toBe(true);
  });
});

describe('gate refuses scores a metric cannot take (issue 26)', () => {
  // Ranges of the metrics by their definitions: accuracy is a share of rows, in [0, 1];
  // log loss is a mean of -ln p, never below 0 (a plain fact of the formulas, not a table).
  it('refuses a hand-edited fold score of 5 for accuracy, or -1 for log-loss, naming report, learner and fold, exit 2', async () => {
    const { good } = await reports();
    const original = JSON.parse(readFileSync(good, 'utf8')) as Report;
    const edit = (metric: string, value: number): string => {
      const r = structuredClone(original) as unknown as { learners: { folds: { scores: Record<string, number | null> }[] }[] };
      r.learners[0].folds[2].scores[metric] = value;
      return tmp.file(`edited-${metric}.json`, JSON.stringify(r));
    };
    const high = edit('accuracy', 5);
    const r = await gate(good, high);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain(`--current ${high}: baseline fold r1.f3 has accuracy = 5, outside the range [0, 1]`);
    const low = edit('log-loss', -1);
    const r2 = await gate(low, good);
    expect(r2.code).toBe(2);
    expect(r2.stderr).toContain(`${low}: baseline fold r1.f3 has log-loss = -1, outside the range [0, `);
    // the untouched report still passes against itself
    expect((await gate(good, good)).code).toBe(0);
  });
});
