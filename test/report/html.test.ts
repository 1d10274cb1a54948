/**
 * Structural tests of the HTML report (src/report/html): the page holds the elements the issue
 * asks for, and the numbers drawn in the SVG are the report's numbers. The data is the Palmer
 * penguins file that the npm package vega-datasets ships (CC0; Gorman, Williams & Fraser 2014),
 * run through eval in-process.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { renderFile } from '../../src/cli/render.js';
import { esc } from '../../src/report/html/escape.js';
import { CSP } from '../../src/report/html/page.js';
import { linearScale, niceStep } from '../../src/report/html/scale.js';
import { classRecall } from '../../src/report/html/class-recall.js';
import type { GateVerdict } from '../../src/model/compare.js';
import type { Report } from '../../src/model/report.js';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { tags } from '../helpers/html.js';

const tmp = tempFolder();
const penguins = tmp.file('penguins.csv', penguinsCsv());

async function evalReport(name: string, args: string[]): Promise<{ path: string; report: Report }> {
  const path = join(tmp.dir, name);
  const r = await cli(['eval', penguins, ...args, '--no-timing', '--quiet', '--jobs', '1', '--json', path]);
  expect(r.stderr.replace(/foldwise: warning: [^\n]*\n/g, '')).toBe('');
  expect(r.code).toBe(0);
  return { path, report: JSON.parse(readFileSync(path, 'utf8')) as Report };
}

async function render(path: string): Promise<string> {
  const out = join(tmp.dir, `${path.split('/').pop()}.html`);
  const r = await cli(['render', path, '--html', out]);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return readFileSync(out, 'utf8');
}

/** The markup of the i-th <g class="learner" ...> group (up to the next one, or the end of its chart). */
function learnerGroup(html: string, i: number): string {
  const pieces = html.split('<g class="learner"');
  expect(pieces.length).toBeGreaterThan(i + 1);
  const piece = pieces[i + 1];
  return `<g class="learner"${piece.slice(0, piece.includes('</svg>') ? piece.indexOf('</svg>') : undefined)}`;
}

const unescape = (s: string): string => s.replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');

describe('HTML eval report of a classification run (penguins)', async () => {
  const { path, report } = await evalReport('cls.json', ['--target', 'Species', '--learner', 'knn', '--learner', 'tree', '--plan', 'kfold:5x2']);
  const html = await render(path);

  it('is one self-contained document: no scripts, no outside resources, a blocking CSP', () => {
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain(`<meta http-equiv="Content-Security-Policy" content="${CSP}">`);
    expect(CSP).toContain("default-src 'none'");
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/<(link|img|iframe|object|embed|use|image)\b/i);
    expect(html).not.toMatch(/\s(href|src|xlink:href)=/i);
    expect(html).not.toMatch(/url\(/i);
  });

  it('has the summary, comparison, metrics, confusion, recall, curve and reliability views, each chart with a text alternative', () => {
    for (const id of ['summary', 'comparisons', 'recall', 'roc', 'pr', 'reliability']) expect(html).toContain(`<figure class="chart" id="${id}">`);
    const svgs = tags(html, 'svg');
    expect(svgs.length).toBe(6);
    for (const s of svgs) {
      expect(s.get('role')).toBe('img');
      expect((s.get('aria-label') ?? '').length).toBeGreaterThan(10);
      const id = s.get('aria-describedby') ?? '';
      expect(html).toMatch(new RegExp(`<desc id="${id}">[^<]{40,}</desc>`));
    }
    expect(html.match(/<title id="[a-z-]+-title">/g)?.length).toBe(6);
    expect(html).toContain('<table class="metrics">');
    expect(html.match(/<table class="confusion"/g)?.length).toBe(report.learners.length);
    expect(html).toContain('<footer>');
    expect(html).toContain(report.data.sha256);
    expect(html).toContain(esc(report.plan.text));
  });

  it('draws every fold score of the headline metric as a dot at a position linear in the score', () => {
    const m = report.metrics[0];
    expect(m).toBe('accuracy');
    expect(report.learners.length).toBe(3);
    report.learners.forEach((l, i) => {
      const g = learnerGroup(html, i);
      const dots = tags(g, 'circle').filter((c) => c.get('class') === 'fold');
      const scores = l.folds.map((f) => f.scores[m]).filter((v): v is number => v !== null);
      expect(scores.length).toBe(10);
      expect(dots.map((d) => Number(d.get('data-score')))).toEqual(scores);
      const box = tags(g, 'g')[0];
      const s = l.summary[m]!;
      expect(Number(box.get('data-mean'))).toBe(s.mean);
      expect(Number(box.get('data-q1'))).toBe(s.q1);
      expect(Number(box.get('data-q3'))).toBe(s.q3);
      expect(Number(box.get('data-median'))).toBe(s.median);
      const interval = tags(g, 'g').find((t) => t.get('class') === 'interval')!;
      expect(Number(interval.get('data-lo'))).toBe(s.ci95![0]);
      expect(Number(interval.get('data-hi'))).toBe(s.ci95![1]);
    });
    // positions: cx = a + b * score for one a, b over all dots of all learners (to 0.01 px rounding)
    const all = tags(html, 'circle').filter((c) => c.get('class') === 'fold').map((c) => [Number(c.get('data-score')), Number(c.get('cx'))] as const);
    expect(all.length).toBe(30);
    const lo = all.reduce((a, b) => (b[0] < a[0] ? b : a));
    const hi = all.reduce((a, b) => (b[0] > a[0] ? b : a));
    expect(hi[0]).toBeGreaterThan(lo[0]);
    const slope = (hi[1] - lo[1]) / (hi[0] - lo[0]);
    expect(slope).toBeGreaterThan(0);
    for (const [v, cx] of all) expect(Math.abs(cx - (lo[1] + (v - lo[0]) * slope))).toBeLessThan(0.02);
  });

  it('draws the baseline mean as the reference line', () => {
    const base = report.learners.find((l) => l.name === 'baseline')!;
    const line = tags(html, 'g').find((g) => g.get('class') === 'baseline-line')!;
    expect(Number(line.get('data-value'))).toBe(base.summary.accuracy!.mean);
  });

  it('draws each paired comparison with the difference and interval of the report', () => {
    const pairs = report.comparisons!.pairs;
    expect(pairs.length).toBeGreaterThan(1);
    const drawn = tags(html, 'g').filter((g) => g.get('class') === 'pair');
    expect(drawn.length).toBe(pairs.length);
    pairs.forEach((p, i) => {
      expect(unescape(drawn[i].get('data-learner')!)).toBe(p.learner);
      expect(unescape(drawn[i].get('data-reference')!)).toBe(p.reference);
      expect(Number(drawn[i].get('data-diff'))).toBe(p.diff);
      expect(Number(drawn[i].get('data-lo'))).toBe(p.ci95![0]);
    });
  });

  it('shows the confusion counts and row shares of the report, and recall bars equal to diagonal / row total', () => {
    const classes = report.data.classes!;
    expect(classes).toEqual(['Adelie', 'Chinstrap', 'Gentoo']);
    const cells = tags(html, 'td').filter((t) => t.has('data-count'));
    expect(cells.length).toBe(report.learners.length * 9);
    // the first table is the best learner's
    const best = [...report.learners].sort((a, b) => b.summary.accuracy!.mean - a.summary.accuracy!.mean)[0];
    const first = cells.slice(0, 9).map((c) => Number(c.get('data-count')));
    expect(first).toEqual(best.confusion!.flat());
    const row0 = best.confusion![0];
    const total = row0.reduce((a, b) => a + b, 0);
    expect(Number(cells[0].get('data-share'))).toBe(row0[0] / total);
    const bars = tags(html, 'rect').filter((r) => r.get('class') === 'recall');
    const others = report.learners.filter((l) => l.name !== 'baseline');
    expect(bars.length).toBe(classes.length * others.length);
    for (const b of bars) {
      const l = others.find((o) => o.spec === unescape(b.get('data-learner')!))!;
      const k = classes.indexOf(unescape(b.get('data-class')!));
      const row = l.confusion![k];
      expect(Number(b.get('data-value'))).toBe(row[k] / row.reduce((a, c) => a + c, 0));
    }
  });
});

describe('HTML eval report of a regression run (penguins body mass)', async () => {
  const { path, report } = await evalReport('reg.json', ['--target', 'Body Mass (g)', '--learner', 'knn', '--plan', 'kfold:5']);
  const html = await render(path);
  it('has the summary chart in the target units and no classification views', () => {
    expect(report.data.task).toBe('regression');
    expect(html).toContain('<figure class="chart" id="summary">');
    expect(html).toContain(esc(`rmse (units of ${report.data.target}; lower is better)`));
    expect(html).not.toContain('<table class="confusion"');
    expect(html).not.toContain('id="recall"');
    const dots = tags(html, 'circle').filter((c) => c.get('class') === 'fold');
    expect(dots.length).toBe(report.learners.length * 5);
  });
});

describe('HTML gate page', async () => {
  const a = await evalReport('gate-a.json', ['--target', 'Species', '--learner', 'knn', '--plan', 'kfold:5']);
  const b = await evalReport('gate-b.json', ['--target', 'Species', '--learner', 'knn:k=15', '--plan', 'kfold:5']);
  const verdictPath = join(tmp.dir, 'verdict.json');
  const g = await cli(['gate', '--previous', a.path, '--current', b.path, '--learner', 'knn', '--current-learner', 'knn:k=15', '--json', verdictPath]);
  expect([0, 1]).toContain(g.code);
  const verdict = JSON.parse(readFileSync(verdictPath, 'utf8')) as GateVerdict;
  const html = await render(verdictPath);
  it('shows the verdict, both means and the change with its interval', () => {
    expect(html).toContain(verdict.verdict === 'pass' ? '>PASS</span>' : '>FAIL</span>');
    expect(html).toContain(`data-mean="${verdict.previous.mean}"`);
    expect(html).toContain(`data-mean="${verdict.current.mean}"`);
    const change = tags(html, 'g').find((t) => t.get('class') === 'change')!;
    expect(Number(change.get('data-change'))).toBe(verdict.change);
    expect(Number(change.get('data-lo'))).toBe(verdict.ci95![0]);
    expect(tags(html, 'svg')[0].get('role')).toBe('img');
    expect(html).not.toMatch(/<script/i);
  });
});

describe('render refuses what it cannot draw', () => {
  it('names the file and the formats it accepts', async () => {
    const p = tmp.file('other.json', '{"schema":"something/1"}');
    const r = await cli(['render', p, '--html', join(tmp.dir, 'x.html')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^foldwise: render .*other\.json: not a file foldwise can render .*foldwise-report\/2.*foldwise-gate\/2/);
    const q = tmp.file('bad.json', '{"schema":"foldwise-report/2"}');
    const s = await cli(['render', q, '--html', join(tmp.dir, 'y.html')]);
    expect(s.code).toBe(2);
    expect(s.stderr).toMatch(/not a valid foldwise-report\/2 report/);
    expect(() => renderFile(join(tmp.dir, 'missing.json'))).toThrow(/cannot be read \(ENOENT\)/);
  });
});

describe('building blocks', () => {
  it('escapes the five markup characters (HTML Living Standard 13.1.4; OWASP XSS cheat sheet rules 1-2)', () => {
    expect(esc(`<a href="x">&'</a>`)).toBe('&lt;a href=&quot;x&quot;&gt;&amp;&#39;&lt;/a&gt;');
    expect(esc('a\u0000b\u001fc\td\ne')).toBe('a\ufffdb\ufffdc\td\ne');
  });

  it('picks 1-2-5 tick steps (Heckbert, Graphics Gems 1990, from memory)', () => {
    expect(niceStep(0.7, 8)).toBeCloseTo(0.1, 12);
    expect(niceStep(3.7, 6)).toBeCloseTo(1, 12);
    expect(niceStep(0.07, 5)).toBeCloseTo(0.02, 12);
    expect(niceStep(120, 6)).toBe(20);
    const s = linearScale(0.2857, 0.8857, 100, 900, 8);
    expect(s.ticks).toEqual([0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9]);
    expect(s(0.2)).toBe(100);
    expect(Math.abs(s(0.9) - 900)).toBeLessThan(1e-9);
  });

  it('computes recall as diagonal over row total, null for an empty row', () => {
    // worked by hand: row 0 has 8 of 10 right, row 1 has 0 rows
    expect(classRecall([[8, 2], [0, 0]])).toEqual([0.8, null]);
    expect(() => classRecall([[1, 2]])).toThrow(/square/);
  });
});
