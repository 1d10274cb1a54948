/**
 * A loaded table, column by column. Numeric columns are Float64Array with NaN for missing;
 * categorical columns are integer codes into a level table, -1 for missing. Columns are found
 * by name through a Map, never through a plain object (a CSV header may be `__proto__`).
 */
import type { Task } from '../learning.js';

export type ColumnKind = 'numeric' | 'categorical';

export interface NumericColumn {
  readonly kind: 'numeric';
  readonly name: string;
  /** 0-based position in the file's header */
  readonly position: number;
  readonly values: Float64Array;
  readonly missing: number;
  /** true when the texts were dates, read as days since 1970-01-01 UTC */
  readonly dates?: boolean;
  /** for a date column, how its texts were read (e.g. "ISO 8601 (year-month-day)") */
  readonly dateReading?: string;
}

/** The first cells that kept an otherwise numeric or date column from that type. */
export interface TypeBreak {
  readonly expected: 'numbers' | 'dates';
  /** how many non-missing cells are not of the expected type */
  readonly cells: number;
  /** the first of them (at most 3), with their file lines */
  readonly examples: readonly { readonly line: number; readonly text: string }[];
}

export interface CategoricalColumn {
  readonly kind: 'categorical';
  readonly name: string;
  readonly position: number;
  /** code per row, -1 where missing */
  readonly codes: Int32Array;
  /** level names in order of first appearance */
  readonly levels: readonly string[];
  readonly missing: number;
  /** set when all but a few cells are numbers, or dates of one shape: the cells that are not */
  readonly breaks?: TypeBreak;
}

export type Column = NumericColumn | CategoricalColumn;

export interface Fingerprint {
  /** SHA-256 of the input bytes, hex */
  readonly sha256: string;
  readonly rows: number;
  readonly columns: number;
  /** resolved schema: [name, kind] in header order */
  readonly schema: readonly (readonly [string, ColumnKind])[];
}

export interface Table {
  /** where the data came from: a path, or "-" for standard input */
  readonly source: string;
  readonly rows: number;
  readonly columns: readonly Column[];
  readonly byName: ReadonlyMap<string, Column>;
  readonly fingerprint: Fingerprint;
  /** 1-based line number in the file of each data row (for error messages) */
  readonly lines: Int32Array;
  readonly warnings: readonly string[];
  /** the field separator the file was read with (absent in tables not read from a CSV) */
  readonly delimiter?: string;
}

/** What every report says about its data: the same fields in eval, tune and audit reports. */
export interface DataSection {
  readonly path: string;
  readonly sha256: string;
  readonly rows: number;
  readonly columns: number;
  readonly rowsUsed: number;
  readonly excludedRows: number;
  readonly target: string;
  readonly task: Task;
  readonly classes?: readonly string[];
  readonly features: readonly string[];
  readonly dropped: readonly string[];
  /** how each date column among the features and --order was read (absent when there is none) */
  readonly dates?: readonly { readonly column: string; readonly read: string }[];
}
