/**
 * The self-contained HTML report: `renderEvalHtml(report)` for an eval report,
 * `renderTuneHtml(report)` for a tune report, `renderGateHtml(verdict)` for a gate verdict and
 * `renderAuditHtml(report)` for an audit report,
 * each one string holding a whole document with inline SVG charts, inline styles and no
 * scripts or outside resources.
 */
export { renderEvalHtml } from './eval-page.js';
export { renderGateHtml } from './gate-page.js';
export { renderTuneHtml } from './tune-page.js';
export { renderAuditHtml } from './audit-page.js';
export { esc } from './escape.js';
