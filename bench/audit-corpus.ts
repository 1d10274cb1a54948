/**
 * The audit's calibration corpus (issue #20): clean data sets, where nothing should be printed
 * before eval, and data sets with one planted problem each, where the audit should find it.
 *
 * Clean: seeded processes of several shapes (stated beside each generator; nothing here is
 * real data) and open data sets shipped in the npm package vega-datasets (read from
 * node_modules, as test/helpers/penguins.ts does), each with a sensible target and the options
 * a user would give (an obvious name column dropped, a time-ordered set evaluated forward).
 * Planted: a clean process plus one known problem: a noisy copy of the target, a post-outcome
 * column, an id following the row order of a sorted target, target encoding computed on all
 * rows, duplicated records across folds, a group structure the plan ignores, informative
 * missingness.
 *
 * `auditCorpus(size)` returns CSV texts with options; `measureCorpus` runs the quick audit (what
 * eval prints) and the full audit on each and tabulates false alarms and detections.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Papa from 'papaparse';
import { audit, quickSuspects, type AuditReport, type SuspectKind } from '../src/audit/index.js';
import { loadCsv } from '../src/data/load-csv.js';
import { createRng, type Rng } from '../src/rng.js';

export interface CorpusEntry {
  readonly name: string;
  readonly clean: boolean;
  /** for planted entries: the kind of finding that names the problem, and whether it is a leak */
  readonly planted?: { readonly kind: SuspectKind; readonly leak: boolean; readonly what: string };
  readonly csv: string;
  readonly target: string;
  readonly drop?: readonly string[];
  readonly group?: string;
  readonly order?: string;
  readonly plan?: string;
}

type Col = (string | number | null)[];

function gauss(rng: Rng): number {
  let u = 0;
  while (u === 0) u = rng.next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.next());
}

function csvOf(cols: ReadonlyMap<string, Col>): string {
  const names = [...cols.keys()];
  const n = cols.get(names[0])!.length;
  const rows: string[][] = [names];
  for (let i = 0; i < n; i++) rows.push(names.map((c) => { const v = cols.get(c)![i]; return v === null ? '' : typeof v === 'number' ? String(Number(v.toFixed(6))) : v; }));
  return `${Papa.unparse(rows, { newline: '\n' })}\n`;
}

const num = (v: number): number => Number(v.toFixed(6));

/** Signal in one feature: classes 2 sd apart on x1 (or y = 2 x1 + 1.2 e), four noise columns. */
function dominant(n: number, seed: number, task: 'classification' | 'regression'): Map<string, Col> {
  const rng = createRng(seed);
  const cols = new Map<string, Col>([['x1', []], ['x2', []], ['x3', []], ['x4', []], ['x5', []], ['y', []]]);
  for (let i = 0; i < n; i++) {
    const cls = rng.next() < 0.5 ? 1 : 0;
    const x1 = task === 'classification' ? gauss(rng) + 2 * cls : gauss(rng);
    cols.get('x1')!.push(num(x1));
    for (const c of ['x2', 'x3', 'x4', 'x5']) cols.get(c)!.push(num(gauss(rng)));
    cols.get('y')!.push(task === 'classification' ? (cls ? 'yes' : 'no') : num(2 * x1 + 1.2 * gauss(rng)));
  }
  return cols;
}

/** Many weak features: 20 standard normals, y from 0.25 times their sum plus noise. */
function weak(n: number, seed: number, task: 'classification' | 'regression'): Map<string, Col> {
  const rng = createRng(seed);
  const cols = new Map<string, Col>();
  for (let j = 1; j <= 20; j++) cols.set(`w${j}`, []);
  cols.set('y', []);
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 1; j <= 20; j++) {
      const x = gauss(rng);
      s += 0.25 * x;
      cols.get(`w${j}`)!.push(num(x));
    }
    const t = s + gauss(rng);
    cols.get('y')!.push(task === 'classification' ? (t > 0 ? 'a' : 'b') : num(t));
  }
  return cols;
}

/** Three blocks of four features, each a shared factor plus 0.3 sd noise; y from the factors. */
function blocks(n: number, seed: number, task: 'classification' | 'regression'): Map<string, Col> {
  const rng = createRng(seed);
  const cols = new Map<string, Col>();
  for (let b = 1; b <= 3; b++) for (let j = 1; j <= 4; j++) cols.set(`b${b}_${j}`, []);
  cols.set('y', []);
  for (let i = 0; i < n; i++) {
    const f = [gauss(rng), gauss(rng), gauss(rng)];
    for (let b = 1; b <= 3; b++) for (let j = 1; j <= 4; j++) cols.get(`b${b}_${j}`)!.push(num(f[b - 1] + 0.3 * gauss(rng)));
    const t = 0.6 * f[0] - 0.4 * f[1] + 0.3 * f[2] + gauss(rng);
    cols.get('y')!.push(task === 'classification' ? (t > 0 ? 'up' : 'down') : num(t));
  }
  return cols;
}

/** Six categorical features of 3 to 8 uniform levels and one numeric; y from two of them. */
function categorical(n: number, seed: number, task: 'classification' | 'regression'): Map<string, Col> {
  const rng = createRng(seed);
  const sizes = [3, 4, 5, 6, 7, 8];
  const cols = new Map<string, Col>();
  sizes.forEach((_, j) => cols.set(`cat${j + 1}`, []));
  cols.set('x', []);
  cols.set('y', []);
  const effect = sizes.map((k) => Array.from({ length: k }, () => gauss(rng)));
  for (let i = 0; i < n; i++) {
    let t = 0;
    sizes.forEach((k, j) => {
      const l = rng.int(k);
      cols.get(`cat${j + 1}`)!.push(`L${l}`);
      if (j < 2) t += 0.7 * effect[j][l];
    });
    const x = gauss(rng);
    cols.get('x')!.push(num(x));
    t += 0.3 * x + gauss(rng);
    cols.get('y')!.push(task === 'classification' ? (t > 0 ? 'p' : 'q') : num(t));
  }
  return cols;
}

/** Imbalanced classes: a minority of about 5% from a logistic score on three features. */
function imbalanced(n: number, seed: number): Map<string, Col> {
  const rng = createRng(seed);
  const cols = new Map<string, Col>([['x1', []], ['x2', []], ['x3', []], ['x4', []], ['y', []]]);
  for (let i = 0; i < n; i++) {
    const x = [gauss(rng), gauss(rng), gauss(rng), gauss(rng)];
    x.forEach((v, j) => cols.get(`x${j + 1}`)!.push(num(v)));
    const t = x[0] + 0.7 * x[1] - 0.5 * x[2] - 2.55 + 0.8 * gauss(rng);
    cols.get('y')!.push(t > 0 ? 'event' : 'none');
  }
  return cols;
}

/** Time-ordered: one row per day with a slow trend and a weekly wave; evaluated forward. */
function timeOrdered(n: number, seed: number): Map<string, Col> {
  const rng = createRng(seed);
  const cols = new Map<string, Col>([['day', []], ['x1', []], ['x2', []], ['load', []]]);
  for (let i = 0; i < n; i++) {
    const x1 = gauss(rng);
    const x2 = gauss(rng);
    cols.get('day')!.push(new Date(Date.UTC(2019, 0, 1 + i)).toISOString().slice(0, 10));
    cols.get('x1')!.push(num(x1));
    cols.get('x2')!.push(num(x2));
    cols.get('load')!.push(num(0.002 * i + Math.sin((2 * Math.PI * i) / 7) + x1 + 0.5 * x2 + gauss(rng)));
  }
  return cols;
}

/** Grouped: 40 sites with a site effect; `grouped` says whether the plan groups by site. */
function sites(n: number, seed: number, effect: number): Map<string, Col> {
  const rng = createRng(seed);
  const fx = Array.from({ length: 40 }, () => effect * gauss(rng));
  const cols = new Map<string, Col>([['site', []], ['x1', []], ['x2', []], ['y', []]]);
  for (let i = 0; i < n; i++) {
    const s = rng.int(40);
    const x1 = gauss(rng);
    const x2 = gauss(rng);
    cols.get('site')!.push(`s${s}`);
    cols.get('x1')!.push(num(x1));
    cols.get('x2')!.push(num(x2));
    cols.get('y')!.push(x1 + 0.5 * x2 + fx[s] + gauss(rng) > 0 ? 'ok' : 'fail');
  }
  return cols;
}

// ---------------------------------------------------------------- planted problems

function targetCells(cols: Map<string, Col>): Col {
  return cols.get('y')!;
}

function plantCopy(cols: Map<string, Col>, seed: number, task: 'classification' | 'regression'): void {
  const rng = createRng(seed);
  const y = targetCells(cols);
  const levels = [...new Set(y)];
  if (task === 'classification') {
    // 3% of labels replaced by another class
    cols.set('label_copy', y.map((v) => (rng.next() < 0.03 ? levels[(levels.indexOf(v) + 1) % levels.length] : v)));
  } else {
    const ys = y as number[];
    const m = ys.reduce((s, v) => s + v, 0) / ys.length;
    const sd = Math.sqrt(ys.reduce((s, v) => s + (v - m) ** 2, 0) / ys.length);
    cols.set('y_copy', ys.map((v) => num(v + 0.1 * sd * gauss(rng))));
  }
}

function plantPostOutcome(cols: Map<string, Col>, seed: number, task: 'classification' | 'regression'): void {
  const rng = createRng(seed);
  const y = targetCells(cols);
  if (task === 'classification') {
    const first = y[0];
    // a later measurement: 2 units higher after the outcome, with noise of 0.5
    cols.set('followup', y.map((v) => num((v === first ? 2 : 0) + 0.5 * gauss(rng))));
  } else {
    const ys = y as number[];
    const m = ys.reduce((s, v) => s + v, 0) / ys.length;
    const sd = Math.sqrt(ys.reduce((s, v) => s + (v - m) ** 2, 0) / ys.length);
    // the outcome plus later information of 0.2 sd
    cols.set('settled', ys.map((v) => num(v + 0.2 * sd * gauss(rng))));
  }
}

/** Rows sorted by the target, then a running id. */
function plantSortedId(cols: Map<string, Col>): Map<string, Col> {
  const y = targetCells(cols);
  const key = (i: number): number | string => (typeof y[i] === 'number' ? (y[i] as number) : String(y[i]));
  const idx = y.map((_, i) => i).sort((a, b) => {
    const ka = key(a);
    const kb = key(b);
    return (ka < kb ? -1 : ka > kb ? 1 : 0) || a - b;
  });
  const out = new Map<string, Col>([['record_id', idx.map((_, r) => r + 1)]]);
  for (const [k, v] of cols) out.set(k, idx.map((i) => v[i]));
  return out;
}

/** A 60-level zone without effect, written as the mean target of its level over all rows. */
function plantTargetEncoding(cols: Map<string, Col>, seed: number, task: 'classification' | 'regression'): void {
  const rng = createRng(seed);
  const y = targetCells(cols);
  const zone = y.map(() => rng.int(60));
  const first = y[0];
  const val = (v: string | number | null): number => (task === 'classification' ? (v === first ? 1 : 0) : (v as number));
  const sum = new Float64Array(60);
  const cnt = new Float64Array(60);
  zone.forEach((z, i) => {
    sum[z] += val(y[i]);
    cnt[z]++;
  });
  cols.set('zone_rate', zone.map((z) => num(sum[z] / cnt[z])));
}

/** 5% of the records repeated once, the copies shuffled in. */
function plantDuplicates(cols: Map<string, Col>, seed: number): Map<string, Col> {
  const rng = createRng(seed);
  const n = targetCells(cols).length;
  const picks = Array.from({ length: Math.round(0.05 * n) }, () => rng.int(n));
  const order = [...Array.from({ length: n }, (_, i) => i), ...picks];
  for (let i = order.length - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    [order[i], order[j]] = [order[j], order[i]];
  }
  const out = new Map<string, Col>();
  for (const [k, v] of cols) out.set(k, order.map((i) => v[i]));
  return out;
}

/** Missing x2 in 30% of the first class, 5% of the others. */
function plantMissingness(cols: Map<string, Col>, seed: number, column: string): void {
  const rng = createRng(seed);
  const y = targetCells(cols);
  const first = y[0];
  const c = cols.get(column)!;
  cols.set(column, c.map((v, i) => (rng.next() < (y[i] === first ? 0.3 : 0.05) ? null : v)));
}

// ---------------------------------------------------------------- open data sets

function vegaDir(): string | null {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let up = 0; up < 5; up++) {
    const d = join(dir, 'node_modules', 'vega-datasets', 'data');
    if (existsSync(d)) return d;
    dir = dirname(dir);
  }
  return null;
}

function jsonCsv(file: string, keep?: readonly string[]): string {
  const rows = JSON.parse(readFileSync(file, 'utf8')) as Record<string, unknown>[];
  const header = keep ?? Object.keys(rows[0]);
  const data = rows.map((r) => header.map((h) => (r[h] === null || r[h] === undefined ? '' : String(r[h]))));
  return `${Papa.unparse([header, ...data], { newline: '\n' })}\n`;
}

/** The open data sets of vega-datasets used as clean data, with a sensible target each. */
export function openEntries(): CorpusEntry[] {
  const dir = vegaDir();
  if (!dir) return [];
  const f = (name: string): string => join(dir, name);
  const text = (name: string): string => readFileSync(f(name), 'utf8');
  return [
    // Palmer penguins (CC0; Gorman, Williams & Fraser 2014)
    { name: 'penguins/species', clean: true, csv: jsonCsv(f('penguins.json')), target: 'Species' },
    { name: 'penguins/body-mass', clean: true, csv: jsonCsv(f('penguins.json')), target: 'Body Mass (g)' },
    // cars (the car-model data of vega-datasets); the model name is an identifier, so dropped
    { name: 'cars/origin', clean: true, csv: jsonCsv(f('cars.json')), target: 'Origin', drop: ['Name'] },
    { name: 'cars/mpg', clean: true, csv: jsonCsv(f('cars.json')), target: 'Miles_per_Gallon', drop: ['Name'] },
    // Seattle daily weather 2012-2015
    { name: 'seattle-weather/weather', clean: true, csv: text('seattle-weather.csv'), target: 'weather' },
    { name: 'seattle-weather/temp_max', clean: true, csv: text('seattle-weather.csv'), target: 'temp_max' },
    { name: 'weather/location', clean: true, csv: text('weather.csv'), target: 'location' },
    // barley yields: 6 sites x 10 varieties x 2 years
    { name: 'barley/yield', clean: true, csv: jsonCsv(f('barley.json')), target: 'yield' },
    // flights: the delay from distance, origin and destination
    { name: 'flights-2k/delay', clean: true, csv: jsonCsv(f('flights-2k.json')), target: 'delay', drop: ['date'] },
    // Burtin's antibiotics: 16 bacteria, Gram staining from three MICs
    { name: 'burtin/gram', clean: true, csv: jsonCsv(f('burtin.json')), target: 'Gram_Staining', drop: ['Bacteria', 'Genus'], plan: 'kfold:3' },
    { name: 'population/people', clean: true, csv: jsonCsv(f('population.json')), target: 'people' },
    { name: 'unemployment/rate', clean: true, csv: jsonCsv(f('unemployment-across-industries.json')), target: 'rate', drop: ['date'] },
    { name: 'windvectors/speed', clean: true, csv: text('windvectors.csv'), target: 'speed' },
    { name: 'driving/gas', clean: true, csv: jsonCsv(f('driving.json')), target: 'gas', plan: 'kfold:5' },
    { name: 'seattle-hourly/temperature', clean: true, csv: text('seattle-weather-hourly-normals.csv'), target: 'temperature', drop: ['date'] },
    { name: 'birdstrikes/damage', clean: true, csv: text('birdstrikes.csv'), target: 'Effect Amount of damage', drop: ['Cost Other', 'Cost Repair', 'Cost Total $', 'Flight Date'] },
    { name: 'jobs/perc', clean: true, csv: jsonCsv(f('jobs.json')), target: 'perc', drop: ['count'] },
  ];
}

// ---------------------------------------------------------------- the corpus

export type CorpusSize = 'full' | 'fast';

export function syntheticEntries(size: CorpusSize): CorpusEntry[] {
  const seeds = size === 'full' ? [1, 2, 3] : [1];
  const sizes = size === 'full' ? [400, 2000] : [400];
  const out: CorpusEntry[] = [];
  const tasks = ['classification', 'regression'] as const;
  for (const seed of seeds) {
    for (const n of sizes) {
      for (const task of tasks) {
        const t = task === 'classification' ? 'class' : 'reg';
        out.push({ name: `dominant/${t}/n${n}/s${seed}`, clean: true, csv: csvOf(dominant(n, seed, task)), target: 'y' });
        out.push({ name: `weak/${t}/n${n}/s${seed}`, clean: true, csv: csvOf(weak(n, seed, task)), target: 'y' });
        out.push({ name: `blocks/${t}/n${n}/s${seed}`, clean: true, csv: csvOf(blocks(n, seed, task)), target: 'y' });
        out.push({ name: `categorical/${t}/n${n}/s${seed}`, clean: true, csv: csvOf(categorical(n, seed, task)), target: 'y' });
      }
      out.push({ name: `imbalanced/n${n * 2}/s${seed}`, clean: true, csv: csvOf(imbalanced(n * 2, seed)), target: 'y' });
      out.push({ name: `time/n${n}/s${seed}`, clean: true, csv: csvOf(timeOrdered(n, seed)), target: 'load', order: 'day', plan: 'forward:5' });
      out.push({ name: `grouped/n${n}/s${seed}`, clean: true, csv: csvOf(sites(n, seed, 1)), target: 'y', group: 'site', plan: 'kfold:5' });
      out.push({ name: `site-no-effect/n${n}/s${seed}`, clean: true, csv: csvOf(sites(n, seed, 0)), target: 'y' });
    }
  }
  // planted problems, each on a clean process
  const pseeds = size === 'full' ? [11, 12, 13, 14, 15] : [11];
  for (const seed of pseeds) {
    const n = 600;
    for (const task of tasks) {
      const t = task === 'classification' ? 'class' : 'reg';
      const base = (): Map<string, Col> => (seed % 2 ? weak(n, seed, task) : blocks(n, seed, task));
      let c = base();
      plantCopy(c, seed, task);
      out.push({ name: `copy/${t}/s${seed}`, clean: false, planted: { kind: 'leakage', leak: true, what: 'noisy copy of the target' }, csv: csvOf(c), target: 'y' });
      c = base();
      plantPostOutcome(c, seed, task);
      out.push({ name: `post-outcome/${t}/s${seed}`, clean: false, planted: { kind: 'leakage', leak: true, what: 'post-outcome column' }, csv: csvOf(c), target: 'y' });
      out.push({ name: `sorted-id/${t}/s${seed}`, clean: false, planted: { kind: 'leakage', leak: true, what: 'id following a sorted target' }, csv: csvOf(plantSortedId(base())), target: 'y' });
      c = base();
      plantTargetEncoding(c, seed, task);
      out.push({ name: `target-encoding/${t}/s${seed}`, clean: false, planted: { kind: 'leakage', leak: true, what: 'target encoding on all rows' }, csv: csvOf(c), target: 'y' });
      out.push({ name: `duplicates/${t}/s${seed}`, clean: false, planted: { kind: 'duplicate-rows', leak: false, what: 'duplicated records across folds' }, csv: csvOf(plantDuplicates(base(), seed)), target: 'y' });
    }
    out.push({ name: `ignored-groups/s${seed}`, clean: false, planted: { kind: 'group-like', leak: false, what: 'group structure the plan ignores' }, csv: csvOf(sites(n, seed, 1.5)), target: 'y' });
    const m = weak(n, seed, 'classification');
    plantMissingness(m, seed, 'w2');
    out.push({ name: `missingness/s${seed}`, clean: false, planted: { kind: 'informative-missingness', leak: false, what: 'informative missingness' }, csv: csvOf(m), target: 'y' });
  }
  return out;
}

export function auditCorpus(size: CorpusSize): CorpusEntry[] {
  const open = openEntries();
  return [...syntheticEntries(size), ...(size === 'full' ? open : open.filter((e) => ['penguins/species', 'cars/mpg', 'seattle-weather/weather', 'burtin/gram'].includes(e.name)))];
}

// ---------------------------------------------------------------- measuring

export interface EntryResult {
  readonly entry: CorpusEntry;
  /** lines the quick audit prints before eval */
  readonly printed: readonly string[];
  readonly report: AuditReport;
}

export async function runEntry(entry: CorpusEntry, full = true): Promise<EntryResult> {
  const table = await loadCsv({ text: entry.csv, name: `${entry.name}.csv` });
  const opts = { target: entry.target, drop: entry.drop, group: entry.group, order: entry.order };
  const plan = entry.plan ?? 'kfold:10';
  const printed = quickSuspects(table, { ...opts, plan, seed: 1 });
  const report = full ? audit(table, { ...opts, plan, seed: 1 }) : (undefined as unknown as AuditReport);
  return { entry, printed, report };
}

const pct = (a: number, b: number): string => (b === 0 ? '-' : `${((100 * a) / b).toFixed(1)}%`);

export interface CorpusTable {
  readonly cleanSets: number;
  readonly cleanQuiet: number;
  readonly header: readonly string[];
  readonly rows: string[][];
  /** names of clean sets with a printed finding, and the lines */
  readonly alarms: readonly string[];
  /** planted sets whose problem was not found at the expected severity */
  readonly misses: readonly string[];
}

/** False-alarm rate per check on the clean sets, and detection per planted problem. */
export function tabulate(results: readonly EntryResult[]): CorpusTable {
  const clean = results.filter((r) => r.entry.clean);
  const planted = results.filter((r) => !r.entry.clean);
  const kinds = [...new Set(results.flatMap((r) => r.report.suspects.map((s) => s.kind)))].sort();
  const rows: string[][] = [];
  for (const kind of kinds) {
    const printed = clean.filter((r) => r.printed.some((l) => l.startsWith(`${kind}:`))).length;
    const at = (sevs: readonly string[]): number => clean.filter((r) => r.report.suspects.some((s) => s.kind === kind && sevs.includes(s.severity))).length;
    rows.push([`clean: ${kind}`, String(clean.length), pct(printed, clean.length), pct(at(['high']), clean.length), pct(at(['high', 'warn']), clean.length), pct(at(['high', 'warn', 'note']), clean.length)]);
  }
  const whats = [...new Set(planted.map((r) => r.entry.planted!.what))];
  const misses: string[] = [];
  for (const what of whats) {
    const sets = planted.filter((r) => r.entry.planted!.what === what);
    const kind = sets[0].entry.planted!.kind;
    const found = (r: EntryResult, sevs: readonly string[]): boolean => r.report.suspects.some((s) => s.kind === kind && sevs.includes(s.severity));
    const printed = sets.filter((r) => r.printed.some((l) => l.startsWith(`${kind}:`))).length;
    for (const r of sets) if (!found(r, r.entry.planted!.leak ? ['high'] : ['high', 'warn'])) misses.push(r.entry.name);
    rows.push([
      `planted: ${what} (${kind})`,
      String(sets.length),
      pct(printed, sets.length),
      pct(sets.filter((r) => found(r, ['high'])).length, sets.length),
      pct(sets.filter((r) => found(r, ['high', 'warn'])).length, sets.length),
      pct(sets.filter((r) => found(r, ['high', 'warn', 'note'])).length, sets.length),
    ]);
  }
  const quiet = clean.filter((r) => r.printed.length === 0).length;
  rows.unshift(['clean: anything printed before eval', String(clean.length), pct(clean.length - quiet, clean.length), '', '', '']);
  return {
    cleanSets: clean.length,
    cleanQuiet: quiet,
    header: ['corpus: check', 'sets', 'printed before eval', 'high', 'warn or higher', 'any, notes too'],
    rows,
    alarms: clean.filter((r) => r.printed.length > 0).map((r) => `${r.entry.name}: ${r.printed.join(' | ')}`),
    misses,
  };
}
