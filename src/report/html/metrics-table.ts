/**
 * Every reported metric per learner as an HTML table: the mean over folds with its corrected
 * 95% interval below it, and the score of the pooled out-of-fold predictions. The best mean of
 * each metric (in that metric's better direction) is set in bold.
 */
import { METRICS, type MetricName } from '../../metrics/index.js';
import { esc } from './escape.js';
import { intervalText, num } from './format.js';
import { own, summaryOf } from './context.js';
import type { Report } from '../../model/report.js';

export function metricsTable(report: Report): string {
  const best = new Map<string, number>();
  for (const m of report.metrics) {
    const hib = METRICS.get(m as MetricName)?.higherIsBetter;
    if (hib === undefined) continue;
    const means = report.learners.map((l) => summaryOf(l, m)?.mean).filter((v): v is number => v !== undefined && Number.isFinite(v));
    if (means.length) best.set(m, hib ? Math.max(...means) : Math.min(...means));
  }
  const head = report.metrics.map((m) => `<th scope="col">${esc(m)}</th>`).join('');
  const rows = report.learners.map((l) => {
    const cells = report.metrics.map((m) => {
      const s = summaryOf(l, m);
      const pooled = own(l.pooled, m) ?? null;
      const bold = s && best.get(m) === s.mean ? ' class="best"' : '';
      return `<td${bold}>${num(s?.mean)}<span class="ci">${s ? intervalText(s.ci95) : ''}</span><span class="pooled">pooled ${num(pooled)}</span></td>`;
    });
    return `<tr><th scope="row">${esc(l.spec)}</th>${cells.join('')}</tr>`;
  });
  return [
    '<table class="metrics">',
    '<caption>Mean over folds, its corrected 95% interval, and the score of all out-of-fold predictions pooled. Bold: the best mean of the column.</caption>',
    `<thead><tr><th scope="col">learner</th>${head}</tr></thead>`,
    `<tbody>${rows.join('\n')}</tbody>`,
    '</table>',
  ].join('\n');
}
