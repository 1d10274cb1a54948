/**
 * The outer (nested) views of a tune report:
 * - the outer fold scores of the headline metric, one dot per outer fold (each scored by that
 *   fold's own pick, chosen on its training rows only), the mean as a diamond with its
 *   corrected 95% interval (Nadeau-Bengio, as in src/stats/summary.ts), and the baseline's mean
 *   on the same outer folds as a dashed line when the report carries that comparison;
 * - the paired difference, tuned minus baseline, with its corrected interval and zero marked
 *   (figures from src/compare/paired-stats.ts, as eval's comparisons; this only draws them);
 * - the table of each outer fold's pick, and the stability of the picks in words.
 */
import { textWidth, xAxis } from './axis.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, intervalText, metricLabel, num, pText, px, signed, svgText } from './format.js';
import { own } from './context.js';
import { BASELINE, BETTER, INK, INTERVAL, MUTED, POINT, UNCLEAR, WORSE } from './palette.js';
import { linearScale } from './scale.js';
import { spread } from './summary-chart.js';
import type { ComparisonEntry } from '../../model/compare.js';
import type { TuneOuterFold, TuneReport } from '../../model/tune.js';

const WIDTH = CHART_WIDTH;

const finite = (v: number | null | undefined): v is number => v !== null && v !== undefined && Number.isFinite(v);

export const foldName = (report: TuneReport, f: TuneOuterFold): string => (report.plan.outer.repeats > 1 ? `repeat ${f.repeat + 1}, fold ${f.fold + 1}` : `fold ${f.fold + 1}`);

/** The tuned-against-baseline pair on the headline metric, if the report carries it. */
export function baselinePair(report: TuneReport): ComparisonEntry | undefined {
  const cmp = report.comparisons;
  if (!cmp || cmp.metric !== report.selection.metric) return undefined;
  return cmp.pairs.find((p) => p.reference === 'baseline');
}

export function outerChart(report: TuneReport): string {
  const metric = report.selection.metric;
  const s = own(report.outer.summary, metric) ?? null;
  const pair = baselinePair(report);
  const scores = report.outer.folds.map((f) => own(f.scores, metric) ?? null);
  const left = 170;
  const right = WIDTH - 30;
  const top = 44;
  const cy = top + 28;
  const iy = cy + 30;
  const bottom = iy + 22;
  const values = [...scores.filter(finite), ...(s ? [s.mean, ...(s.ci95 ?? [])] : []), ...(pair ? [pair.referenceMean] : [])].filter(Number.isFinite);
  const x = linearScale(values.length ? Math.min(...values) : 0, values.length ? Math.max(...values) : 1, left, right, 7);
  const body: string[] = [xAxis(x, top - 8, bottom, `outer ${metricLabel(metric, report.data.target, report.selection.higherIsBetter)}`)];
  body.push(svgText(left - 12, cy + 5, 'tuned (nested)', `text-anchor="end" font-size="14" font-weight="600" fill="${INK}"`));
  body.push(svgText(left - 12, cy + 23, `${scores.filter(finite).length} outer folds`, `text-anchor="end" font-size="13" fill="${MUTED}"`));
  report.outer.folds.forEach((f, i) => {
    const v = scores[i];
    if (!finite(v)) return;
    body.push(`<circle class="outer-fold" cx="${px(x(v))}" cy="${px(cy + spread(i) * 9)}" r="5" fill="${POINT}" fill-opacity="0.75" stroke="#ffffff" stroke-width="0.8" data-score="${attrNum(v)}" data-pick="${f.pick}"><title>${esc(`outer ${foldName(report, f)}, pick ${f.pickSpec}: ${metric} ${num(v)}`)}</title></circle>`);
  });
  const words: string[] = [];
  if (s) {
    body.push(`<g class="outer-mean" data-mean="${attrNum(s.mean)}"${s.ci95 ? ` data-lo="${attrNum(s.ci95[0])}" data-hi="${attrNum(s.ci95[1])}"` : ''}><title>${esc(`outer mean ${num(s.mean)}, corrected 95% interval ${intervalText(s.ci95)}`)}</title>`);
    if (s.ci95) {
      body.push(`<line x1="${px(x(s.ci95[0]))}" x2="${px(x(s.ci95[1]))}" y1="${iy}" y2="${iy}" stroke="${INTERVAL}" stroke-width="3"/>`);
      for (const b of s.ci95) body.push(`<line x1="${px(x(b))}" x2="${px(x(b))}" y1="${iy - 5}" y2="${iy + 5}" stroke="${INTERVAL}" stroke-width="2"/>`);
    }
    const mx = x(s.mean);
    body.push(`<path d="M${px(mx)} ${iy - 7} L${px(mx + 7)} ${iy} L${px(mx)} ${iy + 7} L${px(mx - 7)} ${iy} Z" fill="${INTERVAL}" stroke="#ffffff" stroke-width="1"/>`);
    body.push('</g>');
    body.push(svgText(left - 12, iy + 5, `mean ${num(s.mean)}`, `text-anchor="end" font-size="13" fill="${INTERVAL}"`));
    words.push(`Outer mean ${num(s.mean)}, corrected 95% interval ${intervalText(s.ci95)}, folds from ${num(s.min)} to ${num(s.max)}.`);
  } else words.push(`No outer fold has a defined ${metric}.`);
  if (pair && Number.isFinite(pair.referenceMean)) {
    const bx = x(pair.referenceMean);
    const label = `baseline mean ${num(pair.referenceMean)}`;
    const half = textWidth(label.length, 13) / 2;
    const anchor = bx > right - half ? 'end' : bx < left + half ? 'start' : 'middle';
    body.push(`<g class="baseline-line" data-value="${attrNum(pair.referenceMean)}"><line x1="${px(bx)}" x2="${px(bx)}" y1="${top - 8}" y2="${bottom}" stroke="${BASELINE}" stroke-width="2" stroke-dasharray="5 3"/>${svgText(bx, top - 14, label, `text-anchor="${anchor}" font-size="13" fill="${BASELINE}"`)}</g>`);
    words.push(`Dashed line: the baseline's mean on the same outer folds, ${num(pair.referenceMean)}.`);
  }
  const per = report.outer.folds.map((f, i) => `${foldName(report, f)} ${num(scores[i])}`).join(', ');
  return figure({
    id: 'outer',
    width: WIDTH,
    height: bottom + 56,
    title: `Outer ${metric} of the tuned learner on each of the ${report.outer.folds.length} outer folds`,
    desc: `One dot per outer fold: ${per}. ${words.join(' ')}`,
    caption: `Each dot is one outer test fold of plan ${report.plan.outer.text}, scored by the candidate that fold's own inner search picked on its training rows. The orange diamond is their mean with its corrected 95% interval (Nadeau-Bengio)${pair ? '; the dashed line is the baseline fitted on the same outer folds' : ''}. This nested estimate is the number to quote.`,
    body: body.join('\n'),
  });
}

export function outerDiffChart(report: TuneReport): string | undefined {
  const p = baselinePair(report);
  if (!p || !Number.isFinite(p.diff)) return undefined;
  const metric = report.selection.metric;
  const left = 170;
  const right = WIDTH - 300;
  const top = 34;
  const cy = top + 26;
  const bottom = top + 52;
  const values = [0, p.diff, ...(p.ci95 ?? [])].filter(Number.isFinite);
  const x = linearScale(Math.min(...values), Math.max(...values), left, right, 5);
  const clear = p.ci95 !== null && (p.ci95[0] > 0 || p.ci95[1] < 0);
  const colour = !clear ? UNCLEAR : p.direction === 'better' ? BETTER : p.direction === 'worse' ? WORSE : UNCLEAR;
  const verdict = !clear ? 'within fold noise' : p.direction === 'better' ? 'better beyond fold noise' : 'worse beyond fold noise';
  const better = report.selection.higherIsBetter ? 'higher' : 'lower';
  const body: string[] = [xAxis(x, top - 8, bottom, `difference in ${metric}, tuned minus baseline (${better} is better)`)];
  body.push(`<line class="zero" x1="${px(x(0))}" x2="${px(x(0))}" y1="${top - 8}" y2="${bottom}" stroke="${INK}" stroke-width="1.5"/>`);
  body.push(svgText(x(0), top - 13, 'no difference', `text-anchor="middle" font-size="13" fill="${MUTED}"`));
  body.push(svgText(left - 12, cy + 5, 'tuned vs baseline', `text-anchor="end" font-size="14" font-weight="600" fill="${INK}"`));
  body.push(`<g class="pair" data-diff="${attrNum(p.diff)}"${p.ci95 ? ` data-lo="${attrNum(p.ci95[0])}" data-hi="${attrNum(p.ci95[1])}"` : ''}>`);
  if (p.ci95) {
    body.push(`<line x1="${px(x(p.ci95[0]))}" x2="${px(x(p.ci95[1]))}" y1="${cy}" y2="${cy}" stroke="${colour}" stroke-width="3"/>`);
    for (const b of p.ci95) body.push(`<line x1="${px(x(b))}" x2="${px(x(b))}" y1="${cy - 6}" y2="${cy + 6}" stroke="${colour}" stroke-width="2"/>`);
  }
  body.push(`<circle cx="${px(x(p.diff))}" cy="${cy}" r="6.5" fill="${colour}" stroke="#ffffff" stroke-width="1.2"><title>${esc(`tuned minus baseline: ${signed(p.diff)}, corrected 95% interval ${intervalText(p.ci95)}, p ${pText(p.p)}`)}</title></circle>`);
  body.push('</g>');
  body.push(svgText(right + 14, cy + 1, `${signed(p.diff)}  (${intervalText(p.ci95)})`, `font-size="13" fill="${INK}"`));
  body.push(svgText(right + 14, cy + 18, `${verdict}; won ${p.wins} of ${p.folds} folds`, `font-size="13" fill="${MUTED}"`));
  return figure({
    id: 'outer-diff',
    width: WIDTH,
    height: bottom + 56,
    title: `Tuned against the baseline on the same outer folds, ${metric}`,
    desc: `Mean paired difference in ${metric}, tuned minus baseline, over ${p.folds} outer folds: ${signed(p.diff)}, corrected ${Math.round((report.comparisons?.level ?? 0.95) * 100)}% interval ${intervalText(p.ci95)}, ${verdict}; better on ${p.wins}, equal on ${p.ties}, worse on ${p.losses} folds.`,
    caption: `The dot is the mean of the paired outer-fold differences (tuned minus baseline, in ${metric} units), the bar its corrected interval (Nadeau-Bengio). Blue: better beyond fold noise; orange: worse; grey: the interval reaches across zero.`,
    body: body.join('\n'),
  });
}

/** The pick of every outer fold, with the stability of the picks above the table. */
export function picksTable(report: TuneReport): string {
  const metric = report.selection.metric;
  const rec = report.recommendation;
  const n = report.outer.folds.length;
  const rows = report.outer.folds.map((f) => {
    const isRec = f.pick === rec.id;
    const note = [isRec ? 'the recommendation' : '', f.best !== f.pick ? 'one-se pick' : ''].filter(Boolean).join('; ');
    return `<tr${isRec ? ' class="rec"' : ''} data-pick="${f.pick}"><th scope="row">${esc(foldName(report, f))}</th><td>${f.trainRows}</td><td>${f.testRows}</td><td class="spec"><code>${esc(clip(f.pickSpec, 80))}</code>${note ? `<span>${esc(note)}</span>` : ''}</td><td>${num(f.innerMean)}</td><td>${num(f.innerSd)}</td><td data-score="${attrNum(own(f.scores, metric) ?? NaN)}">${num(own(f.scores, metric))}</td></tr>`;
  });
  const st = report.stability;
  const top = st.winners[0];
  const recWins = report.candidates.find((c) => c.id === rec.id)?.wins ?? 0;
  const list = st.winners.map((w) => `<li><code>${esc(clip(w.spec, 80))}</code> ${esc(`picked by ${w.folds} of ${n}`)}${w.id === rec.id ? ' <strong>(recommended)</strong>' : ''}</li>`).join('');
  const words = top
    ? `The ${n} outer folds made ${st.distinct} distinct pick${st.distinct === 1 ? '' : 's'}; the most frequent took ${top.folds} of ${n} (${(100 * st.topShare).toFixed(0)}%). The recommendation was the pick of ${recWins} of ${n} outer folds${rec.matchesTopWinner ? ', the most frequent' : ''}.`
    : 'No outer fold made a pick.';
  return [
    `<p class="lead">${esc(words)}</p>`,
    `<ul class="winners">${list}</ul>`,
    '<table class="picks">',
    `<caption>${esc(`Each outer fold's inner search (plan ${report.plan.inner.text} on that fold's training rows) picked one candidate; it was refitted on the training rows and scored on the test rows. Inner figures are on the training rows, the last column on the test rows.`)}</caption>`,
    `<thead><tr><th scope="col">outer fold</th><th scope="col">train rows</th><th scope="col">test rows</th><th scope="col">pick</th><th scope="col">${esc(`inner ${metric}`)}</th><th scope="col">inner sd</th><th scope="col">${esc(`outer ${metric}`)}</th></tr></thead>`,
    `<tbody>${rows.join('\n')}</tbody>`,
    '</table>',
  ].join('\n');
}
