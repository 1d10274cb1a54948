/**
 * The HTML page of an eval report: a heading naming the target and data (and counting the
 * warnings and the quick audit's suspects), the summary chart of the headline metric, the
 * paired comparison chart (when the report carries comparisons), a table of every metric, the
 * slice charts (with --slice: slice-chart.ts), then
 * by task:
 *
 * - classification: the pooled confusion matrix of the best learner (the others' folded away in
 *   a <details> block), the per-class recall bars, and for the best learner with probabilities
 *   the ROC and precision-recall curves with their fold bands and the reliability diagram
 *   (curve-charts.ts);
 * - regression: for the best learner, predicted against actual with the identity line and the
 *   residuals against predicted with a zero line, drawn from the sample of pooled out-of-fold
 *   predictions the report carries (regression-charts.ts); the other learners' charts folded
 *   away. A report of an older version, without the sample, gets no such charts;
 *
 * then with --importance one permutation-importance chart per learner (importance-chart.ts),
 * and the footer with the run details, the quick audit's suspects and the warnings.
 */
import { comparisonChart } from './comparison-chart.js';
import { confusionTable } from './confusion-table.js';
import { prChart, reliabilityChart, rocChart } from './curve-charts.js';
import { chartContext, summaryOf } from './context.js';
import { esc } from './escape.js';
import { evalFooter } from './footer.js';
import { intervalText, num } from './format.js';
import { importanceChart } from './importance-chart.js';
import { thresholdSection } from './threshold-table.js';
import { metricsTable } from './metrics-table.js';
import { page } from './page.js';
import { recallChart } from './recall-chart.js';
import { residualChart, scatterChart } from './regression-charts.js';
import { summaryChart } from './summary-chart.js';
import { sliceCharts } from './slice-chart.js';
import { foldLabel } from '../../model/fold-label.js';
import type { Report } from '../../model/report.js';

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
  for (const l of report.learners) {
    const failed = l.folds.filter((f) => f.failed !== undefined);
    if (!failed.length) continue;
    const where = failed.map(foldLabel).join(', ');
    parts.push(`<p class="lead failed">${esc(`Failed folds: ${l.spec} failed in ${failed.length} of ${l.folds.length} folds (${where}); its scores use the other folds, and foldwise gate does not compare this report.`)}</p>`);
  }
  const counts = [
    report.warnings.length ? `${report.warnings.length} warning${report.warnings.length === 1 ? '' : 's'}` : '',
    report.audit?.suspects.length ? `${report.audit.suspects.length} data-audit suspect${report.audit.suspects.length === 1 ? '' : 's'}` : '',
  ].filter(Boolean);
  if (counts.length) parts.push(`<p class="lead">${esc(`${counts.join(' and ')}: see the run details at the end.`)}</p>`);
  parts.push('</header>');

  parts.push(`<section><h2>${esc(`${ctx.metric} across folds`)}</h2>`, summaryChart(ctx), '</section>');
  const cmp = comparisonChart(ctx);
  if (cmp) parts.push('<section><h2>Paired comparisons</h2>', cmp, '</section>');
  parts.push('<section><h2>All metrics</h2>', metricsTable(report), '</section>');
  const slices = sliceCharts(report, ctx.higherIsBetter);
  if (slices) parts.push('<section><h2>Slices</h2>', slices, '</section>');

  if (d.task === 'classification' && d.classes) {
    const withMatrix = report.learners.filter((l) => (l.confusion && l.confusion.length > 0) || l.confusionFolded);
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
    // curves of the best learner with probabilities (src/curves/); the baseline only when alone
    const withCurves = report.learners.filter((l) => l.curves);
    const shown = ctx.best && withCurves.includes(ctx.best) ? ctx.best : (withCurves.find((l) => l !== ctx.baseline) ?? withCurves[0]);
    if (shown) {
      parts.push(`<section><h2>${esc(`Curves of ${shown.spec}`)}</h2>`, rocChart(shown) ?? '', prChart(shown) ?? '', '</section>');
      parts.push(`<section><h2>${esc(`Calibration of ${shown.spec}`)}</h2>`, reliabilityChart(shown) ?? '', '</section>');
    }
  }
  if (d.task === 'regression') {
    const withSample = report.learners.filter((l) => l.pooledSample);
    if (withSample.length) {
      const first = ctx.best && withSample.includes(ctx.best) ? ctx.best : withSample[0];
      parts.push('<section><h2>Predicted against actual</h2>', scatterChart(first, d.target) ?? '', '</section>');
      parts.push('<section><h2>Residuals</h2>', residualChart(first, d.target) ?? '');
      const others = withSample.filter((l) => l !== first);
      if (others.length) {
        parts.push(`<details><summary>${esc(`Predicted-against-actual and residual charts of the other learners (${others.map((l) => l.spec).join(', ')})`)}</summary>`);
        for (const l of others) {
          const suffix = `-${report.learners.indexOf(l) + 1}`;
          parts.push(`<h3>${esc(l.spec)}</h3>`, scatterChart(l, d.target, suffix) ?? '', residualChart(l, d.target, suffix) ?? '');
        }
        parts.push('</details>');
      }
      parts.push('</section>');
    }
  }
  if (report.threshold) parts.push(thresholdSection(report.threshold, report.learners));
  if (report.importance) {
    const imp = report.importance;
    parts.push(`<section><h2>${esc(`Permutation importance (${imp.metric})`)}</h2>`);
    report.learners.forEach((l, i) => {
      if (l.name === 'baseline') return;
      const chart = importanceChart(imp, l, i);
      if (chart) parts.push(`<h3>${esc(l.spec)}</h3>`, chart);
    });
    parts.push('</section>');
  }
  parts.push(evalFooter(report));
  return page(`foldwise: ${d.target} in ${d.path}`, parts.join('\n'));
}
