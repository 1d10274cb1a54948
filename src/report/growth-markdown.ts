/** The Markdown of a growth report: per learner, test and training scores at each size, the fitted curve and the doubling gain. */
import { cell, num } from './markdown.js';
import type { GrowthReport } from '../growth/growth.js';
import { costsSection } from './costs-markdown.js';

const iv = (ci: readonly [number, number] | null | undefined): string => (ci ? `${num(ci[0])} to ${num(ci[1])}` : '–');

export function renderGrowthMarkdown(r: GrowthReport): string {
  const out: string[] = [
    `# foldwise growth: ${cell(r.data.target)}`,
    '',
    `- Data: ${cell(r.data.path)}, ${r.data.rowsUsed} rows used; plan ${r.plan.text} (${r.plan.folds} folds${r.plan.repeats > 1 ? ` x ${r.plan.repeats} repeats` : ''}), seed ${r.plan.seed}`,
    `- Metric: ${cell(r.metric)} (${r.higherIsBetter ? 'higher' : 'lower'} is better), on the same outer test rows at every size; training subsets nested and ${r.plan.stratified ? 'stratified' : 'not stratified'}`,
    '',
    ...costsSection(r.settings?.costs),
  ];
  for (const l of r.learners) {
    out.push(`## ${cell(l.spec)}`, '');
    out.push('| size | rows | test mean | test 95% interval (corrected) | training mean | gap |', '| --: | --: | --: | --: | --: | --: |');
    for (const p of l.points) {
      const gap = p.test && p.train ? p.train.mean - p.test.mean : null;
      out.push(`| ${p.size} | ${p.rows.toFixed(1)} | ${num(p.test?.mean)} | ${iv(p.test?.ci95)} | ${num(p.train?.mean)} | ${num(gap)} |`);
    }
    out.push('');
    if (l.fit) {
      out.push(`- Fitted: ${r.metric} = ${num(l.fit.a)} - ${num(l.fit.b)} n^-${l.fit.c} (${l.fit.method})`);
      if (l.doubling) out.push(`- Doubling the data to ${l.doubling.rows.toFixed(0)} rows: ${num(l.doubling.gain)} (bootstrap over folds, 95% ${iv(l.doubling.ci95)}; it ignores the overlap of folds, so it is too narrow)`);
    } else out.push('- No curve fitted (fewer than 3 distinct sizes with scores)');
    out.push(l.flatFrom === null ? '- The last step still changes the score beyond noise' : `- Flat within noise from size ${l.flatFrom} on (every later step's corrected interval covers 0)`, '');
  }
  if (r.warnings.length) out.push('## Warnings', '', ...r.warnings.map((w) => `- ${cell(w)}`), '');
  return out.join('\n');
}
