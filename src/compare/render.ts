/**
 * Markdown for people: the `foldwise compare` table and the gate verdict, short enough for a
 * pull-request comment. Numbers have four decimals; differences carry their sign.
 */
import { cell, num } from '../markdown-text.js';
import type { CrossComparison, GateVerdict } from '../model/compare.js';
import { familyName } from './gate-family.js';

/** A signed number with four decimals ("+0.0120", "-0.0031"), or "–". */
export function signed(v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  const t = num(v);
  return v > 0 ? `+${t}` : t === '-0.0000' ? '0.0000' : t;
}

/** A p-value: four decimals, or "< 0.0001". */
export function pValue(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '–';
  return p < 0.0001 ? '< 0.0001' : p.toFixed(4);
}

/** A limit as given by the user (shortest form). */
const limit = (v: number): string => String(v);

const direction = (higherIsBetter: boolean): string => (higherIsBetter ? 'higher is better' : 'lower is better');

function table(header: readonly string[], align: readonly ('l' | 'r')[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]): string => `| ${cells.join(' | ')} |`;
  return [line(header), line(align.map((a) => (a === 'l' ? ':--' : '--:'))), ...rows.map(line)].join('\n');
}

export function renderCompareMarkdown(c: CrossComparison): string {
  const out = [
    `# foldwise compare: ${cell(c.metric)}`,
    '',
    `- First: ${cell(c.firstPath)}; second: ${cell(c.secondPath)}`,
    `- Same data (SHA-256 ${c.sha256.slice(0, 12)}), plan ${cell(c.plan)}, seed ${c.seed}: folds paired by repeat and fold`,
    `- difference = second minus first (${cell(c.metric)}: ${direction(c.higherIsBetter)}); interval and t with the Nadeau-Bengio correction; the Wilcoxon test treats folds as independent, so read its p as a description`,
    '',
    table(
      ['learner', 'first', 'second', 'difference', '95% interval (corrected)', 't', 'df', 'p', 'Wilcoxon p', 'second wins/ties/losses'],
      ['l', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r'],
      c.rows.map((r) => {
        const s = r.stats;
        const name = r.first === r.second ? cell(r.first) : `${cell(r.first)} -> ${cell(r.second)}`;
        if (!s) return [name, '–', '–', '–', '–', '–', '–', '–', '–', '–'];
        return [
          name,
          num(s.referenceMean),
          num(s.learnerMean),
          signed(s.diff),
          s.ci95 ? `${signed(s.ci95[0])} to ${signed(s.ci95[1])}` : '–',
          s.t === null ? '–' : s.t.toFixed(2),
          s.df === null ? '–' : String(s.df),
          pValue(s.p),
          pValue(s.wilcoxon.p),
          `${s.wins}/${s.ties}/${s.losses}`,
        ];
      }),
    ),
    '',
  ];
  if (c.warnings.length) out.push(...c.warnings.map((w) => `- Warning: ${cell(w)}`), '');
  return out.join('\n');
}

export function renderGateMarkdown(v: GateVerdict): string {
  const m = cell(v.metric);
  const confidence = `${Math.round((1 - v.alpha) * 1000) / 10}%`;
  const learners = v.previous.learner === v.current.learner ? cell(v.current.learner) : `${cell(v.previous.learner)} -> ${cell(v.current.learner)}`;
  const folds =
    v.rule === 'paired'
      ? `${v.current.folds} folds paired by repeat and fold`
      : `${v.previous.folds} previous and ${v.current.folds} current folds, NOT paired`;
  const out = [
    `### foldwise gate: ${v.verdict === 'pass' ? 'PASS' : 'FAIL'}`,
    '',
    `- **Compared:** ${learners} on ${m} (${direction(v.higherIsBetter)}), previous ${cell(v.previous.path)} -> current ${cell(v.current.path)}; ${folds}`,
    `- **Score:** ${num(v.previous.mean)} -> ${num(v.current.mean)}, change ${signed(v.change)} (${v.ci95 ? `95% interval ${signed(v.ci95[0])} to ${signed(v.ci95[1])}, corrected` : 'no interval: no fold shows any spread'})`,
  ];
  const test = `one-sided ${v.rule === 'paired' ? 'corrected' : 'Welch'} t test of "drop <= ${limit(v.maxDrop)}" at alpha ${limit(v.alpha)}: ${v.t === null ? 'no spread' : `t = ${v.t.toFixed(2)}`}, df ${Number.isInteger(v.df) ? v.df : v.df.toFixed(1)}, p = ${pValue(v.p)}`;
  if (v.rule === 'paired') {
    out.push(`- **Rule:** fail only when the drop exceeds ${limit(v.maxDrop)} beyond fold noise; ${test}`);
  } else {
    out.push(
      `- **Rule (unpaired):** the runs used different folds (they differ in ${v.unpairedBecause.map(cell).join(', ')}), so the two sets of fold scores are compared by a Welch test, each variance with the Nadeau-Bengio correction; conservative: pair the runs (same plan and seed) for a sharper gate. Fail only when the drop exceeds ${limit(v.maxDrop)} beyond fold noise; ${test}`,
    );
  }
  if (v.family) {
    const f = v.family;
    out.push(
      `- **Family:** ${f.tests.length} tests (${[...new Set(f.tests.map((t) => t.metric))].map(cell).join(', ')}${f.tests.some((t) => t.column !== undefined) ? ', on all rows and per slice' : ''}), each the rule above; Holm's step-down method keeps the chance of any false failure at most alpha ${limit(v.alpha)}`,
    );
    for (const t of f.tests.filter((x) => x.regression)) {
      out.push(`- **Failing:** ${cell(familyName(t))}: drop ${num(t.drop)} (one-sided bound ${num(t.dropBound)}), p = ${pValue(t.p)}, Holm-adjusted ${pValue(t.adjustedP)}`);
    }
    if (f.notGated.length) out.push(`- **Not gated:** ${f.notGated.map(cell).join('; ')}`);
  }
  if (v.worstAllowed !== null) {
    const met = !v.reasons.includes('worst-allowed');
    out.push(
      `- **Worst allowed:** ${m} must be ${v.higherIsBetter ? 'at least' : 'at most'} ${limit(v.worstAllowed)} (--worst-allowed): ${num(v.current.mean)}, ${met ? 'met' : 'NOT met'}`,
    );
  }
  let why: string;
  if (v.reasons.includes('regression') && v.family) {
    why = `a drop beyond ${limit(v.maxDrop)} and beyond fold noise, after Holm's adjustment, in ${v.family.failing.map(cell).join('; ')}`;
  } else if (v.reasons.includes('regression')) {
    why = `${m} dropped by ${num(v.drop)} (at least ${num(v.dropBound)} with ${confidence} confidence), more than the allowed ${limit(v.maxDrop)}`;
  } else if (v.improvement) {
    why = `${m} improved beyond fold noise (one-sided, alpha ${limit(v.alpha)})`;
  } else if (v.drop > v.maxDrop) {
    why = `the drop of ${num(v.drop)} is within fold noise (its ${confidence} lower bound ${num(v.dropBound)} does not exceed ${limit(v.maxDrop)})`;
  } else {
    why = `no drop beyond the allowed ${limit(v.maxDrop)}`;
  }
  if (v.reasons.includes('worst-allowed')) {
    why += `${v.reasons.includes('regression') ? '; and ' : '; but '}the score is worse than the worst allowed ${limit(v.worstAllowed as number)} (--worst-allowed)`;
  }
  out.push(`- **Verdict:** ${v.verdict}: ${why}`);
  if (v.detectable) {
    out.push(`- **Could see:** a drop of at least ${num(v.detectable.drop)} would have been caught with power ${v.detectable.power} (the allowed ${limit(v.maxDrop)} plus the minimal detectable difference ${num(v.detectable.mdd)} of these folds)`);
  }
  if (v.accepted !== undefined) {
    out.push(v.accepted ? `- **Previous report:** replaced by the current report (--accept)` : `- **Previous report:** kept; --accept replaces it only when the gate passes`);
  }
  for (const w of v.warnings) out.push(`- Warning: ${cell(w)}`);
  out.push('');
  return out.join('\n');
}

/** The Markdown of a gate that could not compare the runs (exit code 2). */
export function renderNotComparableMarkdown(reason: string): string {
  return [
    '### foldwise gate: NOT COMPARABLE',
    '',
    `- ${cell(reason)}; no verdict (exit code 2)`,
    '- Re-run eval with the previous report\'s data, target, task, metrics, group and order; or, when the change is intended, replace the previous report by copying the current report over it',
    '',
  ].join('\n');
}
