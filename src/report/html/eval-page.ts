/**
 * The HTML page of an eval report: a heading naming the target and data, the summary chart of
 * the headline metric, the paired comparison chart (when the report carries comparisons), a
 * table of every metric, for classification the pooled confusion matrix of the best learner
 * (the others' folded away) and the per-class recall bars, and the footer with the run details.
 *
 * Regression reports get the summary, comparison and metric views; a predicted-against-actual
 * plot would need the out-of-fold predictions, which reports do not store.
 */
import { comparisonChart } from './comparison-chart.js';
import { confusionTable } from './confusion-table.js';
import { chartContext, summaryOf } from './context.js';
import { esc } from './escape.js';
import { evalFooter } from './footer.js';
import { intervalText, num } from './format.js';
import { metricsTable } from './metrics-table.js';
import { page } from './page.js';
import { recallChart } from './recall-chart.js';
import { summaryChart } from './summary-chart.js';
import type { Report } from '../types.js';

export function renderEvalHtml(report: Report): string {
  const ctx = chartContext(report);
  const d = report.data;
  const parts: string[] = [];
  const task = d.task === 'classification' ? `classification into ${d.classes?.length ?? 0} classes` : 'regression';
  parts.push('<header>');
  parts.push(`<h1>${esc(`Predicting ${d.target}`)}</h1>`);
  parts.push(`<p>${esc(`${d.path}: ${d.rowsUsed} rows, ${d.features.length} features, ${task}; plan ${report.plan.text}, seed ${report.plan.seed}`)}</p>`);
  if (ctx.best) {
    const s = summaryOf(ctx.best, ctx.metric);
    const base = ctx.baseline && ctx.baseline !== ctx.best ? summaryOf(ctx.baseline, ctx.metric) : null;
    const lead = `Best mean ${ctx.metric}: ${ctx.best.spec}, ${num(s?.mean)} (corrected 95% interval ${intervalText(s?.ci95)})${base ? `; the baseline reaches ${num(base.mean)}` : ''}.`;
    parts.push(`<p class="lead">${esc(lead)}</p>`);
  }
  if (report.warnings.length) parts.push(`<p class="lead">${esc(`${report.warnings.length} warning${report.warnings.length === 1 ? '' : 's'}: see the run details at the end.`)}</p>`);
  parts.push('</header>');

  parts.push(`<section><h2>${esc(`${ctx.metric} across folds`)}</h2>`, summaryChart(ctx), '</section>');
  const cmp = comparisonChart(ctx);
  if (cmp) parts.push('<section><h2>Paired comparisons</h2>', cmp, '</section>');
  parts.push('<section><h2>All metrics</h2>', metricsTable(report), '</section>');

  if (d.task === 'classification' && d.classes) {
    const withMatrix = report.learners.filter((l) => l.confusion && l.confusion.length > 0);
    if (withMatrix.length) {
      const first = ctx.best && withMatrix.includes(ctx.best) ? ctx.best : withMatrix[0];
      parts.push('<section><h2>Confusion matrix</h2>');
      parts.push(confusionTable(first, d.classes) ?? '');
      const others = withMatrix.filter((l) => l !== first);
      if (others.length) {
        parts.push(`<details><summary>${esc(`Confusion matrices of the other learners (${others.map((l) => l.spec).join(', ')})`)}</summary><div class="matrices">`);
        for (const l of others) parts.push(confusionTable(l, d.classes) ?? '');
        parts.push('</div></details>');
      }
      parts.push('</section>');
      const recall = recallChart(ctx);
      if (recall) parts.push('<section><h2>Recall per class</h2>', recall, '</section>');
    }
  }
  parts.push(evalFooter(report));
  return page(`foldwise: ${d.target} in ${d.path}`, parts.join('\n'));
}
