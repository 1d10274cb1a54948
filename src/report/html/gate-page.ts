/**
 * The HTML page of a gate verdict (format foldwise-gate/2): the verdict and its reasons in
 * words, the previous and current means side by side, the change chart (src/report/html/
 * gate-chart.ts), and the rule's figures, paths and warnings in a footer block.
 */
import { esc } from './escape.js';
import { warningsBlock } from './footer.js';
import { num, pText, signed } from './format.js';
import { gateChart } from './gate-chart.js';
import { page } from './page.js';
import { FAIL, PASS } from './palette.js';
import type { GateVerdict } from '../../model/compare.js';

const item = (term: string, value: string): string => `<div><dt>${esc(term)}</dt><dd>${value}</dd></div>`;

export function renderGateHtml(v: GateVerdict): string {
  const reasons = v.reasons.map((r) => (r === 'regression' ? `a drop in ${v.metric} beyond fold noise and beyond the allowed ${num(v.maxDrop)}` : `the current ${v.metric} is worse than the worst allowed ${num(v.worstAllowed)}`));
  const says =
    v.verdict === 'pass'
      ? `Passed: no drop in ${v.metric} beyond the allowed ${num(v.maxDrop)}${v.improvement ? ', and the current run is better beyond fold noise' : ''}.`
      : `Failed: ${reasons.join('; and ')}.`;
  const parts = [
    '<header>',
    `<h1>${esc(`Gate on ${v.metric}`)}</h1>`,
    `<p><span class="verdict" style="background:${v.verdict === 'pass' ? PASS : FAIL}">${v.verdict === 'pass' ? 'PASS' : 'FAIL'}</span></p>`,
    `<p class="lead">${esc(says)}</p>`,
    '</header>',
    '<section><h2>Previous against current</h2>',
    '<table class="sides"><thead><tr><th scope="col">run</th><th scope="col">learner</th><th scope="col">folds</th><th scope="col">mean</th><th scope="col">file</th></tr></thead><tbody>',
    ...(['previous', 'current'] as const).map((k) => `<tr><th scope="row">${k}</th><td>${esc(v[k].learner)}</td><td>${v[k].folds}</td><td data-mean="${v[k].mean}">${num(v[k].mean)}</td><td><code>${esc(v[k].path)}</code></td></tr>`),
    '</tbody></table>',
    gateChart(v),
    '</section>',
    '<footer><h2>Rule</h2><dl class="facts">',
    item('rule', esc(v.rule === 'paired' ? 'paired by (repeat, fold)' : `unpaired${v.unpairedBecause.length ? ` because ${v.unpairedBecause.join(', ')} differ` : ''}`)),
    item('change', esc(`${signed(v.change)} (drop ${num(v.drop)}, one-sided bound ${num(v.dropBound)})`)),
    item('test', esc(`t ${v.t === null ? '–' : num(v.t, 3)}, df ${v.df}, one-sided p ${pText(v.p)}, alpha ${v.alpha}`)),
    item('worst allowed', esc(v.worstAllowed === null ? 'none' : num(v.worstAllowed))),
    ...(v.accepted !== undefined ? [item('accepted', esc(v.accepted ? 'yes, the previous report was replaced' : 'no'))] : []),
    item('format', esc(v.schema)),
    '</dl><h3>Warnings</h3>',
    warningsBlock(v.warnings),
    '</footer>',
  ];
  return page(`foldwise gate: ${v.verdict} on ${v.metric}`, parts.join('\n'));
}
