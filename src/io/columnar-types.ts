/**
 * The shapes of columns written out as Parquet or Arrow (write-columnar.ts builds them,
 * columnar-encoders.ts encodes them), in a file of their own so neither imports the other.
 */
export type OutColumn =
  | { readonly kind: 'float'; readonly name: string; readonly values: Float64Array }
  | { readonly kind: 'int'; readonly name: string; readonly values: Int32Array; readonly nulls?: Uint8Array }
  | { readonly kind: 'text'; readonly name: string; readonly codes: Int32Array; readonly levels: readonly string[] }
  | {
      readonly kind: 'days';
      readonly name: string;
      readonly values: Float64Array;
      /**
       * the column's type decided by the caller over all its rows: true a millisecond timestamp,
       * false a date of whole days; absent, it follows the values given (a batch's only, so a file
       * written batch by batch must set it, or a later batch with a time of day is refused)
       */
      readonly times?: boolean;
    };

/**
 * One batch of a file written batch by batch: every batch of a file has the same column names
 * and kinds, and a text column the same `levels` array in every batch.
 */
export interface ColumnBatch {
  readonly columns: readonly OutColumn[];
  readonly length: number;
}
