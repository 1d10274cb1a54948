/**
 * --threshold on the HTML page (eval: per learner; tune: the tuned procedure): per learner, the thresholds chosen inside the outer
 * training folds (per fold and their spread) and each figure at the chosen threshold beside
 * 0.5, with the corrected intervals.
 */
import type { LearnerThreshold, ReportThreshold } from '../../model/threshold.js';
import { esc } from './escape.js';
import { intervalText, num } from './format.js';

/** The section for the report's rule `t` and each learner's results; `note` is added to the opening paragraph. */
export function thresholdSection(t: ReportThreshold | undefined, learners: readonly { readonly spec: string; readonly threshold?: LearnerThreshold }[], note = ''): string {
  if (!t) return '';
  const parts: string[] = t.given
    ? [
        `<section><h2>${esc(`At the given threshold ${t.rule}`)}</h2>`,
        `<p>${esc(`A row is called ${t.positive} when its probability of ${t.positive} is at least ${t.rule} (given with --threshold, the same on every fold; at 0.5, at least 0.5). Precision, recall and F1 are those of ${t.positive}.`)}</p>`,
      ]
    : [
        `<section><h2>${esc(`Threshold chosen inside the training folds (${t.rule})`)}</h2>`,
        `<p>${esc(`A row is called ${t.positive} when its probability of ${t.positive} is at least the threshold. Each outer fold's threshold is chosen on out-of-fold predictions of a ${t.timeOrdered ? `time-ordered ${t.innerFolds}-fold inner split (each inner fold fits on earlier rows and predicts the block after them)` : `${t.innerFolds}-fold inner split`} of its training rows, then applied to its test rows, which the choice never saw. Precision, recall and F1 are those of ${t.positive}.${note}`)}</p>`,
      ];
  for (const l of learners) {
    const lt = l.threshold;
    if (!lt) continue;
    const s = lt.spread;
    parts.push(
      `<h3>${esc(l.spec)}</h3>`,
      ...(t.given ? [] : [`<p>${esc(`Threshold across ${lt.folds.length} folds: mean ${num(s?.mean)}, sd ${num(s?.sd)}, range ${num(s?.min)} to ${num(s?.max)}; per fold: ${lt.folds.map((f) => (f.threshold === null ? 'none' : num(f.threshold))).join(', ')}.`)}</p>`]),
      `<table class="metrics"><thead><tr><th>figure</th><th>${esc(t.given ? `at ${t.rule}` : 'at the chosen threshold')}</th><th>95% interval (corrected)</th><th>at 0.5</th><th>interval at 0.5</th></tr></thead><tbody>`,
      ...Object.keys(lt.summary).map(
        (k) =>
          `<tr><td>${esc(k)}</td><td>${num(lt.summary[k]?.mean)}</td><td>${esc(intervalText(lt.summary[k]?.ci95))}</td><td>${num(lt.atDefault[k]?.mean)}</td><td>${esc(intervalText(lt.atDefault[k]?.ci95))}</td></tr>`,
      ),
      '</tbody></table>',
    );
  }
  parts.push('</section>');
  return parts.join('\n');
}
