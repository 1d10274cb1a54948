/**
 * The page shell shared by every HTML report: one self-contained document with its styles
 * inline and no scripts, fonts, images or links to anything outside it. A Content Security
 * Policy in the head forbids scripts and every fetch (default-src 'none'; only the inline
 * styles are allowed), so even a mistake in escaping could not run code or reach the network.
 * The layout is one column, readable on screen and at A4/letter print size.
 *
 * Source for the policy: the W3C "Content Security Policy Level 3" draft, section 6 (free).
 */
import { esc } from './escape.js';
import { BOX_STROKE, GRID, INK, MUTED } from './palette.js';

export const CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'";

const STYLE = `
*{box-sizing:border-box}
html{-webkit-text-size-adjust:100%}
body{margin:0;background:#ffffff;color:${INK};font:15px/1.45 system-ui,-apple-system,"Segoe UI",Roboto,"Noto Sans","DejaVu Sans",sans-serif}
main{max-width:1040px;margin:0 auto;padding:24px 20px 40px}
header h1{font-size:24px;margin:0 0 4px}
header p{margin:0;color:${MUTED}}
h2{font-size:19px;margin:30px 0 8px;padding-bottom:4px;border-bottom:2px solid ${GRID}}
h3{font-size:16px;margin:18px 0 6px}
.lead{margin:6px 0 0}
.lead.failed{font-weight:600}
figure.chart{margin:8px 0 4px}
figure.chart svg{display:block;width:100%;height:auto;max-width:1000px;font-family:inherit}
figcaption{color:${MUTED};font-size:13.5px;margin-top:4px;max-width:1000px}
table{border-collapse:collapse;margin:8px 0 4px;font-variant-numeric:tabular-nums}
caption{caption-side:bottom;text-align:left;color:${MUTED};font-size:13.5px;padding-top:6px}
th,td{padding:6px 10px;border:1px solid ${GRID};text-align:right;vertical-align:top}
th{font-weight:600;background:#f6f7f9}
th[scope=row]{text-align:left}
table.metrics td span{display:block;font-size:12px;color:${MUTED}}
table.metrics td.best{font-weight:700}
table.confusion td{min-width:72px;font-size:16px;font-weight:600}
table.confusion td span.share{display:block;font-size:12px;font-weight:400;opacity:.9}
table.confusion td.diag{outline:2px solid ${INK};outline-offset:-3px}
table.confusion td.total{background:#f6f7f9;color:${MUTED};font-weight:400}
table.confusion th.corner{font-weight:400;color:${MUTED};font-size:13px}
.matrices{display:flex;flex-wrap:wrap;gap:8px 28px;align-items:flex-start}
details{margin:6px 0}
summary{cursor:pointer;color:${BOX_STROKE}}
footer{margin-top:34px}
dl.facts{display:grid;grid-template-columns:1fr 1fr;gap:4px 24px;margin:0;font-size:13.5px}
dl.facts div{display:flex;gap:8px;min-width:0}
dt{flex:0 0 84px;color:${MUTED}}
dd{margin:0;min-width:0;overflow-wrap:anywhere}
code{font-family:ui-monospace,"DejaVu Sans Mono",monospace;font-size:12.5px}
ul.warnings{margin:4px 0;padding-left:20px}
ul.warnings li{margin:2px 0}
.verdict{display:inline-block;font-size:22px;font-weight:700;padding:4px 14px;border-radius:4px;color:#fff}
.note{color:${MUTED};font-size:13.5px}
@media print{
  body{font-size:11pt}
  main{max-width:none;padding:0}
  h2{break-after:avoid}
  figure.chart,table{break-inside:avoid}
  details{display:block}
  details>*{display:block}
  summary{display:none}
}
`;

/** A whole HTML document; `title` is escaped here, `content` must be escaped markup, `style` adds page-specific rules (our own, not data). */
export function page(title: string, content: string, style = ''): string {
  return [
    '<!DOCTYPE html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8">',
    `<meta http-equiv="Content-Security-Policy" content="${CSP}">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    '<meta name="referrer" content="no-referrer">',
    `<title>${esc(title)}</title>`,
    `<style>${STYLE}${style}</style>`,
    '</head>',
    '<body>',
    '<main>',
    content,
    '</main>',
    '</body>',
    '</html>',
    '',
  ].join('\n');
}
