/**
 * What makes two runs the same run: data fingerprint, how the data was read (missing tokens,
 * forced categorical columns, delimiter, the resulting column kinds), problem, plan, seed,
 * settings (imputation, --final, --on-fold-error, the quick audit), learners and metrics, and for
 * `foldwise growth` its sizes (so an eval journal or part is never taken for a growth one).
 * Journals and shard parts carry it; resuming or merging refuses a mismatch and says exactly
 * what differs. What only changes how a run is carried out (jobs, shards, timings, progress,
 * temporary folders) is left out.
 */
import { costRows } from '../metrics/index.js';
import type { ReportFrame } from './evaluate.js';
import type { Prepared } from './prepare.js';

/** What the loader was told, as the report's settings show it. */
export interface ReadSettings {
  /** texts read as missing besides the empty cell, sorted */
  readonly missing: readonly string[];
  /** columns read as categorical by request, sorted */
  readonly categorical: readonly string[];
  readonly delimiter: string;
}

/** The read settings in canonical form (sorted, without the empty cell, no repeats). */
export function readSettings(missing: readonly string[], categorical: readonly string[], delimiter: string): ReadSettings {
  const sorted = (xs: readonly string[]): string[] => [...new Set(xs)].sort();
  return { missing: sorted(missing.map((t) => t.trim()).filter((t) => t !== '')), categorical: sorted(categorical), delimiter };
}

/** The frame with the read settings added to its settings (unchanged without them). */
export function withReadSettings(frame: ReportFrame, read: ReadSettings | undefined): ReportFrame {
  if (!read) return frame;
  return { ...frame, settings: { ...frame.settings, missing: read.missing, categorical: read.categorical, delimiter: read.delimiter } };
}

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
  /** how the data was read (present when the caller says: the CLI always does) */
  readonly missing?: readonly string[];
  readonly categorical?: readonly string[];
  readonly delimiter?: string;
  /** the kinds the columns were read as, in header order ("n" numeric, "c" categorical) */
  readonly kinds: string;
  readonly onFoldError: string;
  readonly audit: boolean;
  /** --importance: repeats and inputs (present only with it) */
  readonly importance?: string;
  /** `foldwise growth`: the sizes of its training subsets (present only in growth runs) */
  readonly growth?: string;
  /** --threshold: the rule and inner folds (present only with it) */
  readonly threshold?: string;
  /** --costs: the cost matrix in the target's class order, as JSON (present only with it; the file's layout and bytes do not count) */
  readonly costs?: string;
}

export function identityOf(p: Prepared, read?: ReadSettings): RunIdentity {
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
    ...(read ? { missing: read.missing, categorical: read.categorical, delimiter: read.delimiter } : {}),
    kinds: p.table.fingerprint.schema.map(([, k]) => (k === 'numeric' ? 'n' : 'c')).join(''),
    onFoldError: p.onFoldError ?? 'fail',
    audit: p.audit !== undefined,
    ...(p.costs ? { costs: JSON.stringify(costRows(p.costs)) } : {}),
    ...(p.threshold ? { threshold: `${p.threshold.text} (${p.threshold.innerFolds} inner folds${p.threshold.timeOrdered ? ', in time order' : ''})` } : {}),
    ...(p.importance ? { importance: `${p.importance.metric.name} x${p.importance.repeats}: ${p.importance.inputs.map((i) => i.name).join(', ')}` } : {}),
  };
}

const short = (v: unknown): string => {
  // an optional field absent on one side (programs, importance) reads as "none"
  const t = JSON.stringify(v) ?? 'none';
  return t.length > 40 ? `${t.slice(0, 37)}...` : t;
};

/**
 * The fields where two identities differ, as "field (A: a, B: b)" with the labels given
 * (default "field (a vs b)"); empty when they are the same.
 */
export function identityDiff(a: RunIdentity, b: RunIdentity, labels?: readonly [string, string]): string[] {
  const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])] as (keyof RunIdentity)[];
  return keys
    .filter((k) => JSON.stringify(a[k]) !== JSON.stringify(b[k]))
    .map((k) => (labels ? `${k} (${labels[0]}: ${short(a[k])}, ${labels[1]}: ${short(b[k])})` : `${k} (${short(a[k])} vs ${short(b[k])})`));
}
