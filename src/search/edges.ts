/**
 * Edge warnings: when the pick takes the smallest or largest value a numeric option had among
 * the searched candidates of its learner, the best value may lie outside the searched range,
 * and the user should widen it. No warning when the option had a single value, or when the edge
 * is also the option's own limit (k = 1 cannot go lower).
 */
import type { ParamSpec } from '../learning.js';
import type { SearchCandidate } from './space.js';

export function edgeWarnings(pick: SearchCandidate, candidates: readonly SearchCandidate[], label: string): string[] {
  const same = candidates.filter((c) => c.learner === pick.learner);
  const out: string[] = [];
  for (const p of pick.learner.params) {
    if (p.kind !== 'int' && p.kind !== 'number') continue;
    const values = same.map((c) => Number(c.params[p.name]));
    const lo = Math.min(...values);
    const hi = Math.max(...values);
    if (lo === hi) continue;
    const v = Number(pick.params[p.name]);
    const spec = p as Extract<ParamSpec, { kind: 'int' | 'number' }>;
    if (v === lo && v !== spec.min) {
      out.push(`${label} ${pick.spec} has ${p.name}=${v}, the lower edge of the searched ${p.name} (${lo} to ${hi}); a smaller ${p.name} might be better, so widen the range`);
    } else if (v === hi && v !== spec.max) {
      out.push(`${label} ${pick.spec} has ${p.name}=${v}, the upper edge of the searched ${p.name} (${lo} to ${hi}); a larger ${p.name} might be better, so widen the range`);
    }
  }
  return out;
}

/** Which option an edge warning of `edgeWarnings` is about, and which edge; undefined for any other warning. */
export function edgeOfWarning(text: string): { readonly option: string; readonly side: 'lower' | 'upper' } | undefined {
  const m = /, the (lower|upper) edge of the searched (.+?) \(.+ to .+\); a (?:smaller|larger) (.+) might be better, so widen the range$/.exec(text);
  if (!m || m[2] !== m[3]) return undefined;
  return { option: m[2], side: m[1] as 'lower' | 'upper' };
}
