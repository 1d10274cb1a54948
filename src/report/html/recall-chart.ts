/**
 * Per-class recall bars: for each class, one horizontal bar per learner with the share of the
 * class's rows that the learner predicted as that class (src/report/html/class-recall.ts, from
 * the pooled confusion matrix). The value is written at the end of every bar. The baseline is
 * left out when other learners are drawn (its matrix is on the page); the learners take the
 * series colours in report order, named in a legend. With a folded matrix (more classes than
 * CONFUSION_CLASS_LIMIT, src/report/confusion-view.ts) only the kept classes, those with the
 * most rows, get bars, and the caption says how many are not drawn.
 */
import { textWidth, xAxis } from './axis.js';
import { classRecall } from './class-recall.js';
import { confusionView } from '../confusion-view.js';
import { clip, esc } from './escape.js';
import { CHART_WIDTH, figure } from './figure.js';
import { attrNum, num, px, svgText } from './format.js';
import { BASELINE, INK, MUTED, SERIES } from './palette.js';
import { linearScale } from './scale.js';
import type { ChartContext } from './context.js';

const WIDTH = CHART_WIDTH;
const BAR = 15;
const GAP = 16;
const LABEL_CHARS = 28;

export function recallChart(ctx: ChartContext): string | undefined {
  const all = ctx.report.data.classes;
  if (!all || all.length === 0) return undefined;
  const views = new Map(ctx.report.learners.map((l) => [l, confusionView(l, all)] as const));
  const withMatrix = ctx.report.learners.filter((l) => views.get(l));
  // the baseline predicts one class (recall 1 for it, 0 for the rest); leave it out beside others
  const learners = withMatrix.length > 1 ? withMatrix.filter((l) => l !== ctx.baseline) : withMatrix;
  if (learners.length === 0) return undefined;
  // a folded matrix: bars for its kept classes only (the first learner's; the same rows pool in every learner without failed folds)
  const firstView = views.get(learners[0])!;
  const classes = firstView.folded ? firstView.labels.slice(0, -1) : all;
  const notDrawn = all.length - classes.length;
  const colours = new Map<string, string>();
  let next = 0;
  for (const l of learners) colours.set(l.spec, l === ctx.baseline ? BASELINE : SERIES[next++ % SERIES.length]);
  const recalls = learners.map((l) => {
    const view = views.get(l)!;
    const recall = classRecall(view.matrix);
    const at = new Map(view.labels.map((c, k) => [c, k] as const));
    return classes.map((c) => {
      const k = at.get(c);
      return k === undefined || (view.folded && k === view.labels.length - 1) ? null : recall[k];
    });
  });
  const labelChars = Math.min(LABEL_CHARS, Math.max(6, ...classes.map((c) => Array.from(c).length)));
  const left = Math.max(90, textWidth(labelChars, 14) + 20);
  const right = WIDTH - 70;
  // legend
  const legendItems: string[] = [];
  let lx = left;
  let ly = 16;
  for (const l of learners) {
    const name = clip(l.spec, 40);
    const w = 22 + textWidth(Array.from(name).length, 13) + 20;
    if (lx + w > WIDTH && lx > left) {
      lx = left;
      ly += 20;
    }
    legendItems.push(`<rect x="${px(lx)}" y="${ly - 7}" width="14" height="14" fill="${colours.get(l.spec)}"/>${svgText(lx + 20, ly + 5, name, `font-size="13" fill="${INK}"`)}`);
    lx += w;
  }
  const top = ly + 24;
  const group = learners.length * BAR + GAP;
  const bottom = top + classes.length * group - GAP + 6;
  const x = linearScale(0, 1, left, right, 5);
  const body: string[] = [`<g class="legend">${legendItems.join('')}</g>`, xAxis(x, top - 6, bottom, 'recall (share of the class\u2019s rows predicted as that class, 0 to 1; higher is better)')];
  const words: string[] = [];
  classes.forEach((c, k) => {
    const y0 = top + k * group;
    body.push(`<text x="${px(left - 12)}" y="${px(y0 + (learners.length * BAR) / 2 + 5)}" text-anchor="end" font-size="14" font-weight="600" fill="${INK}">${esc(clip(c, LABEL_CHARS))}<title>${esc(c)}</title></text>`);
    const parts: string[] = [];
    learners.forEach((l, j) => {
      const r = recalls[j][k];
      const y = y0 + j * BAR;
      if (r === null) {
        body.push(svgText(left + 4, y + BAR - 4, 'no rows of this class', `font-size="12" fill="${MUTED}"`));
        parts.push(`${l.spec} no rows`);
        return;
      }
      const w = Math.max(0, x(r) - x(0));
      body.push(`<rect class="recall" x="${px(x(0))}" y="${px(y + 1)}" width="${px(w)}" height="${BAR - 2}" fill="${colours.get(l.spec)}" data-learner="${esc(l.spec)}" data-class="${esc(c)}" data-value="${attrNum(r)}"><title>${esc(`${l.spec}, class ${c}: recall ${num(r)}`)}</title></rect>`);
      body.push(svgText(x(0) + w + 5, y + BAR - 3, num(r, 3), `font-size="13" fill="${INK}"`));
      parts.push(`${l.spec} ${num(r, 3)}`);
    });
    words.push(`${c}: ${parts.join(', ')}.`);
  });
  return figure({
    id: 'recall',
    width: WIDTH,
    height: bottom + 56,
    title: 'Recall of each class, per learner',
    desc: `Horizontal bars of per-class recall on the pooled out-of-fold predictions. ${words.join(' ')}`,
    caption: `Recall of each class on the pooled out-of-fold predictions: the share of the rows of that class the learner got right. A class the model never gets right shows as a missing bar.${notDrawn > 0 ? ` Only the ${classes.length} classes with the most rows are drawn; the other ${notDrawn} of the ${all.length} classes are not.` : ''}`,
    body: body.join('\n'),
  });
}
