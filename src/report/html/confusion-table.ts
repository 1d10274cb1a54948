/**
 * The pooled confusion matrix of one learner as a shaded HTML table: rows are the actual
 * classes, columns the predicted ones, in the report's class order; each cell shows the count
 * and its share of the row (so the diagonal reads as the class's recall), shaded from white
 * (0%) to dark blue (100%) by that share. Diagonal cells are outlined. The table is text, so
 * it needs no separate text alternative; its caption says how to read it. With more classes
 * than CONFUSION_CLASS_LIMIT the matrix is folded (src/report/confusion-view.ts): the last row
 * and column hold the other classes, their corner cell is not outlined, and the caption says so.
 */
import { esc } from './escape.js';
import { attrNum } from './format.js';
import { shade } from './palette.js';
import type { LearnerReport } from '../../model/report.js';
import { confusionView, foldedNote, isOwnDiagonal } from '../confusion-view.js';

const pct = (v: number): string => `${(v * 100).toFixed(1)}%`;

export function confusionTable(l: LearnerReport, classes: readonly string[]): string | undefined {
  const view = confusionView(l, classes);
  if (!view) return undefined;
  const head = view.labels.map((c) => `<th scope="col">${esc(c)}</th>`).join('');
  const rows = view.matrix.map((row, i) => {
    const total = row.reduce((a, b) => a + b, 0);
    const cells = row.map((count, j) => {
      const share = total > 0 ? count / total : 0;
      const { background, text } = shade(share);
      const diag = i === j && isOwnDiagonal(view, i) ? ' class="diag"' : '';
      return `<td${diag} style="background:${background};color:${text}" data-count="${count}" data-share="${attrNum(share)}">${count}<span class="share">${total > 0 ? pct(share) : '–'}</span></td>`;
    });
    return `<tr><th scope="row">${esc(view.labels[i])}</th>${cells.join('')}<td class="total">${total}</td></tr>`;
  });
  const note = foldedNote(view);
  return [
    `<table class="confusion" data-learner="${esc(l.spec)}"${view.folded ? ` data-folded="${view.folded.otherClasses}"` : ''}>`,
    `<caption>${esc(`${l.spec}: pooled out-of-fold predictions. Rows are the actual class, columns the predicted class; each cell gives the count and its share of the row.${note ? ` ${note}` : ''}`)}</caption>`,
    `<thead><tr><th scope="col" class="corner">actual \u2193 / predicted \u2192</th>${head}<th scope="col">rows</th></tr></thead>`,
    `<tbody>${rows.join('\n')}</tbody>`,
    '</table>',
  ].join('\n');
}
