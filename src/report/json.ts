/** The JSON report: two-space indented, keys in the order the report was built, a final newline. */
import type { Report } from '../model/report.js';

export function renderJson(report: Report): string {
  return `${JSON.stringify(report, null, 2)}\n`;
}
