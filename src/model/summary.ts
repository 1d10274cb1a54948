/** The summary of one metric's fold scores, as every report shows it. */

export interface ScoreSummary {
  readonly n: number;
  readonly mean: number;
  readonly median: number;
  readonly sd: number | null;
  readonly min: number;
  readonly max: number;
  readonly q1: number;
  readonly q3: number;
  /** 95% interval for the mean, Student t with the Nadeau-Bengio variance correction */
  readonly ci95: readonly [number, number] | null;
}
