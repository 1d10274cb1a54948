/** Fold-score statistics: summaries, corrected intervals and paired tests. */
export { tCdf, tQuantile } from './t-quantile.js';
export { finiteValues } from './finite-values.js';
export {
  checkCorrection,
  checkLevel,
  correctedInterval,
  correctedVarianceFactor,
  type ResampleCorrection,
} from './corrected-interval.js';
export { summarize, type Summary, type SummaryRules } from './summary.js';
export { binomialVarianceFloor, clipInterval, differenceRange } from './variance-floor.js';
export { holm, type HolmResult } from './holm.js';
export { correctedT, type CorrectedTResult } from './corrected-t.js';
export {
  roundingTolerance,
  wilcoxon,
  WILCOXON_EXACT_AUTO_MAX,
  WILCOXON_EXACT_MAX,
  type WilcoxonMethod,
  type WilcoxonOptions,
  type WilcoxonResult,
} from './wilcoxon.js';
