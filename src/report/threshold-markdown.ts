/**
 * The Markdown section of --threshold (eval: per learner; tune: the tuned procedure): per learner, the thresholds the inner splits chose
 * (their spread across outer folds) and each figure at the chosen threshold beside 0.5, with
 * the corrected intervals.
 */
import type { ScoreSummary } from '../model/report.js';
import type { DeployThreshold, LearnerThreshold, ReportThreshold } from '../model/threshold.js';
import { cell, num } from '../markdown-text.js';

type Table = (header: readonly string[], align: readonly ('l' | 'r')[], rows: readonly (readonly string[])[]) => string;

const interval = (s: ScoreSummary | null | undefined): string => (s?.ci95 ? `${num(s.ci95[0])} to ${num(s.ci95[1])}` : '–');

/** score --threshold T: the figures at the given T beside 0.5, per learner (nothing was chosen, so no spread). */
function givenSection(t: ReportThreshold, learners: readonly { readonly spec: string; readonly threshold?: LearnerThreshold }[], table: Table): string[] {
  const out: string[] = [
    `## At the given threshold ${cell(t.rule)}`,
    '',
    `A row is called ${cell(t.positive)} when its probability of ${cell(t.positive)} is at least ${cell(t.rule)} (given with --threshold, the same on every fold; at 0.5, at least 0.5). Precision, recall and F1 are those of ${cell(t.positive)}.`,
    '',
  ];
  for (const l of learners) {
    const lt = l.threshold;
    if (!lt) continue;
    out.push(`### ${cell(l.spec)}`, '');
    out.push(
      table(
        ['figure', `at ${cell(t.rule)}`, '95% interval (corrected)', 'at 0.5', 'interval at 0.5'],
        ['l', 'r', 'r', 'r', 'r'],
        Object.keys(lt.summary).map((k) => [cell(k), num(lt.summary[k]?.mean), interval(lt.summary[k]), num(lt.atDefault[k]?.mean), interval(lt.atDefault[k])]),
      ),
      '',
    );
  }
  return out;
}

/** The section for the report's rule `t` and each learner's results; `note` is added to the opening paragraph. */
export function thresholdSection(t: ReportThreshold | undefined, learners: readonly { readonly spec: string; readonly threshold?: LearnerThreshold }[], table: Table, note = ''): string[] {
  if (!t) return [];
  if (t.given) return givenSection(t, learners, table);
  const out: string[] = [
    `## Threshold chosen inside the training folds: ${cell(t.rule)}`,
    '',
    `A row is called ${cell(t.positive)} when its probability of ${cell(t.positive)} is at least the threshold. Each outer fold's threshold is chosen on out-of-fold predictions of a ${t.timeOrdered ? `time-ordered ${t.innerFolds}-fold inner split (each inner fold fits on earlier rows and predicts the block after them)` : `${t.innerFolds}-fold inner split`} of that fold's training rows, then applied to its test rows, which the choice never saw. Precision, recall and F1 are those of ${cell(t.positive)}.${note}`,
    '',
  ];
  for (const l of learners) {
    const lt = l.threshold;
    if (!lt) continue;
    const s = lt.spread;
    const nothing = lt.folds.filter((f) => f.threshold === null).length;
    out.push(`### ${cell(l.spec)}`, '');
    out.push(
      `Threshold across ${lt.folds.length} folds: mean ${num(s?.mean)}, sd ${num(s?.sd)}, range ${num(s?.min)} to ${num(s?.max)}${nothing ? ` (${nothing} fold${nothing === 1 ? '' : 's'} called nothing positive, counted as 1)` : ''}; per fold: ${lt.folds.map((f) => (f.threshold === null ? 'none' : num(f.threshold))).join(', ')}.`,
      '',
    );
    const names = Object.keys(lt.summary);
    out.push(
      table(
        ['figure', 'at the chosen threshold', '95% interval (corrected)', 'at 0.5', 'interval at 0.5'],
        ['l', 'r', 'r', 'r', 'r'],
        names.map((k) => [cell(k), num(lt.summary[k]?.mean), interval(lt.summary[k]), num(lt.atDefault[k]?.mean), interval(lt.atDefault[k])]),
      ),
      '',
    );
  }
  return out;
}

/**
 * tune: the sentence on the threshold to deploy with the recommendation, shared by the Markdown
 * and the HTML page; `q` quotes names for the format (the HTML page escapes the whole sentence).
 */
export function deployThresholdText(t: ReportThreshold, d: DeployThreshold, q: (text: string) => string = (x) => x): string {
  const split = t.timeOrdered ? `a time-ordered ${t.innerFolds}-fold inner split` : `a ${t.innerFolds}-fold inner split`;
  const call = d.value === null ? `the rule ${q(t.rule)} called nothing positive there, so no row would be called ${q(t.positive)}` : `call a row ${q(t.positive)} when its probability of ${q(t.positive)} is at least ${num(d.value)} (rounded here; the exact value is recommendation.threshold.value in the JSON report)`;
  const unmet = d.met ? '' : ' The rule was not met there; this is the threshold closest to meeting it.';
  return `Threshold to deploy with these settings (${q(t.rule)}): ${call}. Chosen after the pick, on out-of-fold predictions of ${split} of all ${d.rows} search rows. It is a setting, not an estimate of performance: the figures at a threshold chosen without seeing the test rows are those of the outer folds (threshold section).${unmet}`;
}
