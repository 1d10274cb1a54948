/**
 * The heat table of a learner whose search varied exactly two options: one row per value of
 * the option with more values (the first in option order on a tie), one column per value of
 * the other, and in each cell the inner mean of the headline metric on all search rows with
 * its sd. Cells are shaded in one blue hue by where the mean lies between the worst and the
 * best cell (darker is better, in the metric's better direction), so the shade is only a cue:
 * the number is written in every cell. The recommendation's cell is outlined and labelled; a
 * combination the search did not try (random search) says so.
 */
import { clip, esc } from './escape.js';
import { attrNum, num } from './format.js';
import { shade } from './palette.js';
import { type LearnerSpace, optionOf, valueKey, valueText } from './tune-space.js';
import type { TuneCandidate, TuneReport } from '../../model/tune.js';

const finite = (v: number | null): v is number => v !== null && Number.isFinite(v);

export function heatTable(report: TuneReport, space: LearnerSpace): string | undefined {
  if (space.varying.length !== 2) return undefined;
  const [first, second] = space.varying;
  const [rows, cols] = second.values.length > first.values.length ? [second, first] : [first, second];
  const cell = new Map<string, TuneCandidate>();
  for (const c of space.candidates) cell.set(`${valueKey(optionOf(c, rows.name))}\u0000${valueKey(optionOf(c, cols.name))}`, c);
  const means = space.candidates.map((c) => c.all.mean).filter(finite);
  const lo = means.length ? Math.min(...means) : 0;
  const hi = means.length ? Math.max(...means) : 0;
  const hib = report.selection.higherIsBetter;
  const rec = report.recommendation;
  const folds = report.outer.folds.length;
  const head = cols.values.map((v) => `<th scope="col">${esc(clip(valueText(v), 24))}</th>`).join('');
  const body = rows.values.map((rv) => {
    const cells = cols.values.map((cv) => {
      const c = cell.get(`${valueKey(rv)}\u0000${valueKey(cv)}`);
      if (!c) return '<td class="untried">not tried</td>';
      if (!finite(c.all.mean)) return `<td class="untried" data-candidate="${c.id}">no score</td>`;
      const share = hi > lo ? (hib ? c.all.mean - lo : hi - c.all.mean) / (hi - lo) : 0.5;
      const { background, text } = shade(0.08 + 0.8 * share);
      const marks = [c.id === rec.id ? 'recommended' : '', c.id === rec.best && rec.best !== rec.id ? 'best inner mean' : '', c.wins ? `picked by ${c.wins} of ${folds} outer folds` : ''].filter(Boolean);
      const cls = c.id === rec.id ? ' class="pick"' : '';
      return `<td${cls} style="background:${background};color:${text}" data-candidate="${c.id}" data-mean="${attrNum(c.all.mean)}" title="${esc(c.spec)}">${num(c.all.mean)}<span>sd ${num(c.all.sd)}</span>${marks.length ? `<span class="mark">${esc(marks.join('; '))}</span>` : ''}</td>`;
    });
    return `<tr><th scope="row">${esc(clip(valueText(rv), 24))}</th>${cells.join('')}</tr>`;
  });
  const better = hib ? 'higher' : 'lower';
  return [
    `<table class="heat" data-rows="${esc(rows.name)}" data-cols="${esc(cols.name)}">`,
    `<caption>${esc(`${space.learner}: inner ${report.selection.metric} on all ${report.plan.searchRows} search rows for each searched pair of ${rows.name} (rows) and ${cols.name} (columns), with the inner-fold sd below. Darker cells are better (${better} is better); the outlined cell is the recommendation. These inner means flatter the winner; quote the outer estimate.`)}</caption>`,
    `<thead><tr><th scope="col" class="corner">${esc(`${clip(rows.name, 20)} \u2193 / ${clip(cols.name, 20)} \u2192`)}</th>${head}</tr></thead>`,
    `<tbody>${body.join('\n')}</tbody>`,
    '</table>',
  ].join('\n');
}
