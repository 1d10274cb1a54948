/**
 * Types of paired comparisons: two score series on the same folds, the comparisons an eval
 * report carries, report-to-report comparisons and the gate verdict.
 *
 * Sign convention, everywhere in this folder: `diff` (or `change`) is THIS learner (or the
 * current / second run) MINUS the REFERENCE (or the baseline / first run), in the metric's own
 * units, so for a lower-is-better metric such as rmse a negative diff is an improvement.
 * `direction` says which way that is: "better", "worse" or "equal" in the metric's better
 * direction. Wins, ties and losses count folds from THIS learner's side, in the better direction.
 */


export type Direction = 'better' | 'worse' | 'equal';

/** The Wilcoxon signed-rank figures of the paired differences (this minus reference). */
export interface WilcoxonFigures {
  /** non-zero differences ranked */
  readonly n: number;
  /** sum of the ranks of positive differences (this above reference, in raw units) */
  readonly tPlus: number;
  readonly tMinus: number;
  /** two-sided p-value; it treats folds as independent, which they are not (see paired-stats.ts) */
  readonly p: number;
  readonly method: 'exact' | 'normal';
}

/** Statistics of one learner's fold scores against a reference's, paired by (repeat, fold). */
export interface PairedStats {
  /** folds scored for both, paired by (repeat, fold) */
  readonly folds: number;
  /** folds left out because a score was null on either side */
  readonly skippedFolds: number;
  /** mean test-set and training-set rows of the paired folds (the Nadeau-Bengio correction) */
  readonly testRows: number;
  readonly trainRows: number;
  /** means of the two series over the paired folds */
  readonly learnerMean: number;
  readonly referenceMean: number;
  /** mean of (this minus reference) over the paired folds, in the metric's units */
  readonly diff: number;
  readonly direction: Direction;
  /** corrected 95% interval of diff, clipped to the range of a difference; null whenever t is */
  readonly ci95: readonly [number, number] | null;
  /**
   * corrected resampled t of diff; null with fewer than 2 paired folds, and also when every
   * paired difference is the same and the metric has no variance floor (no spread: no claim)
   */
  readonly t: number | null;
  /** degrees of freedom, paired folds - 1; null with fewer than 2 paired folds */
  readonly df: number | null;
  /** two-sided p-value of the corrected t; null whenever t is */
  readonly p: number | null;
  readonly wilcoxon: WilcoxonFigures;
  /**
   * the minimal detectable difference: the smallest true difference the two-sided corrected test
   * at 0.05 finds with power 0.8 (src/stats/power.ts, one-sided 0.025); null with fewer than 2
   * paired folds or no spread. A difference smaller than this can go unseen.
   */
  readonly mdd: number | null;
  /** folds where this learner is better / equal / worse than the reference */
  readonly wins: number;
  readonly ties: number;
  readonly losses: number;
}

/** Why a reference was chosen: it is the report's baseline learner, its best learner, or both. */
export type Against = 'baseline' | 'best';

export interface ComparisonEntry extends PairedStats {
  /** spec of this learner */
  readonly learner: string;
  /** spec of the reference learner */
  readonly reference: string;
  readonly against: readonly Against[];
}

/** The comparisons inside one eval report, on its headline metric. */
export interface ReportComparisons {
  readonly metric: string;
  readonly higherIsBetter: boolean;
  /** level of every ci95 */
  readonly level: number;
  readonly pairs: readonly ComparisonEntry[];
}

/** One learner of `foldwise compare`: the second run's scores against the first run's. */
export interface CrossRow {
  /** the learner's spec in the first and in the second report */
  readonly first: string;
  readonly second: string;
  /** null when no fold has a score in both reports */
  readonly stats: PairedStats | null;
}

export interface CrossComparison {
  readonly metric: string;
  readonly higherIsBetter: boolean;
  readonly firstPath: string;
  readonly secondPath: string;
  readonly sha256: string;
  readonly plan: string;
  readonly seed: number;
  readonly rows: readonly CrossRow[];
  readonly warnings: readonly string[];
}

/** A gate verdict (format foldwise-gate/2, JSON Schema in schema/gate.schema.json). */
export interface GateVerdict {
  readonly schema: 'foldwise-gate/2';
  readonly verdict: 'pass' | 'fail';
  /** why it failed: a drop beyond fold noise, and/or the current score worse than --worst-allowed */
  readonly reasons: readonly ('regression' | 'worst-allowed')[];
  /** the current score is better than the previous one beyond fold noise (one-sided test at alpha) */
  readonly improvement: boolean;
  readonly metric: string;
  readonly higherIsBetter: boolean;
  /** the previous report: the committed one the gate compares against (--previous) */
  readonly previous: GateSide;
  readonly current: GateSide;
  /** paired by (repeat, fold), or the unpaired fallback when the runs used different folds */
  readonly rule: 'paired' | 'unpaired';
  /** for the unpaired rule: what made the folds differ (e.g. "plan.seed (1 vs 2)") */
  readonly unpairedBecause: readonly string[];
  /** current mean minus previous mean, in the metric's units */
  readonly change: number;
  /** corrected 95% interval of change, clipped to the metric's range; null when no fold shows any spread */
  readonly ci95: readonly [number, number] | null;
  /** the change in the worse direction: positive means the current run is worse */
  readonly drop: number;
  /** one-sided (1 - alpha) lower confidence bound of the drop; the gate fails when it exceeds maxDrop */
  readonly dropBound: number;
  readonly maxDrop: number;
  readonly alpha: number;
  /** corrected t of (drop - maxDrop); null when the spread is zero */
  readonly t: number | null;
  readonly df: number;
  /** one-sided p-value of H0: drop <= maxDrop */
  readonly p: number;
  /** the --worst-allowed limit, or null */
  readonly worstAllowed: number | null;
  /**
   * what the gate could detect: the minimal detectable difference of its one-sided test at alpha
   * with the given power (src/stats/power.ts), and the drop it catches with that power
   * (maxDrop + mdd); null when the folds show no spread
   */
  readonly detectable: { readonly power: number; readonly mdd: number; readonly drop: number } | null;
  /** several --metric or --slices: every test, Holm-adjusted over the family (src/compare/gate-family.ts) */
  readonly family?: GateFamily;
  /** present when --accept was given: whether the previous report's file was replaced */
  readonly accepted?: boolean;
  readonly warnings: readonly string[];
}

export interface GateSide {
  readonly path: string;
  readonly learner: string;
  /** folds whose scores the rule used */
  readonly folds: number;
  /** mean of those scores */
  readonly mean: number;
}

export interface FamilyTest {
  readonly metric: string;
  /** the slice column and level; absent for the test on all rows */
  readonly column?: string;
  readonly level?: string;
  readonly rule: 'paired' | 'unpaired';
  /** folds the test used (current side) */
  readonly folds: number;
  readonly drop: number;
  /** one-sided (1 - alpha) lower bound of the drop, before the Holm adjustment */
  readonly dropBound: number;
  /** one-sided p of H0: drop <= maxDrop */
  readonly p: number;
  /** Holm-adjusted p over the family */
  readonly adjustedP: number;
  /** adjustedP <= alpha: this test fails the gate */
  readonly regression: boolean;
}

export interface GateFamily {
  readonly method: 'holm';
  readonly tests: readonly FamilyTest[];
  /** the failing tests, as "metric" or "metric in column = level" */
  readonly failing: readonly string[];
  /** slices or metrics that could not be tested, with why */
  readonly notGated: readonly string[];
}
