/**
 * The score across one option of a tune search: the inner mean of the headline metric on all
 * search rows (`all.mean`) at each value of the option, with the other options held at the
 * values of the anchor candidate (the recommendation, src/report/html/tune-space.ts), and a
 * band of one inner-fold sd (`all.sd`) either side. A numeric option is a line over its values
 * (a log axis when the values are positive, span a factor of 10 or more and are not evenly
 * spaced); a categorical one is a point with an sd bar at each category. Candidates with other
 * values of the other options are faint dots behind. The recommendation is ringed, the best
 * inner mean (when the one-standard-error rule picked another) boxed, an edge warning of this
 * option drawn as a dashed line at the edge, and triangles above the plot count the outer folds
 * whose pick had each value. Every point's mean is written above it and in its tooltip.
 */
import { textWidth, xAxis, yAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, metricLabel, num, px, svgText } from './format.js';
import { AXIS, BOX_FILL, GRID, BOX_STROKE, INK, INTERVAL, MUTED, POINT, WORSE } from './palette.js';
import { linearScale, type Scale } from './scale.js';
import { candidateById, type LearnerSpace, type OptionAxis, optionOf, sliceOf, valueKey, valueText } from './tune-space.js';
import type { ParamValue } from '../../learning.js';
import type { TuneCandidate, TuneReport } from '../../model/tune.js';

const WIDTH = CHART_WIDTH;
const LEFT = 92;
const RIGHT = WIDTH - 24;
const PAD = 26;
const PLOT = 230;
/** at most this many points get their mean written beside them */
const LABELLED = 14;

export interface OptionChartSpec {
  readonly id: string;
  readonly report: TuneReport;
  readonly space: LearnerSpace;
  readonly axis: OptionAxis;
  /** the edge of this option named by an edge warning, if any */
  readonly edge?: 'lower' | 'upper';
}

interface XMap {
  /** pixel of a value of the option */
  at(v: ParamValue): number;
  /** the axis markup: grid lines from top to bottom, labels below */
  axis(top: number, bottom: number, label: string): string;
  /** how positions follow the values */
  readonly kind: 'linear' | 'log' | 'ranked' | 'categories';
}

const evenlySpaced = (v: readonly number[]): boolean => {
  const span = v[v.length - 1] - v[0];
  for (let i = 2; i < v.length; i++) if (Math.abs(v[i] - v[i - 1] - (v[1] - v[0])) > 1e-9 * span) return false;
  return true;
};

/**
 * The x mapping of a numeric option: linear when the values are evenly spaced; log when they
 * are positive, span a factor of 10 or more and are not evenly spaced; and when neither fits
 * and a linear axis would crowd some values together (such as 0, 0.01, 0.1, 1, 10, 100), the
 * searched values evenly spaced in order, which the axis label says. Ticks are the searched
 * values themselves when their labels fit, else nice 1-2-5 steps (or powers of 10).
 */
function numericX(values: readonly number[]): XMap {
  const lo = values[0];
  const hi = values[values.length - 1];
  let minGap = Infinity;
  for (let i = 1; i < values.length; i++) minGap = Math.min(minGap, values[i] - values[i - 1]);
  const even = evenlySpaced(values);
  const kind: XMap['kind'] = even ? 'linear' : lo > 0 && hi / lo >= 10 ? 'log' : minGap / (hi - lo) < 0.03 && values.length <= 30 ? 'ranked' : 'linear';
  const rank = new Map(values.map((v, i) => [v, i] as const));
  const t = (v: number): number => (kind === 'log' ? Math.log10(v) : kind === 'ranked' ? (rank.get(v) ?? 0) : v);
  const a = t(lo);
  const b = t(hi);
  const inner = RIGHT - LEFT - 2 * PAD;
  const f = (v: number): number => LEFT + PAD + ((t(v) - a) / (b - a)) * inner;
  if (kind === 'ranked') {
    const widest = Math.max(...values.map((v) => valueText(v).length));
    const every = Math.max(1, Math.ceil((textWidth(widest, 13) + 8) / (inner / Math.max(1, values.length - 1))));
    return {
      at: (v) => f(Number(v)),
      axis: (top, bottom, label) => {
        const out = [`<g class="axis" font-size="13" fill="${MUTED}">`];
        values.forEach((v, i) => {
          out.push(`<line x1="${px(f(v))}" x2="${px(f(v))}" y1="${px(top)}" y2="${px(bottom)}" stroke="${GRID}" stroke-width="1"/>`);
          if (i % every === 0 || i === values.length - 1) out.push(svgText(f(v), bottom + 18, valueText(v), 'text-anchor="middle"'));
        });
        out.push(`<line x1="${LEFT}" x2="${RIGHT}" y1="${px(bottom)}" y2="${px(bottom)}" stroke="${AXIS}" stroke-width="1"/>`);
        out.push(`<text x="${px((LEFT + RIGHT) / 2)}" y="${px(bottom + 40)}" text-anchor="middle" font-size="14" fill="${MUTED}">${esc(label)}</text>`);
        out.push('</g>');
        return out.join('\n');
      },
      kind,
    };
  }
  const inv = (u: number): number => (kind === 'log' ? 10 ** u : u);
  const domain = [inv(a - (PAD * (b - a)) / inner), inv(b + (PAD * (b - a)) / inner)] as const;
  // the searched values as ticks when their labels do not collide
  const widest = Math.max(...values.map((v) => valueText(v).length));
  let gap = Infinity;
  for (let i = 1; i < values.length; i++) gap = Math.min(gap, f(values[i]) - f(values[i - 1]));
  let ticks: number[];
  let text: (v: number) => string = (v) => valueText(v);
  let decimals = 0;
  if (values.length <= 12 && gap >= textWidth(widest, 13) + 8) ticks = [...values];
  else if (kind === 'log') {
    ticks = [];
    for (let e = Math.floor(a); e <= Math.ceil(b); e++) for (const m of b - a <= 2 ? [1, 2, 5] : [1]) ticks.push(Number((m * 10 ** e).toPrecision(12)));
    ticks = ticks.filter((v) => v >= lo && v <= hi);
    if (ticks.length < 2) ticks = [lo, hi];
  } else {
    const nice = linearScale(lo, hi, 0, 1, 6);
    ticks = nice.ticks.filter((v) => v >= lo - 1e-9 * (hi - lo) && v <= hi + 1e-9 * (hi - lo));
    decimals = nice.decimals;
    text = (v) => v.toFixed(decimals).replace('-', '−');
  }
  const scale = Object.assign((v: number) => f(v), { domain, ticks, decimals }) as Scale;
  return {
    at: (v) => f(Number(v)),
    axis: (top, bottom, label) => xAxis(scale, top, bottom, label, text),
    kind,
  };
}

/** The x mapping of a categorical option: one band per value, its text below. */
function categoryX(values: readonly ParamValue[]): XMap {
  const band = (RIGHT - LEFT) / values.length;
  const index = new Map(values.map((v, i) => [valueKey(v), i] as const));
  const at = (v: ParamValue): number => LEFT + band * ((index.get(valueKey(v)) ?? 0) + 0.5);
  const chars = Math.max(4, Math.floor(band / (13 * 0.6)) - 1);
  return {
    at,
    axis: (_top, bottom, label) => {
      const out = [`<g class="axis" font-size="13" fill="${MUTED}">`];
      for (const v of values) out.push(`<text x="${px(at(v))}" y="${px(bottom + 18)}" text-anchor="middle">${esc(clip(valueText(v), chars))}<title>${esc(valueText(v))}</title></text>`);
      out.push(`<line x1="${LEFT}" x2="${RIGHT}" y1="${px(bottom)}" y2="${px(bottom)}" stroke="${AXIS}" stroke-width="1"/>`);
      out.push(`<text x="${px((LEFT + RIGHT) / 2)}" y="${px(bottom + 40)}" text-anchor="middle" font-size="14" fill="${MUTED}">${esc(label)}</text>`);
      out.push('</g>');
      return out.join('\n');
    },
    kind: 'categories',
  };
}

const finite = (v: number | null | undefined): v is number => v !== null && v !== undefined && Number.isFinite(v);

/** Runs of consecutive entries for which `ok` holds. */
function runs<T>(items: readonly T[], ok: (t: T) => boolean): T[][] {
  const out: T[][] = [];
  let cur: T[] = [];
  for (const it of items) {
    if (ok(it)) cur.push(it);
    else if (cur.length) {
      out.push(cur);
      cur = [];
    }
  }
  if (cur.length) out.push(cur);
  return out;
}

/** A wrapped legend row from y = `y0`; returns its markup and its bottom. */
function legend(items: readonly (readonly [string, string])[], y0: number): { markup: string; bottom: number } {
  const out: string[] = [];
  let x = 0;
  let row = 0;
  for (const [mark, text] of items) {
    const w = 26 + textWidth(text.length, 13) + 18;
    if (x > 0 && x + w > WIDTH) {
      x = 0;
      row++;
    }
    out.push(`<g transform="translate(${px(x)},${y0 + row * 22})">${mark}${svgText(26, 4, text, `fill="${INK}"`)}</g>`);
    x += w;
  }
  return { markup: `<g class="legend" font-size="13">${out.join('')}</g>`, bottom: y0 + row * 22 + 8 };
}

const heldText = (space: LearnerSpace, axis: OptionAxis): string => {
  const others = space.varying.filter((a) => a.name !== axis.name);
  if (!others.length) return 'no other option of this learner was searched';
  const values = others.map((a) => `${a.name}=${valueText(optionOf(space.anchor, a.name))}`).join(', ');
  return space.anchorIsRecommendation
    ? `the other options held at the recommended candidate's values (${values})`
    : `the other options held at the values of this learner's best candidate by inner mean, ${space.anchor.spec} (${values}), since the recommendation is another learner`;
};

export function optionChart(spec: OptionChartSpec): string {
  const { report, space, axis } = spec;
  const metric = report.selection.metric;
  const hib = report.selection.higherIsBetter;
  const rec = report.recommendation;
  const slice = sliceOf(space, axis);
  const inSlice = new Set(slice.map((c) => c.id));
  const others = space.candidates.filter((c) => !inSlice.has(c.id));
  const x = axis.numeric ? numericX(axis.values as number[]) : categoryX(axis.values);
  const xOf = (c: TuneCandidate): number => x.at(optionOf(c, axis.name) ?? '');

  // the outer folds' picks of this learner, counted by their value of the option
  const picks = new Map<string, { value: ParamValue; folds: number }>();
  let elsewhere = 0;
  for (const f of report.outer.folds) {
    const c = candidateById(report, f.pick);
    const v = c && c.name === space.learner ? optionOf(c, axis.name) : undefined;
    if (v === undefined) {
      elsewhere++;
      continue;
    }
    const e = picks.get(valueKey(v));
    if (e) e.folds++;
    else picks.set(valueKey(v), { value: v, folds: 1 });
  }

  const marks: (readonly [string, string])[] = [
    axis.numeric
      ? [`<rect x="0" y="-7" width="20" height="14" fill="${BOX_FILL}"/><line x1="0" x2="20" y1="0" y2="0" stroke="${BOX_STROKE}" stroke-width="2.5"/><circle cx="10" cy="0" r="4.5" fill="${POINT}"/>`, 'inner mean, band ±1 sd']
      : [`<line x1="10" x2="10" y1="-7" y2="7" stroke="${BOX_STROKE}" stroke-width="2"/><circle cx="10" cy="0" r="4.5" fill="${POINT}"/>`, 'inner mean, bar ±1 sd'],
  ];
  if (others.length) marks.push([`<circle cx="10" cy="0" r="3.5" fill="${MUTED}" fill-opacity="0.45"/>`, 'other values of the other options']);
  if (slice.some((c) => c.id === rec.id)) marks.push([`<circle cx="10" cy="0" r="8" fill="none" stroke="${INTERVAL}" stroke-width="2.5"/>`, 'recommended']);
  if (rec.best !== rec.id && slice.some((c) => c.id === rec.best)) marks.push([`<rect x="2" y="-8" width="16" height="16" fill="none" stroke="${INK}" stroke-width="1.5"/>`, 'best inner mean']);
  marks.push([`<path d="M4 -5 L16 -5 L10 5 Z" fill="${INTERVAL}"/>`, "outer folds' picks"]);
  const key = legend(marks, 44);
  const strip = key.bottom + 16;
  const top = strip + 24;
  const bottom = top + PLOT;

  const values: number[] = [];
  for (const c of space.candidates) {
    if (!finite(c.all.mean)) continue;
    values.push(c.all.mean);
    if (inSlice.has(c.id) && finite(c.all.sd)) values.push(c.all.mean - c.all.sd, c.all.mean + c.all.sd);
  }
  const y = linearScale(values.length ? Math.min(...values) : 0, values.length ? Math.max(...values) : 1, bottom, top, 5);
  const yLabel = `inner ${metricLabel(metric, report.data.target, hib)}`;
  const body: string[] = [svgText(LEFT - 60, 20, yLabel, `font-size="14" fill="${MUTED}"`), key.markup, yAxis(y, LEFT, RIGHT)];
  body.push(x.axis(top, bottom, `${axis.name}${x.kind === 'log' ? ' (log scale)' : x.kind === 'ranked' ? ' (the searched values, evenly spaced: not to scale)' : ''}`));

  // the sd band and the line (numeric), or sd bars (categorical)
  const withMean = slice.filter((c) => finite(c.all.mean));
  if (axis.numeric) {
    for (const r of runs(slice, (c) => finite(c.all.mean) && finite(c.all.sd))) {
      if (r.length < 2) continue;
      const up = r.map((c) => `${px(xOf(c))} ${px(y(c.all.mean! + c.all.sd!))}`);
      const down = [...r].reverse().map((c) => `${px(xOf(c))} ${px(y(c.all.mean! - c.all.sd!))}`);
      body.push(`<path class="band" d="M${up.join(' L')} L${down.join(' L')} Z" fill="${BOX_FILL}" fill-opacity="0.85"/>`);
    }
    for (const r of runs(slice, (c) => finite(c.all.mean))) {
      if (r.length < 2) continue;
      body.push(`<polyline class="line" points="${r.map((c) => `${px(xOf(c))},${px(y(c.all.mean!))}`).join(' ')}" fill="none" stroke="${BOX_STROKE}" stroke-width="2.5"/>`);
    }
  }
  // the edge the warning names
  if (spec.edge && axis.numeric) {
    const v = spec.edge === 'lower' ? axis.values[0] : axis.values[axis.values.length - 1];
    const ex = x.at(v);
    body.push(`<g class="edge" data-value="${attrNum(Number(v))}"><line x1="${px(ex)}" x2="${px(ex)}" y1="${px(top)}" y2="${px(bottom)}" stroke="${WORSE}" stroke-width="2" stroke-dasharray="6 4"/>${svgText(ex + (spec.edge === 'lower' ? 6 : -6), bottom - 8, `${spec.edge} edge of the searched ${axis.name}`, `text-anchor="${spec.edge === 'lower' ? 'start' : 'end'}" font-size="13" fill="${WORSE}"`)}</g>`);
  }
  for (const c of others) {
    if (!finite(c.all.mean)) continue;
    body.push(`<circle class="other" cx="${px(xOf(c))}" cy="${px(y(c.all.mean))}" r="3.5" fill="${MUTED}" fill-opacity="0.45" data-candidate="${c.id}" data-mean="${attrNum(c.all.mean)}"><title>${esc(`${c.spec}: inner ${metric} ${num(c.all.mean)} (sd ${num(c.all.sd)})`)}</title></circle>`);
  }
  // mean labels above the points (below when there is no room), the recommendation's and the
  // best mean's first; a label that would overlap one already placed is left out (every mean
  // is also in the point's tooltip, the text alternative and the table of candidates)
  const labels = new Map<number, { x: number; y: number }>();
  const placed: { x0: number; x1: number; y: number }[] = [];
  const first = (c: TuneCandidate): number => (c.id === rec.id ? 0 : c.id === rec.best ? 1 : 2);
  for (const c of [...withMean].sort((a, b) => first(a) - first(b))) {
    if (withMean.length > LABELLED && first(c) === 2) continue;
    const cx = xOf(c);
    const cy = y(c.all.mean!);
    const w = textWidth(num(c.all.mean).length, 12);
    const lx = cx + (axis.numeric ? 0 : 10);
    const ly = cy - 14 > top - 6 ? cy - 14 : cy + 24;
    const box = { x0: axis.numeric ? lx - w / 2 : lx, x1: axis.numeric ? lx + w / 2 : lx + w, y: ly };
    if (placed.some((p) => p.x0 < box.x1 + 4 && box.x0 < p.x1 + 4 && Math.abs(p.y - box.y) < 14)) continue;
    placed.push(box);
    labels.set(c.id, { x: lx, y: ly });
  }
  const folds = report.outer.folds.length;
  for (const c of slice) {
    const v = optionOf(c, axis.name);
    if (!finite(c.all.mean)) {
      body.push(svgText(xOf(c), bottom - 8, 'no score', `text-anchor="middle" font-size="12" fill="${MUTED}"`));
      continue;
    }
    const cx = xOf(c);
    const cy = y(c.all.mean);
    const g: string[] = [`<g class="point" data-candidate="${c.id}" data-value="${esc(valueText(v))}" data-mean="${attrNum(c.all.mean)}"${finite(c.all.sd) ? ` data-sd="${attrNum(c.all.sd)}"` : ''}>`];
    if (!axis.numeric && finite(c.all.sd)) {
      const [a, b] = [y(c.all.mean - c.all.sd), y(c.all.mean + c.all.sd)];
      g.push(`<line x1="${px(cx)}" x2="${px(cx)}" y1="${px(a)}" y2="${px(b)}" stroke="${BOX_STROKE}" stroke-width="2"/>`);
      for (const e of [a, b]) g.push(`<line x1="${px(cx - 6)}" x2="${px(cx + 6)}" y1="${px(e)}" y2="${px(e)}" stroke="${BOX_STROKE}" stroke-width="2"/>`);
    }
    if (c.id === rec.id) g.push(`<circle class="recommended" cx="${px(cx)}" cy="${px(cy)}" r="10" fill="none" stroke="${INTERVAL}" stroke-width="2.5"/>`);
    if (c.id === rec.best && rec.best !== rec.id) g.push(`<rect class="best-mean" x="${px(cx - 9)}" y="${px(cy - 9)}" width="18" height="18" fill="none" stroke="${INK}" stroke-width="1.5"/>`);
    const tip = `${c.spec}: inner ${metric} ${num(c.all.mean)} (sd ${num(c.all.sd)}) on all search rows${c.id === rec.id ? '; recommended' : ''}; picked by ${c.wins} of ${folds} outer folds`;
    g.push(`<circle cx="${px(cx)}" cy="${px(cy)}" r="5.5" fill="${POINT}" stroke="#ffffff" stroke-width="1.2"><title>${esc(tip)}</title></circle>`);
    const label = labels.get(c.id);
    if (label) g.push(svgText(label.x, label.y, num(c.all.mean), `class="mean-label" text-anchor="${axis.numeric ? 'middle' : 'start'}" font-size="12"${c.id === rec.id ? ' font-weight="700"' : ''} fill="${INK}"`));
    g.push('</g>');
    body.push(g.join('\n'));
  }
  // the outer folds' picks
  body.push(svgText(LEFT - 8, strip + 6, 'outer picks', `text-anchor="end" font-size="12" fill="${MUTED}"`));
  for (const { value, folds: n } of picks.values()) {
    const px0 = x.at(value);
    body.push(
      `<g class="pick" data-value="${esc(valueText(value))}" data-folds="${n}"><path d="M${px(px0 - 6)} ${px(strip - 4)} L${px(px0 + 6)} ${px(strip - 4)} L${px(px0)} ${px(strip + 7)} Z" fill="${INTERVAL}"/>${svgText(px0 + 8, strip + 5, `×${n}`, `font-size="12" fill="${INK}"`)}<title>${esc(`${n} of ${folds} outer folds picked ${axis.name}=${valueText(value)}`)}</title></g>`,
    );
  }

  const held = heldText(space, axis);
  const points = withMean.map((c) => `${axis.name}=${valueText(optionOf(c, axis.name))}: ${num(c.all.mean)}${finite(c.all.sd) ? ` (sd ${num(c.all.sd)})` : ''}${c.id === rec.id ? ', recommended' : ''}`);
  const pickWords = [...picks.values()].map((p) => `${axis.name}=${valueText(p.value)} by ${p.folds}`);
  const desc = [
    `Inner ${metric} on all search rows for ${space.learner} across ${axis.values.length} values of ${axis.name}, with ${held}.`,
    points.length ? `${points.join('; ')}.` : 'No candidate of this view has a defined score.',
    others.length ? `${others.length} other candidates are drawn as grey dots.` : '',
    `Outer folds' picks: ${pickWords.length ? pickWords.join(', ') : 'none of this learner'}${elsewhere && pickWords.length ? `; ${elsewhere} outer folds picked another learner or value` : ''}.`,
    spec.edge ? `The recommended ${axis.name} is at the ${spec.edge} edge of the searched values.` : '',
  ].filter(Boolean);
  const caption = [
    `Inner ${metric} on all ${report.plan.searchRows} search rows (inner plan ${report.plan.inner.text}) at each searched ${axis.name} of ${space.learner}, with ${held}; ${axis.numeric ? 'the band' : 'the bar'} is ±1 sd over the inner folds.`,
    others.length ? 'Grey dots: candidates with other values of the other options.' : '',
    `Triangles above count the outer folds whose pick had that ${axis.name}.`,
    'These inner means are the search\u2019s own figures and flatter the winner; quote the outer estimate.',
  ].filter(Boolean);
  return figure({
    id: spec.id,
    width: WIDTH,
    height: bottom + 58,
    title: `Inner ${metric} across ${axis.name} (${clip(space.learner, 60)})`,
    desc: desc.join(' '),
    caption: caption.join(' '),
    body: body.join('\n'),
  });
}
