#!/usr/bin/env node
// Writes examples/packhouse/fruit-grading.csv: an INVENTED demo data set (no real-world data).
// A made-up packing house grades lots of apples from made-up orchards into premium, standard,
// juice or reject. Every orchard and cultivar name here is invented. The generating rules are
// written out in README.md beside this file; the constants below are the same rules.
//
// Plain Node ESM, no dependencies. Randomness comes from mulberry32 (a small public-domain
// 32-bit generator by Tommy Ettinger, from memory) with a fixed seed, so every run writes the same bytes.
//
// Usage: node examples/packhouse/generate.mjs   (prints class and missing-value counts)

import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const SEED = 20240917;
const ROWS = 1200;
const OUT = join(dirname(fileURLToPath(import.meta.url)), 'fruit-grading.csv');

// ---------------------------------------------------------------- random numbers

/** mulberry32: uniform doubles in [0, 1) from a 32-bit state. */
function mulberry32(seed) {
  let a = seed >>> 0;
  return function next() {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const rand = mulberry32(SEED);

/** Standard normal draw (Box-Muller, one value per call; 1 - u keeps the log finite). */
function normal(mean = 0, sd = 1) {
  const u = 1 - rand();
  const v = rand();
  return mean + sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/** Poisson draw by Knuth's multiplication method (fine for small means). */
function poisson(lambda) {
  const limit = Math.exp(-lambda);
  let k = 0;
  let p = rand();
  while (p > limit) {
    k += 1;
    p *= rand();
  }
  return k;
}

/** Index drawn with probability proportional to weights. */
function pick(weights) {
  const total = weights.reduce((s, w) => s + w, 0);
  let r = rand() * total;
  for (let i = 0; i < weights.length; i++) {
    r -= weights[i];
    if (r < 0) return i;
  }
  return weights.length - 1;
}

const clamp = (x, lo, hi) => Math.min(hi, Math.max(lo, x));

// ---------------------------------------------------------------- the invented world

// Orchards: share of lots (uneven), a shift of mean firmness (N), a mean blemish count, and
// leniency: newtons added to the firmness the grader perceives (a slightly kinder or stricter
// eye for that orchard's lots). "Fennick Hill, Lower" carries a comma on purpose, so the file
// has quoted fields.
const ORCHARDS = [
  { name: 'Hollow Creek', share: 18, firmShift: 1.5, spotRate: 1.1, leniency: 1.0 },
  { name: 'Marl Ridge', share: 14, firmShift: 0.5, spotRate: 1.2, leniency: -0.5 },
  { name: "Tanner's Bend", share: 12, firmShift: -1.0, spotRate: 1.4, leniency: 0.5 },
  { name: 'Fennick Hill, Lower', share: 11, firmShift: 0.0, spotRate: 1.3, leniency: 0.0 },
  { name: 'Low Copse', share: 10, firmShift: -1.5, spotRate: 1.6, leniency: -1.0 },
  { name: 'Stillwater Rows', share: 9, firmShift: 1.5, spotRate: 1.0, leniency: 0.0 },
  { name: 'Grayling Flats', share: 8, firmShift: -0.5, spotRate: 1.3, leniency: 1.5 },
  { name: 'Ashcombe Terrace', share: 7, firmShift: 1.0, spotRate: 1.2, leniency: -1.5 },
  { name: 'Pellworth', share: 6, firmShift: -1.0, spotRate: 1.5, leniency: 0.5 },
  { name: 'North Wicket', share: 5, firmShift: 0.0, spotRate: 1.3, leniency: -0.5 },
];

// Cultivars (invented): share of lots, mean weight (g), mean firmness at the season's start
// (N), mean sugar (degrees Brix) and mean blush (% of skin).
const VARIETIES = [
  { name: 'Brindlecot', share: 35, weight: 185, firmness: 66, brix: 12.6, blush: 55 },
  { name: 'Tallowmere', share: 28, weight: 205, firmness: 62, brix: 12.0, blush: 25 },
  { name: 'Quillan Red', share: 22, weight: 170, firmness: 70, brix: 13.4, blush: 75 },
  { name: 'Osterblush', share: 15, weight: 195, firmness: 58, brix: 13.0, blush: 45 },
];

// Season: 2023-08-21 to 2023-10-29 (70 days). Picking is busiest mid-season.
const SEASON_DAYS = 70;
const SEASON_MONTHS = [
  { month: '2023-08', from: 21, days: 31 },
  { month: '2023-09', from: 1, days: 30 },
  { month: '2023-10', from: 1, days: 31 },
];

// ---------------------------------------------------------------- grading rules

// The grader judges the fruit's actual state; the CSV holds sensor readings of that state,
// which carry measurement error. So the rules below are sharp on the actual values but blurred
// on the readings, and no model can be perfect. Orchards also differ slightly in how strictly
// their lots are graded (a shift of the firmness cut, in newtons).
const READ_SD = { firmness: 1.5, brix: 0.2, blush: 3, weight: 1 };
const REJECT_SPOTS = 7; // this many blemishes or more: reject
const REJECT_FIRMNESS_N = 44; // softer than this: reject
const HIDDEN_DEFECT_RATE = 0.012; // bruise or puncture no sensor sees: reject
const UNDERSIZE_G = 135; // lighter than this: juice
const JUICE_SPOTS = 5; // this many blemishes or more: juice
const JUICE_BELOW = -1.2; // eating score below this: juice
const PREMIUM_AT = 0.7; // eating score at or above this, and
const PREMIUM_SPOTS = 2; // at most this many blemishes: premium

/** Eating score: firmness and sugar on a common scale, a little credit for blush. */
function eatingScore(firmness, brix, blush) {
  return (firmness - 60) / 8 + (brix - 12.8) / 1.3 + 0.3 * ((blush - 50) / 25);
}

function gradeOf(fruit, orchard) {
  const firmness = fruit.firmness + orchard.leniency;
  if (fruit.spots >= REJECT_SPOTS || firmness < REJECT_FIRMNESS_N) return 'reject';
  if (rand() < HIDDEN_DEFECT_RATE) return 'reject';
  const score = eatingScore(firmness, fruit.brix, fruit.blush);
  if (fruit.weight < UNDERSIZE_G || fruit.spots >= JUICE_SPOTS || score < JUICE_BELOW) return 'juice';
  if (score >= PREMIUM_AT && fruit.spots <= PREMIUM_SPOTS) return 'premium';
  return 'standard';
}

// ---------------------------------------------------------------- rows

/** ISO date of a day of the season, by plain calendar arithmetic (no clock involved). */
function isoDate(dayIndex) {
  let left = dayIndex;
  for (const m of SEASON_MONTHS) {
    const inMonth = m.days - m.from + 1;
    if (left < inMonth) return `${m.month}-${String(m.from + left).padStart(2, '0')}`;
    left -= inMonth;
  }
  throw new Error(`day ${dayIndex} is past the season`);
}

/** Day of the season: a hump-shaped draw (mean of two uniforms) over 0..SEASON_DAYS-1. */
function pickDay() {
  return Math.floor(((rand() + rand()) / 2) * SEASON_DAYS);
}

function makeLot() {
  const day = pickDay();
  const t = day / (SEASON_DAYS - 1); // 0 at the season's start, 1 at its end
  const orchard = ORCHARDS[pick(ORCHARDS.map((o) => o.share))];
  const variety = VARIETIES[pick(VARIETIES.map((v) => v.share))];

  const weight = clamp(normal(variety.weight + 10 * t, 28), 95, 340);
  // Diameter follows the cube root of weight (a near-sphere of fixed density), plus noise.
  const diameter = 12.6 * Math.cbrt(weight) + normal(0, 1.3);
  // Later picks are softer, sweeter and more blushed; spots rise a little late in the season.
  const firmness = clamp(normal(variety.firmness - 10 * t + orchard.firmShift, 8), 25, 95);
  const brix = clamp(normal(variety.brix + 0.9 * t, 1.2), 8, 19);
  const blush = clamp(normal(variety.blush + 8 * t, 15), 0, 100);
  const spots = poisson(orchard.spotRate * (0.8 + 0.5 * t));

  const grade = gradeOf({ weight, firmness, brix, blush, spots }, orchard);
  // What the sensors report: the actual values plus measurement error. Spots are counted
  // exactly (the camera counts the same blemishes the grader sees).
  const reading = {
    weight: clamp(weight + normal(0, READ_SD.weight), 90, 345),
    diameter,
    firmness: clamp(firmness + normal(0, READ_SD.firmness), 20, 99),
    brix: clamp(brix + normal(0, READ_SD.brix), 7, 20),
    blush: clamp(blush + normal(0, READ_SD.blush), 0, 100),
    spots,
  };
  return { day, orchard: orchard.name, variety: variety.name, ...reading, grade };
}

const lots = Array.from({ length: ROWS }, makeLot);
// Time order: sort by picking day (stable, so draw order breaks ties), then number the lots.
lots.sort((a, b) => a.day - b.day);

// ---------------------------------------------------------------- gaps

// Empty cells: a sensor that did not report. A few cells hold the text NA instead (hand-keyed).
const GAPS = [
  { column: 'firmness_n', emptyRate: 0.03, na: 4 },
  { column: 'sugar_brix', emptyRate: 0.025, na: 3 },
  { column: 'blush_pct', emptyRate: 0.0, na: 5 },
];

const COLUMNS = ['lot_id', 'orchard', 'picked_on', 'variety', 'weight_g', 'diameter_mm',
  'firmness_n', 'sugar_brix', 'blush_pct', 'spots', 'grade'];

const rows = lots.map((lot, i) => ({
  lot_id: String(1001 + i),
  orchard: lot.orchard,
  picked_on: isoDate(lot.day),
  variety: lot.variety,
  weight_g: lot.weight.toFixed(1),
  diameter_mm: lot.diameter.toFixed(1),
  firmness_n: lot.firmness.toFixed(1),
  sugar_brix: lot.brix.toFixed(1),
  blush_pct: String(Math.round(lot.blush)),
  spots: String(lot.spots),
  grade: lot.grade,
}));

for (const gap of GAPS) {
  for (const row of rows) if (rand() < gap.emptyRate) row[gap.column] = '';
  let placed = 0;
  while (placed < gap.na) {
    const row = rows[Math.floor(rand() * rows.length)];
    if (row[gap.column] === '' || row[gap.column] === 'NA') continue;
    row[gap.column] = 'NA';
    placed += 1;
  }
}

// ---------------------------------------------------------------- CSV out

/** RFC 4180 quoting, only where a field needs it. */
function csvField(text) {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

const lines = [COLUMNS.join(',')];
for (const row of rows) lines.push(COLUMNS.map((c) => csvField(row[c])).join(','));
const csv = lines.join('\n') + '\n';
writeFileSync(OUT, csv);

// ---------------------------------------------------------------- summary

const classCounts = new Map();
for (const row of rows) classCounts.set(row.grade, (classCounts.get(row.grade) ?? 0) + 1);
console.log(`wrote ${OUT}: ${rows.length} rows, ${Buffer.byteLength(csv)} bytes`);
console.log('grade counts:');
for (const g of ['premium', 'standard', 'juice', 'reject']) {
  const n = classCounts.get(g) ?? 0;
  console.log(`  ${g.padEnd(9)} ${String(n).padStart(5)}  ${((100 * n) / rows.length).toFixed(1)}%`);
}
console.log('missing cells (empty / NA):');
for (const c of COLUMNS) {
  const empty = rows.filter((r) => r[c] === '').length;
  const na = rows.filter((r) => r[c] === 'NA').length;
  if (empty + na > 0) console.log(`  ${c.padEnd(11)} ${empty} / ${na}`);
}
