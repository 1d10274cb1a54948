/**
 * What makes two runs the same run: data fingerprint, problem, plan, seed, settings, learners
 * and metrics. Journals and shard parts carry it; resuming or merging refuses a mismatch and
 * says exactly what differs.
 */
import type { Prepared } from './prepare.js';

export interface RunIdentity {
  readonly sha256: string;
  readonly rowsUsed: number;
  readonly target: string;
  readonly task: string;
  readonly plan: string;
  readonly stratified: boolean;
  readonly group: string | null;
  readonly order: string | null;
  readonly seed: number;
  readonly impute: string;
  readonly final: boolean;
  readonly features: readonly string[];
  readonly learners: readonly string[];
  readonly metrics: readonly string[];
  /** the programs of command: learners (present only when the run has some) */
  readonly programs?: readonly string[];
  /** --importance: repeats and inputs (present only with it) */
  readonly importance?: string;
}

export function identityOf(p: Prepared): RunIdentity {
  const programs = p.candidates.filter((c) => c.learner.name.startsWith('command:')).map((c) => `${c.learner.name}=${c.learner.origin ?? ''}`);
  return {
    sha256: p.table.fingerprint.sha256,
    rowsUsed: p.problem.rows.length,
    target: p.problem.targetName,
    task: p.problem.task,
    plan: p.planText,
    stratified: p.stratified,
    group: p.problem.groupName ?? null,
    order: p.problem.orderName ?? null,
    seed: p.seed,
    impute: p.impute,
    final: p.final,
    features: p.problem.features.map((f) => f.name),
    learners: p.candidates.map((c) => c.spec),
    metrics: p.metrics.map((m) => m.name),
    ...(programs.length ? { programs } : {}),
    ...(p.importance ? { importance: `${p.importance.metric.name} x${p.importance.repeats}: ${p.importance.inputs.map((i) => i.name).join(', ')}` } : {}),
  };
}

const short = (v: unknown): string => {
  // an optional field absent on one side (programs, importance) reads as "none"
  const t = JSON.stringify(v) ?? 'none';
  return t.length > 40 ? `${t.slice(0, 37)}...` : t;
};

/** The fields where two identities differ, as "field (a vs b)"; empty when they are the same. */
export function identityDiff(a: RunIdentity, b: RunIdentity): string[] {
  const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])] as (keyof RunIdentity)[];
  return keys.filter((k) => JSON.stringify(a[k]) !== JSON.stringify(b[k])).map((k) => `${k} (${short(a[k])} vs ${short(b[k])})`);
}
