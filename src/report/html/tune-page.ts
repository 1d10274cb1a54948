/**
 * The HTML page of a tune report (format foldwise-tune/2). From the top:
 * - a header with the two numbers a tune run gives and must not mix up: the nested outer
 *   estimate (the number to quote) and the recommendation (the candidate to deploy, whose inner
 *   mean is the search's own optimistic figure), with the stability of the picks, the
 *   comparison with the baseline and the holdout score when the report has them;
 * - the outer estimate: every outer fold's score, the mean with its corrected interval and the
 *   baseline, then the paired difference against the baseline;
 * - each outer fold's pick and how often the folds agreed;
 * - the search: for each learner, one chart per option that took more than one value (the
 *   other options held at the recommendation's values), edge warnings beside their chart, and
 *   a heat table when exactly two options varied; then every candidate in a folded table;
 * - the footer with the data fingerprint, plans, seed, search, tool version and warnings.
 * The candidates' inner means come from `all` (the inner plan on all search rows).
 */
import { thresholdSection } from './threshold-table.js';
import { deployThresholdText } from '../threshold-markdown.js';
import { TUNE_THRESHOLD_NOTE } from '../tune-markdown.js';
import { clip, esc } from './escape.js';
import { tuneFooter } from './footer.js';
import { attrNum, intervalText, num, pText, signed } from './format.js';
import { own } from './context.js';
import { page } from './page.js';
import { BOX_STROKE, GRID, INK, INTERVAL, MUTED, WORSE } from './palette.js';
import { heatTable } from './tune-heat.js';
import { optionChart } from './tune-option-chart.js';
import { baselinePair, outerChart, outerDiffChart, picksTable } from './tune-outer.js';
import { byInnerMean, candidateById, learnerSpaces } from './tune-space.js';
import { edgeOfWarning } from '../../search/edges.js';
import type { TuneReport } from '../../model/tune.js';

const STYLE = `
.cards{display:flex;flex-wrap:wrap;gap:12px 20px;margin:14px 0 6px}
.card{flex:1 1 320px;border:1px solid ${GRID};border-left:6px solid ${BOX_STROKE};border-radius:4px;padding:10px 14px}
.card.deploy{border-left-color:${INTERVAL}}
.card .label{font-size:13px;font-weight:600;letter-spacing:.03em;text-transform:uppercase;color:${MUTED}}
.card .value{font-size:26px;font-weight:700;line-height:1.25;overflow-wrap:anywhere}
.card .value code{font-size:20px}
.card p{margin:4px 0 0;font-size:14px}
p.edge{border-left:5px solid ${WORSE};background:#fdf2e7;padding:6px 10px;margin:10px 0 4px;color:${INK}}
ul.winners{margin:4px 0 6px;padding-left:20px;font-size:14px}
table.picks td.spec{text-align:left}
table.picks td.spec span{display:block;font-size:12px;color:${MUTED}}
table.picks tr.rec th,table.picks tr.rec td{font-weight:700}
table.heat td{min-width:86px;font-size:15px;font-weight:600}
table.heat td span{display:block;font-size:12px;font-weight:400;opacity:.95}
table.heat td.pick{outline:3px solid ${INK};outline-offset:-4px}
table.heat td.untried{background:#f6f7f9;color:${MUTED};font-weight:400;font-size:13px}
table.heat th.corner{font-weight:400;color:${MUTED};font-size:13px}
table.grid td.spec{text-align:left}
table.grid tr.rec th,table.grid tr.rec td{font-weight:700}
`;

const plural = (n: number, noun: string): string => `${n} ${noun}${n === 1 ? '' : 's'}`;

function header(r: TuneReport): string {
  const d = r.data;
  const metric = r.selection.metric;
  const s = own(r.outer.summary, metric) ?? null;
  const pooled = own(r.outer.pooled, metric) ?? null;
  const rec = r.recommendation;
  const folds = r.outer.folds.length;
  const task = d.task === 'classification' ? `classification into ${d.classes?.length ?? 0} classes` : 'regression';
  const out: string[] = ['<header>', `<h1>${esc(`Tuning a learner to predict ${d.target}`)}</h1>`];
  out.push(`<p>${esc(`${d.path}: ${d.rowsUsed} rows (${r.plan.searchRows} in the search), ${d.features.length} features, ${task}; outer plan ${r.plan.outer.text}, inner plan ${r.plan.inner.text}, seed ${r.plan.seed}; ${plural(r.search.tried, 'candidate')}, pick rule ${r.selection.rule}`)}</p>`);
  out.push('<div class="cards">');
  out.push(
    [
      '<section class="card quote">',
      `<div class="label">${esc(`Outer estimate of ${metric}: the number to quote`)}</div>`,
      `<div class="value"${s ? ` data-mean="${attrNum(s.mean)}"` : ''}>${num(s?.mean)}</div>`,
      `<p>${esc(s ? `Mean over ${s.n} outer folds, corrected 95% interval ${intervalText(s.ci95)}; pooled ${num(pooled)}. Nested: each outer fold's candidate was chosen on that fold's training rows only.` : `No outer fold has a defined ${metric}.`)}</p>`,
      '</section>',
    ].join(''),
  );
  const note = rec.best !== rec.id ? ` The best inner mean was ${rec.bestSpec} at ${num(rec.bestInnerMean)}; the one-standard-error rule took the simpler candidate.` : '';
  out.push(
    [
      '<section class="card deploy">',
      `<div class="label">Recommendation: the candidate to deploy</div>`,
      `<div class="value"><code>${esc(clip(rec.spec, 120))}</code></div>`,
      `<p>${esc(`Picked by the inner plan on all ${r.plan.searchRows} search rows. Its inner ${metric} of ${num(rec.innerMean)} (sd ${num(rec.innerSd)}) is optimistic: the search that picked it out of ${plural(r.search.tried, 'candidate')} also scored it, so do not quote it.${note}`)}</p>`,
      r.threshold && rec.threshold ? `<p class="deploy-threshold">${esc(deployThresholdText(r.threshold, rec.threshold))}</p>` : '',
      '</section>',
    ].join(''),
  );
  out.push('</div>');
  const top = r.stability.winners[0];
  const recWins = candidateById(r, rec.id)?.wins ?? 0;
  if (top) out.push(`<p class="lead">${esc(`Stability: the outer folds made ${plural(r.stability.distinct, 'distinct pick')}; the most frequent, ${top.spec}, was picked by ${top.folds} of ${folds}; the recommendation by ${recWins} of ${folds}.`)}</p>`);
  const pair = baselinePair(r);
  if (pair) {
    const clear = pair.ci95 !== null && (pair.ci95[0] > 0 || pair.ci95[1] < 0);
    const verdict = !clear ? 'within fold noise' : pair.direction === 'better' ? 'better beyond fold noise' : 'worse beyond fold noise';
    out.push(`<p class="lead">${esc(`Against the baseline on the same outer folds: ${signed(pair.diff)} in ${metric} (corrected 95% interval ${intervalText(pair.ci95)}, p ${pText(pair.p)}), ${verdict}; the tuned learner won ${pair.wins} of ${pair.folds} folds.`)}</p>`);
  }
  if (r.holdout) {
    const h = r.holdout;
    out.push(`<p class="lead">${esc(`Holdout, scored once: ${h.spec} fitted on ${h.trainRows} search rows, ${metric} ${num(own(h.scores, metric))} on ${h.testRows} held-out rows.`)}</p>`);
  }
  const edges = r.warnings.filter((w) => edgeOfWarning(w));
  if (r.warnings.length) {
    out.push(`<p class="lead">${esc(`${plural(r.warnings.length, 'warning')}${edges.length ? `, ${edges.length} about the edge of a searched range (shown beside its chart)` : ''}: see the run details at the end.`)}</p>`);
  }
  out.push('</header>');
  return out.join('\n');
}

function searchSection(r: TuneReport): string {
  const spaces = learnerSpaces(r);
  const rec = candidateById(r, r.recommendation.id);
  // edge warnings are about the recommendation, so they belong to its learner's charts
  const edges = r.warnings.map((w) => ({ text: w, edge: edgeOfWarning(w) })).filter((e) => e.edge !== undefined);
  const placed = new Set<string>();
  const out: string[] = [`<section><h2>${esc(`The search: inner ${r.selection.metric} across the options`)}</h2>`];
  spaces.forEach((space, g) => {
    if (!space.varying.length) {
      out.push(`<p class="note">${esc(`No option of ${space.learner} took more than one value, so there is no curve to draw.`)}</p>`);
      return;
    }
    space.varying.forEach((axis, i) => {
      const mine = rec !== undefined && rec.name === space.learner ? edges.filter((e) => e.edge!.option === axis.name) : [];
      out.push(`<h3>${esc(`${axis.name}${axis.numeric ? '' : ' (categories)'}${spaces.length > 1 ? ` of ${space.learner}` : ''}`)}</h3>`);
      for (const e of mine) {
        out.push(`<p class="edge">${esc(`Edge of the searched range: ${e.text}.`)}</p>`);
        placed.add(e.text);
      }
      out.push(optionChart({ id: `option-${g + 1}-${i + 1}`, report: r, space, axis, edge: mine[0]?.edge?.side }));
    });
    const heat = heatTable(r, space);
    if (heat) out.push(`<h3>${esc(`${space.varying[0].name} and ${space.varying[1].name} together`)}</h3>`, heat);
  });
  const rest = edges.filter((e) => !placed.has(e.text));
  if (rest.length) out.splice(1, 0, ...rest.map((e) => `<p class="edge">${esc(`Edge of the searched range: ${e.text}.`)}</p>`));
  out.push('</section>');
  return out.join('\n');
}

function candidatesTable(r: TuneReport): string {
  const rec = r.recommendation;
  const sorted = [...r.candidates].sort(byInnerMean(r.selection.higherIsBetter));
  const folds = r.outer.folds.length;
  const rows = sorted.map((c, i) => {
    const mark = [c.id === rec.id ? 'recommended' : '', c.id === rec.best && rec.best !== rec.id ? 'best inner mean' : ''].filter(Boolean).join(', ');
    return `<tr${c.id === rec.id ? ' class="rec"' : ''} data-candidate="${c.id}"><th scope="row">${i + 1}</th><td class="spec"><code>${esc(clip(c.spec, 100))}</code>${mark ? ` (${esc(mark)})` : ''}</td><td>${num(c.all.mean)}</td><td>${num(c.all.sd)}</td><td>${c.wins} of ${folds}</td></tr>`;
  });
  return [
    `<details><summary>${esc(`All ${plural(r.candidates.length, 'candidate')}, best inner mean first`)}</summary>`,
    '<table class="grid">',
    `<caption>${esc(`Inner ${r.selection.metric} on all search rows (mean and sd over the inner folds), and how many outer folds picked each candidate.`)}</caption>`,
    `<thead><tr><th scope="col">rank</th><th scope="col">candidate</th><th scope="col">inner mean</th><th scope="col">inner sd</th><th scope="col">outer picks</th></tr></thead>`,
    `<tbody>${rows.join('\n')}</tbody>`,
    '</table></details>',
  ].join('\n');
}

export function renderTuneHtml(report: TuneReport): string {
  const metric = report.selection.metric;
  const parts: string[] = [header(report)];
  const diff = outerDiffChart(report);
  parts.push(`<section><h2>${esc(`Outer estimate${baselinePair(report) ? ' against the baseline' : ''}: ${metric} on each outer fold`)}</h2>`, outerChart(report), ...(diff ? [diff] : []), '</section>');
  parts.push('<section><h2>Picks of the outer folds</h2>', picksTable(report), '</section>');
  if (report.threshold) parts.push(thresholdSection(report.threshold, report.outer.threshold ? [{ spec: 'tuned', threshold: report.outer.threshold }] : [], TUNE_THRESHOLD_NOTE));
  parts.push(searchSection(report));
  parts.push(`<section><h2>Every candidate</h2>`, candidatesTable(report), '</section>');
  parts.push(tuneFooter(report));
  return page(`foldwise tune: ${report.data.target} in ${report.data.path}`, parts.join('\n'), STYLE);
}
