/**
 * The --costs matrix in the Markdown reports of eval, tune and growth: one table, rows the actual
 * class, columns the predicted class, with the file's SHA-256 (the matrix is part of the run's
 * identity and of what compare and gate check).
 */
import { cell } from '../markdown-text.js';
import type { ReportCosts } from '../model/report.js';

export function costsSection(costs: ReportCosts | undefined): string[] {
  if (!costs) return [];
  const fmt = (v: number): string => String(v);
  return [
    '## Cost matrix (--costs)',
    '',
    `| actual \\ predicted | ${costs.classes.map((c) => cell(c)).join(' | ')} |`,
    `| :-- | ${costs.classes.map(() => '--:').join(' | ')} |`,
    ...costs.matrix.map((row, a) => `| ${cell(costs.classes[a])} | ${row.map(fmt).join(' | ')} |`),
    '',
    `_cost = the mean of these entries over the test rows (lower is better); file SHA-256 ${costs.sha256.slice(0, 12)}_`,
    '',
  ];
}
