/**
 * Partial reports of sharded runs, and `merge`. A part carries the run's identity, the report
 * frame (everything known before fitting), the ids of every task of the whole run, and the
 * records of its own tasks (actual and predicted values of each test part). `merge` checks
 * that all parts belong to one run and that every task is there exactly once, then assembles
 * the report exactly as a single run would have (byte-identical with --no-timing).
 */
import { InputError } from '../errors.js';
import { refuseOldFormat } from '../renamed.js';
import type { Target } from '../learning.js';
import type { Report } from '../model/report.js';
import { VERSION } from '../version.js';
import { assembleReport, type ReportFrame, type TaskRecord } from './evaluate.js';
import { identityDiff, type RunIdentity } from './identity.js';
import { fromJsonNumbers, notesOf, thresholdFromJSON, thresholdToJSON, type ThresholdJSON } from './result-json.js';
import type { ShardSpec } from './shard.js';

export const PARTIAL_FORMAT = 'foldwise-partial/2';

interface RecordJSON {
  readonly id: string;
  readonly candidateIndex: number;
  readonly foldIndex: number;
  readonly repeat: number;
  readonly fold: number;
  readonly trainRows: number;
  readonly actual: number[];
  readonly predicted: number[];
  readonly probs?: number[];
  readonly fitMs: number;
  readonly predictMs: number;
  readonly failed?: string;
  /** 0-based data rows and 1-based lines of the test rows (for merge --predictions) */
  readonly rows?: number[];
  readonly lines?: number[];
  /** --predictions-keep: the kept columns' text, row by row */
  readonly keep?: string[];
  readonly notes?: Readonly<Record<string, number>>;
  readonly drops?: (number | null)[];
  readonly own?: (number | null)[];
  readonly threshold?: ThresholdJSON;
}

export interface PartialReport {
  readonly schema: typeof PARTIAL_FORMAT;
  readonly tool: { readonly name: 'foldwise'; readonly version: string };
  readonly shard: ShardSpec;
  /** false when the part was made with --no-timing: the merged report then has no timing either */
  readonly timing: boolean;
  readonly identity: RunIdentity;
  readonly frame: ReportFrame;
  /** every task id of the whole run, in the run's order */
  readonly tasks: readonly string[];
  readonly records: readonly RecordJSON[];
  /** the columns --predictions-keep copied into the records (absent when none) */
  readonly keep?: readonly string[];
}

export function makePartial(
  identity: RunIdentity,
  frame: ReportFrame,
  shard: ShardSpec,
  allTasks: readonly string[],
  records: readonly TaskRecord[],
  timing = true,
  keep: readonly string[] = [],
): PartialReport {
  return {
    schema: PARTIAL_FORMAT,
    tool: { name: 'foldwise', version: VERSION },
    shard,
    timing,
    identity,
    frame,
    tasks: allTasks,
    records: records.map((r) => ({
      id: r.id,
      candidateIndex: r.candidateIndex,
      foldIndex: r.foldIndex,
      repeat: r.repeat,
      fold: r.fold,
      trainRows: r.trainRows,
      actual: Array.from(r.actual.task === 'classification' ? r.actual.codes : r.actual.values),
      predicted: Array.from(r.predicted),
      ...(r.probs ? { probs: Array.from(r.probs) } : {}),
      fitMs: r.fitMs,
      predictMs: r.predictMs,
      ...(r.failed ? { failed: r.failed } : {}),
      ...(r.rows ? { rows: Array.from(r.rows) } : {}),
      ...(r.lines ? { lines: Array.from(r.lines) } : {}),
      ...(r.keep ? { keep: [...r.keep] } : {}),
      ...(r.notes ? { notes: r.notes } : {}),
      ...(r.drops ? { drops: Array.from(r.drops) } : {}),
      ...(r.own ? { own: Array.from(r.own) } : {}),
      ...(r.threshold ? { threshold: thresholdToJSON(r.threshold) } : {}),
    })),
    ...(keep.length ? { keep: [...keep] } : {}),
  };
}

function recordFromJSON(j: RecordJSON, frame: ReportFrame): TaskRecord {
  const classes = frame.data.classes;
  const actual: Target = classes
    ? { task: 'classification', codes: Int32Array.from(j.actual), classes }
    : { task: 'regression', values: Float64Array.from(j.actual) };
  return {
    id: j.id,
    candidateIndex: j.candidateIndex,
    foldIndex: j.foldIndex,
    repeat: j.repeat,
    fold: j.fold,
    trainRows: j.trainRows,
    fitMs: j.fitMs,
    predictMs: j.predictMs,
    actual,
    predicted: classes ? Int32Array.from(j.predicted) : Float64Array.from(fromJsonNumbers(j.predicted)),
    ...(j.probs ? { probs: Float64Array.from(fromJsonNumbers(j.probs)) } : {}),
    ...(typeof j.failed === 'string' && j.failed !== '' ? { failed: j.failed } : {}),
    ...(Array.isArray(j.rows) ? { rows: Int32Array.from(j.rows) } : {}),
    ...(Array.isArray(j.lines) ? { lines: Int32Array.from(j.lines) } : {}),
    ...(Array.isArray(j.keep) ? { keep: j.keep.map(String) } : {}),
    ...(notesOf(j.notes) ? { notes: notesOf(j.notes) } : {}),
    ...(Array.isArray(j.drops) ? { drops: Float64Array.from(fromJsonNumbers(j.drops)) } : {}),
    ...(Array.isArray(j.own) ? { own: Float64Array.from(fromJsonNumbers(j.own)) } : {}),
    ...(j.threshold !== undefined ? { threshold: thresholdFromJSON(j.threshold, `task ${j.id}`)! } : {}),
  };
}

/** Parses a part file's text; names the file in every error. */
export function parsePartial(text: string, name: string): PartialReport {
  let j: Partial<PartialReport>;
  try {
    j = JSON.parse(text);
  } catch {
    throw new InputError(`${name}: not JSON; expected a part written by foldwise eval --shard`);
  }
  refuseOldFormat(name, j?.schema, PARTIAL_FORMAT, 'rerun the shards with this foldwise');
  if (j?.schema !== PARTIAL_FORMAT || !j.identity || !j.frame || !Array.isArray(j.tasks) || !Array.isArray(j.records) || !j.shard) {
    throw new InputError(`${name}: not a foldwise part (${PARTIAL_FORMAT}); expected a part written by foldwise eval --shard`);
  }
  return j as PartialReport;
}

/** Merges parts into the report of the whole run. `names` label the parts in errors. */
export function mergeParts(parts: readonly PartialReport[], names: readonly string[], timing: boolean): Report {
  return mergePartsWithRecords(parts, names, timing).report;
}

/** As mergeParts, also giving the task records in run order and the kept column names (for merge --predictions). */
export function mergePartsWithRecords(
  parts: readonly PartialReport[],
  names: readonly string[],
  timing: boolean,
): { report: Report; frame: ReportFrame; records: TaskRecord[]; keep: readonly string[] } {
  const records = checkParts(parts, names);
  const first = parts[0];
  const keep = first.keep ?? [];
  parts.forEach((p, i) => {
    if (JSON.stringify(p.keep ?? []) !== JSON.stringify(keep)) {
      throw new InputError(`merge: ${names[i]} keeps the columns ${JSON.stringify(p.keep ?? [])} and ${names[0]} ${JSON.stringify(keep)}; make every part with the same --predictions-keep`);
    }
  });
  const ordered = first.tasks.map((id) => recordFromJSON(records.get(id)!, first.frame));
  // the parts carry the --no-timing choice of their runs; merge --no-timing also leaves it out
  const total = timing && parts.every((p) => p.timing !== false) ? ordered.reduce((s, r) => s + r.fitMs + r.predictMs, 0) : undefined;
  return { report: assembleReport(first.frame, ordered, total), frame: first.frame, records: ordered, keep };
}

/** What every kind of part has: the run's identity, the shard, every task id of the run, and its own records. */
export interface PartLike<Rec extends { readonly id: string }> {
  readonly tool?: { readonly version: string };
  readonly shard: ShardSpec;
  readonly identity: RunIdentity;
  readonly tasks: readonly string[];
  readonly records: readonly Rec[];
}

/**
 * The checks of merge for every kind of part: all parts of one run (identity and foldwise
 * version), of one shard count, each shard once, and every task of the run exactly once.
 * Returns the records by task id.
 */
export function checkParts<Rec extends { readonly id: string }>(parts: readonly PartLike<Rec>[], names: readonly string[]): Map<string, Rec> {
  if (parts.length === 0) throw new InputError('merge: give the part files to merge');
  const first = parts[0];
  parts.forEach((p, i) => {
    const diff = identityDiff(p.identity, first.identity, [names[i], names[0]]);
    // parts of another foldwise version may differ in ways the identity does not show
    const version = (q: PartLike<Rec>): string => JSON.stringify(q.tool?.version ?? null);
    if (version(p) !== version(first)) diff.unshift(`foldwise version (${names[i]}: ${version(p)}, ${names[0]}: ${version(first)})`);
    if (diff.length) throw new InputError(`merge: ${names[i]} belongs to another run than ${names[0]}: it differs in ${diff.join(', ')}`);
    if (p.shard.count !== first.shard.count) throw new InputError(`merge: ${names[i]} is shard ${p.shard.index}/${p.shard.count}, ${names[0]} is of ${first.shard.count}`);
  });
  // the same shard given twice (the same file, or a copy) is a mistake of the command line
  const shardOf = new Map<number, string>();
  parts.forEach((p, i) => {
    const before = shardOf.get(p.shard.index);
    if (before !== undefined) {
      throw new InputError(`merge: ${before} and ${names[i]} are both shard ${p.shard.index}/${p.shard.count} (doubled); give each part once (one file per shard 1 to ${p.shard.count})`);
    }
    shardOf.set(p.shard.index, names[i]);
  });
  const seen = new Map<string, string>();
  const doubled: string[] = [];
  const records = new Map<string, Rec>();
  parts.forEach((p, i) => {
    for (const r of p.records) {
      if (seen.has(r.id)) doubled.push(`${r.id} (in ${seen.get(r.id)} and ${names[i]})`);
      else seen.set(r.id, names[i]);
      records.set(r.id, r);
    }
  });
  const missing = first.tasks.filter((id) => !records.has(id));
  const unknown = [...records.keys()].filter((id) => !first.tasks.includes(id));
  const problems = [
    ...(missing.length ? [`${missing.length} task${missing.length === 1 ? ' is' : 's are'} missing: ${missing.slice(0, 5).join(', ')}${missing.length > 5 ? ', ...' : ''}`] : []),
    ...(doubled.length ? [`${doubled.length} doubled: ${doubled.slice(0, 5).join(', ')}`] : []),
    ...(unknown.length ? [`${unknown.length} not of this run: ${unknown.slice(0, 5).join(', ')}`] : []),
  ];
  if (problems.length) throw new InputError(`merge: ${problems.join('; ')}; run or add the missing shards`);
  return records;
}
