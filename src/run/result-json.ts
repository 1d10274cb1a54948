/**
 * Task results as plain JSON (journals and shard parts) and back. Doubles survive the trip
 * exactly: JSON.stringify writes the shortest text that parses back to the same double.
 */
import { InputError } from '../errors.js';
import { notesOf } from './notes.js';
import type { TaskResult } from './tasks.js';
import type { InnerThreshold } from './threshold-inner.js';

export interface TaskResultJSON {
  readonly id: string;
  readonly predicted: number[];
  readonly probs?: number[];
  readonly fitMs: number;
  readonly predictMs: number;
  readonly notes?: Readonly<Record<string, number>>;
  /** --importance: drops per input (null for NaN) and the model's own importance per feature */
  readonly drops?: (number | null)[];
  readonly own?: number[];
  /** --threshold: the inner split's threshold (value null: +Infinity, nothing positive) */
  readonly threshold?: ThresholdJSON;
}

export interface ThresholdJSON {
  readonly value: number | null;
  readonly met: boolean;
}

export function thresholdToJSON(t: InnerThreshold): ThresholdJSON {
  return { value: Number.isFinite(t.value) ? t.value : null, met: t.met };
}

/** The threshold back from JSON; undefined when absent, InputError naming `where` when malformed. */
export function thresholdFromJSON(j: unknown, where: string): InnerThreshold | undefined {
  if (j === undefined) return undefined;
  const o = j as Partial<ThresholdJSON> | null;
  if (!o || typeof o !== 'object' || !(o.value === null || typeof o.value === 'number') || typeof o.met !== 'boolean') throw new InputError(`${where}: a malformed threshold`);
  return { value: o.value === null ? Infinity : o.value, met: o.met };
}

export { notesOf };

export function resultToJSON(r: TaskResult): TaskResultJSON {
  return {
    id: r.id,
    predicted: Array.from(r.predicted),
    ...(r.probs ? { probs: Array.from(r.probs) } : {}),
    fitMs: r.fitMs,
    predictMs: r.predictMs,
    ...(r.notes ? { notes: r.notes } : {}),
    ...(r.drops ? { drops: Array.from(r.drops) } : {}),
    ...(r.own ? { own: Array.from(r.own) } : {}),
    ...(r.threshold ? { threshold: thresholdToJSON(r.threshold) } : {}),
  };
}

/** JSON writes a non-finite double as null; it reads back as NaN (never as 0). */
export const fromJsonNumbers = (v: readonly (number | null)[]): number[] => v.map((x) => (x === null ? NaN : x));

const numbers = (v: unknown): v is (number | null)[] => Array.isArray(v) && v.every((x) => typeof x === 'number' || x === null);

export function resultFromJSON(j: unknown, classification: boolean, where: string): TaskResult {
  const o = j as Partial<TaskResultJSON> | null;
  if (
    !o ||
    typeof o.id !== 'string' ||
    !numbers(o.predicted) ||
    (o.probs !== undefined && !numbers(o.probs)) ||
    (o.drops !== undefined && !numbers(o.drops)) ||
    (o.own !== undefined && !numbers(o.own))
  ) {
    throw new InputError(`${where}: not a task result`);
  }
  const notes = notesOf(o.notes);
  const threshold = thresholdFromJSON(o.threshold, where);
  return {
    ...(threshold ? { threshold } : {}),
    ...(notes ? { notes } : {}),
    id: o.id,
    predicted: classification ? Int32Array.from(o.predicted) : Float64Array.from(fromJsonNumbers(o.predicted)),
    ...(o.probs ? { probs: Float64Array.from(fromJsonNumbers(o.probs)) } : {}),
    fitMs: Number(o.fitMs) || 0,
    predictMs: Number(o.predictMs) || 0,
    ...(o.drops ? { drops: Float64Array.from(fromJsonNumbers(o.drops)) } : {}),
    ...(o.own ? { own: Float64Array.from(fromJsonNumbers(o.own)) } : {}),
  };
}
